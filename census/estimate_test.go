package census

import (
	"strings"
	"testing"

	"avoidcert/pattern"
	"avoidcert/structure"
	"avoidcert/transfer"
)

// The closed-form parts of the estimate are the engine's own estimates,
// the ones the run holds each worker to; the modelled time grows with the
// counts' n and the digits.
func TestEstimateUsesTheEnginesClosedForms(t *testing.T) {
	params := Params{Length: 5, To: 14, Digits: 8, RefineDigits: 8}
	e := EstimateRun(params, Shard{}, 2, 1<<30)
	if len(e.Classes) != 32 {
		t.Fatalf("%d classes, want the 32 of length 5", len(e.Classes))
	}
	for i, c := range pattern.SymmetryClasses(5) {
		got := e.Classes[i]
		set := pattern.NewSet(c.Representative)
		if got.Representative != c.Representative.String() ||
			got.Counting != transfer.CountsFootprint(set, 14) ||
			got.Structure != structure.Estimate(transfer.NewStates(set), structure.Options{}).Memory {
			t.Errorf("class %s: estimate %+v, not the engine's closed forms", c.Representative, got)
		}
		if got.Seconds <= 0 || got.Resident < got.Counting {
			t.Errorf("class %s: %g s, %d bytes resident below the count's %d", c.Representative, got.Seconds, got.Resident, got.Counting)
		}
	}
	more := EstimateRun(Params{Length: 5, To: 20, Digits: 16, RefineDigits: 16}, Shard{}, 2, 1<<30)
	if more.Seconds() <= e.Seconds() {
		t.Errorf("counts to 20 at 16 digits estimated at %g s, not more than to 14 at 8 digits (%g s)", more.Seconds(), e.Seconds())
	}
	if _, _, _, over := e.Over(); over {
		t.Error("length 5 is over a budget of 1 GiB per worker")
	}
	small := EstimateRun(params, Shard{Index: 2, Of: 3}, 1, 1000)
	class, what, need, over := small.Over()
	if !over || class != small.Classes[0].Representative || !strings.Contains(what, "n = 14") || need <= 1000 {
		t.Errorf("a budget of 1000 bytes: over %v for %s (%s, %d bytes), want the shard's first class refused for counting", over, class, what, need)
	}
	if s := e.Summary(); !strings.Contains(s, "on 2 worker(s), each held to 1.0 GiB") || !strings.Contains(s, "not bounds") {
		t.Errorf("summary %q", s)
	}
}
