package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"math/big"
	"strings"
	"time"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prove"
)

func init() {
	commands["bound"] = command{
		summary: "certified interval for the growth rate lambda and 1/lambda, with a certificate",
		usage: `Usage: avoidcert bound [--digits D | --width W] [--out FILE | --no-certificate] [--json] PATTERN...

Brackets lambda = lim (a_n/n!)^(1/n) by the coefficientwise Collatz-Wielandt
bound on the exact iterates, until lo and hi agree to D significant digits
(truncated) or hi - lo <= W. Prints lambda and the radius 1/lambda, both
rounded outward, bounds on a_n/n! valid for every n >= n0, the structure class,
and writes a certificate that 'avoidcert check' re-verifies independently.
Nothing is printed or written before the independent checker has accepted
that certificate: the intervals and the bounds for every n shown are its
statement.

The structure decides the method: periodic sets are bracketed through T^d,
reducible ones block by block; for subexponential sets lambda = 0 is proved by
the structure pass and only the upper bound is bracketed. For periodic sets
the constants c_r of a_n/n! = lambda^n (c_(n mod d) + o(1)) are estimated
from exact counts (estimate, not certified).

Flags:
  --digits D          significant digits to certify, 1 to 995 (default 10)
  --width W           absolute width target instead, e.g. 1e-20 (not with --digits)
  --out FILE          certificate path (default avoidcert-SET.json); see below
  --no-certificate    write no certificate
  --json              {"format":"avoidcert-bound","version":1,"patterns":[...],
                      "structure_class":...,"primitivity_exponent":k,"period":p,
                      "finite_from":N1,"lambda":{"lo","hi"},"radius":{...},"k":K,
                      "lambda_digits":D,"all_n":{"n0","a_n0","lo","hi"},
                      "estimates":{"note":"estimate, not certified",...},
                      "stop":...,"certificate":PATH} (docs/json.md)
  --max-k K           stop at this k (default 1000, the checker's limit)
  --max-memory B      the engine's work and the checker's re-check together:
                      no bracket whose certificate the checker could not check
                      within it (default 4G)
  --timeout T         stop the bracket in time to certify the best one within
                      this long, e.g. 90s or 10m, as estimated (default none)
  --progress          the plan, one line per bracket, and a line at least
                      every 3 s, on stderr (for logs)
  --quiet             no live progress bar (shown on a terminal by default);
                      not with --progress

The certificate file: a regular file is replaced atomically (temp file
.NAME.avoidcert-tmp-PID-DIGITS beside it, then a rename), a new one is
created in an existing folder (a missing folder is refused); a symbolic link is
written through to its target, which must be a regular file or missing in an
existing folder; a folder, device, FIFO or socket is refused before any work.
A temp file left by a killed run is removed by a later write of that NAME
once its process is gone (README: the temp-file rule).
--out - writes the certificate to standard output; the report then goes to
standard error.

Exit codes: 0 target met (or lambda decided exactly), 3 a budget stopped the
run first (the best certified bracket is printed and certified, and the
flag to raise named; a budget that cannot hold a first bracket and its check
is refused at once, and nothing is written), 2 bad input, 4 interrupted
(Ctrl-C or SIGTERM: nothing is written; use --timeout to stop early and keep
a certificate), out of space, or a certificate the checker refused (with its
reason; nothing is written).
`,
		run: runBound,
	}
}

// budget holds the flags shared by bound and claim.
type budget struct {
	maxK      int
	maxMemory byteSize
	timeout   duration
	progress  bool
	quiet     bool
	typed     []string // the pattern arguments as typed
}

func (b *budget) register(fs *flag.FlagSet) {
	b.maxMemory = defaultMemory
	fs.IntVar(&b.maxK, "max-k", certify.MaxN, "")
	fs.Var(&b.maxMemory, "max-memory", "")
	fs.Var(&b.timeout, "timeout", "")
	fs.BoolVar(&b.progress, "progress", false, "")
	fs.BoolVar(&b.quiet, "quiet", false, "")
}

// parse registers the budget flags on fs, parses args and returns the
// pattern set they name, with the budget checked; b.typed keeps the
// pattern arguments as they were typed, for the checker.
func (b *budget) parse(fs *flag.FlagSet, args []string) (pattern.Set, error) {
	b.register(fs)
	pos, err := parseArgs(fs, args)
	if err != nil {
		return pattern.Set{}, err
	}
	set, err := parsePatterns(fs.Name(), pos)
	if err != nil {
		return pattern.Set{}, err
	}
	b.typed = pos
	return set, b.validate(fs.Name())
}

func (b *budget) validate(cmd string) error {
	switch {
	case b.maxK < 1:
		return usagef("%s: --max-k must be at least 1", cmd)
	case b.maxK > certify.MaxN:
		return usagef("%s: --max-k %d is over %d, the largest k a certificate checker accepts", cmd, b.maxK, certify.MaxN)
	case b.progress && b.quiet:
		return usagef("%s: give --progress (lines for logs) or --quiet (no progress at all), not both", cmd)
	}
	return nil
}

// options are the prove options of the budget: --max-k, --max-memory (also
// the runtime's memory limit), the deadline of --timeout from now, and the
// pattern arguments as typed, which bind the checker.
func (b *budget) options() prove.Options {
	limitMemory(int64(b.maxMemory))
	opts := prove.Options{MaxK: b.maxK, MaxMemory: int64(b.maxMemory), Tool: toolName(), Typed: b.typed}
	if b.timeout > 0 {
		opts.Deadline = time.Now().Add(time.Duration(b.timeout))
	}
	return opts
}

// watch sets the progress reports of opts, for the bracket run towards
// wanted digits and for the check of its certificate: live bars on a
// terminal (unless --quiet), lines with --progress, else nothing. done
// must be called before the result is printed.
func (b *budget) watch(e *env, opts *prove.Options, wanted int) (done func()) {
	where := func(ev prove.Event) string {
		n := ev.N // the newest iterate, or the n of the bracket just taken
		if ev.Bracket != nil {
			n = ev.Bracket.N
		}
		if ev.Blocks == 0 {
			return fmt.Sprintf("n=%d", n)
		}
		return fmt.Sprintf("block %d of %d, n=%d", ev.Block+1, ev.Blocks, n)
	}
	agreed := func(x bounds.Enclosure) int {
		if !x.Finite() || x.Lo.Sign() <= 0 {
			return 0
		}
		return interval.CommonDigits(x.Lo, x.Hi)
	}
	switch {
	case b.progress:
		log := newProgressLog(e.stderr)
		opts.Planned = func(p prove.Plan) {
			limit := "the largest --max-k allows"
			if p.Beyond != nil {
				limit = "past it, " + p.Beyond.Explain(flagOf)
			}
			log.printf("plan: brackets up to n = %d (%s); the checker's re-check of a bracket there: about %.2g coefficient operations, %s (estimates)",
				p.LastN, limit, p.CheckWork, p.CheckTime.Round(time.Second/10))
		}
		opts.Progress = func(ev prove.Event) {
			if ev.Bracket == nil {
				log.doing(fmt.Sprintf("%s, iterating towards the bracket at n=%d", where(ev), ev.NextN))
				return
			}
			d := agreed(ev.Lambda)
			log.doing(fmt.Sprintf("%s, the bracket taken; iterating on, or certifying the best bracket", where(ev)))
			log.printf("%s: lambda in %s (%d of %d digits agreed)", where(ev), ev.Lambda.String(max(d+3, 8)), d, wanted)
		}
		opts.CheckProgress = checkLines(log)
		return log.close
	case e.progress && !b.quiet:
		bar := newLiveBar(e.stderr, int64(wanted), "digits")
		opts.Progress = func(ev prove.Event) {
			bar.set(where(ev)+" ", int64(agreed(ev.Lambda)), int64(wanted))
		}
		var checking *liveBar // the checker's bar, once the bracket run is over
		opts.CheckProgress = func(done, total int64) {
			if checking == nil {
				bar.finish()
				checking = newLiveBar(e.stderr, total, "operations")
			}
			checking.set("checking ", done, total)
		}
		return func() {
			if checking == nil {
				bar.finish()
			} else {
				checking.finish()
			}
		}
	}
	return func() {}
}

func runBound(ctx context.Context, e *env, args []string) int {
	fs := newFlags("bound")
	digits := fs.Int("digits", 10, "")
	width := fs.String("width", "", "")
	out := fs.String("out", "", "")
	noCert := fs.Bool("no-certificate", false, "")
	asJSON := fs.Bool("json", false, "")
	var b budget
	set, err := b.parse(fs, args)
	if err != nil {
		return failure(e, err)
	}
	given := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { given[f.Name] = true })
	opts := b.options()
	opts.Digits, opts.ResidueConstants = *digits, true
	switch {
	case given["digits"] && given["width"]:
		return failure(e, usagef("bound: give --digits or --width, not both"))
	case *digits < 1 || *digits > certify.MaxDigits-5:
		return failure(e, usagef("bound: --digits %d is out of range; give 1 to %d", *digits, certify.MaxDigits-5))
	case given["out"] && *noCert:
		return failure(e, usagef("bound: give --out or --no-certificate, not both"))
	case *width != "":
		w, err := interval.ParseDecimal(*width)
		if err != nil || w.Sign() <= 0 {
			return failure(e, usagef("bound: --width %s is not a positive decimal such as 1e-20", quote(*width)))
		}
		opts.Width, opts.Digits = w, 0
	}
	path := *out
	if path == "" {
		path = "avoidcert-" + strings.ReplaceAll(set.String(), ",", "_") + ".json"
	}
	// Refuse an unusable --out before the work, not after it.
	dest, err := openOut("bound", "--out", path, *noCert)
	if err != nil {
		return failure(e, err)
	}
	report := e.stdout
	if dest.stdout {
		report = e.stderr // standard output carries the certificate alone
	}

	// prove.Certify stops the bracket run at --timeout and certifies the
	// best bracket; only Ctrl-C stops the certificate's build and check.
	// The certificate is made even with --no-certificate: the explicit
	// bound printed is its statement.
	progressDone := b.watch(e, &opts, wantedDigits(opts))
	r, err := prove.Certify(ctx, set, opts)
	progressDone()
	if ctx.Err() != nil {
		return interrupted(e)
	}
	if err != nil {
		return failure(e, err)
	}
	data, err := certify.Marshal(r.Certificate)
	if err != nil {
		return failure(e, err)
	}
	if err := dest.write(e.stdout, data); err != nil {
		return failure(e, fmt.Errorf("bound: cannot write the certificate to %s: %w", quote(path), err))
	}
	if *asJSON {
		writeBoundJSON(report, r, dest)
	} else {
		writeBoundText(report, r, dest)
	}
	if r.Done() {
		return exitOK
	}
	return exitUndecided
}

// wantedDigits is the digits target shown by progress: --digits, or the
// digits a bracket of width --width has at lambda about 1.
func wantedDigits(opts prove.Options) int {
	if opts.Width == nil {
		return opts.Digits
	}
	w, _ := opts.Width.Float64()
	return max(1, int(math.Ceil(-math.Log10(w))))
}

// stopWords says why the bracket run ended: its goal, or the budget that
// stopped it, named by its flag, with what more it would need.
func stopWords(r *prove.Result) string {
	switch r.Bracket.Stop {
	case bounds.StopTarget:
		return "target met"
	case bounds.StopExact:
		return "lambda known exactly (a bracket of zero width)"
	}
	if over := r.Stopped(); over != nil {
		return "budget stop: " + over.Explain(flagOf)
	}
	return "decided"
}

// certified returns the lambda and radius intervals the checked
// certificate states, the digits they are printed with, and the
// significant digits of lambda they agree on (0 unless lambda > 0).
func certified(c *certify.Certificate) (lambda, radius bounds.Enclosure, digits, agreed int) {
	st := c.Statement
	lambda = bounds.Enclosure{Lo: st.Lambda.Lo, Hi: st.Lambda.Hi}
	if lambda.Finite() && lambda.Lo.Sign() > 0 {
		agreed = interval.CommonDigits(lambda.Lo, lambda.Hi)
	}
	return lambda, bounds.Enclosure{Lo: st.Radius.Lo, Hi: st.Radius.Hi}, st.Lambda.Digits, agreed
}

func writeBoundText(w io.Writer, r *prove.Result, dest *outFile) {
	res, cs := r.Bracket, r.Certificate.Structure
	lambda, radius, digits, agreed := certified(r.Certificate)
	fmt.Fprintf(w, "patterns: %s (window length %d)\n", r.Set, r.Set.Window())
	form := prove.FormOf(r.Certificate)
	printWrapped(w, "class: "+form.Words(), "  ")
	if form.Class == certify.ClassSubexponential {
		fmt.Fprintln(w, "lambda = 0 (proved by the structure test: no cyclic avoider of any length)")
	}
	fmt.Fprintf(w, "lambda   in %s  (%s)\n", lambda.String(digits), digitWords(lambda, agreed))
	if prove.LambdaZero(r.Certificate) {
		fmt.Fprintln(w, "1/lambda: "+noRadius)
	} else {
		fmt.Fprintf(w, "1/lambda in %s\n", radius.String(digits))
	}
	for _, br := range res.Brackets {
		fmt.Fprintf(w, "bracket: n = %d, step %d, start %s, on %d of %d prefix states\n", br.N, br.Step, br.Start, len(br.States), r.States.Len())
	}
	if line := allNLine(r.Certificate.Statement.AllN, !dest.skip, digits); line != "" {
		fmt.Fprintln(w, line)
	}
	est := r.Estimates
	if est.Rate > 0 {
		fmt.Fprintf(w, "estimate, not certified: |lambda_2|/lambda ~ %.3g (from the width decay)\n", est.Rate)
	}
	if est.C > 0 {
		fmt.Fprintf(w, "estimate, not certified: c in a_n ~ c lambda^n n! ~ %.6g\n", est.C)
	}
	for i, c := range est.ByResidue {
		fmt.Fprintf(w, "estimate, not certified: c_%d in a_n/n! = lambda^n (c_(n mod %d) + o(1)) ~ %.6g (from the exact a_n)\n", i, len(est.ByResidue), c)
	}
	if cs.Class == certify.ClassSubexponential {
		fmt.Fprintf(w, "stopped: upper bound taken at k = %d (lambda = 0 is proved; the bracket only bounds the decay) after %.1f s\n",
			r.K(), res.Elapsed.Seconds())
	} else {
		fmt.Fprintf(w, "stopped: %s after %.1f s\n", stopWords(r), res.Elapsed.Seconds())
	}
	fmt.Fprintf(w, "certificate: %s\n", dest.describe())
}

// noRadius is what bound, claim and check say of 1/lambda when the
// checked certificate proves lambda = 0 (JSON: "radius": null).
const noRadius = "none (lambda = 0)"

// allNLine prints the certificate's explicit bound, valid for every
// n >= n0 (the checker verifies it). A is shown rounded to nearest, for
// reading; its exact value a_n0/n0! is in the certificate when one is
// written.
func allNLine(x certify.AllN, written bool, digits int) string {
	if x.AN0 == nil || x.AN0.Sign() == 0 {
		return ""
	}
	fact := new(big.Int).MulRange(1, int64(x.N0))
	a := new(big.Float).SetPrec(64).SetRat(new(big.Rat).SetFrac(x.AN0, fact))
	var lower, upper string
	if x.MuLo != nil && x.MuLo.Sign() > 0 {
		lower = fmt.Sprintf("A*%s^(n-%d) <= ", interval.DecimalDown(x.MuLo, digits), x.N0)
	}
	if x.MuHi != nil && x.MuHi.Sign() > 0 {
		upper = fmt.Sprintf(" <= A*%s^(n-%d)", interval.DecimalUp(x.MuHi, digits), x.N0)
	}
	if lower == "" && upper == "" {
		return ""
	}
	exact := "exact in the certificate"
	if !written {
		exact = fmt.Sprintf("a_%d exact: 'avoidcert count'", x.N0)
	}
	return fmt.Sprintf("for every n >= %d: %sa_n/n!%s, A = a_%d/%d! ~ %s (%s)",
		x.N0, lower, upper, x.N0, x.N0, a.Text('g', 10), exact)
}

// allNJSONOf is the certificate's explicit bound for --json output.
func allNJSONOf(x certify.AllN, digits int) *allNJSON {
	if x.AN0 == nil || x.AN0.Sign() == 0 {
		return nil
	}
	j := &allNJSON{N0: x.N0, AN0: x.AN0.String()}
	if x.MuLo != nil && x.MuLo.Sign() > 0 {
		s := interval.DecimalDown(x.MuLo, digits)
		j.Lo = &s
	}
	if x.MuHi != nil && x.MuHi.Sign() > 0 {
		s := interval.DecimalUp(x.MuHi, digits)
		j.Hi = &s
	}
	return j
}

func digitWords(x bounds.Enclosure, digits int) string {
	switch {
	case x.Lo != nil && x.Hi != nil && x.Lo.Cmp(x.Hi) == 0:
		return "exact"
	case x.Lo != nil && x.Lo.Sign() == 0:
		return "an upper bound only"
	}
	return fmt.Sprintf("%d significant digits certified", digits)
}

// boundJSON is the --json output of bound.
type boundJSON struct {
	jsonHead
	Patterns    []string       `json:"patterns"`
	Class       string         `json:"structure_class"`
	Exponent    *int           `json:"primitivity_exponent"`
	Period      *int           `json:"period"`
	FiniteFrom  *int           `json:"finite_from"`
	Lambda      endsJSON       `json:"lambda"`
	Radius      *endsJSON      `json:"radius"`
	K           int            `json:"k"`
	Digits      int            `json:"lambda_digits"`
	AllN        *allNJSON      `json:"all_n"`
	Estimates   *estimatesJSON `json:"estimates"`
	Stop        string         `json:"stop"`
	Seconds     float64        `json:"seconds"`
	Certificate *string        `json:"certificate"`
}

type endsJSON struct {
	Lo *string `json:"lo"`
	Hi *string `json:"hi"`
}

// allNJSON is A*lo^(n-n0) <= a_n/n! <= A*hi^(n-n0) for every n >= n0,
// A = a_n0/n0!.
type allNJSON struct {
	N0  int     `json:"n0"`
	AN0 string  `json:"a_n0"`
	Lo  *string `json:"lo"`
	Hi  *string `json:"hi"`
}

type estimatesJSON struct {
	Note    string    `json:"note"`
	Rate    *float64  `json:"rate,omitempty"`
	C       *float64  `json:"c,omitempty"`
	CPhases []float64 `json:"c_by_residue,omitempty"`
}

func ends(x bounds.Enclosure, digits int) endsJSON {
	var out endsJSON
	out.Lo, out.Hi = interval.DecimalEnds(x.Lo, x.Hi, digits)
	return out
}

func writeBoundJSON(w io.Writer, r *prove.Result, dest *outFile) {
	res := r.Bracket
	lambda, radius, digits, agreed := certified(r.Certificate)
	out := boundJSON{jsonHead: headOf("bound"), Patterns: r.Set.Strings(), Class: string(prove.FormOf(r.Certificate).Class),
		Lambda: ends(lambda, digits), K: r.K(), Digits: min(agreed, 1000),
		Stop: string(res.Stop), Seconds: res.Elapsed.Seconds()}
	if !prove.LambdaZero(r.Certificate) {
		rad := ends(radius, digits)
		out.Radius = &rad // null when lambda = 0: 1/lambda has no value
	}
	out.Exponent, out.Period, out.FiniteFrom = classNumbers(r.Certificate.Structure)
	out.AllN = allNJSONOf(r.Certificate.Statement.AllN, digits)
	est := &estimatesJSON{Note: "estimate, not certified", CPhases: r.Estimates.ByResidue}
	if x := r.Estimates.Rate; x > 0 {
		est.Rate = &x
	}
	if x := r.Estimates.C; x > 0 {
		est.C = &x
	}
	if est.Rate != nil || est.C != nil || est.CPhases != nil {
		out.Estimates = est
	}
	switch {
	case dest.stdout:
		s := "-"
		out.Certificate = &s
	case !dest.skip:
		out.Certificate = &dest.path
	}
	writeJSON(w, out)
}
