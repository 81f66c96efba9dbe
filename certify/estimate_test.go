package certify_test

import (
	"errors"
	"testing"

	"avoidcert/certify"
)

// TestEstimateIsChecksOwn: Estimate gives the memory Check itself
// estimates before its work (the figure of its LimitError), and work within
// a small factor (only the length of the bounds differs), for certificates
// with and without a structure section, whole and by blocks.
func TestEstimateIsChecksOwn(t *testing.T) {
	for _, tc := range []struct {
		given     []string
		specs     []spec
		structure *certify.Structure
	}{
		{[]string{"123"}, []spec{wholeSpec(8, 1, true)}, structure123()},
		{[]string{"1342"}, []spec{wholeSpec(12, 1, true)}, nil},
		{[]string{"123", "321"}, []spec{wholeSpec(10, 2, true), wholeSpec(10, 1, false)}, nil},
	} {
		for _, st := range []*certify.Structure{nil, tc.structure} {
			c := assemble(t, tc.given, tc.specs, st)
			var planned []certify.Planned
			for _, b := range c.Evidence.Brackets {
				planned = append(planned, certify.Planned{States: b.States, Start: b.Start, Step: b.Step, N: b.N})
			}
			work, memory, err := certify.Estimate(tc.given, st, planned, 64)
			if err != nil {
				t.Fatal(err)
			}
			var limit *certify.LimitError
			if err := certify.Check(bg, c, certify.CheckOptions{MaxMemory: 1}); !errors.As(err, &limit) || limit.Resource != "memory" {
				t.Fatalf("%v: want a memory refusal, got %v", tc.given, err)
			}
			if memory != limit.Need {
				t.Errorf("%v (structure %v): Estimate memory %.4g, Check's %.4g", tc.given, st != nil, memory, limit.Need)
			}
			if err := certify.Check(bg, c, certify.CheckOptions{MaxWork: 1}); !errors.As(err, &limit) || limit.Resource != "work" {
				t.Fatalf("%v: want a work refusal, got %v", tc.given, err)
			}
			if work < limit.Need/2 || work > 2*limit.Need {
				t.Errorf("%v (structure %v): Estimate work %.4g, Check's %.4g", tc.given, st != nil, work, limit.Need)
			}
		}
	}
	if _, _, err := certify.Estimate([]string{"123"}, nil, []certify.Planned{{States: []int{2, 1}, Start: certify.StartOnes, Step: 1, N: 3}}, 64); err == nil {
		t.Error("states out of order were measured")
	}
}
