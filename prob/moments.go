package prob

import (
	"math/big"

	"avoidcert/pattern"
)

// The mean and variance of the number X of matching windows in N i.i.d.
// continuous draws, in closed form (derivation in docs/series.md).
//
// X is a sum of indicators I(m, i): member m matches the window of its
// length k_m that starts at draw i. Every order of distinct draws is equally
// likely, so E I(m, i) = 1/k_m! and, by linearity,
//
//	E X = sum over members m of (N - k_m + 1)^+ / k_m!.
//
// Two indicators are independent unless their windows share a draw. When
// the window of member a at i and of member b at j = i + d overlap
// (-k_b < d < k_a), they cover s = max(k_a, d + k_b) - min(0, d)
// consecutive draws, and E[I(a, i) I(b, j)] = c/s!, where c counts the
// permutations of 1..s whose window at offset max(0, -d) has the pattern a
// and whose window at offset max(0, d) has the pattern b (an overlap of a
// with b: c = 0 when they order the shared draws differently, c = 1 for
// a = b, d = 0). Such a pair of windows fits N - s + 1 times into N draws,
// so
//
//	Var X = sum over members a, b and overlapping d of
//	        (N - s + 1)^+ (c/s! - 1/(k_a! k_b!)).
//
// For one pattern of length k and N >= 2k - 1 every overlap fits and Var X
// is linear in N. Counts of the t interleaved subsequences of a delay t are
// independent, so their means and variances add.

// Moments are the exact mean and variance of the number of matching windows.
type Moments struct {
	Mean, Variance *big.Rat
}

// WindowMoments returns the mean and variance of the number of windows of N
// i.i.d. continuous draws that match a member of set (each window of each
// member's length counted once).
func WindowMoments(set pattern.Set, N int) Moments {
	ms := set.Patterns()
	mean, variance := new(big.Rat), new(big.Rat)
	for _, a := range ms {
		if fits := N - len(a) + 1; fits > 0 {
			mean.Add(mean, big.NewRat(int64(fits), int64(pattern.Factorial(len(a)))))
		}
		for _, b := range ms {
			indep := new(big.Rat).SetFrac64(1, int64(pattern.Factorial(len(a))*pattern.Factorial(len(b))))
			for d := -(len(b) - 1); d <= len(a)-1; d++ {
				s, c := overlap(a, b, d)
				fits := N - s + 1
				if fits <= 0 {
					continue
				}
				term := new(big.Rat).SetFrac64(c, int64(pattern.Factorial(s)))
				term.Sub(term, indep)
				variance.Add(variance, term.Mul(term, big.NewRat(int64(fits), 1)))
			}
		}
	}
	return Moments{Mean: mean, Variance: variance}
}

// InterleavedMoments returns the moments of the total count over
// subsequences of the given lengths (a delay: Interleave), which are
// independent, so means and variances add.
func InterleavedMoments(set pattern.Set, lengths []int) Moments {
	sum := Moments{Mean: new(big.Rat), Variance: new(big.Rat)}
	for _, n := range lengths {
		m := WindowMoments(set, n)
		sum.Mean.Add(sum.Mean, m.Mean)
		sum.Variance.Add(sum.Variance, m.Variance)
	}
	return sum
}

// Interleave returns the lengths of the t subsequences x_r, x_(r+t), ...
// (r = 0..t-1) of N draws: with delay t, a window x_i, x_(i+t), ...,
// x_(i+(k-1)t) is a window of consecutive entries of one of them.
func Interleave(N, t int) []int {
	out := make([]int, t)
	for r := range out {
		if N > r {
			out[r] = (N - r + t - 1) / t
		}
	}
	return out
}

// overlap returns the span s of the windows of a at offset 0 and of b at
// offset d, and the number of permutations of 1..s in which both match.
// Both windows order the draws of their positions as chains (by value); a
// permutation in which both match assigns the values 1..s so that each chain
// increases, and counting such assignments smallest value first is a walk
// through the two chains: the next value goes to the next position of
// chain a if no window of b holds it, to the next of chain b likewise, or to
// a shared position when it is next in both.
func overlap(a, b pattern.Perm, d int) (span int, count int64) {
	oa, ob := max(0, -d), max(0, d)
	span = max(oa+len(a), ob+len(b)) - min(oa, ob)
	chain := func(p pattern.Perm, off int) []int {
		c := make([]int, len(p))
		for i, v := range p {
			c[v-1] = off + i
		}
		return c
	}
	ca, cb := chain(a, oa), chain(b, ob)
	inA := func(pos int) bool { return pos >= oa && pos < oa+len(a) }
	inB := func(pos int) bool { return pos >= ob && pos < ob+len(b) }
	f := make([][]int64, len(ca)+1)
	for i := range f {
		f[i] = make([]int64, len(cb)+1)
	}
	f[0][0] = 1
	for i := 0; i <= len(ca); i++ {
		for j := 0; j <= len(cb); j++ {
			w := f[i][j]
			if w == 0 {
				continue
			}
			switch {
			case i < len(ca) && j < len(cb) && ca[i] == cb[j]:
				f[i+1][j+1] += w
			default:
				if i < len(ca) && !inB(ca[i]) {
					f[i+1][j] += w
				}
				if j < len(cb) && !inA(cb[j]) {
					f[i][j+1] += w
				}
			}
		}
	}
	return span, f[len(ca)][len(cb)]
}
