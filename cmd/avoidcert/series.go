package main

import (
	"context"
	crand "crypto/rand"
	"encoding/binary"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"math/big"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"avoidcert/internal/bytesize"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prob"
	"avoidcert/prove"
	"avoidcert/series"
)

func init() {
	commands["series"] = command{
		summary: "ordinal patterns of a data series against i.i.d. draws",
		usage: `Usage: avoidcert series FILE [PATTERN...] [--length K] [flags]

Reads a series of numbers (one a line, or a column of a CSV or TSV file;
FILE - is standard input) and counts its windows of consecutive values (with
--delay t: x_i, x_(i+t), ..., x_(i+(k-1)t)) whose relative order is a given
pattern. Each PATTERN is counted on its own; a comma list (123,321) is one
set, and a window matching any member counts. With --length K, every one of
the K! patterns of length K is counted, as a histogram.

Against the hypothesis that the values are i.i.d. draws from one continuous
distribution it prints, for each pattern: the exact mean and variance of
the count, and P(count <= observed) and P(count >= observed), exact when
the layered iteration fits --max-work and --max-memory (estimated before it
starts), otherwise a normal approximation with the exact mean and variance,
labelled as such. For a pattern seen 0 times it also prints the probability
of avoiding it, exact or certified (as 'avoidcert prob' gives it: from a
certificate the checker accepted in this run). With a delay the t
interleaved subsequences are independent under the hypothesis, and the
exact law of the count is the convolution of theirs.

Ties (equal values in one window) have no place in the hypothesis: they are
counted, and --ties says what to do: refuse (the default: exit 2, naming the
first tie's lines), order (the earlier value is the smaller) or random
(equal values ordered at random, reproducibly from --seed).

A small probability is evidence against the hypothesis for a pattern chosen
before looking at the data; testing many patterns at once (--length K tests
K!) needs a correction for multiple testing, which the output states (README,
"What the probabilities mean").

Flags:
  --column C        read column C of a CSV or TSV file: a name from its first
                    line, or a number (1 = first; a first line that is not a
                    number there is then a header)
  --delimiter D     the column separator: comma or tab (default: tab when the
                    first line has one, comma otherwise)
  --skip-missing    skip missing values (empty, NA, N/A, NaN, null) and
                    fields that are not numbers, counting them, instead of
                    refusing the first one
  --length K        every pattern of length K (2..7), as a histogram
  --delay T         windows of every T-th value (default 1)
  --ties P          refuse, order or random (default refuse)
  --seed S          the seed of --ties random (default: drawn and printed)
  --json            one JSON object (docs/series.md)
  --max-work W      largest estimated work of the exact laws, in word
                    additions (default 5e10, about a minute on two cores)
  --max-memory B    largest estimated memory of one exact law or exact
                    avoidance count (default 4G)
  --exact           exit 3 rather than approximate when an exact law is over
                    the budget
  --rel-width W     relative width of a certified avoidance probability
                    (default 1e-6; not with --length)
  --timeout T       stop tightening a certified bracket after this long
                    (not with --length)
  --digits D        significant digits of printed probabilities (default 4)

Exit codes: 0 success, 2 bad input (a file that cannot be read, a value that
is not a number, a tie under --ties refuse, too few values), 3 an exact law
over the budget with --exact, or a certified avoidance probability still
wider than --rel-width, 4 interrupted (Ctrl-C).
`,
		run: runSeries,
	}
}

type seriesFlags struct {
	column, delimiter, ties string
	skipMissing, asJSON     bool
	exact                   bool
	length, delay, digits   int
	seed                    string
	maxWork, relWidth       float64
	maxMem                  byteSize
	timeout                 duration
	given                   map[string]bool // the flags on the command line
}

func runSeries(ctx context.Context, e *env, args []string) int {
	fs := newFlags("series")
	var f seriesFlags
	fs.StringVar(&f.column, "column", "", "")
	fs.StringVar(&f.delimiter, "delimiter", "", "")
	fs.BoolVar(&f.skipMissing, "skip-missing", false, "")
	fs.IntVar(&f.length, "length", 0, "")
	fs.IntVar(&f.delay, "delay", 1, "")
	fs.StringVar(&f.ties, "ties", "refuse", "")
	fs.StringVar(&f.seed, "seed", "", "")
	fs.BoolVar(&f.asJSON, "json", false, "")
	fs.Float64Var(&f.maxWork, "max-work", prob.DefaultWork, "")
	f.maxMem = byteSize(defaultMemory)
	fs.Var(&f.maxMem, "max-memory", "")
	fs.BoolVar(&f.exact, "exact", false, "")
	fs.Float64Var(&f.relWidth, "rel-width", 1e-6, "")
	fs.Var(&f.timeout, "timeout", "")
	fs.IntVar(&f.digits, "digits", 4, "")
	pos, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	f.given = map[string]bool{}
	fs.Visit(func(fl *flag.Flag) { f.given[fl.Name] = true })
	if len(pos) == 0 {
		return failure(e, usagef("series: give the file of values first, e.g. 'avoidcert series data.txt 132'"))
	}
	file, pats := pos[0], pos[1:]
	items, lengths, err := seriesItems(pats, f.length)
	if err != nil {
		return failure(e, err)
	}
	opts, err := seriesOptions(&f, lengths)
	if err != nil {
		return failure(e, err)
	}
	format := series.Format{Column: f.column, SkipMissing: f.skipMissing}
	switch f.delimiter {
	case "":
	case ",", "comma":
		format.Delimiter = ','
	case "\t", "tab", `\t`:
		format.Delimiter = '\t'
	default:
		return failure(e, usagef("series: --delimiter must be comma or tab, not %s", quote(f.delimiter)))
	}
	if format.Delimiter != 0 && f.column == "" {
		return failure(e, usagef("series: --delimiter needs --column (the file is otherwise one value a line)"))
	}
	limitMemory(int64(f.maxMem))

	in, err := series.Open(file)
	if err != nil {
		return failure(e, usagef("series: %v", err))
	}
	defer in.Close()
	rd, tally, err := seriesRead(ctx, file, in, format, opts)
	if err != nil {
		return seriesReadFailure(e, ctx, err)
	}
	out := series.Run{Format: series.RunFormat, Version: series.RunVersion, Delay: f.delay, Length: f.length,
		Input: series.Input{File: file, Column: f.column, Header: rd.Header, Values: tally.Values,
			SkippedMissing: rd.Skipped.Missing, SkippedNotNumbers: rd.Skipped.NotNumbers, FirstSkippedLine: rd.Skipped.FirstLine}}
	if err := seriesTies(&out, tally, opts, f.ties); err != nil {
		return failure(e, err)
	}
	if err := seriesEnough(tally, items, f.delay, file); err != nil {
		return failure(e, err)
	}
	code, err := seriesAssess(ctx, e, &out, &f, items, pats, tally)
	if errors.Is(err, errSilent) {
		return code
	}
	if err != nil {
		return failure(e, err)
	}
	if f.asJSON {
		writeJSON(e.stdout, out)
	} else {
		writeSeriesText(e.stdout, out, f.digits)
	}
	return code
}

// seriesItems reads the patterns, or every pattern of --length, and the
// window lengths to count.
func seriesItems(pats []string, length int) ([]pattern.Set, []int, error) {
	var items []pattern.Set
	switch {
	case length != 0 && len(pats) > 0:
		return nil, nil, usagef("series: give patterns or --length, not both")
	case length != 0:
		if length < 2 || length > series.MaxLength {
			return nil, nil, usagef("series: --length must be 2 to %d, not %d", series.MaxLength, length)
		}
		for _, p := range pattern.All(length) {
			items = append(items, pattern.NewSet(p))
		}
	case len(pats) == 0:
		return nil, nil, usagef("series: name at least one pattern after the file (e.g. 132, or 123,321 for a set), or give --length K")
	default:
		for _, a := range pats {
			s, err := parseSet([]string{a})
			if err != nil {
				return nil, nil, usagef("series: %v", err)
			}
			items = append(items, s)
		}
	}
	seen := map[int]bool{}
	var lengths []int
	for _, s := range items {
		for _, m := range s.Patterns() {
			if !seen[len(m)] {
				seen[len(m)] = true
				lengths = append(lengths, len(m))
			}
		}
	}
	return items, lengths, nil
}

// seriesOptions checks the flags and turns them into counting options.
func seriesOptions(f *seriesFlags, lengths []int) (series.Options, error) {
	o := series.Options{Lengths: lengths, Delay: f.delay}
	switch f.ties {
	case "refuse":
		o.Ties = series.TiesRefuse
	case "order":
		o.Ties = series.TiesOrder
	case "random":
		o.Ties = series.TiesRandom
	default:
		return o, usagef("series: --ties must be refuse, order or random, not %s", quote(f.ties))
	}
	switch {
	case f.seed != "" && o.Ties != series.TiesRandom:
		return o, usagef("series: --seed goes with --ties random")
	case f.seed != "":
		s, err := strconv.ParseUint(f.seed, 10, 64)
		if err != nil {
			return o, usagef("series: --seed must be a whole number from 0 to 18446744073709551615, not %s", quote(f.seed))
		}
		o.Seed = s
	case o.Ties == series.TiesRandom:
		var b [8]byte
		if _, err := crand.Read(b[:]); err != nil {
			return o, err
		}
		o.Seed = binary.LittleEndian.Uint64(b[:])
		f.seed = strconv.FormatUint(o.Seed, 10)
	}
	switch {
	case f.delay < 1:
		return o, usagef("series: --delay must be at least 1, not %d", f.delay)
	case f.delay > 1_000_000:
		return o, usagef("series: --delay %d is past 1000000", f.delay)
	case !(f.maxWork >= 0):
		return o, usagef("series: --max-work must not be negative")
	case !(f.relWidth > 0 && f.relWidth < 1):
		return o, usagef("series: --rel-width must lie strictly between 0 and 1")
	case f.digits < 1 || f.digits > 100:
		return o, usagef("series: --digits must be 1 to 100")
	case f.length != 0 && (f.given["rel-width"] || f.given["timeout"]):
		return o, usagef("series: --rel-width and --timeout bound the avoidance probability of a pattern seen 0 times, which --length does not give; leave them out")
	}
	return o, nil
}

// seriesRead reads and tallies the series on a goroutine of its own, so
// that Ctrl-C ends the command at once even while a read from standard
// input waits for data (the reader checks ctx only between values).
func seriesRead(ctx context.Context, file string, in io.Reader, format series.Format, opts series.Options) (*series.Reader, *series.Tally, error) {
	type result struct {
		rd  *series.Reader
		t   *series.Tally
		err error
	}
	done := make(chan result, 1)
	go func() {
		rd, err := series.NewReader(ctx, file, in, format)
		if err != nil {
			done <- result{err: err}
			return
		}
		t, err := series.Count(rd, opts)
		done <- result{rd, t, err}
	}()
	select {
	case <-ctx.Done():
		return nil, nil, ctx.Err()
	case r := <-done:
		return r.rd, r.t, r.err
	}
}

// seriesReadFailure reports a fault of the input (exit 2) or an interrupt.
func seriesReadFailure(e *env, ctx context.Context, err error) int {
	if ctx.Err() != nil {
		return interrupted(e)
	}
	return failure(e, usagef("series: %v", err))
}

// seriesTies records the ties and refuses them under --ties refuse.
func seriesTies(out *series.Run, t *series.Tally, o series.Options, policy string) error {
	out.Ties = series.TieNotes{Policy: policy}
	if o.Ties == series.TiesRandom {
		out.Ties.Seed = strconv.FormatUint(o.Seed, 10)
	}
	for _, k := range o.Lengths {
		out.Ties.TiedWindows += t.Tied[k]
	}
	if t.FirstTie != nil {
		out.Ties.First = &series.TiedLines{Lines: t.FirstTie.Lines, Value: strconv.FormatFloat(t.FirstTie.Value, 'g', -1, 64)}
	}
	if o.Ties == series.TiesRefuse && t.FirstTie != nil {
		return usagef("series: %s: %d tied windows (equal values in one window, which i.i.d. continuous draws never have); the first: lines %d and %d both hold %s; break ties with --ties order or --ties random --seed S, or remove them",
			out.Input.File, out.Ties.TiedWindows, t.FirstTie.Lines[0], t.FirstTie.Lines[1], out.Ties.First.Value)
	}
	return nil
}

// seriesEnough refuses a series without a single window to count.
func seriesEnough(t *series.Tally, items []pattern.Set, delay int, file string) error {
	for _, k := range sortedLengths(t.Windows) {
		if t.Windows[k] > 0 {
			return nil
		}
	}
	shortest := series.MaxLength
	for _, s := range items {
		shortest = min(shortest, len(s.Patterns()[0]))
	}
	need := (shortest-1)*delay + 1
	held := fmt.Sprintf("%d values", t.Values)
	switch t.Values {
	case 0:
		held = "no values"
	case 1:
		held = "1 value"
	}
	return usagef("series: %s holds %s: a window of %d values with delay %d spans %d; nothing to count", file, held, shortest, delay, need)
}

func sortedLengths(m map[int]int64) []int {
	var ks []int
	for k := 1; k <= series.MaxLength; k++ {
		if _, ok := m[k]; ok {
			ks = append(ks, k)
		}
	}
	return ks
}

// seriesAssess fills the items: counts, moments, tails, avoidance.
func seriesAssess(ctx context.Context, e *env, out *series.Run, f *seriesFlags, items []pattern.Set, typed []string, t *series.Tally) (int, error) {
	lengths := prob.Interleave(int(t.Values), f.delay)
	obs := make([]prob.Observation, len(items))
	for i, s := range items {
		it := series.Item{Pattern: s.String(), Patterns: s.Strings()}
		seen := map[int]bool{}
		for _, m := range s.Patterns() {
			it.Observed += t.Patterns[len(m)][pattern.Rank(m)]
			if !seen[len(m)] {
				seen[len(m)] = true
				it.Windows += t.Windows[len(m)]
			}
		}
		out.Items = append(out.Items, it)
		obs[i] = prob.Observation{Set: s, Observed: int(it.Observed)}
	}
	as, err := prob.Assess(ctx, obs, lengths, prob.Budget{Work: f.maxWork, Memory: float64(f.maxMem)})
	if err != nil {
		return 0, err
	}
	code := exitOK
	approx := 0
	var need prob.Cost
	for i := range out.Items {
		it, a := &out.Items[i], as[i]
		it.Mean, it.Variance = a.Moments.Mean.RatString(), a.Moments.Variance.RatString()
		it.MeanDecimal, it.SD = roundedDecimal(a.Moments.Mean), sdOf(a.Moments.Variance)
		if a.Exact {
			it.Tails = series.Tails{Method: "exact",
				AtMost:  series.Probability{Lo: interval.DecimalDown(a.AtMost, f.digits), Hi: interval.DecimalUp(a.AtMost, f.digits)},
				AtLeast: series.Probability{Lo: interval.DecimalDown(a.AtLeast, f.digits), Hi: interval.DecimalUp(a.AtLeast, f.digits)}}
			if a.CentralKnown {
				it.Tails.Central95 = &series.Range{Lo: a.Central[0], Hi: a.Central[1]}
			}
		} else {
			approx++
			if a.Need.Work > need.Work {
				need = a.Need
			}
			it.Tails = series.Tails{Method: "normal approximation",
				AtMost:  series.Probability{Approx: strconv.FormatFloat(a.ApproxAtMost, 'g', f.digits, 64)},
				AtLeast: series.Probability{Approx: strconv.FormatFloat(a.ApproxAtLeast, 'g', f.digits, 64)},
				Note:    "the exact law is over the budget left of --max-work and --max-memory (" + needText(a.Need, f.maxWork) + "): an approximation, not a bound"}
		}
		if it.Observed == 0 && f.length == 0 {
			c, err := seriesAvoidance(ctx, it, items[i], typed[i], lengths, f)
			if err != nil {
				return 0, err
			}
			code = max(code, c)
		}
	}
	if approx > 0 && f.exact {
		laws := fmt.Sprintf("%d exact laws are", approx)
		if approx == 1 {
			laws = "1 exact law is"
		}
		fmt.Fprintf(e.stderr, "avoidcert: series: undecided: %s over the budget (the largest: %s); raise --max-work or --max-memory, or leave out --exact for a normal approximation\n", laws, needText(need, f.maxWork))
		return exitUndecided, errSilent
	}
	out.Notes = seriesNotes(out, f, approx)
	return code, nil
}

// needText says what an exact law over the budget would need.
func needText(c prob.Cost, budget float64) string {
	if math.IsInf(c.Work, 1) {
		return fmt.Sprintf("more than the %.2g word additions of --max-work", budget)
	}
	return fmt.Sprintf("estimated %.2g word additions and %s", c.Work, bytesize.Format(int64(c.Memory)))
}

// errSilent ends a command whose message is already written.
var errSilent = errors.New("reported")

// seriesAvoidance fills the avoidance probability of an item seen 0 times;
// typed is the item's argument as the user wrote it, for the checker.
func seriesAvoidance(ctx context.Context, it *series.Item, set pattern.Set, typed string, lengths []int, f *seriesFlags) (int, error) {
	cctx := ctx
	if f.timeout > 0 {
		var cancel context.CancelFunc
		cctx, cancel = context.WithTimeout(ctx, time.Duration(f.timeout))
		defer cancel()
	}
	av, err := prob.AvoidAll(cctx, set, lengths, int64(f.maxMem), f.relWidth, prove.Options{Typed: []string{typed}, MaxMemory: int64(f.maxMem), Tool: toolName()})
	if err != nil {
		return 0, err
	}
	a := &series.Avoidance{}
	it.Avoidance = a
	if av.Exact != nil {
		a.Method = "exact"
		a.Lo, a.Hi = interval.DecimalDown(av.Exact, f.digits), interval.DecimalUp(av.Exact, f.digits)
		a.Note = "a_n/n! over the subsequences' lengths, counted by the engine and the checker, agreeing"
		return exitOK, nil
	}
	c := av.Certified
	a.Method = "certified"
	a.Lo, a.Hi = av.Interval.Lo.Decimal(f.digits, false), av.Interval.Hi.Decimal(f.digits, true)
	a.Note = fmt.Sprintf("from the bound for every n >= %d of a certificate the checker accepted in this run (lambda bracketed to %d digits)",
		c.Result.Certificate.Statement.AllN.N0, c.Digits)
	switch {
	case c.Narrow:
	case av.Interval.Lo.M.Sign() == 0:
		a.Note += "; the lower end is 0 (lambda = 0, or a_n = 0 from some n on), so only the upper end says something"
	default:
		a.Note += fmt.Sprintf("; the relative width is still above --rel-width %g: a budget stopped the bracket first", f.relWidth)
		return exitUndecided, nil
	}
	return exitOK, nil
}

// seriesNotes are the caveats printed with every result.
func seriesNotes(out *series.Run, f *seriesFlags, approx int) []string {
	notes := []string{"hypothesis: the values are i.i.d. draws from one continuous distribution; a small probability is evidence against it for a pattern chosen before looking at the data, not a verdict on the data's source (README, \"What the probabilities mean\")"}
	if f.delay > 1 {
		notes = append(notes, fmt.Sprintf("delay %d: the %d interleaved subsequences are independent under the hypothesis; the exact law is the convolution of theirs", f.delay, f.delay))
	}
	if tests := 2 * len(out.Items); len(out.Items) > 1 {
		notes = append(notes, fmt.Sprintf("%d patterns tested at once (%d tail probabilities): for an overall level alpha compare each with alpha/%d (Bonferroni); marked * below 0.05/%d = %.3g",
			len(out.Items), tests, tests, tests, 0.05/float64(tests)))
	}
	if approx > 0 {
		notes = append(notes, fmt.Sprintf("%d of %d tails are a normal approximation (continuity-corrected, exact mean and variance), not a bound: the exact law was over --max-work or --max-memory; raise them for exact tails, and trust the approximation least far from the mean", approx, len(out.Items)))
	}
	if out.Ties.TiedWindows > 0 {
		how := "the earlier value counted as the smaller"
		if out.Ties.Policy == "random" {
			how = "equal values ordered at random with seed " + out.Ties.Seed
		}
		notes = append(notes, fmt.Sprintf("%d tied windows (equal values in one window), %s: the hypothesis has no ties, so counts near them are uncertain", out.Ties.TiedWindows, how))
	}
	return notes
}

// sdOf is the square root of a variance, a display value rounded to nearest.
func sdOf(v *big.Rat) string {
	x, _ := v.Float64()
	return strconv.FormatFloat(math.Sqrt(x), 'g', 6, 64)
}

// writeSeriesText prints the result as a table with notes.
func writeSeriesText(w io.Writer, o series.Run, digits int) {
	src := o.Input.File
	if o.Input.Column != "" {
		src += ", column " + o.Input.Column
		if o.Input.Header != "" && o.Input.Header != o.Input.Column {
			src += " (" + o.Input.Header + ")"
		}
	}
	fmt.Fprintf(w, "series %s: %d values", src, o.Input.Values)
	if s := o.Input.SkippedMissing + o.Input.SkippedNotNumbers; s > 0 {
		fmt.Fprintf(w, " (skipped %d missing and %d not numbers, the first at line %d)", o.Input.SkippedMissing, o.Input.SkippedNotNumbers, o.Input.FirstSkippedLine)
	}
	fmt.Fprintf(w, "; delay %d; ties: %d tied windows (--ties %s", o.Delay, o.Ties.TiedWindows, o.Ties.Policy)
	if o.Ties.Seed != "" {
		fmt.Fprintf(w, " --seed %s", o.Ties.Seed)
	}
	fmt.Fprintln(w, ")")
	fmt.Fprintf(w, "probabilities under i.i.d. continuous draws; exact ones rounded up to %d digits, approximate ones marked ~\n\n", digits)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "pattern\twindows\tobserved\tmean\tsd\tP(<= obs)\tP(>= obs)\texact 95% range\t \t")
	threshold := 0.05 / float64(2*len(o.Items))
	for _, it := range o.Items {
		le, ge := shownP(it.Tails.AtMost), shownP(it.Tails.AtLeast)
		rng := "-"
		if r := it.Tails.Central95; r != nil {
			rng = fmt.Sprintf("%d..%d", r.Lo, r.Hi)
		}
		mark := ""
		if len(o.Items) > 1 && (pBelow(it.Tails.AtMost, threshold) || pBelow(it.Tails.AtLeast, threshold)) {
			mark = "*"
		}
		mean, _ := strconv.ParseFloat(it.MeanDecimal, 64)
		fmt.Fprintf(tw, "%s\t%d\t%d\t%.6g\t%s\t%s\t%s\t%s\t%s\t\n", it.Pattern, it.Windows, it.Observed, mean, it.SD, le, ge, rng, mark)
	}
	tw.Flush()
	for _, it := range o.Items {
		if a := it.Avoidance; a != nil {
			fmt.Fprintf(w, "\nP(no window matches %s) in [%s, %s], %s: %s\n", it.Pattern, a.Lo, a.Hi, a.Method, a.Note)
		}
	}
	fmt.Fprintln(w)
	for _, n := range o.Notes {
		fmt.Fprintf(w, "note: %s\n", n)
	}
}

// shownP is a probability for the table: an exact one's upper end, or an
// approximation marked ~.
func shownP(p series.Probability) string {
	if p.Approx != "" {
		return "~" + p.Approx
	}
	return p.Hi
}

// pBelow reports whether a printed probability lies below x: an exact
// one's upper end, or an approximation's value.
func pBelow(p series.Probability, x float64) bool {
	s := p.Hi
	if p.Approx != "" {
		s = p.Approx
	}
	v, err := strconv.ParseFloat(strings.TrimPrefix(s, "~"), 64)
	return err == nil && v < x
}
