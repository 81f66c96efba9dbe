package prove_test

import (
	"context"
	"testing"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/prove"
	"avoidcert/structure"
	"avoidcert/transfer"
)

// Certificates built from real runs pass the independent checker, for a
// primitive set (one whole bracket), a periodic one (a step-2 bracket plus
// the whole step-1 bracket the all-n bounds need) and a reducible one
// (block brackets). The sets: 123 and {123, 321} (Elizalde and Noy 2003;
// Andre 1879), and the reducible set found by the bounds tests.
func TestCertificatesPassTheChecker(t *testing.T) {
	ctx := context.Background()
	for _, given := range [][]string{{"123"}, {"123", "321"}, {"1243", "1342", "2314", "2413", "3421", "4132"}} {
		set, err := pattern.ParseSet(given)
		if err != nil {
			t.Fatal(err)
		}
		rep, err := structure.Analyze(ctx, set, structure.Options{Witnesses: true})
		if err != nil {
			t.Fatal(err)
		}
		sys := transfer.FromSet(set)
		opts := bounds.Options{Digits: 8, Digests: true, Step: 1}
		var res *bounds.Result
		switch rep.Class {
		case structure.Periodic:
			opts.Step = rep.Period
			res, err = bounds.Run(ctx, sys, opts, nil)
		case structure.Reducible:
			var blocks [][]int
			for _, i := range rep.Digraph.Order {
				blocks = append(blocks, rep.Digraph.Components[i].Cells)
			}
			res, err = bounds.RunBlocks(ctx, sys, blocks, opts, nil)
		default:
			res, err = bounds.Run(ctx, sys, opts, nil)
		}
		if err != nil {
			t.Fatal(err)
		}
		c, err := prove.BuildCertificate(ctx, "produce test", rep, sys, res, 10)
		if err != nil {
			t.Fatal(err)
		}
		if err := certify.Check(c, certify.CheckOptions{Expect: set}); err != nil {
			t.Errorf("%s (%s): %v", set, rep.Class, err)
		}
		if c.Structure == nil || string(c.Structure.Class) != string(rep.Class) {
			t.Errorf("%s: structure section %+v does not state class %s", set, c.Structure, rep.Class)
		}
	}
}
