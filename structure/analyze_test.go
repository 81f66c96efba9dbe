package structure

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"avoidcert/internal/oeistest"
	"avoidcert/internal/settest"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

// Known sets, each with where its structure comes from.
func TestKnownSets(t *testing.T) {
	tests := []struct {
		set       string
		class     Class
		exponent  int // primitive
		period    int // periodic
		n1        int // finite
		lambda    Lambda
		recurrent []string
		source    string
	}{
		{"123", Primitive, 4, 0, 0, LambdaPositive, []string{"(1)", "(12)"}, "docs/prefix-states.md, small cases (prototype)"},
		{"132", Primitive, 3, 0, 0, LambdaPositive, nil, "docs/prefix-states.md, small cases (prototype)"},
		{"1342", Primitive, 4, 0, 0, LambdaPositive, nil, "docs/prefix-states.md, small cases (prototype)"},
		{"1234", Primitive, 5, 0, 0, LambdaPositive, nil, "docs/prefix-states.md, small cases (prototype)"},
		// method note, section 9 (prototype values)
		{"1324", Primitive, 4, 0, 0, LambdaPositive, nil, "method note, section 9 (prototype values)"},
		{"1234567", Primitive, 8, 0, 0, LambdaPositive, nil, "method note, section 9 (prototype values)"},
		{"1234576", Primitive, 7, 0, 0, LambdaPositive, nil, "method note, section 9 (prototype values)"},
		{"1345672", Primitive, 7, 0, 0, LambdaPositive, nil, "method note, section 9 (prototype values)"},
		{"1526374", Primitive, 7, 0, 0, LambdaPositive, nil, "method note, section 9 (prototype values)"},
		{"1265734", Primitive, 7, 0, 0, LambdaPositive, nil, "method note, section 9 (prototype values)"},
		{"2143657", Primitive, 7, 0, 0, LambdaPositive, nil, "method note, section 9 (prototype values)"},
		{"1324657", Primitive, 7, 0, 0, LambdaPositive, nil, "method note, section 9 (prototype values)"},
		{"1423,2413,3412,4123,4312", Primitive, 4, 0, 0, LambdaPositive, []string{"(12)", "(132)", "(231)", "(321)"}, "method note, section 9 (prototype values)"},
		{"132,1234,3421,4321", Primitive, 8, 0, 0, LambdaPositive, []string{"(12)", "(123)", "(231)"}, "method note, section 9 (prototype values)"},
		// The alternating permutations (Andre 1879): the states alternate
		// between rises and falls.
		{"123,321", Periodic, 0, 2, 0, LambdaPositive, []string{"(12)", "(21)"}, "method note, section 6; docs/prefix-states.md (joint cycle (3, 2))"},
		{"12", Subexponential, 0, 0, 0, LambdaZero, []string{"(1)"}, "a_n = 1 (only the decreasing permutation avoids 12)"},
		// Method note 5b: no cyclic avoider (brute force up to L = 9).
		{"132,231", Subexponential, 0, 0, 0, LambdaZero, nil, "method note, section 5b"},
		{"123,231,312,321", Subexponential, 0, 0, 0, LambdaZero, []string{"(12)", "(21)"}, "method note, section 5b"},
		{"132,213,231,312", Subexponential, 0, 0, 0, LambdaZero, nil, "method note, section 5b"},
		{"123,132,213,231", Subexponential, 0, 0, 0, LambdaZero, nil, "method note, section 5b"},
		{"12,21", Finite, 0, 0, 2, LambdaZero, []string{}, "a_2 = 0: every pair of values rises or falls"},
		{"1", Finite, 0, 0, 1, LambdaZero, []string{}, "a_1 = 0: every single value has the pattern 1"},
		{"21,1234567", Finite, 0, 0, 7, LambdaZero, []string{}, "a_n = 1 for n <= 6, 0 from 7 (only the increasing permutation avoids 21)"},
	}
	for _, tc := range tests {
		rep := analyze(t, settest.Must(t, tc.set), Options{})
		if rep.Class != tc.class || rep.Exponent != tc.exponent || rep.Period != tc.period || rep.N1 != tc.n1 || rep.Lambda != tc.lambda {
			t.Errorf("{%s} (%s): class %s exponent %d period %d N1 %d lambda %s, want %s %d %d %d %s",
				tc.set, tc.source, rep.Class, rep.Exponent, rep.Period, rep.N1, rep.Lambda, tc.class, tc.exponent, tc.period, tc.n1, tc.lambda)
		}
		if tc.recurrent != nil {
			var got []string
			for _, p := range rep.Recurrent {
				got = append(got, StateName(rep.States, p))
			}
			if !slices.Equal(got, tc.recurrent) && (len(got) > 0 || len(tc.recurrent) > 0) {
				t.Errorf("{%s}: recurrent states %v, want %v", tc.set, got, tc.recurrent)
			}
		}
		if rep.Lambda == LambdaPositive && !isCyclicAvoider(rep.Set, rep.CyclicAvoider) {
			t.Errorf("{%s}: %v is not a cyclic avoider", tc.set, rep.CyclicAvoider)
		}
	}
}

// {123, 321}: the joint cycle starts at k = 3 with length 2
// (docs/prefix-states.md), and the counts are those of the alternating
// permutations, 2 E_n for n >= 2 (OEIS A001250), whose growth alternates
// between the two classes of states.
func TestAlternatingIsPeriodic(t *testing.T) {
	s := settest.Must(t, "123,321")
	rep := analyze(t, s, Options{})
	if rep.Class != Periodic || rep.Period != 2 || rep.CycleStart != 3 || rep.CycleLength != 2 {
		t.Fatalf("{123,321}: class %s period %d joint cycle (%d, %d), want periodic 2 (3, 2)", rep.Class, rep.Period, rep.CycleStart, rep.CycleLength)
	}
	tab := oeistest.Read(t, "A001250")
	counts, err := transfer.Counts(context.Background(), s, len(tab.Terms)-1+tab.Offset, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, want := range tab.Terms {
		if n := tab.Offset + i; counts[n].Cmp(want) != 0 {
			t.Errorf("{123,321}: a_%d = %v, OEIS A001250 has %v", n, counts[n], want)
		}
	}
	// Periodic: cyclic avoiders only of even length (method note 5b).
	if len(rep.CyclicAvoider)%2 != 0 {
		t.Errorf("{123,321}: cyclic avoider %v of odd length", rep.CyclicAvoider)
	}
}

// A set of period 3, our own construction: forbidding 321 (two descents
// in a row), 1234 (three ascents) and every pattern of length 4 that
// descends, ascends and descends (2143, 3142, 3241, 4132, 4231) leaves the
// sequences whose rises and descents repeat up, up, down. The structure
// test finds period 3, and a brute-force search over every permutation
// (the definition of a cyclic avoider, method note 5b) finds cyclic
// avoiders only at lengths divisible by 3.
func TestPeriodThree(t *testing.T) {
	s := settest.Must(t, "321,1234,2143,3142,3241,4132,4231")
	rep := analyze(t, s, Options{})
	if rep.Class != Periodic || rep.Period != 3 || rep.Lambda != LambdaPositive {
		t.Fatalf("class %s period %d lambda %s, want periodic 3, positive: %v", rep.Class, rep.Period, rep.Lambda, rep.Explanation)
	}
	if len(rep.CyclicAvoider)%3 != 0 {
		t.Errorf("cyclic avoider %v of length %d, not a multiple of 3", rep.CyclicAvoider, len(rep.CyclicAvoider))
	}
	for L := 4; L <= 8; L++ {
		if n := cyclicAvoiders(s, L); (n > 0) != (L%3 == 0) {
			t.Errorf("%d cyclic avoiders of length %d", n, L)
		}
	}
}

// For {123, 231, 312, 321} the configuration of R_0 at state (12) is
// closable but its period 2 is below w = 3 (docs/prefix-states.md): it
// must not count, and lambda = 0.
func TestShortClosingDoesNotCount(t *testing.T) {
	s := settest.Must(t, "123,231,312,321")
	d := newStateDigraph(transfer.NewStates(s))
	sp := newSpace(d)
	st := d.st.Index(pattern.Perm{1, 2})
	if !sp.closable(sp.start(st)) {
		t.Fatal("the R_0 configuration of (12) is not closable")
	}
	if rep := analyze(t, s, Options{}); rep.Lambda != LambdaZero || rep.Class != Subexponential {
		t.Errorf("class %s lambda %s, want subexponential, zero", rep.Class, rep.Lambda)
	}
}

// Every single pattern of length 3..6 is decided: primitive, with lambda >
// 0 and a cyclic avoider. The exponents are kept in a golden file; the
// complement maps the states of a pattern onto those of its complement
// and so keeps the exponent (checked here; the reverse need not, as
// prefix states are not symmetric in time).
func TestSinglePatternsArePrimitive(t *testing.T) {
	var b strings.Builder
	b.WriteString("# Primitivity exponent e (least k with R_k = D, on prefix states) of every\n")
	b.WriteString("# single pattern of length 3..6. Rewrite: go test ./structure/ -run SinglePatterns -update\n")
	for k := 3; k <= 6; k++ {
		exponent := map[string]int{}
		for _, p := range pattern.All(k) {
			rep := analyze(t, pattern.NewSet(p), Options{})
			if rep.Class != Primitive || rep.Lambda != LambdaPositive || !isCyclicAvoider(rep.Set, rep.CyclicAvoider) {
				t.Fatalf("%v: class %s, lambda %s, avoider %v, want primitive, positive: %v", p, rep.Class, rep.Lambda, rep.CyclicAvoider, rep.Explanation)
			}
			exponent[p.String()] = rep.Exponent
			fmt.Fprintf(&b, "%v %d\n", p, rep.Exponent)
		}
		for _, p := range pattern.All(k) {
			if q := p.Complement(); exponent[q.String()] != exponent[p.String()] {
				t.Errorf("exponent of %v is %d, of its complement %v %d", p, exponent[p.String()], q, exponent[q.String()])
			}
		}
	}
	golden(t, "exponents.golden", b.String())
}

func golden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./structure/ -update to create it)", err)
	}
	if string(want) != got {
		t.Errorf("%s differs from the computed values; rerun with -update if the change is intended", path)
	}
}

// The blocks of a reducible set and their canonical order: {132, 231}
// has the blocks {(1)} and {(12)} (method note, section 5b: a_n =
// 2^(n-1)); with lambda = 0 it is subexponential, and the blocks are
// still reported.
func TestBlocks(t *testing.T) {
	rep := analyze(t, settest.Must(t, "132,231"), Options{})
	var got []string
	for _, b := range rep.Blocks {
		var names []string
		for _, p := range b {
			names = append(names, StateName(rep.States, p))
		}
		got = append(got, strings.Join(names, " "))
	}
	if !slices.Equal(got, []string{"(1)", "(12)"}) {
		t.Errorf("{132,231}: blocks %q, want (1) and (12)", got)
	}
}

// The explanation names the recurrent and transient states and the
// exponent as what it is.
func TestExplanation(t *testing.T) {
	rep := analyze(t, settest.Must(t, "123,321"), Options{})
	text := strings.Join(rep.Explanation, "\n")
	for _, want := range []string{"recurrent: (12), (21)", "transient: (), (1)", "period 2"} {
		if !strings.Contains(text, want) {
			t.Errorf("{123,321}: explanation lacks %q:\n%s", want, text)
		}
	}
	rep = analyze(t, settest.Must(t, "1342"), Options{})
	if text := strings.Join(rep.Explanation, "\n"); !strings.Contains(text, "primitivity exponent k = 4") {
		t.Errorf("{1342}: explanation lacks the exponent:\n%s", text)
	}
}

func TestStepLimit(t *testing.T) {
	rep := analyze(t, settest.Must(t, "1234"), Options{MaxSteps: 3}) // exponent 5
	if rep.Class != Undecided || rep.Exponent != 0 || len(rep.Sizes) != 4 {
		t.Fatalf("1234 with three steps: class %s exponent %d sizes %v", rep.Class, rep.Exponent, rep.Sizes)
	}
	if !strings.Contains(strings.Join(rep.Explanation, "\n"), "step limit") {
		t.Errorf("explanation does not name the step limit: %v", rep.Explanation)
	}
	// A closable configuration found before the limit still proves lambda > 0.
	if rep.Lambda != LambdaPositive {
		t.Errorf("1234 with three steps: lambda %s", rep.Lambda)
	}
}

func TestBudget(t *testing.T) {
	s := settest.Must(t, "123456789")
	cost := Estimate(transfer.NewStates(s), Options{})
	if cost.Configurations != 48602 { // docs/prefix-states.md: |D| for a pattern of length 9
		t.Errorf("|D| of 123456789 is %d, want 48602", cost.Configurations)
	}
	_, err := Analyze(context.Background(), s, Options{MaxMemory: cost.Memory - 1})
	var be *BudgetError
	if !errors.Is(err, ErrBudget) || !errors.As(err, &be) || be.Cost != cost {
		t.Fatalf("under the estimate: %v", err)
	}
	if !strings.Contains(err.Error(), "memory budget") {
		t.Errorf("message %q does not name the budget", err)
	}
}

// A run that would need more sets R_k than the budget holds stops with a
// *BudgetError that says how far it got.
func TestBudgetDuringRun(t *testing.T) {
	s := settest.Must(t, "1234") // exponent 5: R_0 .. R_5
	d := newStateDigraph(transfer.NewStates(s))
	cost := estimate(d, Options{})
	_, err := runJoint(context.Background(), newSpace(d), MaxSteps, false, cost, cost.Fixed+3*cost.PerStep)
	var be *BudgetError
	if !errors.As(err, &be) || be.Steps != 3 || !errors.Is(err, ErrBudget) {
		t.Fatalf("a budget of three sets: %v", err)
	}
	if !strings.Contains(err.Error(), "R_0 .. R_2") {
		t.Errorf("message %q does not say how far the test got", err)
	}
	if _, err := runJoint(context.Background(), newSpace(d), MaxSteps, false, cost, cost.Fixed+6*cost.PerStep); err != nil {
		t.Errorf("a budget of six sets: %v", err)
	}
}

func TestCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Analyze(ctx, settest.Must(t, "1234"), Options{}); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled Analyze returned %v", err)
	}
}

// Every symmetry class of length 7 (1272, method note section 6 and
// docs/census-7.md) is decided: primitive with lambda > 0. The method note
// (section 9) saw exponents 7 and 8 on the patterns it tried; the test
// asserts that range for all of them, and that 1234567 has 8.
func TestLength7ClassesAreDecided(t *testing.T) {
	if testing.Short() {
		t.Skip("1272 classes; run without -short")
	}
	classes := pattern.SymmetryClasses(7)
	if len(classes) != 1272 {
		t.Fatalf("%d symmetry classes of length 7, want 1272", len(classes))
	}
	byExponent := map[int]int{}
	for _, c := range classes {
		rep := analyze(t, pattern.NewSet(c.Representative), Options{})
		if rep.Class != Primitive || rep.Lambda != LambdaPositive || rep.Exponent < 7 || rep.Exponent > 8 {
			t.Fatalf("%v: class %s exponent %d lambda %s", c.Representative, rep.Class, rep.Exponent, rep.Lambda)
		}
		byExponent[rep.Exponent]++
	}
	t.Logf("length 7: exponents %v", byExponent)
}
