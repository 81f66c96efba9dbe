package prove_test

import (
	"context"
	"math/big"
	"testing"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/prove"
	"avoidcert/structure"
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
		rep, err := structure.Analyze(ctx, set, structure.Options{})
		if err != nil {
			t.Fatal(err)
		}
		st := rep.States
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
		c, err := prove.BuildCertificate(ctx, "produce test", rep, res, 10)
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

// TestShortBracketEnds: a bracket's exact ends have about as many digits as
// n! (at 300 digits of 123 they passed the format's 4096-character limit);
// the certificate states them rounded outward to a few dozen bits more
// than the statement, and the checker still accepts it. 123: Elizalde and
// Noy 2003 (the bracket contains 3 sqrt(3)/(2 pi); the bounds tests check
// that).
func TestShortBracketEnds(t *testing.T) {
	ctx := context.Background()
	set, err := pattern.ParseSet([]string{"123"})
	if err != nil {
		t.Fatal(err)
	}
	rep, err := structure.Analyze(ctx, set, structure.Options{})
	if err != nil {
		t.Fatal(err)
	}
	res, err := bounds.Run(ctx, rep.States, bounds.Options{Digits: 60, Digests: true}, nil)
	if err != nil {
		t.Fatal(err)
	}
	c, err := prove.BuildCertificate(ctx, "produce test", rep, res, 60)
	if err != nil {
		t.Fatal(err)
	}
	limit := int(res.Prec) + 64 + 8 // significant bits, and a few for the binary point
	for i, b := range c.Evidence.Brackets {
		for _, end := range []*big.Rat{b.Lo, b.Hi} {
			if end != nil && (end.Num().BitLen() > 2*limit || end.Denom().BitLen() > 2*limit) {
				t.Errorf("bracket %d: end %d/%d bits is not shortened (limit about %d bits)", i, end.Num().BitLen(), end.Denom().BitLen(), limit)
			}
		}
	}
	if err := certify.Check(ctx, c, certify.CheckOptions{Expect: []string{"123"}}); err != nil {
		t.Fatal(err)
	}
}
