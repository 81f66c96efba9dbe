package structure

import (
	"avoidcert/internal/settest"
	"context"
	"flag"
	"fmt"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

func counts(t testing.TB, s pattern.Set, N int) []*big.Int {
	t.Helper()
	c, err := transfer.Counts(context.Background(), s, N, nil)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// Every single pattern of length 3..5 is primitive. The exponents are
// kept in a golden file; they are invariant under reversal and
// complement (which map R_k onto itself), checked here.
func TestSinglePatternsArePrimitive(t *testing.T) {
	var b strings.Builder
	b.WriteString("# Exponent e of the joint-pattern test (least k with R_k every joint pattern)\n")
	b.WriteString("# for every single pattern of length 3..5. Rewrite: go test ./structure/ -update\n")
	for k := 3; k <= 5; k++ {
		exponent := map[string]int{}
		for _, p := range pattern.All(k) {
			rep := analyze(t, pattern.NewSet(p), Options{})
			if rep.Class != Primitive || rep.Lambda != LambdaPositive {
				t.Fatalf("%v: class %s, lambda %s, want primitive, positive: %v", p, rep.Class, rep.Lambda, rep.Explanation)
			}
			exponent[p.String()] = rep.Exponent
			fmt.Fprintf(&b, "%v %d\n", p, rep.Exponent)
		}
		for _, p := range pattern.All(k) {
			for _, q := range []pattern.Perm{p.Reverse(), p.Complement()} {
				if exponent[q.String()] != exponent[p.String()] {
					t.Errorf("exponent of %v is %d, of its symmetric image %v %d", p, exponent[p.String()], q, exponent[q.String()])
				}
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
		t.Errorf("%s differs from the computed values; rerun with -update if the change is intended.\ngot:\n%s", path, got)
	}
}

// Known sets, each with where its structure comes from.
func TestKnownSets(t *testing.T) {
	tests := []struct {
		set    string
		class  Class
		lambda Lambda
		period int
		n1     int
		// a[n] for n = 0.., when the source gives counts.
		a      func(n int) int64
		source string
	}{
		{set: "123,321", class: Periodic, lambda: LambdaPositive, period: 2,
			a:      func(n int) int64 { return alternating(n) },
			source: "Andre 1879: the avoiders are the alternating permutations, 2 E_n for n >= 2 (OEIS A000111)"},
		{set: "12", class: Subexponential, lambda: LambdaZero,
			a: func(int) int64 { return 1 }, source: "only the decreasing permutation avoids 12"},
		{set: "21", class: Subexponential, lambda: LambdaZero,
			a:      func(int) int64 { return 1 },
			source: "a_n = 1; strongly connected and aperiodic window digraph, yet not primitive (method.md section 5)"},
		{set: "132,231", class: Subexponential, lambda: LambdaZero,
			a:      func(n int) int64 { return 1 << max(n-1, 0) },
			source: "no interior peak: the V-shaped permutations, 2^(n-1) (derived by hand: each of 2..n sits left or right of 1)"},
		{set: "123,231,312,321", class: Subexponential, lambda: LambdaZero,
			source: "method.md 5b: no cyclic avoiders (brute-force run), a_n grows like 2^(n/2)"},
		{set: "123,132,213,231,312,321", class: Finite, lambda: LambdaZero, n1: 3,
			source: "every window of length 3 is forbidden"},
		{set: "123,132,213,231", class: Subexponential, lambda: LambdaZero,
			a:      func(n int) int64 { return map[bool]int64{true: int64(pattern.Factorial(n)), false: 2}[n < 3] },
			source: "windows 312 and 321 only: a decreasing run, possibly closed by one rise, 2 for n >= 3 (derived by hand)"},
		{set: "132,213,231,312", class: Subexponential, lambda: LambdaZero,
			a:      func(n int) int64 { return map[bool]int64{true: int64(pattern.Factorial(n)), false: 2}[n < 3] },
			source: "windows 123 and 321 only: the two monotone permutations"},
	}
	for _, tt := range tests {
		s := settest.Must(t, tt.set)
		rep := analyze(t, s, Options{})
		if rep.Class != tt.class || rep.Lambda != tt.lambda || rep.Period != tt.period || rep.N1 != tt.n1 {
			t.Errorf("%v (%s): class %s lambda %s period %d N1 %d, want %s %s %d %d\n%s",
				s, tt.source, rep.Class, rep.Lambda, rep.Period, rep.N1, tt.class, tt.lambda, tt.period, tt.n1, strings.Join(rep.Explanation, "\n"))
		}
		if tt.a != nil {
			for n, got := range counts(t, s, 14) {
				if !got.IsInt64() || got.Int64() != tt.a(n) {
					t.Errorf("%v (%s): a_%d = %v, want %d", s, tt.source, n, got, tt.a(n))
				}
			}
		}
	}
	// {21}: the window digraph alone would pass it.
	rep := analyze(t, settest.Must(t, "21"), Options{})
	if c := rep.Digraph.Components; len(c) != 1 || c[0].Period != 1 {
		t.Errorf("21: window digraph %+v, want one aperiodic component", c)
	}
	// {123,231,312,321}: strongly connected (period 2), lambda = 0 by the
	// exact automaton, not by the simple case.
	rep = analyze(t, settest.Must(t, "123,231,312,321"), Options{})
	if c := rep.Digraph.Components; len(c) != 1 || len(c[0].Cells) != 2 || c[0].Period != 2 || rep.Digraph.SimpleCycles() {
		t.Errorf("123,231,312,321: window digraph %+v, want one component of both cells with period 2", c)
	}
	// {123,132,213,231}: not primitive because the cell 12 has no way back
	// (the windows are 312: 21 -> 12 and 321: 21 -> 21), so the only cycle
	// is the monotone loop and lambda = 0: subexponential.
	rep = analyze(t, settest.Must(t, "123,132,213,231"), Options{})
	if c := rep.Digraph.Components; len(c) != 2 || !rep.Digraph.SimpleCycles() {
		t.Errorf("123,132,213,231: window digraph %+v, want two single-cell components", c)
	}
}

// alternating returns the number of permutations of 1..n that alternate
// (up-down or down-up): 2 E_n for n >= 2, E_n from OEIS A000111.
func alternating(n int) int64 {
	euler := []int64{1, 1, 1, 2, 5, 16, 61, 272, 1385, 7936, 50521, 353792, 2702765, 22368256, 199360981}
	if n < 2 {
		return 1
	}
	return 2 * euler[n]
}

// checkBrute compares a report with what enumeration up to length maxN
// shows. Enumeration cannot prove the claims about all n; it checks their
// consequences at small lengths, and the witnesses completely.
func checkBrute(t *testing.T, s pattern.Set, rep *Report, maxN int) {
	t.Helper()
	m, pats := rep.M, members(s)
	fail := func(format string, args ...any) {
		t.Helper()
		t.Fatalf("%v (%s): %s\n%s", s, rep.Class, fmt.Sprintf(format, args...), strings.Join(rep.Explanation, "\n"))
	}
	switch rep.Class {
	case Primitive:
		w := rep.Witnesses
		if w == nil || w.Length() != m+rep.Exponent || w.Count() != rep.Domain {
			fail("witnesses missing or of the wrong length")
		}
		n := 0
		w.Each(func(joint int, p pattern.Perm) bool {
			n++
			if len(p) != m+rep.Exponent || !isPerm(p) || !brute.Avoids(p, pats) || pattern.Rank(Joint(p, m)) != joint {
				fail("bad witness %v for joint pattern %v", p, pattern.Unrank(2*m, joint))
			}
			return true
		})
		if n != rep.Domain {
			fail("%d witnesses, domain %d", n, rep.Domain)
		}
		if L := m + rep.Exponent; L <= maxN && len(bruteJoint(s, m, L)) != rep.Domain {
			fail("enumeration at length %d does not realise all %d joint patterns", L, rep.Domain)
		}
		if L := m + rep.Exponent - 1; rep.Exponent > m && L <= maxN && len(bruteJoint(s, m, L)) >= rep.Domain {
			fail("exponent %d is not least: length %d already realises every joint pattern", rep.Exponent, L)
		}
	case Finite:
		a := counts(t, s, rep.N1+1)
		if a[rep.N1-1].Sign() == 0 || a[rep.N1].Sign() != 0 || a[rep.N1+1].Sign() != 0 {
			fail("a_%d..a_%d = %v, want nonzero, 0, 0", rep.N1-1, rep.N1+1, a[rep.N1-1:])
		}
		if rep.N1 <= maxN && brute.Count(rep.N1, pats) != 0 {
			fail("brute force finds avoiders of length N1 = %d", rep.N1)
		}
	case Subexponential:
		for n := 1; n <= maxN; n++ {
			if brute.Count(n, pats) == 0 {
				fail("no avoider of length %d", n)
			}
		}
	case Periodic:
		if p := startPeriod(rep.Digraph); p != rep.Period {
			fail("period %d, the window digraph's is %d", rep.Period, p)
		}
		for L := m + 1; L <= maxN; L++ {
			if L%rep.Period != 0 && bruteCyclic(s, L) != 0 {
				fail("cyclic avoiders of length %d, not a multiple of the period %d", L, rep.Period)
			}
		}
		k0, p := rep.CycleStart, rep.Period
		for k := k0; m+k+p <= maxN; k++ {
			now, later := bruteJoint(s, m, m+k), bruteJoint(s, m, m+k+p)
			if len(now) != len(later) {
				fail("the joint patterns at lengths %d and %d differ", m+k, m+k+p)
			}
			for r := range now {
				if !later[r] {
					fail("the joint patterns at lengths %d and %d differ", m+k, m+k+p)
				}
				if bruteJoint(s, m, m+k+1)[r] {
					fail("joint pattern %v at lengths %d and %d", pattern.Unrank(2*m, r), m+k, m+k+1)
				}
			}
		}
	case Reducible:
		from, to := rep.Unreached.From, rep.Unreached.To
		for n := m + 1; n <= maxN; n++ {
			bruteWalk(s, n, func(p []int) {
				if pattern.Standardize(p[:m]).Equal(from) && pattern.Standardize(p[n-m:]).Equal(to) {
					fail("%v starts in %v and ends in %v", p, from, to)
				}
			})
		}
	default:
		fail("undecided for m = %d", m)
	}
	switch rep.Lambda {
	case LambdaPositive:
		c := rep.CyclicAvoider
		if !isCyclicAvoider(s, c) {
			fail("%v is not a cyclic avoider", c)
		}
		for L := m + 1; L < len(c) && L <= maxN; L++ {
			if bruteCyclic(s, L) != 0 {
				fail("cyclic avoider %v is not of least length: some exist at %d", c, L)
			}
		}
	case LambdaZero:
		for L := m + 1; L <= maxN; L++ {
			if bruteCyclic(s, L) != 0 {
				fail("lambda = 0 claimed, yet cyclic avoiders of length %d exist", L)
			}
		}
	default:
		fail("lambda undecided for m = %d", m)
	}
}

// Every set of patterns of length <= 3, and random sets of length <= 4:
// the classification agrees with enumeration.
func TestClassesAgreeWithBruteForce(t *testing.T) {
	var sets []pattern.Set
	all3 := pattern.All(3)
	for mask := 1; mask < 1<<6; mask++ {
		var ps []pattern.Perm
		for i, p := range all3 {
			if mask&(1<<i) != 0 {
				ps = append(ps, p)
			}
		}
		sets = append(sets, pattern.NewSet(ps...))
		sets = append(sets, pattern.NewSet(append(ps, pattern.Perm{1, 2})...))
	}
	rng := rand.New(rand.NewPCG(2024, 4))
	all4 := pattern.All(4)
	for range 80 {
		var ps []pattern.Perm
		density := rng.Float64()
		for _, p := range all4 {
			if rng.Float64() < density {
				ps = append(ps, p)
			}
		}
		if len(ps) == 0 {
			ps = append(ps, all4[rng.IntN(len(all4))])
		}
		sets = append(sets, pattern.NewSet(ps...))
	}
	for range 20 {
		sets = append(sets, settest.Random(rng, 4, 4))
	}
	// Periodic sets with m = 3 (period 3), found by a random search like
	// the one above.
	for _, arg := range []string{
		"1234,1243,1324,1342,1423,2143,2413,2431,3241,3421,4123,4132,4231,4312,4321",
		"1234,1324,2134,2314,2413,2431,3214,4132,4231,4312,4321",
		"1234,1243,1324,1423,1432,2134,2143,3214,3241,3421,4123,4213,4231,4321",
	} {
		sets = append(sets, settest.Must(t, arg))
	}
	seen := map[Class]int{}
	for _, s := range sets {
		rep := analyze(t, s, Options{Witnesses: true})
		seen[rep.Class]++
		checkBrute(t, s, rep, 8)
	}
	t.Logf("classes: %v", seen)
	for _, c := range []Class{Primitive, Periodic, Reducible, Finite, Subexponential} {
		if seen[c] == 0 {
			t.Errorf("no set of class %s among the %d drawn: %v", c, len(sets), seen)
		}
	}
}
