package prove_test

import (
	"context"
	"errors"
	"math"
	"math/big"
	"strings"
	"testing"
	"time"

	"avoidcert/bounds"
	"avoidcert/internal/settest"
	"avoidcert/interval"
	"avoidcert/prove"
	"avoidcert/structure"
	"avoidcert/transfer"
)

func claimOf(t *testing.T, decimal string) interval.Interval {
	t.Helper()
	lo, hi, err := interval.ClaimRange(decimal, false)
	if err != nil {
		t.Fatal(err)
	}
	return interval.Interval{Lo: lo, Hi: hi}
}

// Certify returns a checked certificate whose interval holds the published
// growth rate.
func TestCertifyContainsPublished(t *testing.T) {
	ctx := context.Background()
	for _, p := range []string{"132", "1342"} {
		r, err := prove.Certify(ctx, settest.Must(t, p), prove.Options{Digits: 8})
		if err != nil {
			t.Fatal(err)
		}
		pub, _ := interval.PublishedGrowth(p) // OEIS A111004 (132), A117156 (1342)
		q := prove.Enclosure(r.Certificate, bounds.QuantityLambda)
		want := pub.LambdaRange()
		if q.Lo.Cmp(want.Hi) > 0 || q.Hi.Cmp(want.Lo) < 0 {
			t.Errorf("%s: certified %s misses %s (%s)", p, q.String(12), pub.Digits, pub.Source())
		}
		if !r.Done() {
			t.Errorf("%s: the 8-digit target was not met: %s", p, r.Bracket.Stop)
		}
	}
}

// Judge: a growth rate right to its last digit is proved, one wrong in its
// last digit is refuted, and a budget too small leaves it undecided.
// lambda(1342) = 0.95461183447... (OEIS A117156).
func TestJudge(t *testing.T) {
	ctx := context.Background()
	set := settest.Must(t, "1342")
	for _, tc := range []struct {
		value string
		of    bounds.Quantity
		maxK  int
		want  bounds.Verdict
	}{
		{"0.9546118", bounds.QuantityLambda, 0, bounds.Proved},
		{"0.9546119", bounds.QuantityLambda, 0, bounds.Refuted},
		{"1.047546", bounds.QuantityRadius, 0, bounds.Proved}, // 1/0.954611834... = 1.0475462...
		{"0.9546118", bounds.QuantityLambda, 6, bounds.Undecided},
	} {
		j, err := prove.Judge(ctx, set, claimOf(t, tc.value), tc.of, prove.Options{MaxK: tc.maxK})
		if err != nil {
			t.Fatal(err)
		}
		if j.Verdict != tc.want {
			t.Errorf("%s = %s (max k %d): %s, want %s; certified %s", tc.of, tc.value, tc.maxK, j.Verdict, tc.want, j.Certified.String(12))
		}
	}
}

// Compare: lambda(1342) = 0.95461... < lambda(1324) = 0.95585... (OEIS
// A117156, A113228); the reverse order is refuted; {132, 231} has
// lambda = 0 (subexponential, proved by the structure section).
func TestCompare(t *testing.T) {
	ctx := context.Background()
	for _, tc := range []struct {
		first, second []string
		want          bounds.Verdict
	}{
		{[]string{"1342"}, []string{"1324"}, bounds.Proved},
		{[]string{"1324"}, []string{"1342"}, bounds.Refuted},
		{[]string{"132", "231"}, []string{"123"}, bounds.Proved},
	} {
		c, err := prove.Compare(ctx, settest.Must(t, tc.first...), settest.Must(t, tc.second...), prove.Options{})
		if err != nil {
			t.Fatal(err)
		}
		if c.Verdict != tc.want {
			t.Errorf("lambda(%v) < lambda(%v): %s, want %s", tc.first, tc.second, c.Verdict, tc.want)
		}
	}
}

// Counts agree with OEIS A049774 (123).
func TestCountsOEIS(t *testing.T) {
	got, err := prove.Counts(context.Background(), settest.Must(t, "123"), 12, prove.Options{})
	if err != nil {
		t.Fatal(err)
	}
	// OEIS A049774: 1, 1, 2, 5, 17, 70, 349, 2017, 13358, 99377, 822041, 7477162, 74207209
	want := []int64{1, 1, 2, 5, 17, 70, 349, 2017, 13358, 99377, 822041, 7477162, 74207209}
	for n, w := range want {
		if got[n].Cmp(big.NewInt(w)) != 0 {
			t.Errorf("a_%d = %s, OEIS A049774 gives %d", n, got[n], w)
		}
	}
	if _, err := prove.Counts(context.Background(), settest.Must(t, "1342"), 300, prove.Options{MaxMemory: 1 << 20}); !errors.Is(err, prove.ErrBudget) {
		t.Errorf("a count over the memory budget: %v, want ErrBudget", err)
	}
}

// A certificate changed after the checker accepted it is refused by
// Recheck.
func TestRecheckTampered(t *testing.T) {
	ctx := context.Background()
	set := settest.Must(t, "132")
	r, err := prove.Certify(ctx, set, prove.Options{Digits: 6})
	if err != nil {
		t.Fatal(err)
	}
	if err := prove.Recheck(ctx, r.Certificate, set, prove.Options{}); err != nil {
		t.Fatalf("the untouched certificate: %v", err)
	}
	c := *r.Certificate
	c.Statement.Lambda.Lo = new(big.Rat).Add(c.Statement.Lambda.Lo, big.NewRat(1, 1000))
	if err := prove.Recheck(ctx, &c, set, prove.Options{}); err == nil {
		t.Error("a raised lambda.lo passed the checker")
	}
	if err := prove.Recheck(ctx, r.Certificate, settest.Must(t, "123"), prove.Options{}); err == nil || !strings.Contains(err.Error(), "expected set") {
		t.Errorf("a certificate for another set: %v", err)
	}
}

// A memory budget too small for the structure test, or for the first
// bracket, is a budget refusal (ErrBudget), not a failure, with the
// refusal of the step that needed more in the chain.
func TestBudgetTooSmall(t *testing.T) {
	set := settest.Must(t, "1342")
	_, err := prove.Certify(context.Background(), set, prove.Options{MaxMemory: 1024})
	var se *structure.BudgetError
	if !errors.Is(err, prove.ErrBudget) || !errors.As(err, &se) {
		t.Errorf("1 KiB: got %v, want ErrBudget with the structure test's *structure.BudgetError", err)
	}
	// Enough for the structure test, too little for the bracket run or
	// the checker.
	enough := structure.Estimate(transfer.NewStates(set), structure.Options{}).Memory
	_, err = prove.Certify(context.Background(), set, prove.Options{MaxMemory: enough})
	if !errors.Is(err, prove.ErrBudget) || errors.As(err, &se) {
		t.Errorf("%d bytes: got %v, want ErrBudget from a later step", enough, err)
	}
}

// Options.Deadline stops the bracket run in time to keep its best
// bracket, whose certificate is still built and checked (Certify returns
// only checked certificates); cancelling the context instead leaves
// nothing.
func TestDeadlineKeepsBestBracket(t *testing.T) {
	ctx := context.Background()
	set := settest.Must(t, "1342")
	r, err := prove.Certify(ctx, set, prove.Options{Digits: 900, Deadline: time.Now().Add(300 * time.Millisecond)})
	if err != nil {
		t.Fatal(err)
	}
	if r.Bracket.Stop != bounds.StopTimeout || r.Done() {
		t.Fatalf("stop %s, want a timeout stop", r.Bracket.Stop)
	}
	if r.Certificate == nil || r.Certificate.Statement.Lambda.Lo == nil {
		t.Fatal("no certificate for the kept bracket")
	}
	cancelled, cancel := context.WithCancel(ctx)
	cancel()
	if _, err := prove.Certify(cancelled, set, prove.Options{Digits: 900}); !errors.Is(err, context.Canceled) {
		t.Errorf("a cancelled context: %v, want context.Canceled", err)
	}
}

// Progress events carry the number of blocks: 0 for a set bracketed as a
// whole, the number of strongly connected components for a reducible set
// ({1243, 1342, 2314, 2413, 3421, 4132}, 4 blocks of prefix states: from
// this tool's structure pass, no published source). The checker's
// progress reaches its total.
func TestProgressEvents(t *testing.T) {
	ctx := context.Background()
	for _, tc := range []struct {
		set    []string
		blocks int
	}{
		{[]string{"1342"}, 0},
		{[]string{"1243", "1342", "2314", "2413", "3421", "4132"}, 4},
	} {
		var events int
		var lastDone, lastTotal int64
		opts := prove.Options{Digits: 6,
			Progress: func(ev prove.Event) {
				events++
				if ev.Blocks != tc.blocks || ev.Block < 0 || (tc.blocks > 0 && ev.Block >= tc.blocks) {
					t.Errorf("%v: event of block %d of %d, want %d blocks", tc.set, ev.Block, ev.Blocks, tc.blocks)
				}
			},
			CheckProgress: func(done, total int64) { lastDone, lastTotal = done, total },
		}
		r, err := prove.Certify(ctx, settest.Must(t, tc.set...), opts)
		if err != nil {
			t.Fatal(err)
		}
		if events == 0 || len(r.Blocks) != tc.blocks {
			t.Errorf("%v: %d events, %d blocks in the result, want some events and %d blocks", tc.set, events, len(r.Blocks), tc.blocks)
		}
		if lastTotal == 0 || lastDone != lastTotal {
			t.Errorf("%v: the checker's progress ended at %d of %d", tc.set, lastDone, lastTotal)
		}
	}
}

// The labelled estimates: for {123, 321}, a_n = 2 E_n (alternating
// permutations) and E_n/n! ~ 2 (2/pi)^(n+1) (Andre 1879), so both
// constants c_r of a_n/n! = lambda^n (c_(n mod 2) + o(1)) are
// 8/pi = 2.546479...; for 1342 c in a_n ~ c lambda^n n! is near 1.15
// (this tool's own estimate, no published source: only its order is
// checked), and for a periodic set there is no such c.
func TestEstimates(t *testing.T) {
	ctx := context.Background()
	r, err := prove.Certify(ctx, settest.Must(t, "123", "321"), prove.Options{Digits: 12, ResidueConstants: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Estimates.ByResidue) != 2 {
		t.Fatalf("c_r: %v, want two", r.Estimates.ByResidue)
	}
	for i, c := range r.Estimates.ByResidue {
		if math.Abs(c-8/math.Pi) > 1e-4 {
			t.Errorf("c_%d ~ %g, want 8/pi = %g (Andre 1879)", i, c, 8/math.Pi)
		}
	}
	if r.Estimates.C != 0 {
		t.Errorf("a periodic set has c = %g, want none", r.Estimates.C)
	}
	r, err = prove.Certify(ctx, settest.Must(t, "1342"), prove.Options{Digits: 8})
	if err != nil {
		t.Fatal(err)
	}
	if c := r.Estimates.C; c < 1 || c > 1.3 || r.Estimates.ByResidue != nil {
		t.Errorf("1342: c ~ %g and c_r %v, want c near 1.15 and no c_r", c, r.Estimates.ByResidue)
	}
	if r.K() != r.Bracket.Brackets[0].N-r.States.MaxLength() || r.K() < 1 {
		t.Errorf("k = %d for a bracket at n = %d", r.K(), r.Bracket.Brackets[0].N)
	}
}
