package prove_test

import (
	"context"
	"errors"
	"testing"
	"time"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/internal/settest"
	"avoidcert/interval"
	"avoidcert/prove"
	"avoidcert/transfer"
)

// A run never takes a bracket whose certificate the checker could not
// re-check within the same budget: it stops at the last one it can
// (StopCertifiable), that certificate passes the checker at the budget,
// and the stop says what the next bracket's check would need. 1342 to 100
// digits needs far more than these budgets.
func TestCertifyStopsAtTheLastCertifiableBracket(t *testing.T) {
	ctx := context.Background()
	set := settest.Must(t, "1342")
	for _, budget := range []int64{100 << 10, 1 << 20} {
		r, err := prove.Certify(ctx, set, prove.Options{Digits: 100, MaxMemory: budget})
		if err != nil {
			t.Fatalf("%d bytes: %v", budget, err)
		}
		if r.Done() || r.Bracket.Stop != bounds.StopCertifiable {
			t.Fatalf("%d bytes: stop %s, want %s", budget, r.Bracket.Stop, bounds.StopCertifiable)
		}
		if err := certify.Check(ctx, r.Certificate, certify.CheckOptions{MaxMemory: budget, Expect: []string{"1342"}}); err != nil {
			t.Errorf("%d bytes: the certificate does not pass the checker at the same budget: %v", budget, err)
		}
		over := r.Stopped()
		if over == nil || over.Budget != prove.BudgetMemory || over.Need <= float64(budget) || over.Limit != float64(budget) {
			t.Errorf("%d bytes: stop %+v, want the memory the next bracket's check needs", budget, over)
		}
	}
}

// What cannot fit even a first bracket with its check is refused before
// the work, with the amount needed.
func TestRefusedAtOnce(t *testing.T) {
	ctx := context.Background()
	_, err := prove.Certify(ctx, settest.Must(t, "1342"), prove.Options{MaxMemory: 20 << 10})
	var over *prove.BudgetError
	if !errors.As(err, &over) || !errors.Is(err, prove.ErrBudget) || over.Budget != prove.BudgetMemory || over.Need <= over.Limit {
		t.Fatalf("20 KiB: %v, want a memory refusal with its need", err)
	}
	// a deadline that leaves no time for the check of a first bracket
	_, err = prove.Certify(ctx, settest.Must(t, "1342"), prove.Options{Digits: 20, Deadline: time.Now().Add(time.Microsecond)})
	if !errors.As(err, &over) || over.Budget != prove.BudgetTime || !errors.Is(err, context.DeadlineExceeded) {
		t.Fatalf("a deadline gone: %v, want a time refusal", err)
	}
	// counts: the engine and the checker side by side
	set := settest.Must(t, "1342")
	need := prove.CountsMemory(set, 200, prove.Options{})
	if engine := transfer.CountsFootprint(set, 200); need <= engine {
		t.Errorf("CountsMemory %d is not above the engine's %d: the checker counts too", need, engine)
	}
	if _, err := prove.Counts(ctx, set, 200, prove.Options{MaxMemory: need - 1}); !errors.As(err, &over) || over.Need != float64(need) {
		t.Errorf("counts just over the budget: %v", err)
	}
}

// A claim that no set satisfies is refuted without a certificate; one that
// only touches what every set satisfies goes to the checker.
func TestImpossibleClaims(t *testing.T) {
	ctx := context.Background()
	set := settest.Must(t, "123")
	for _, tc := range []struct {
		lo, hi     string
		of         bounds.Quantity
		impossible bool
	}{
		{"-1", "-0.5", bounds.QuantityLambda, true},
		{"1.001", "2", bounds.QuantityLambda, true},
		{"0.2", "0.999", bounds.QuantityRadius, true},
		{"-1", "0", bounds.QuantityLambda, false},
		{"0.5", "1", bounds.QuantityRadius, false},
	} {
		lo, _ := interval.ParseDecimal(tc.lo)
		hi, _ := interval.ParseDecimal(tc.hi)
		j, err := prove.Judge(ctx, set, interval.Interval{Lo: lo, Hi: hi}, tc.of, prove.Options{MaxK: 20})
		if err != nil {
			t.Fatal(err)
		}
		if got := j.Impossible != ""; got != tc.impossible || (got && (j.Verdict != bounds.Refuted || j.Result != nil)) {
			t.Errorf("[%s, %s] of %s: verdict %s, impossible %q, result %v", tc.lo, tc.hi, tc.of, j.Verdict, j.Impossible, j.Result != nil)
		}
		if !tc.impossible && j.Verdict != bounds.Refuted { // lambda(123) = 0.8269... (Elizalde and Noy 2003)
			t.Errorf("[%s, %s] of %s: %s, want refuted from a checked certificate", tc.lo, tc.hi, tc.of, j.Verdict)
		}
	}
}
