package main

import (
	"context"
	_ "embed"
	"encoding/json"
	"fmt"
	"math/big"
	"strings"
	"text/tabwriter"

	"avoidcert/bounds"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/structure"
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
for this demo) and prints a verdict per entry:
  counts a_n             compared with the exact count
  growth rates           a printed decimal means the true value within half a
                         unit of its last digit; proved or refuted by a
                         certified bracket
  "a_n/n! ~ c lambda^n"  with lambda > 0 and one constant c > 0: confirmed
                         when the structure test proves the operator
                         primitive, refuted when it proves lambda = 0
The demo itself succeeds (exit 0) whatever the verdicts are.
`,
		run: runDemo,
	}
}

// demoClaim is one row of the table: a count (N, Count), a growth rate
// (Of, Value) or the asymptotic form (Asymptotic).
type demoClaim struct {
	Row        string   `json:"row"`
	Patterns   []string `json:"patterns"`
	N          int      `json:"n"`
	Count      string   `json:"count"`
	Of         string   `json:"of"`
	Value      string   `json:"value"`
	Asymptotic bool     `json:"asymptotic"`
}

func (c demoClaim) String() string {
	set := strings.Join(c.Patterns, ",")
	switch {
	case c.Count != "":
		return fmt.Sprintf("a_%d(%s) = %s", c.N, set, c.Count)
	case c.Value != "":
		return fmt.Sprintf("%s(%s) = %s", c.Of, set, c.Value)
	default:
		return fmt.Sprintf("a_n/n! ~ c lambda^n, c > 0, lambda > 0 (%s)", set)
	}
}

func runDemo(ctx context.Context, e *env, args []string) int {
	pos, err := parseArgs(newFlags("demo"), args)
	if err != nil {
		return failure(e, err)
	}
	if len(pos) > 0 {
		return failure(e, usagef("demo: takes no arguments (got %s); run 'avoidcert demo'", quote(pos[0])))
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
		verdict, ok, err := checkDemoClaim(ctx, c)
		if err != nil {
			return failure(e, fmt.Errorf("demo row %s: %v", c.Row, err))
		}
		if !ok {
			refuted++
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\n", c.Row, c, verdict)
	}
	tw.Flush()
	fmt.Fprintf(e.stdout, "\n%d of %d entries confirmed, %d refuted.\n", len(table.Claims)-refuted, len(table.Claims), refuted)
	fmt.Fprintln(e.stdout, "Certify any growth rate with 'avoidcert bound PATTERN... --digits D' and re-check it with 'avoidcert check FILE'.")
	return exitOK
}

func checkDemoClaim(ctx context.Context, c demoClaim) (verdict string, ok bool, err error) {
	set, err := pattern.ParseSet(c.Patterns)
	if err != nil {
		return "", false, err
	}
	switch {
	case c.Count != "":
		return checkCountClaim(ctx, set, c)
	case c.Value != "":
		return checkGrowthClaim(ctx, set, c)
	default:
		return checkFormClaim(ctx, set)
	}
}

// checkCountClaim compares a claimed count with the exact one.
func checkCountClaim(ctx context.Context, set pattern.Set, c demoClaim) (string, bool, error) {
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

// checkGrowthClaim proves or refutes a printed growth rate.
func checkGrowthClaim(ctx context.Context, set pattern.Set, c demoClaim) (string, bool, error) {
	quantity, err := bounds.ParseQuantity(c.Of)
	if err != nil {
		return "", false, err
	}
	lo, hi, err := interval.ClaimRange(c.Value, false)
	if err != nil {
		return "", false, err
	}
	claimed := interval.Interval{Lo: lo, Hi: hi}
	p, err := planFor(ctx, set)
	if err != nil {
		return "", false, err
	}
	verdict, res, err := bounds.JudgeBlocks(ctx, p.states, p.blocks, claimed, quantity,
		bounds.Options{Step: p.step, MaxN: p.maxN(200)}, nil)
	if err != nil {
		return "", false, err
	}
	shown := res.Lambda
	if quantity == bounds.QuantityRadius {
		shown = res.Radius
	}
	digits := claimDigits(claimed)
	switch verdict {
	case bounds.Proved:
		return fmt.Sprintf("confirmed: certified %s", shown.String(digits)), true, nil
	case bounds.Refuted:
		return fmt.Sprintf("REFUTED: certified %s", shown.String(digits)), false, nil
	default:
		return fmt.Sprintf("undecided within the demo's budget: %s", shown.String(digits)), false, nil
	}
}

// checkFormClaim judges "a_n/n! ~ c lambda^n with c > 0, lambda > 0" by
// the structure test.
func checkFormClaim(ctx context.Context, set pattern.Set) (string, bool, error) {
	rep, err := structure.Analyze(ctx, set, structure.Options{})
	if err != nil {
		return "", false, err
	}
	switch rep.Class {
	case structure.Primitive:
		return fmt.Sprintf("confirmed: primitive, exponent %d (Jentzsch)", rep.Exponent), true, nil
	case structure.Subexponential, structure.Finite:
		return fmt.Sprintf("REFUTED: %s", classLine(rep)), false, nil
	default:
		return fmt.Sprintf("not established: %s", classLine(rep)), false, nil
	}
}
