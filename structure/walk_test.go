package structure

import (
	"avoidcert/internal/settest"
	"context"
	"math"
	"math/rand/v2"
	"testing"
)

func cyclicCount(t *testing.T, set string, L int) int64 {
	t.Helper()
	n, err := CyclicAvoiders(context.Background(), settest.Must(t, set), L)
	if err != nil {
		t.Fatal(err)
	}
	return n
}

// CyclicAvoiders against enumeration of every permutation of 1..L.
func TestCyclicAvoidersMatchBruteForce(t *testing.T) {
	sets := []string{"123", "132", "123,321", "1324", "2413", "123,2143", "12,2341", "1234,4321"}
	rng := rand.New(rand.NewPCG(9, 9))
	for range 10 {
		sets = append(sets, settest.Random(rng, 6, 4).String())
	}
	for _, set := range sets {
		s := settest.Must(t, set)
		for L := s.Window(); L <= 8; L++ {
			if got, want := cyclicCount(t, set, L), bruteCyclic(s, L); got != int64(want) {
				t.Errorf("%v: %d cyclic avoiders of length %d, enumeration counts %d", s, got, L, want)
			}
		}
	}
	if _, err := CyclicAvoiders(context.Background(), settest.Must(t, "1234"), 3); err == nil {
		t.Error("length 3 for a window of 4 was accepted")
	}
}

// The counts of method.md section 5b, which come from a brute-force run.
func TestCyclicAvoidersMethodNote(t *testing.T) {
	tests := []struct {
		set  string
		from int
		want []int64
	}{
		{"123", 3, []int64{3, 12, 45, 234, 1323}},
		{"123,321", 3, []int64{0, 8, 0, 96, 0, 2176}},
		{"123,231,312,321", 3, []int64{0, 0, 0, 0, 0, 0, 0}},
		{"132,231", 3, []int64{0, 0, 0, 0, 0, 0, 0}},
		{"132,213,231,312", 3, []int64{0, 0, 0, 0, 0, 0, 0}},
		{"123,132,213,231", 3, []int64{0, 0, 0, 0, 0, 0, 0}},
	}
	for _, tt := range tests {
		for i, want := range tt.want {
			if got := cyclicCount(t, tt.set, tt.from+i); got != want {
				t.Errorf("%s: %d cyclic avoiders of length %d, method.md 5b lists %d", tt.set, got, tt.from+i, want)
			}
		}
	}
}

// OEIS A232864, offset 0: permutations of n not cyclically containing
// 123, every rotation counted separately (its a(4) = 12 is 3 permutations
// times 4 rotations). That is our count for n >= 3 = m+1; below that a
// cyclic window of length 3 would repeat an entry and we do not define
// it.
var a232864 = []int64{1, 1, 2, 3, 12, 45, 234, 1323, 8856, 65529, 543510, 4937031, 49030596,
	526930677, 6101871426, 75686176035, 1001517264432}

// The trace identity for 123: the eigenvalues of T are c/(3j+1), j in Z,
// c = 3 sqrt(3)/(2 pi) (the reciprocal poles of the EGF, Elizalde-Noy
// 2003), so L! sum_j (c/(3j+1))^L = L! tr(T^L) counts the cyclic
// 123-avoiders of length L (method.md 5b; OEIS A232864 states the same
// formula for n >= 2).
func TestTraceIdentity123(t *testing.T) {
	c := 3 * math.Sqrt(3) / (2 * math.Pi)
	for L := 3; L < len(a232864); L++ {
		fact := 1.0
		for i := 2; i <= L; i++ {
			fact *= float64(i) // exact: L! < 2^53
		}
		// Terms with |j| > J: |3j+1| >= 3|j|-1, so their sum is at most
		// 2 integral_J^inf (c/(3x-1))^L dx = 2 c^L / (3 (L-1) (3J-1)^(L-1)).
		// Take the least J that makes L! times that below 1e-3.
		J := 1
		tail := func(J int) float64 {
			return 2 * math.Pow(c, float64(L)) / (3 * float64(L-1) * math.Pow(float64(3*J-1), float64(L-1)))
		}
		for fact*tail(J) > 1e-3 {
			J++
		}
		sum, abs := 0.0, 0.0
		add := func(j int) {
			term := math.Pow(c/float64(3*j+1), float64(L))
			sum += term
			abs += math.Abs(term)
		}
		for j := J; j >= 1; j-- { // small terms first
			add(j)
			add(-j)
		}
		add(0)
		// Rounding: c carries a relative error of a few ulps, raised to
		// the L-th power about L times that (allow 4L ulps); summing 2J+1
		// terms adds at most (2J+1) ulps of sum |term|; the product with
		// L! one more ulp.
		eps := math.Pow(2, -52)
		tol := fact*tail(J) + fact*abs*eps*float64(4*L+2*J+2)
		if tol >= 0.5 {
			t.Fatalf("L = %d: tolerance %g does not decide the integer", L, tol)
		}
		got := fact * sum
		if math.Abs(got-float64(a232864[L])) > tol {
			t.Errorf("L = %d: L! sum = %.6f, A232864 = %d (tolerance %g)", L, got, a232864[L], tol)
		}
		if L <= 10 {
			if n := cyclicCount(t, "123", L); n != a232864[L] {
				t.Errorf("L = %d: %d cyclic 123-avoiders, A232864 = %d", L, n, a232864[L])
			}
		}
	}
}
