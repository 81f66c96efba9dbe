package main

import (
	"context"
	"fmt"
	"strings"

	"avoidcert/bounds"
	"avoidcert/interval"
)

func init() {
	commands["claim"] = command{
		summary: "prove or refute a claimed growth rate (a gate for CI)",
		usage: `Usage: avoidcert claim [--of lambda|radius] (--value X [--truncated] | --interval LO,HI) PATTERN...

Decides a claim about lambda (default) or the radius 1/lambda, tightening the
certified bracket until it lies inside the claim (proved) or misses it
(refuted), or a budget stops it (undecided).

A claimed decimal X means the true value lies within half a unit of X's last
digit: --value 0.9546 claims [0.95455, 0.95465]. With --truncated, X is the
true value cut after its last digit: [0.9546, 0.9547]. --interval LO,HI
claims the closed interval [LO, HI].

Flags:
  --of Q           lambda or radius (default lambda)
  --value X        a claimed decimal
  --truncated      read --value as truncated, not rounded
  --interval L,H   a claimed closed interval
  --max-k K, --max-memory B, --timeout T, --progress   budgets, as for bound

Exit codes: 0 proved, 1 refuted, 3 undecided within the budget, 2 bad input.
`,
		run: runClaim,
	}
}

func runClaim(ctx context.Context, e *env, args []string) int {
	fs := newFlags("claim")
	of := fs.String("of", "lambda", "")
	value := fs.String("value", "", "")
	truncated := fs.Bool("truncated", false, "")
	within := fs.String("interval", "", "")
	var b budget
	set, err := b.parse(fs, args)
	if err != nil {
		return failure(e, err)
	}
	quantity, err := bounds.ParseQuantity(*of)
	if err != nil {
		return failure(e, usagef("claim: --of %q: say lambda or radius", *of))
	}
	claimed, err := claimInterval(*value, *within, *truncated)
	if err != nil {
		return failure(e, err)
	}
	ctx, cancel, p, err := b.start(ctx, set)
	if err != nil {
		return failure(e, err)
	}
	defer cancel()
	opts := bounds.Options{Step: p.step, MaxN: p.maxN(b.maxK), MaxMemory: int64(b.maxMemory)}
	verdict, res, err := bounds.JudgeBlocks(ctx, p.states, p.blocks, claimed, quantity, opts, b.reporter(e))
	if err != nil {
		return failure(e, err)
	}
	shown := res.Lambda
	if quantity == bounds.QuantityRadius {
		shown = res.Radius
	}
	digits := claimDigits(claimed)
	fmt.Fprintf(e.stdout, "claim: %s(%s) in %s\n", quantity, set, claimed.String(digits))
	fmt.Fprintf(e.stdout, "certified: %s in %s (k = %d)\n", quantity, shown.String(digits), p.k(res.Brackets[0]))
	switch verdict {
	case bounds.Proved:
		fmt.Fprintln(e.stdout, "proved: the certified interval lies inside the claim")
		return exitOK
	case bounds.Refuted:
		fmt.Fprintln(e.stdout, "refuted: the certified interval misses the claim")
		return exitFailed
	default:
		fmt.Fprintf(e.stdout, "undecided: %s\n", stopWords(res))
		return exitUndecided
	}
}

// claimInterval reads exactly one of --value and --interval.
func claimInterval(value, within string, truncated bool) (interval.Interval, error) {
	switch {
	case value != "" && within != "":
		return interval.Interval{}, usagef("claim: give --value or --interval, not both")
	case value != "":
		lo, hi, err := interval.ClaimRange(value, truncated)
		if err != nil {
			return interval.Interval{}, usagef("claim: --value: %v", err)
		}
		return interval.Interval{Lo: lo, Hi: hi}, nil
	case within != "":
		if truncated {
			return interval.Interval{}, usagef("claim: --truncated goes with --value, not --interval")
		}
		parts := strings.Split(within, ",")
		if len(parts) != 2 {
			return interval.Interval{}, usagef("claim: --interval %q: write two decimals LO,HI such as 0.95,0.96", within)
		}
		lo, err := interval.ParseDecimal(strings.TrimSpace(parts[0]))
		if err != nil {
			return interval.Interval{}, usagef("claim: --interval: %v", err)
		}
		hi, err := interval.ParseDecimal(strings.TrimSpace(parts[1]))
		if err != nil {
			return interval.Interval{}, usagef("claim: --interval: %v", err)
		}
		if lo.Cmp(hi) > 0 {
			return interval.Interval{}, usagef("claim: --interval %q: LO is above HI", within)
		}
		return interval.Interval{Lo: lo, Hi: hi}, nil
	default:
		return interval.Interval{}, usagef("claim: say what is claimed: --value X or --interval LO,HI")
	}
}

// claimDigits prints the claim and the bracket with enough digits to see
// where they differ.
func claimDigits(x interval.Interval) int {
	d := interval.CommonDigits(x.Lo, x.Hi)
	return min(max(d+4, 8), 60)
}
