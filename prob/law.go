package prob

import (
	"context"
	"fmt"
	"math"
	"math/big"

	"avoidcert/pattern"
)

// Law is the exact distribution of a number of matching windows, known for
// the counts 0..J: Ways[j] of Total equally likely cases have exactly j.
// The cases are the orders of the draws: N! for one sequence, the product
// of the subsequences' factorials for a delay.
type Law struct {
	Ways  []*big.Int
	Total *big.Int
}

// J is the largest count the law knows.
func (l Law) J() int { return len(l.Ways) - 1 }

// AtMost returns P(count <= x) exactly; x must be at most J.
func (l Law) AtMost(x int) *big.Rat {
	if x > l.J() {
		panic(fmt.Sprintf("prob: P(count <= %d) asked of a law known to %d", x, l.J()))
	}
	sum := new(big.Int)
	for j := 0; j <= x && j <= l.J(); j++ {
		sum.Add(sum, l.Ways[j])
	}
	return new(big.Rat).SetFrac(sum, l.Total)
}

// AtLeast returns P(count >= x) = 1 - P(count <= x-1) exactly; x must be
// at most J+1.
func (l Law) AtLeast(x int) *big.Rat {
	if x <= 0 {
		return big.NewRat(1, 1)
	}
	return new(big.Rat).Sub(big.NewRat(1, 1), l.AtMost(x-1))
}

// Central returns the central range [lo, hi] of level 1-2*tail: lo is the
// largest count with P(count < lo) <= tail and hi the smallest with
// P(count > hi) <= tail, so P(lo <= count <= hi) >= 1 - 2*tail
// (0 < tail < 1/2). ok is false when the law does not reach hi.
func (l Law) Central(tail *big.Rat) (lo, hi int, ok bool) {
	upper := new(big.Rat).Sub(big.NewRat(1, 1), tail)
	sum := new(big.Int)
	lo = -1
	for j := 0; j <= l.J(); j++ {
		sum.Add(sum, l.Ways[j])
		F := new(big.Rat).SetFrac(sum, l.Total)
		if lo < 0 && F.Cmp(tail) > 0 {
			lo = j
		}
		if F.Cmp(upper) >= 0 {
			return lo, j, true
		}
	}
	return 0, 0, false
}

// convolve returns the law of the sum of two independent counts, known to
// the smaller J of the two.
func convolve(a, b Law) Law {
	J := min(a.J(), b.J())
	out := Law{Ways: make([]*big.Int, J+1), Total: new(big.Int).Mul(a.Total, b.Total)}
	for s := range out.Ways {
		sum := new(big.Int)
		for i := 0; i <= s; i++ {
			sum.Add(sum, new(big.Int).Mul(a.Ways[i], b.Ways[s-i]))
		}
		out.Ways[s] = sum
	}
	return out
}

// InterleavedCost estimates InterleavedLaw without running it: one layered
// iteration per distinct length. A cost over limit word additions is +Inf.
func InterleavedCost(set pattern.Set, lengths []int, J int, limit float64) Cost {
	var c Cost
	for _, n := range distinct(lengths) {
		_, x := cheapestImage(set, n, J+1, limit)
		c.Work += x.Work
		c.Memory = max(c.Memory, x.Memory)
	}
	return c
}

// InterleavedLaw returns the exact law, to J, of the total number of
// matching windows over independent subsequences of the given lengths (a
// delay t: Interleave(N, t)): the convolution of each subsequence's law,
// from Occurrences, computed once per distinct length.
func InterleavedLaw(ctx context.Context, set pattern.Set, lengths []int, J int) (Law, error) {
	byLength := map[int]Law{}
	for _, n := range distinct(lengths) {
		ways, err := Occurrences(ctx, set, n, J)
		if err != nil {
			return Law{}, err
		}
		byLength[n] = Law{Ways: ways, Total: factorial(n)}
	}
	out := Law{Ways: []*big.Int{big.NewInt(1)}, Total: big.NewInt(1)}
	for j := 1; j <= J; j++ {
		out.Ways = append(out.Ways, new(big.Int))
	}
	for _, n := range lengths {
		out = convolve(out, byLength[n])
	}
	return out, nil
}

func distinct(ns []int) []int {
	var out []int
	seen := map[int]bool{}
	for _, n := range ns {
		if !seen[n] {
			seen[n] = true
			out = append(out, n)
		}
	}
	return out
}

// NormalTails returns the normal approximation, with continuity correction,
// of P(count <= x) and P(count >= x) for a count with the given mean and
// variance: Phi((x + 1/2 - mean)/sd) and 1 - Phi((x - 1/2 - mean)/sd). It is
// an approximation, not a bound: the count is a sum of dependent indicators
// (overlapping windows) and its tails are not normal far from the mean.
func NormalTails(m Moments, x int) (atMost, atLeast float64) {
	mean, _ := m.Mean.Float64()
	variance, _ := m.Variance.Float64()
	if variance <= 0 {
		// a count that cannot vary (N below the window, or a length-1
		// member): it equals its mean
		atMost, atLeast = 0, 0
		if float64(x) >= mean {
			atMost = 1
		}
		if float64(x) <= mean {
			atLeast = 1
		}
		return atMost, atLeast
	}
	sd := math.Sqrt(variance)
	// Phi(z) = erfc(-z/sqrt 2)/2; the upper tail as Phi(-z), which keeps
	// its relative precision far out
	phi := func(z float64) float64 { return 0.5 * math.Erfc(-z/math.Sqrt2) }
	return phi((float64(x) + 0.5 - mean) / sd), phi(-(float64(x) - 0.5 - mean) / sd)
}
