package main

import (
	"context"
	"encoding/csv"
	"fmt"
	"math/big"
	"strconv"
	"text/tabwriter"

	"avoidcert/internal/bytesize"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

func init() {
	commands["count"] = command{
		summary: "exact counts a_n and probabilities a_n/n!",
		usage: `Usage: avoidcert count [--from N] [--to N] [--format text|csv|json | --json] PATTERN...

Prints, for n = from..to, the number a_n of permutations of 1..n that avoid
every pattern consecutively, and a_n/n!: the probability that n i.i.d.
draws from a continuous distribution avoid them. Counts are exact.

Flags:
  --from N          first n (default 0)
  --to N            last n (default 20)
  --format F        text (a table; a_n/n! rounded to 10 significant digits),
                    csv (header n,count,probability; probability as an exact
                    fraction p/q) or json (counts as decimal strings,
                    probability as an exact fraction; docs/json.md)
  --json            the same as --format json
  --max-memory B    refuse runs estimated to need more memory (default 4G)
  --progress        report each iterate on stderr
  --verbose         say which patterns were dropped as duplicates or redundant

Exit codes: 0 success, 2 bad input, 3 over --max-memory (nothing counted),
4 interrupted (Ctrl-C or SIGTERM) or output that could not be written.
`,
		run: runCount,
	}
}

func runCount(ctx context.Context, e *env, args []string) int {
	fs := newFlags("count")
	from := fs.Int("from", 0, "")
	to := fs.Int("to", 20, "")
	format := fs.String("format", "text", "")
	asJSON := fs.Bool("json", false, "")
	maxMem := byteSize(defaultMemory)
	fs.Var(&maxMem, "max-memory", "")
	progress := fs.Bool("progress", false, "")
	verbose := fs.Bool("verbose", false, "")
	pos, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	set, err := parsePatterns("count", pos)
	if err != nil {
		return failure(e, err)
	}
	if *asJSON {
		if *format != "text" && *format != "json" {
			return failure(e, usagef("count: give --json or --format %s, not both", quote(*format)))
		}
		*format = "json"
	}
	switch {
	case *from < 0 || *to < 0:
		return failure(e, usagef("count: --from and --to must be at least 0"))
	case *from > *to:
		return failure(e, usagef("count: --from %d is past --to %d", *from, *to))
	case *format != "text" && *format != "csv" && *format != "json":
		return failure(e, usagef("count: --format %s is not one of text, csv, json", quote(*format)))
	}
	if need := transfer.CountsFootprint(set, *to); need > int64(maxMem) {
		// a budget, not bad input: exit 3 as for every budget
		fmt.Fprintf(e.stderr, "avoidcert: count: undecided: counting to n = %d needs %s, over --max-memory %s; lower --to or raise --max-memory\n",
			*to, bytesize.About(need), bytesize.Format(int64(maxMem)))
		return exitUndecided
	}
	if *verbose {
		reportDropped(e.stderr, set)
	}
	limitMemory(int64(maxMem))
	var report transfer.Progress
	if *progress {
		report = func(k, last int) { fmt.Fprintf(e.stderr, "iterate %d of %d\n", k, last) }
	}
	counts, err := transfer.Counts(ctx, set, *to, report)
	if err != nil {
		return failure(e, err)
	}
	rows := make([]countRow, 0, *to-*from+1)
	fact := big.NewInt(1)
	for n := 0; n <= *to; n++ {
		if n > 0 {
			fact.Mul(fact, big.NewInt(int64(n)))
		}
		if n >= *from {
			rows = append(rows, countRow{n: n, count: counts[n], prob: new(big.Rat).SetFrac(counts[n], fact)})
		}
	}
	switch *format {
	case "csv":
		writeCountsCSV(e, rows)
	case "json":
		writeCountsJSON(e, set, rows)
	default:
		writeCountsText(e, set, rows)
	}
	return exitOK
}

type countRow struct {
	n     int
	count *big.Int
	prob  *big.Rat
}

func writeCountsText(e *env, s pattern.Set, rows []countRow) {
	fmt.Fprintf(e.stdout, "permutations avoiding %s (consecutive patterns), window length %d\n", s, s.Window())
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "n\ta_n\ta_n/n! (rounded)\t")
	for _, r := range rows {
		// big.Float, not float64: a_n/n! underflows float64 near n = 180.
		f := new(big.Float).SetPrec(96).SetRat(r.prob)
		fmt.Fprintf(tw, "%d\t%s\t%s\t\n", r.n, r.count, f.Text('g', 10))
	}
	tw.Flush()
}

func writeCountsCSV(e *env, rows []countRow) {
	w := csv.NewWriter(e.stdout)
	w.Write([]string{"n", "count", "probability"})
	for _, r := range rows {
		w.Write([]string{strconv.Itoa(r.n), r.count.String(), r.prob.RatString()})
	}
	w.Flush()
}

func writeCountsJSON(e *env, s pattern.Set, rows []countRow) {
	type entry struct {
		N           int    `json:"n"`
		Count       string `json:"count"`
		Probability string `json:"probability"`
	}
	out := struct {
		jsonHead
		Patterns []string `json:"patterns"`
		Window   int      `json:"window"`
		Counts   []entry  `json:"counts"`
	}{jsonHead: headOf("count"), Patterns: s.Strings(), Window: s.Window(), Counts: []entry{}}
	for _, r := range rows {
		out.Counts = append(out.Counts, entry{N: r.n, Count: r.count.String(), Probability: r.prob.RatString()})
	}
	writeJSON(e.stdout, out)
}
