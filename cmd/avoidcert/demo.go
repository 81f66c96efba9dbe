package main

import (
	"context"
	_ "embed"
	"encoding/json"
	"fmt"
	"math/big"
	"strings"
	"text/tabwriter"

	"avoidcert/pattern"
	"avoidcert/transfer"
)

// manuscript is the demo's input: the claimed table of a fictional
// manuscript. Some entries are right and some are not, on purpose.
//
//go:embed manuscript.json
var manuscript []byte

func init() {
	commands["demo"] = command{
		summary: "a referee checks a fictional manuscript's table (built in)",
		usage: `Usage: avoidcert demo

Checks every entry of the built-in table of a fictional manuscript (invented
for this demo) and prints a verdict per entry: confirmed or refuted, with the
exact value. The demo itself succeeds (exit 0) whatever the verdicts are.
`,
		run: runDemo,
	}
}

type demoClaim struct {
	Row      string   `json:"row"`
	Patterns []string `json:"patterns"`
	N        int      `json:"n"`
	Count    string   `json:"count"`
}

func runDemo(ctx context.Context, e *env, args []string) int {
	if _, err := parseArgs(newFlags("demo"), args); err != nil {
		return failure(e, err)
	}
	var table struct {
		Title  string      `json:"title"`
		Claims []demoClaim `json:"claims"`
	}
	if err := json.Unmarshal(manuscript, &table); err != nil {
		return failure(e, fmt.Errorf("demo table: %v", err))
	}
	fmt.Fprintf(e.stdout, "Referee check of %s\n\n", table.Title)
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "row\tclaim\tverdict")
	refuted := 0
	for _, c := range table.Claims {
		verdict, ok, err := checkCountClaim(ctx, c)
		if err != nil {
			return failure(e, fmt.Errorf("demo row %s: %v", c.Row, err))
		}
		if !ok {
			refuted++
		}
		fmt.Fprintf(tw, "%s\ta_%d(%s) = %s\t%s\n", c.Row, c.N, strings.Join(c.Patterns, ","), c.Count, verdict)
	}
	tw.Flush()
	fmt.Fprintf(e.stdout, "\n%d of %d entries confirmed, %d refuted.\n", len(table.Claims)-refuted, len(table.Claims), refuted)
	return exitOK
}

// checkCountClaim compares a claimed count with the exact one.
func checkCountClaim(ctx context.Context, c demoClaim) (verdict string, ok bool, err error) {
	set, err := pattern.ParseSet(c.Patterns)
	if err != nil {
		return "", false, err
	}
	claimed, good := new(big.Int).SetString(c.Count, 10)
	if !good {
		return "", false, fmt.Errorf("count %q is not an integer", c.Count)
	}
	counts, err := transfer.Counts(ctx, set, c.N, nil)
	if err != nil {
		return "", false, err
	}
	if counts[c.N].Cmp(claimed) == 0 {
		return "confirmed (exact count)", true, nil
	}
	return fmt.Sprintf("REFUTED: the exact count is %s", counts[c.N]), false, nil
}
