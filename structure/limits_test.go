package structure

import (
	"avoidcert/internal/settest"
	"context"
	"errors"
	"strings"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/pattern"
)

// m = 6: the exact test is out of range; the digraph and a bounded search
// still decide what they can, and nothing more is claimed.
func TestLength7IsOutOfRange(t *testing.T) {
	s := settest.Must(t, "1234567")
	rep := analyze(t, s, Options{})
	if rep.Exact || rep.Class != Undecided || rep.Lambda != LambdaPositive || !isCyclicAvoider(s, rep.CyclicAvoider) {
		t.Fatalf("1234567: exact %v class %s lambda %s cyclic %v", rep.Exact, rep.Class, rep.Lambda, rep.CyclicAvoider)
	}
	text := strings.Join(rep.Explanation, "\n")
	for _, want := range []string{"out of range", "necessary for primitivity, not sufficient"} {
		if !strings.Contains(text, want) {
			t.Errorf("1234567: explanation lacks %q:\n%s", want, text)
		}
	}
	// A finite set is still decided exactly: only 1234567 itself avoids 21.
	rep = analyze(t, settest.Must(t, "21,1234567"), Options{})
	if rep.Class != Finite || rep.N1 != 7 {
		t.Errorf("21,1234567: class %s N1 %d, want finite 7", rep.Class, rep.N1)
	}
}

func TestStepLimit(t *testing.T) {
	rep := analyze(t, settest.Must(t, "1234"), Options{MaxSteps: 1}) // exponent 5 needs 2 steps
	if rep.Class != Undecided || rep.Exponent != 0 || len(rep.Sizes) != 2 {
		t.Fatalf("1234 with one step: class %s exponent %d sizes %v", rep.Class, rep.Exponent, rep.Sizes)
	}
	if !strings.Contains(strings.Join(rep.Explanation, "\n"), "step limit") {
		t.Errorf("explanation does not name the step limit: %v", rep.Explanation)
	}
}

func TestCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Analyze(ctx, settest.Must(t, "1234"), Options{}); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled Analyze returned %v", err)
	}
}

// Witnesses of single patterns: each is a permutation of length m+e that
// avoids the pattern and has its joint pattern at the ends. Length 3 and 4
// in full, length 5 for a sample of patterns.
func TestWitnessesOfSinglePatterns(t *testing.T) {
	var ps []pattern.Perm
	ps = append(ps, pattern.All(3)...)
	ps = append(ps, pattern.All(4)...)
	for _, p := range []string{"12345", "13254", "24153", "12453"} {
		q, _ := pattern.Parse(p)
		ps = append(ps, q)
	}
	for _, p := range ps {
		s := pattern.NewSet(p)
		rep := analyze(t, s, Options{Witnesses: true})
		m, w := rep.M, rep.Witnesses
		if w == nil || w.Count() != pattern.Factorial(2*m) {
			t.Fatalf("%v: witnesses %v", p, w)
		}
		pats := members(s)
		for r := range pattern.Factorial(2 * m) {
			q := w.Of(r)
			if len(q) != m+rep.Exponent || !isPerm(q) || !brute.Avoids(q, pats) || pattern.Rank(Joint(q, m)) != r {
				t.Fatalf("%v: witness %v for %v", p, q, pattern.Unrank(2*m, r))
			}
		}
		if w.Of(-1) != nil || w.Of(pattern.Factorial(2*m)) != nil {
			t.Errorf("%v: witness outside the range", p)
		}
	}
	if rep := analyze(t, settest.Must(t, "132"), Options{}); rep.Witnesses != nil {
		t.Error("witnesses kept without Options.Witnesses")
	}
}
