package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"math/big"
	"os"
	"path/filepath"
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
		usage: `Usage: avoidcert bound [--digits D | --width W] [--out FILE] [--json] PATTERN...

Brackets lambda = lim (a_n/n!)^(1/n) by the coefficientwise Collatz-Wielandt
bound on the exact iterates, until lo and hi agree to D significant digits
(truncated) or hi - lo <= W. Prints lambda and the radius 1/lambda, both
rounded outward, bounds on a_n/n! valid for every n >= n0, the structure class,
and writes a certificate that 'avoidcert check' re-verifies independently.

The structure decides the method: periodic sets are bracketed through T^d,
reducible ones block by block; for subexponential sets lambda = 0 is proved by
the structure pass and only the upper bound is bracketed.

Flags:
  --digits D        significant digits to certify (default 10)
  --width W         absolute width target instead, e.g. 1e-20
  --out FILE        certificate path (default avoidcert-SET.json)
  --json            {"patterns":[...],"lambda":{"lo","hi"},"radius":{...},"k":K,"certificate":PATH,...}
  --max-k K         stop at this k (default 1000, the checker's limit)
  --max-memory B    stop before a step that would need more (default 8G)
  --timeout T       stop after this long, e.g. 90s or 10m (default none)
  --progress        report brackets on stderr

Exit codes: 0 target met (or lambda decided exactly), 3 a budget stopped the
run first (the best certified bracket is printed and certified), 2 bad input.
`,
		run: runBound,
	}
}

// budget holds the flags shared by bound and claim.
type budget struct {
	maxK      int
	maxMemory byteSize
	timeout   time.Duration
	progress  bool
}

func (b *budget) register(fs *flag.FlagSet) {
	b.maxMemory = 8 << 30
	fs.IntVar(&b.maxK, "max-k", certify.MaxK, "")
	fs.Var(&b.maxMemory, "max-memory", "")
	fs.DurationVar(&b.timeout, "timeout", 0, "")
	fs.BoolVar(&b.progress, "progress", false, "")
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
	case b.maxK > certify.MaxK:
		return usagef("%s: --max-k %d is over %d, the largest k a certificate checker accepts", cmd, b.maxK, certify.MaxK)
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
		ctx, cancel = context.WithTimeout(ctx, b.timeout)
	}
	p, err := planFor(ctx, set)
	if err != nil {
		cancel()
		return nil, nil, nil, err
	}
	return ctx, cancel, p, nil
}

func (b *budget) reporter(e *env) bounds.Progress {
	if !b.progress {
		return nil
	}
	return func(ev bounds.Event) {
		if ev.Bracket != nil {
			fmt.Fprintf(e.stderr, "block %d k=%d lambda in %s\n", ev.Block, ev.K, ev.Lambda.String(12))
		}
	}
}

// plan is how a set is bracketed, decided from its structure.
type plan struct {
	rep    *structure.Report
	sys    transfer.System
	step   int
	blocks [][]int // nil: the whole system
}

func planFor(ctx context.Context, set pattern.Set) (*plan, error) {
	// Certificates list witnesses up to prove.MaxWitnessM.
	rep, err := structure.Analyze(ctx, set, structure.Options{Witnesses: set.Window()-1 <= prove.MaxWitnessM})
	if err != nil {
		return nil, err
	}
	p := &plan{rep: rep, sys: transfer.FromSet(set), step: 1}
	switch rep.Class {
	case structure.Periodic:
		p.step = rep.Period
	case structure.Reducible:
		for _, i := range rep.Digraph.Order {
			p.blocks = append(p.blocks, rep.Digraph.Components[i].Cells)
		}
	}
	return p, nil
}

func runBound(ctx context.Context, e *env, args []string) int {
	fs := newFlags("bound")
	digits := fs.Int("digits", 0, "")
	width := fs.String("width", "", "")
	out := fs.String("out", "", "")
	asJSON := fs.Bool("json", false, "")
	var b budget
	set, err := b.parse(fs, args)
	if err != nil {
		return failure(e, err)
	}
	opts := bounds.Options{Digits: *digits, MaxK: b.maxK, MaxMemory: int64(b.maxMemory), Digests: true}
	switch {
	case *digits < 0 || *digits > certify.MaxDigits-5:
		return failure(e, usagef("bound: --digits must be between 1 and %d", certify.MaxDigits-5))
	case *width != "":
		w, err := interval.ParseDecimal(*width)
		if err != nil || w.Sign() <= 0 {
			return failure(e, usagef("bound: --width %q is not a positive decimal such as 1e-20", *width))
		}
		opts.Width = w
	case *digits == 0:
		opts.Digits = 10
	}
	path := *out
	if path == "" {
		path = "avoidcert-" + strings.ReplaceAll(set.String(), ",", "_") + ".json"
	}
	// Refuse an unusable --out before the work, not after it.
	if info, err := os.Stat(filepath.Dir(path)); err != nil || !info.IsDir() {
		return failure(e, usagef("bound: cannot write the certificate to %s: folder %s does not exist; choose another --out",
			path, filepath.Dir(path)))
	}

	ctx, cancel, p, err := b.start(ctx, set)
	if err != nil {
		return failure(e, err)
	}
	defer cancel()
	opts.Step = p.step
	res, err := p.bracket(ctx, opts, b.reporter(e))
	if err != nil {
		return failure(e, err)
	}
	cert, err := prove.BuildCertificate(ctx, "avoidcert "+version, p.rep, p.sys, res, printDigits(opts))
	if err != nil {
		return failure(e, err)
	}
	if err := certify.Write(path, cert); err != nil {
		return failure(e, usagef("bound: cannot write the certificate to %s: %v; choose another --out", path, err))
	}
	if *asJSON {
		writeBoundJSON(e, set, p, res, path, printDigits(opts))
	} else {
		writeBoundText(e, set, p, res, path, printDigits(opts))
	}
	if res.Stop == bounds.StopTarget || res.Stop == bounds.StopExact || p.rep.Class == structure.Subexponential {
		return exitOK
	}
	return exitUndecided
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
		opts.MaxK = min(opts.MaxK, 40)
	}
	if p.blocks != nil {
		return bounds.RunBlocks(ctx, p.sys, p.blocks, opts, progress)
	}
	return bounds.Run(ctx, p.sys, opts, progress)
}

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

func writeBoundText(e *env, set pattern.Set, p *plan, res *bounds.Result, path string, digits int) {
	w := e.stdout
	fmt.Fprintf(w, "patterns: %s (window length %d)\n", set, set.Window())
	fmt.Fprintf(w, "class: %s\n", classLine(p.rep))
	if p.rep.Class == structure.Subexponential {
		fmt.Fprintln(w, "lambda = 0 (proved by the structure pass: no cyclic avoider of any length)")
	}
	fmt.Fprintf(w, "lambda   in %s  (%s)\n", res.Lambda.String(digits), digitWords(res))
	fmt.Fprintf(w, "1/lambda in %s\n", res.Radius.String(digits))
	for _, br := range res.Brackets {
		fmt.Fprintf(w, "bracket: k = %d, step %d, on %d of %d cells\n", br.K, br.Step, len(br.Cells), p.sys.Cells())
	}
	if x := res.Explicit; x != nil && x.AN0.Sign() > 0 {
		writeExplicit(w, x, digits)
	}
	if est := res.Estimates; est.Rate > 0 && p.rep.Class != structure.Subexponential {
		fmt.Fprintf(w, "estimate, not certified: |lambda_2|/lambda ~ %.3g (from the width decay)\n", est.Rate)
	}
	if est := res.Estimates; est.C > 0 && p.rep.Class == structure.Primitive {
		fmt.Fprintf(w, "estimate, not certified: c in a_n ~ c lambda^n n! ~ %.6g\n", est.C)
	}
	if p.rep.Class == structure.Subexponential {
		fmt.Fprintf(w, "stopped: upper bound taken at k = %d (lambda = 0 is proved; the bracket only bounds the decay) after %.1f s\n",
			res.Brackets[0].K, res.Elapsed.Seconds())
	} else {
		fmt.Fprintf(w, "stopped: %s after %.1f s\n", stopWords(res), res.Elapsed.Seconds())
	}
	fmt.Fprintf(w, "certificate: %s\n", path)
}

// writeExplicit prints the bounds valid for every n >= n0. A is shown
// rounded to nearest, for reading; its exact value a_n0/n0! is in the
// certificate.
func writeExplicit(w io.Writer, x *bounds.AllN, digits int) {
	fact := new(big.Int).MulRange(1, int64(x.N0))
	a := new(big.Float).SetPrec(64).SetRat(new(big.Rat).SetFrac(x.AN0, fact))
	var lower, upper string
	if x.MuLo.Sign() > 0 {
		lower = fmt.Sprintf("A*%s^(n-%d) <= ", interval.DecimalDown(x.MuLo, digits), x.N0)
	}
	if x.MuHi != nil && x.MuHi.Sign() > 0 {
		upper = fmt.Sprintf(" <= A*%s^(n-%d)", interval.DecimalUp(x.MuHi, digits), x.N0)
	}
	if lower == "" && upper == "" {
		return
	}
	fmt.Fprintf(w, "for every n >= %d: %sa_n/n!%s, A = a_%d/%d! ~ %s (exact in the certificate)\n",
		x.N0, lower, upper, x.N0, x.N0, a.Text('g', 10))
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

func writeBoundJSON(e *env, set pattern.Set, p *plan, res *bounds.Result, path string, digits int) {
	type ends struct {
		Lo *string `json:"lo"`
		Hi *string `json:"hi"`
	}
	side := func(x bounds.Enclosure) ends {
		var out ends
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
	k := 0
	if len(res.Brackets) > 0 {
		k = res.Brackets[0].K
	}
	writeJSON(e, struct {
		Patterns    []string `json:"patterns"`
		Class       string   `json:"class"`
		Lambda      ends     `json:"lambda"`
		Radius      ends     `json:"radius"`
		K           int      `json:"k"`
		Digits      int      `json:"digits"`
		Stop        string   `json:"stop"`
		Seconds     float64  `json:"seconds"`
		Certificate string   `json:"certificate"`
	}{set.Strings(), string(p.rep.Class), side(res.Lambda), side(res.Radius), k, min(res.Digits, 1000),
		string(res.Stop), res.Elapsed.Seconds(), path})
}
