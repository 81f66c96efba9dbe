package pattern_test

import (
	"avoidcert/internal/settest"
	"math/rand/v2"
	"slices"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/pattern"
)

func TestNewSetIsSortedAndIrredundant(t *testing.T) {
	given := pattern.NewSet(mustPerm(t, "1234"), mustPerm(t, "123"), mustPerm(t, "1234")).Given()
	if !slices.Equal(given, []string{"1234", "123", "1234"}) {
		t.Errorf("NewSet(1234, 123, 1234).Given() = %v, want the arguments in order", given)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for range 300 {
		s := settest.Random(rng, 6, 5)
		ps := s.Patterns()
		for i := 1; i < len(ps); i++ {
			if !ps[i-1].Less(ps[i]) {
				t.Fatalf("%v: members not strictly sorted", s)
			}
		}
		for _, p := range ps {
			for _, q := range ps {
				if len(q) < len(p) && pattern.Contains(p, q) {
					t.Fatalf("%v: member %v contains member %v", s, p, q)
				}
			}
		}
		for _, d := range s.Dropped() {
			if d.Inside == nil {
				if !slices.ContainsFunc(ps, d.Pattern.Equal) {
					t.Fatalf("%v: duplicate %v dropped but not kept once", s, d.Pattern)
				}
			} else if !slices.ContainsFunc(ps, d.Inside.Equal) || !pattern.Contains(d.Pattern, d.Inside) {
				t.Fatalf("%v: %v dropped as containing %v, which is not a member it contains", s, d.Pattern, d.Inside)
			}
		}
		if len(ps)+len(s.Dropped()) != len(s.Given()) {
			t.Fatalf("%v: %d kept + %d dropped != %d given", s, len(ps), len(s.Dropped()), len(s.Given()))
		}
	}
}

// Avoids is checked permutation by permutation against the brute-force
// reference, which compares windows pairwise.
func TestAvoidsMatchesBruteForce(t *testing.T) {
	check := func(s pattern.Set, n int) {
		t.Helper()
		ref := s.Patterns()
		for _, p := range pattern.All(n) {
			if got, want := s.Avoids(p), brute.Avoids(p, ref); got != want {
				t.Fatalf("%v: Avoids(%v) = %v, brute force says %v", s, p, got, want)
			}
		}
	}
	for k := 1; k <= 4; k++ {
		for _, p := range pattern.All(k) {
			for n := 0; n <= 6; n++ {
				check(pattern.NewSet(p), n)
			}
		}
	}
	rng := rand.New(rand.NewPCG(3, 4))
	for range 40 {
		check(settest.Random(rng, 6, 5), 7)
	}
}

// OEIS A262480: number of trivial c-Wilf classes of S_n (classes under
// reversal and complement), a(0..8).
var symmetryClassCounts = []int{1, 1, 1, 2, 8, 32, 192, 1272, 10176}

func TestSymmetryClasses(t *testing.T) {
	for k, want := range symmetryClassCounts {
		classes := pattern.SymmetryClasses(k)
		if len(classes) != want {
			t.Errorf("SymmetryClasses(%d): %d classes, OEIS A262480 has %d", k, len(classes), want)
		}
		owner := make(map[string]int) // member -> class index
		for ci, c := range classes {
			if ci > 0 && !classes[ci-1].Representative.Less(c.Representative) {
				t.Fatalf("k=%d: classes not ordered by representative", k)
			}
			if !c.Representative.Equal(c.Members[0]) {
				t.Fatalf("k=%d: representative %v is not the least member of %v", k, c.Representative, c.Members)
			}
			for i, p := range c.Members {
				if i > 0 && !c.Members[i-1].Less(p) {
					t.Fatalf("k=%d: members %v not sorted and distinct", k, c.Members)
				}
				if prev, dup := owner[p.String()]; dup {
					t.Fatalf("k=%d: %v is in classes %d and %d", k, p, prev, ci)
				}
				owner[p.String()] = ci
			}
		}
		if len(owner) != pattern.Factorial(k) {
			t.Fatalf("k=%d: classes cover %d permutations, want all %d", k, len(owner), pattern.Factorial(k))
		}
		// closed under the symmetries: an image lies in the same class
		for _, p := range pattern.All(k) {
			for _, q := range []pattern.Perm{p.Reverse(), p.Complement(), p.Reverse().Complement()} {
				if owner[q.String()] != owner[p.String()] {
					t.Fatalf("k=%d: %v and its image %v are in different classes", k, p, q)
				}
			}
		}
	}
	// the two classes of length 3 (OEIS A262480 %C names them)
	got := pattern.SymmetryClasses(3)
	if got[0].Representative.String() != "123" || len(got[0].Members) != 2 ||
		got[1].Representative.String() != "132" || len(got[1].Members) != 4 {
		t.Errorf("classes of length 3 = %v, want {123, 321} and {132, 213, 231, 312}", got)
	}
}

func TestCanonical(t *testing.T) {
	var sets []pattern.Set
	for k := 1; k <= 5; k++ {
		for _, p := range pattern.All(k) {
			sets = append(sets, pattern.NewSet(p))
		}
	}
	three := pattern.All(3)
	for i := range three {
		for j := i + 1; j < len(three); j++ {
			sets = append(sets, pattern.NewSet(three[i], three[j]))
		}
	}
	rng := rand.New(rand.NewPCG(7, 8))
	for range 200 {
		sets = append(sets, settest.Random(rng, 6, 5))
	}
	for _, s := range sets {
		c := s.Canonical()
		images := s.Symmetric()
		if !images[0].Equal(s) {
			t.Fatalf("Symmetric()[0] = %v, want %v itself", images[0], s)
		}
		found := false
		for _, img := range images {
			if !img.Canonical().Equal(c) {
				t.Fatalf("%v: canonical %v, but its image %v has canonical %v", s, c, img, img.Canonical())
			}
			found = found || img.Equal(c)
		}
		if !found {
			t.Fatalf("%v: canonical %v is none of its images %v", s, c, images)
		}
		if !c.Canonical().Equal(c) {
			t.Fatalf("%v: canonical %v is not its own canonical", s, c)
		}
	}
	// a single pattern's canonical set is its class representative
	for k := 1; k <= 6; k++ {
		for _, cl := range pattern.SymmetryClasses(k) {
			for _, p := range cl.Members {
				if got := pattern.NewSet(p).Canonical().String(); got != cl.Representative.String() {
					t.Fatalf("canonical of %v = %s, want the class representative %v", p, got, cl.Representative)
				}
			}
		}
	}
}

func TestSetSymmetriesAndInverse(t *testing.T) {
	s := settest.Must(t, "1342,213")
	tests := []struct {
		name string
		got  pattern.Set
		want string
	}{
		{"reverse", s.Reverse(), "312,2431"},
		{"complement", s.Complement(), "231,4213"},
		{"reverse-complement", s.ReverseComplement(), "132,3124"},
		{"inverse", s.Inverse(), "213,1423"},
	}
	for _, tc := range tests {
		if tc.got.String() != tc.want {
			t.Errorf("%s of %v = %v, want %s", tc.name, s, tc.got, tc.want)
		}
	}
	if s.Window() != 4 || settest.Must(t, "1").Window() != 1 {
		t.Error("Window must be the length of the longest member")
	}
}
