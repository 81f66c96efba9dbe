package celltransfer_test

import (
	"avoidcert/internal/settest"
	"math/big"
	"math/rand/v2"
	"slices"
	"testing"

	"avoidcert/pattern"
)

func sameCounts(a, b []*big.Int) bool {
	return slices.EqualFunc(a, b, func(x, y *big.Int) bool { return x.Cmp(y) == 0 })
}

// Reversal, complement and reverse-complement preserve a_n (method note,
// section 1): checked on random sets and on every single pattern of
// length 4 and 5, to n = 12.
func TestCountsInvariantUnderSymmetries(t *testing.T) {
	var sets []pattern.Set
	rng := rand.New(rand.NewPCG(41, 42))
	for range 40 {
		sets = append(sets, settest.Random(rng, 6, 5))
	}
	for k := 4; k <= 5; k++ {
		for _, p := range pattern.All(k) {
			sets = append(sets, pattern.NewSet(p))
		}
	}
	for _, s := range sets {
		images := s.Symmetric()
		want := counts(t, s, 12)
		for _, img := range images[1:] {
			if got := counts(t, img, 12); !sameCounts(got, want) {
				t.Fatalf("{%v} has counts %v, its image {%v} has %v", s, want, img, got)
			}
		}
	}
}

// firstDifference returns the least n with a_n(s) != a_n(s.Inverse()) for
// n <= N, or -1.
func firstDifference(t *testing.T, s pattern.Set, N int) int {
	a, b := counts(t, s, N), counts(t, s.Inverse(), N)
	for n := range a {
		if a[n].Cmp(b[n]) != 0 {
			return n
		}
	}
	return -1
}

// Inversion is not a symmetry of consecutive-pattern avoidance. Among the
// single patterns of length 4, search for those whose inverse has other
// counts; the pinned case is 1342, whose inverse is 1423.
func TestInverseIsNotASymmetry(t *testing.T) {
	var differ []string
	for _, p := range pattern.All(4) {
		if firstDifference(t, pattern.NewSet(p), 10) >= 0 {
			differ = append(differ, p.String())
		}
	}
	t.Logf("single patterns of length 4 whose inverse has other counts (n <= 10): %v", differ)
	if !slices.Contains(differ, "1342") {
		t.Errorf("search did not find 1342 among %v", differ)
	}
	// No pattern of length 3 differs: each one's inverse is itself or in
	// its class (231 and 312 are reverse-complements).
	for _, p := range pattern.All(3) {
		if n := firstDifference(t, pattern.NewSet(p), 10); n >= 0 {
			t.Errorf("%v and its inverse differ at n=%d", p, n)
		}
	}

	// Pinned: OEIS A117156 (1342) has a(6) = 630, OEIS A201692 (1423) has
	// a(6) = 631, and the two agree below n = 6.
	s := settest.Must(t, "1342")
	if inv := s.Inverse().String(); inv != "1423" {
		t.Fatalf("inverse of 1342 = %s, want 1423", inv)
	}
	if n := firstDifference(t, s, 8); n != 6 {
		t.Errorf("1342 and 1423: first difference at n=%d, want 6", n)
	}
	a, b := counts(t, s, 6), counts(t, s.Inverse(), 6)
	if a[6].Int64() != 630 || b[6].Int64() != 631 {
		t.Errorf("a_6(1342) = %v, a_6(1423) = %v; OEIS A117156 and A201692 have 630 and 631", a[6], b[6])
	}
}
