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
	"avoidcert/structure"
	"avoidcert/transfer"
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
  --json              {"patterns":[...],"class":...,"period":d,"exponent":e,
                      "lambda":{"lo","hi"},"radius":{...},"k":K,"digits":D,
                      "all_n":{"n0","a_n0","lo","hi"},"estimates":{"note":
                      "estimate, not certified",...},"stop":...,"certificate":PATH}
  --max-k K           stop at this k (default 1000, the checker's limit)
  --max-memory B      stop before a step that would need more (default 8G)
  --timeout T         stop after this long, e.g. 90s or 10m (default none)
  --progress          one line per bracket on stderr (for logs)
  --quiet             no live progress bar (shown on a terminal by default)

The certificate file: a regular file is replaced atomically (temp file
.NAME.avoidcert-tmp-DIGITS beside it, then a rename); a symbolic link is
written through to its target, which must be a regular file or missing in an
existing folder; a folder, device, FIFO or socket is refused before any work.
A temp file left by a killed run is removed by the next write of that NAME.
--out - writes the certificate to standard output; the report then goes to
standard error.

Exit codes: 0 target met (or lambda decided exactly), 3 a budget stopped the
run first (the best certified bracket is printed and certified; when it stops
before a first bracket nothing is written), 2 bad input, 4 interrupted
(Ctrl-C: nothing is written; use --timeout to stop early and keep a
certificate).
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
}

func (b *budget) register(fs *flag.FlagSet) {
	b.maxMemory = 8 << 30
	fs.IntVar(&b.maxK, "max-k", certify.MaxN, "")
	fs.Var(&b.maxMemory, "max-memory", "")
	fs.Var(&b.timeout, "timeout", "")
	fs.BoolVar(&b.progress, "progress", false, "")
	fs.BoolVar(&b.quiet, "quiet", false, "")
}

// parse registers the budget flags on fs, parses args and returns the
// pattern set they name, with the budget checked.
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
	return set, b.validate(fs.Name())
}

func (b *budget) validate(cmd string) error {
	switch {
	case b.maxK < 1:
		return usagef("%s: --max-k must be at least 1", cmd)
	case b.maxK > certify.MaxN:
		return usagef("%s: --max-k %d is over %d, the largest k a certificate checker accepts", cmd, b.maxK, certify.MaxN)
	case b.timeout < 0:
		return usagef("%s: --timeout must not be negative", cmd)
	}
	return nil
}

// start applies the budget (the runtime memory limit, the deadline) and
// plans the bracket from the set's structure. The caller must call cancel.
func (b *budget) start(ctx context.Context, set pattern.Set) (context.Context, context.CancelFunc, *plan, error) {
	limitMemory(int64(b.maxMemory))
	cancel := context.CancelFunc(func() {})
	if b.timeout > 0 {
		ctx, cancel = context.WithTimeout(ctx, time.Duration(b.timeout))
	}
	p, err := planFor(ctx, set)
	if err != nil {
		cancel()
		return nil, nil, nil, err
	}
	return ctx, cancel, p, nil
}

// watch returns the progress report of a bracket run towards wanted
// digits: a live bar on a terminal (unless --quiet), one line per bracket
// with --progress, else nothing. done must be called before the result is
// printed.
func (b *budget) watch(e *env, p *plan, wanted int) (report bounds.Progress, done func()) {
	where := func(ev bounds.Event) string {
		n := ev.N // the newest iterate, or the n of the bracket just taken
		if ev.Bracket != nil {
			n = ev.Bracket.N
		}
		if p.blocks == nil {
			return fmt.Sprintf("n=%d", n)
		}
		return fmt.Sprintf("block %d of %d, n=%d", ev.Block+1, len(p.blocks), n)
	}
	agreed := func(x bounds.Enclosure) int {
		if !x.Finite() || x.Lo.Sign() <= 0 {
			return 0
		}
		return interval.CommonDigits(x.Lo, x.Hi)
	}
	switch {
	case b.progress:
		return func(ev bounds.Event) {
			if ev.Bracket != nil {
				d := agreed(ev.Lambda)
				fmt.Fprintf(e.stderr, "%s: lambda in %s (%d of %d digits agreed)\n", where(ev), ev.Lambda.String(max(d+3, 8)), d, wanted)
			}
		}, func() {}
	case e.progress && !b.quiet:
		bar := newLiveBar(e.stderr, int64(wanted), "digits")
		return func(ev bounds.Event) {
			bar.set(where(ev)+" ", int64(agreed(ev.Lambda)), int64(wanted))
		}, bar.finish
	}
	return nil, func() {}
}

// plan is how a set is bracketed, decided from its structure.
type plan struct {
	rep    *structure.Report
	states *transfer.States
	step   int
	blocks [][]int // nil: the whole system
}

func planFor(ctx context.Context, set pattern.Set) (*plan, error) {
	// Certificates list witnesses up to prove.MaxWitnessM.
	rep, err := structure.Analyze(ctx, set, structure.Options{Witnesses: set.Window()-1 <= prove.MaxWitnessM})
	if err != nil {
		return nil, err
	}
	p := &plan{rep: rep, states: transfer.NewStates(set), step: 1}
	switch rep.Class {
	case structure.Periodic:
		p.step = rep.Period
	case structure.Reducible:
		p.blocks = bounds.Blocks(p.states) // the components of the state digraph
	}
	return p, nil
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
	opts := bounds.Options{Digits: *digits, MaxMemory: int64(b.maxMemory), Digests: true}
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

	runCtx, cancel, p, err := b.start(ctx, set)
	if err != nil {
		return failure(e, err)
	}
	defer cancel()
	opts.Step = p.step
	opts.MaxN = p.maxN(b.maxK)
	progress, progressDone := b.watch(e, p, wantedDigits(opts))
	res, err := p.bracket(runCtx, opts, progress)
	progressDone()
	if ctx.Err() != nil {
		return interrupted(e)
	}
	if err != nil {
		return failure(e, err)
	}
	// The budget is spent; certifying the best bracket is not cut short
	// by --timeout, only by Ctrl-C. The certificate is made even with
	// --no-certificate: the explicit bound printed is its statement.
	cert, err := prove.BuildCertificate(ctx, "avoidcert "+version, p.rep, p.states, res, printDigits(opts))
	if err != nil {
		return failure(e, err)
	}
	data, err := certify.Marshal(cert)
	if err != nil {
		return failure(e, err)
	}
	if ctx.Err() != nil {
		return interrupted(e)
	}
	if err := dest.write(e.stdout, data); err != nil {
		return failure(e, usagef("bound: cannot write the certificate to %s: %v; choose another --out", quote(path), err))
	}
	phases := phaseConstants(ctx, set, p, res)
	if *asJSON {
		writeBoundJSON(report, set, p, res, cert.Statement.AllN, dest, phases, printDigits(opts))
	} else {
		writeBoundText(report, set, p, res, cert.Statement.AllN, dest, phases, printDigits(opts))
	}
	if res.Stop == bounds.StopTarget || res.Stop == bounds.StopExact || p.rep.Class == structure.Subexponential {
		return exitOK
	}
	return exitUndecided
}

// wantedDigits is the digits target shown by progress: --digits, or the
// digits a bracket of width --width has at lambda about 1.
func wantedDigits(opts bounds.Options) int {
	if opts.Width == nil {
		return opts.Digits
	}
	w, _ := opts.Width.Float64()
	return max(1, int(math.Ceil(-math.Log10(w))))
}

// printDigits is how many significant digits the interval is printed with:
// a few more than certified, so that the printed ends show the bracket.
func printDigits(opts bounds.Options) int {
	if opts.Digits > 0 {
		return opts.Digits + 3
	}
	return 20
}

// bracket runs the bracket search the plan asks for. A subexponential set
// has lambda = 0 proved: only a short run for the explicit upper bound.
func (p *plan) bracket(ctx context.Context, opts bounds.Options, progress bounds.Progress) (*bounds.Result, error) {
	if p.rep.Class == structure.Subexponential {
		opts.MaxN = min(opts.MaxN, p.maxN(40))
	}
	if p.blocks != nil {
		return bounds.RunBlocks(ctx, p.states, p.blocks, opts, progress)
	}
	return bounds.Run(ctx, p.states, opts, progress)
}

// maxN turns --max-k (steps above the longest state, k = n - m) into the
// largest n of a bracket, within what a certificate checker accepts.
func (p *plan) maxN(maxK int) int { return min(maxK+p.states.MaxLength(), certify.MaxN) }

// k returns a bracket's n - m, the steps above the longest state.
func (p *plan) k(br bounds.Bracket) int { return br.N - p.states.MaxLength() }

func stopWords(res *bounds.Result) string {
	switch res.Stop {
	case bounds.StopTarget:
		return "target met"
	case bounds.StopExact:
		return "lambda known exactly (a bracket of zero width)"
	default:
		if res.Detail != "" {
			return fmt.Sprintf("budget stop (%s): %s", res.Stop, res.Detail)
		}
		return fmt.Sprintf("budget stop (%s)", res.Stop)
	}
}

func writeBoundText(w io.Writer, set pattern.Set, p *plan, res *bounds.Result, allN certify.AllN, dest *outFile, phases []float64, digits int) {
	fmt.Fprintf(w, "patterns: %s (window length %d)\n", set, set.Window())
	printWrapped(w, "class: "+classLine(p.rep), "  ")
	if p.rep.Class == structure.Subexponential {
		fmt.Fprintln(w, "lambda = 0 (proved by the structure pass: no cyclic avoider of any length)")
	}
	fmt.Fprintf(w, "lambda   in %s  (%s)\n", res.Lambda.String(digits), digitWords(res))
	fmt.Fprintf(w, "1/lambda in %s\n", res.Radius.String(digits))
	for _, br := range res.Brackets {
		fmt.Fprintf(w, "bracket: n = %d, step %d, start %s, on %d of %d prefix states\n", br.N, br.Step, br.Start, len(br.States), p.states.Len())
	}
	if line := allNLine(allN, !dest.skip, digits); line != "" {
		fmt.Fprintln(w, line)
	}
	if est := res.Estimates; est.Rate > 0 && p.rep.Class != structure.Subexponential {
		fmt.Fprintf(w, "estimate, not certified: |lambda_2|/lambda ~ %.3g (from the width decay)\n", est.Rate)
	}
	if est := res.Estimates; est.C > 0 && p.rep.Class == structure.Primitive {
		fmt.Fprintf(w, "estimate, not certified: c in a_n ~ c lambda^n n! ~ %.6g\n", est.C)
	}
	for r, c := range phases {
		fmt.Fprintf(w, "estimate, not certified: c_%d in a_n/n! = lambda^n (c_(n mod %d) + o(1)) ~ %.6g (from the exact a_n)\n", r, len(phases), c)
	}
	if p.rep.Class == structure.Subexponential {
		fmt.Fprintf(w, "stopped: upper bound taken at k = %d (lambda = 0 is proved; the bracket only bounds the decay) after %.1f s\n",
			p.k(res.Brackets[0]), res.Elapsed.Seconds())
	} else {
		fmt.Fprintf(w, "stopped: %s after %.1f s\n", stopWords(res), res.Elapsed.Seconds())
	}
	fmt.Fprintf(w, "certificate: %s\n", dest.describe())
}

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

// phaseConstants estimates, for a periodic set of period d, the constants
// c_r in a_n/n! = lambda^n (c_(n mod d) + o(1)) as a_n/(n! mid^n) at the d
// lengths n from the bracket's n0 on, mid the middle of the lambda
// bracket: estimates, not certified. nil for other classes, or when the
// counting is interrupted.
func phaseConstants(ctx context.Context, set pattern.Set, p *plan, res *bounds.Result) []float64 {
	if p.rep.Class != structure.Periodic || len(res.Brackets) == 0 || !res.Lambda.Finite() || res.Lambda.Lo.Sign() <= 0 {
		return nil
	}
	d, n0 := p.rep.Period, res.Brackets[0].N
	counts, err := transfer.Counts(ctx, set, n0+d-1, nil)
	if err != nil {
		return nil
	}
	mid := new(big.Rat).Add(res.Lambda.Lo, res.Lambda.Hi)
	mid.Quo(mid, big.NewRat(2, 1))
	c := make([]float64, d)
	for n := n0; n < n0+d; n++ {
		den := new(big.Rat).SetInt(new(big.Int).MulRange(1, int64(n)))
		pow := new(big.Rat).SetInt64(1)
		for range n {
			pow.Mul(pow, mid)
		}
		den.Mul(den, pow)
		c[n%d], _ = new(big.Rat).Quo(new(big.Rat).SetInt(counts[n]), den).Float64()
	}
	return c
}

func digitWords(res *bounds.Result) string {
	x := res.Lambda
	switch {
	case x.Lo != nil && x.Hi != nil && x.Lo.Cmp(x.Hi) == 0:
		return "exact"
	case x.Lo != nil && x.Lo.Sign() == 0:
		return "an upper bound only"
	}
	return fmt.Sprintf("%d significant digits certified", res.Digits)
}

// boundJSON is the --json output of bound.
type boundJSON struct {
	Patterns    []string       `json:"patterns"`
	Class       string         `json:"class"`
	Period      *int           `json:"period"`
	Exponent    *int           `json:"exponent"`
	Lambda      endsJSON       `json:"lambda"`
	Radius      endsJSON       `json:"radius"`
	K           int            `json:"k"`
	Digits      int            `json:"digits"`
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
	if x.Lo != nil {
		s := interval.DecimalDown(x.Lo, digits)
		out.Lo = &s
	}
	if x.Hi != nil {
		s := interval.DecimalUp(x.Hi, digits)
		out.Hi = &s
	}
	return out
}

func writeBoundJSON(w io.Writer, set pattern.Set, p *plan, res *bounds.Result, allN certify.AllN, dest *outFile, phases []float64, digits int) {
	out := boundJSON{Patterns: set.Strings(), Class: string(p.rep.Class),
		Lambda: ends(res.Lambda, digits), Radius: ends(res.Radius, digits), Digits: min(res.Digits, 1000),
		Stop: string(res.Stop), Seconds: res.Elapsed.Seconds()}
	out.Period, out.Exponent = periodExponent(p.rep)
	if len(res.Brackets) > 0 {
		out.K = p.k(res.Brackets[0])
	}
	out.AllN = allNJSONOf(allN, digits)
	est := &estimatesJSON{Note: "estimate, not certified", CPhases: phases}
	if r := res.Estimates.Rate; r > 0 && p.rep.Class != structure.Subexponential {
		est.Rate = &r
	}
	if c := res.Estimates.C; c > 0 && p.rep.Class == structure.Primitive {
		est.C = &c
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
