package produce_test

import (
	"context"
	"testing"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/certify/produce"
	"avoidcert/pattern"
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
		st := transfer.NewStates(set)
		opts := bounds.Options{Digits: 8, Digests: true, Step: 1}
		var res *bounds.Result
		switch rep.Class {
		case structure.Periodic:
			opts.Step = rep.Period
			res, err = bounds.Run(ctx, st, opts, nil)
		case structure.Reducible:
			res, err = bounds.RunBlocks(ctx, st, bounds.Blocks(st), opts, nil)
		default:
			res, err = bounds.Run(ctx, st, opts, nil)
		}
		if err != nil {
			t.Fatal(err)
		}
		c, err := produce.Certificate(ctx, "produce test", rep, st, res, 10)
		if err != nil {
			t.Fatal(err)
		}
		if err := certify.Check(context.Background(), c, certify.CheckOptions{Expect: set.Strings()}); err != nil {
			t.Errorf("%s (%s): %v", set, rep.Class, err)
		}
		if c.Structure == nil || string(c.Structure.Class) != string(rep.Class) {
			t.Errorf("%s: structure section %+v does not state class %s", set, c.Structure, rep.Class)
		}
	}
}
