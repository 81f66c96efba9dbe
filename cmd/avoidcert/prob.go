package main

import (
	"context"
	"flag"
	"fmt"
	"math/big"
	"strconv"
	"text/tabwriter"
	"time"

	"avoidcert/internal/bytesize"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prob"
	"avoidcert/prove"
)

func init() {
	commands["prob"] = command{
		summary: "probability that N i.i.d. draws avoid the set, exact or certified",
		usage: `Usage: avoidcert prob --n N [--json] [--occurrences J] PATTERN...

Prints a_N/N!: the probability that N independent draws from one continuous
distribution avoid every pattern consecutively (for 12...k: that no
increasing run reaches length k).

Within the counting range (N <= 500 and the count's estimated memory within
--max-memory, checked before any work) the answer is exact: a fraction, and
its decimal rounded outward. Beyond it, up to N = 10^9, it is a certified
interval read from the explicit bound for every n >= n0 of a certificate the
checker accepted, A mu_lo^(N-n0) <= a_N/N! <= A mu_hi^(N-n0); the bracket
is tightened (more digits of lambda) until the interval's relative width is
below --rel-width, and the output says when a budget stopped it first.

With --occurrences J it also prints the exact P(count = j), j = 0..J, of
the number of windows that match a member of the set, from a layered
iteration (one layer per count); its estimated work and memory are checked
against --max-work and --max-memory before it starts.

These are properties of the i.i.d. model (README, "What the probabilities
mean").

Flags:
  --n N             the number of draws, 0..1000000000 (required)
  --json            one JSON object instead of text (docs/json.md)
  --occurrences J   also the distribution of the number of matches, j <= J
  --max-work W      largest estimated work of --occurrences, in word additions
                    (default 5e10, about a minute on two cores; only with
                    --occurrences)
  --rel-width W     target relative width of a certified interval (default 1e-6)
  --max-memory B    largest estimated memory of an exact count (default 4G);
                    over it the certified interval answers; also the limit
                    of --occurrences
  --timeout T       stop tightening the bracket after this long (e.g. 90s;
                    a positive duration: leave it out for no limit)
  --digits D        significant digits of printed decimals (default 15)

Exit codes: 0 success, 2 bad input, 3 the relative width is still above
--rel-width (the interval printed is proved all the same) or --occurrences
over --max-work or --max-memory, 4 interrupted (Ctrl-C or SIGTERM).
`,
		run: runProb,
	}
}

func runProb(ctx context.Context, e *env, args []string) int {
	fs := newFlags("prob")
	n := fs.Int("n", -1, "")
	asJSON := fs.Bool("json", false, "")
	occ := fs.Int("occurrences", -1, "")
	maxWork := fs.Float64("max-work", prob.DefaultWork, "")
	relWidth := fs.Float64("rel-width", 1e-6, "")
	maxMem := byteSize(defaultMemory)
	fs.Var(&maxMem, "max-memory", "")
	var timeout duration
	fs.Var(&timeout, "timeout", "")
	digits := fs.Int("digits", 15, "")
	pos, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	set, err := parsePatterns("prob", pos)
	if err != nil {
		return failure(e, err)
	}
	given := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { given[f.Name] = true })
	switch {
	case *n < 0:
		return failure(e, usagef("prob: give the number of draws with --n N (0 to %d)", prob.MaxN))
	case *n > prob.MaxN:
		return failure(e, usagef("prob: --n %d is past %d", *n, prob.MaxN))
	case !(*relWidth > 0 && *relWidth < 1):
		return failure(e, usagef("prob: --rel-width must lie strictly between 0 and 1"))
	case *digits < 1 || *digits > 100:
		return failure(e, usagef("prob: --digits must be 1 to 100"))
	case given["occurrences"] && *occ < 0:
		return failure(e, usagef("prob: --occurrences %d: give the largest number of matching windows to tabulate, 0 or more", *occ))
	case given["max-work"] && !given["occurrences"]:
		return failure(e, usagef("prob: --max-work bounds the work of --occurrences only; give --occurrences J, or leave --max-work out"))
	case !(*maxWork > 0):
		return failure(e, usagef("prob: --max-work must be a positive number of word additions, such as 5e10"))
	}
	limitMemory(int64(maxMem))
	out := probOutput{jsonHead: headOf("prob"), Patterns: set.Strings(), N: *n}
	code := exitOK
	exact, need := prob.InExactRange(set, *n, int64(maxMem))
	if *occ >= 0 {
		if c := occurrencesInto(ctx, e, &out, set, *n, *occ, *maxWork, maxMem); c != exitOK {
			return c
		}
	}
	if exact {
		a, p, err := prob.Exact(ctx, set, *n, prove.Options{Typed: pos, MaxMemory: int64(maxMem)})
		if err != nil {
			return failure(e, err)
		}
		out.Method = "exact"
		out.Count = a.String()
		out.Probability = p.RatString()
		out.Lo, out.Hi = interval.DecimalDown(p, *digits), interval.DecimalUp(p, *digits)
		out.Note = fmt.Sprintf("counted to N = %d by the engine and the checker, agreeing (estimated memory %s)", *n, bytesize.Format(need))
	} else {
		cctx := ctx
		if timeout > 0 {
			var cancel context.CancelFunc
			cctx, cancel = context.WithTimeout(ctx, time.Duration(timeout))
			defer cancel()
		}
		c, err := prob.Certify(cctx, set, *n, *relWidth, prove.Options{Typed: pos, MaxMemory: int64(maxMem), Tool: toolName()})
		if err != nil {
			return failure(e, err)
		}
		all := c.Result.Certificate.Statement.AllN
		out.Method = "certified"
		out.Lo, out.Hi = c.Interval.Lo.Decimal(*digits, false), c.Interval.Hi.Decimal(*digits, true)
		if w := c.Interval.RelativeWidth(); w != nil {
			out.RelativeWidth = interval.DecimalUp(w, 3)
		}
		_, _, certDigits, agreed := certified(c.Result.Certificate)
		out.AllN, out.LambdaDigits = allNJSONOf(all, certDigits), &agreed
		why := "N is past 500"
		if *n <= prob.MaxExactN {
			why = fmt.Sprintf("an exact count would need %s, over --max-memory %s", bytesize.About(need), bytesize.Format(int64(maxMem)))
		}
		out.Note = fmt.Sprintf("%s; from the checked certificate's bound for every n >= %d (lambda bracketed to %d digits; its certified ends agree to %d)", why, all.N0, c.Digits, agreed)
		narrow := c.Narrow
		out.Narrow = &narrow
		switch {
		case narrow:
		case c.Interval.Hi.M.Sign() == 0:
			out.Note += "; a_N = 0: the set is unavoidable from n0 on, the probability is 0"
		case c.Interval.Lo.M.Sign() == 0:
			out.Note += "; λ = 0 for this set (a_N/N! decays faster than any exponential), so the bound's lower end is 0 and only the upper end says something; more digits do not change that"
		default:
			out.Note += fmt.Sprintf("; the relative width is still above --rel-width %g: %s", *relWidth, stopWords(c.Result))
			code = exitUndecided
		}
	}
	if *asJSON {
		writeJSON(e.stdout, out)
	} else {
		writeProbText(e, set, out)
	}
	return code
}

// occurrencesInto fills out.Occurrences, or reports why it cannot.
func occurrencesInto(ctx context.Context, e *env, out *probOutput, set pattern.Set, N, J int, maxWork float64, maxMem byteSize) int {
	J = min(J, N)
	cost := prob.OccurrenceCost(set, N, J)
	if cost.Work > maxWork {
		fmt.Fprintf(e.stderr, "avoidcert: prob: undecided: --occurrences %d at N = %d needs about %.2g word additions, over --max-work %.2g; raise --max-work, or lower --n or --occurrences\n", J, N, cost.Work, maxWork)
		return exitUndecided
	}
	if cost.Memory > float64(maxMem) {
		fmt.Fprintf(e.stderr, "avoidcert: prob: undecided: --occurrences needs about %s, over --max-memory %s; raise --max-memory, or lower --n or --occurrences\n", bytesize.Format(int64(cost.Memory)), bytesize.Format(int64(maxMem)))
		return exitUndecided
	}
	counts, err := prob.Occurrences(ctx, set, N, J)
	if err != nil {
		return failure(e, err)
	}
	fact := new(big.Int).MulRange(1, int64(N))
	rest := new(big.Rat).SetInt64(1)
	for j, c := range counts {
		p := new(big.Rat).SetFrac(c, fact)
		rest.Sub(rest, p)
		out.Occurrences = append(out.Occurrences, probOccurrence{J: j, Count: c.String(), Probability: p.RatString(), Decimal: roundedDecimal(p)})
	}
	out.MoreThanJ = rest.RatString()
	return exitOK
}

// roundedDecimal is a display value, rounded to nearest.
func roundedDecimal(p *big.Rat) string {
	return new(big.Float).SetPrec(96).SetRat(p).Text('g', 10)
}

type probOccurrence struct {
	J           int    `json:"j"`
	Count       string `json:"count"`
	Probability string `json:"probability"`
	Decimal     string `json:"decimal"`
}

type probOutput struct {
	jsonHead
	Patterns      []string         `json:"patterns"`
	N             int              `json:"n"`
	Method        string           `json:"method"`
	Count         string           `json:"count,omitempty"`
	Probability   string           `json:"probability,omitempty"`
	Lo            string           `json:"lo"`
	Hi            string           `json:"hi"`
	RelativeWidth string           `json:"relative_width,omitempty"`
	Narrow        *bool            `json:"narrow,omitempty"`
	LambdaDigits  *int             `json:"lambda_digits,omitempty"`
	AllN          *allNJSON        `json:"all_n,omitempty"`
	Note          string           `json:"note"`
	Occurrences   []probOccurrence `json:"occurrences,omitempty"`
	MoreThanJ     string           `json:"more_than_j,omitempty"`
}

func writeProbText(e *env, s pattern.Set, o probOutput) {
	fmt.Fprintf(e.stdout, "probability that %d i.i.d. continuous draws avoid %s (consecutive patterns)\n", o.N, s)
	if o.Method == "exact" {
		fmt.Fprintf(e.stdout, "exact:    a_N/N! = %s/%d!  = %s\n", o.Count, o.N, o.Probability)
		fmt.Fprintf(e.stdout, "decimal:  [%s, %s]  (rounded outward)\n", o.Lo, o.Hi)
	} else {
		fmt.Fprintf(e.stdout, "certified: [%s, %s]  (rounded outward)\n", o.Lo, o.Hi)
		if o.RelativeWidth != "" {
			fmt.Fprintf(e.stdout, "relative width: at most %s\n", o.RelativeWidth)
		}
	}
	fmt.Fprintf(e.stdout, "how: %s\n", o.Note)
	if len(o.Occurrences) > 0 {
		fmt.Fprintln(e.stdout, "\nnumber of matching windows (exact; decimals rounded to nearest for display)")
		tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "j\tpermutations\tP(count = j)\t")
		for _, r := range o.Occurrences {
			fmt.Fprintf(tw, "%s\t%s\t%s\t\n", strconv.Itoa(r.J), r.Count, r.Decimal)
		}
		more, _ := new(big.Rat).SetString(o.MoreThanJ)
		fmt.Fprintf(tw, "> %d\t\t%s\t\n", len(o.Occurrences)-1, roundedDecimal(more))
		tw.Flush()
	}
}
