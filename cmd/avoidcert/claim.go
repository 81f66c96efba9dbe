package main

import (
	"context"
	"fmt"
	"strings"

	"avoidcert/bounds"
	"avoidcert/interval"
	"avoidcert/prove"
)

func init() {
	commands["claim"] = command{
		summary: "prove or refute a claimed growth rate (a gate for CI)",
		usage: `Usage: avoidcert claim [--of lambda|radius] (--value X [--truncated] | --interval LO,HI) PATTERN...

Decides a claim about lambda (default) or the radius 1/lambda, tightening the
certified bracket until it lies inside the claim (proved) or misses it
(refuted), or a budget stops it (undecided). The final bracket is written into
a certificate that the independent checker (as in 'avoidcert check') must
accept before anything is printed: every verdict, and the certified interval
shown, is read from that checked certificate. Should the checker ever refuse
it, claim says why and exits 4.

A claimed decimal X means the true value lies within half a unit of X's last
digit: --value 0.9546 claims [0.95455, 0.95465]. With --truncated, X is the
true value cut after its last digit: [0.9546, 0.9547]. --interval LO,HI
claims the closed interval [LO, HI].

Flags:
  --of Q           lambda or radius (default lambda)
  --value X        a claimed decimal
  --truncated      read --value as truncated, not rounded
  --interval L,H   a claimed closed interval
  --json           {"format":"avoidcert-claim","version":1,"patterns":[...],
                   "structure_class":...,"quantity":...,"claimed":{"lo","hi"},
                   "certified":{"lo","hi"},"k":K,"verdict":"proved"|"refuted"|
                   "undecided","evidence":...,"seconds":S} (docs/json.md)
  --max-k K, --max-memory B, --timeout T   budgets, as for bound
  --progress, --quiet                       progress, as for bound

A claim that no set satisfies is refuted at once, without a certificate:
0 <= a_n <= n! gives 0 <= lambda <= 1 and 1/lambda >= 1.

Exit codes: 0 proved, 1 refuted, 3 undecided within the budget (--timeout
stops the bracket in time to certify the best one), 2 bad input, 4 interrupted
(Ctrl-C or SIGTERM) or a certificate the checker refused.
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
	asJSON := fs.Bool("json", false, "")
	var b budget
	set, err := b.parse(fs, args)
	if err != nil {
		return failure(e, err)
	}
	quantity, err := bounds.ParseQuantity(*of)
	if err != nil {
		return failure(e, usagef("claim: --of %s: say lambda or radius", quote(*of)))
	}
	claimed, err := claimInterval(*value, *within, *truncated)
	if err != nil {
		return failure(e, err)
	}
	opts := b.options()
	progressDone := b.watch(e, &opts, interval.CommonDigits(claimed.Lo, claimed.Hi)+1)
	j, err := prove.Judge(ctx, set, claimed, quantity, opts)
	progressDone()
	if ctx.Err() != nil {
		return interrupted(e)
	}
	if err != nil {
		return failure(e, err)
	}
	digits := claimDigits(claimed)
	if j.Impossible != "" {
		// refuted by what every set satisfies: no certificate is needed
		reason := j.Impossible + "; this needs no certificate"
		if *asJSON {
			writeJSON(e.stdout, claimJSON{jsonHead: headOf("claim"), Patterns: set.Strings(), Quantity: string(quantity),
				Claimed: ends(bounds.Enclosure{Lo: claimed.Lo, Hi: claimed.Hi}, digits), Verdict: "refuted", Evidence: reason})
			return exitFailed
		}
		fmt.Fprintf(e.stdout, "claim: %s(%s) in %s\n", quantity, set, claimed.String(digits))
		fmt.Fprintln(e.stdout, "refuted: "+reason)
		return exitFailed
	}
	// The verdict and the interval shown are read from the certificate
	// the checker accepted.
	res := j.Bracket
	none := quantity == bounds.QuantityRadius && prove.LambdaZero(j.Certificate)
	var words string
	code := exitUndecided
	switch {
	case j.Verdict == bounds.Proved:
		words, code = "proved: the certified interval lies inside the claim", exitOK
	case j.Verdict == bounds.Refuted && none:
		words, code = "refuted: lambda = 0, so 1/lambda has no value, in no interval", exitFailed
	case j.Verdict == bounds.Refuted:
		words, code = "refuted: the certified interval misses the claim", exitFailed
	default:
		words = "undecided: " + stopWords(j.Result)
	}
	verdict, reason, _ := strings.Cut(words, ":")
	if *asJSON {
		k, class := j.K(), string(prove.FormOf(j.Certificate).Class)
		out := claimJSON{jsonHead: headOf("claim"), Patterns: set.Strings(), Class: &class, Quantity: string(quantity),
			Claimed: ends(bounds.Enclosure{Lo: claimed.Lo, Hi: claimed.Hi}, digits),
			K:       &k, Verdict: verdict, Evidence: strings.TrimSpace(reason), Seconds: res.Elapsed.Seconds()}
		if !none {
			certified := ends(j.Certified, digits)
			out.Certified = &certified
		}
		writeJSON(e.stdout, out)
		return code
	}
	fmt.Fprintf(e.stdout, "claim: %s(%s) in %s\n", quantity, set, claimed.String(digits))
	if none {
		fmt.Fprintf(e.stdout, "certified: %s: %s (k = %d)\n", quantity, noRadius, j.K())
	} else {
		fmt.Fprintf(e.stdout, "certified: %s in %s (k = %d)\n", quantity, j.Certified.String(digits), j.K())
	}
	fmt.Fprintln(e.stdout, words)
	return code
}

// claimJSON is the --json output of claim. structure_class, certified and k are
// null for a claim refuted without a certificate (no set satisfies it);
// certified is null too for the radius of a set with lambda = 0 (1/lambda
// has no value).
type claimJSON struct {
	jsonHead
	Patterns  []string  `json:"patterns"`
	Class     *string   `json:"structure_class"`
	Quantity  string    `json:"quantity"`
	Claimed   endsJSON  `json:"claimed"`
	Certified *endsJSON `json:"certified"`
	K         *int      `json:"k"`
	Verdict   string    `json:"verdict"`
	Evidence  string    `json:"evidence"`
	Seconds   float64   `json:"seconds"`
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
			return interval.Interval{}, usagef("claim: --interval %s: write two decimals LO,HI such as 0.95,0.96", quote(within))
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
			return interval.Interval{}, usagef("claim: --interval %s: LO is above HI", quote(within))
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
