package transfer

import (
	"math"
	"math/big"
	"math/bits"
)

// Sizes are estimated before any work, for lengths where the iterates
// could never be stored (count 123 --to 100000000): everything here takes
// time independent of n and saturates instead of overflowing.

// sizeCap is where counts of coefficients and words saturate: 2^58 on a
// 64-bit machine (2 EiB of words), far beyond any memory, and small enough
// that a saturated Footprint in bytes (2^61) plus a few more such sizes
// (as callers add them) stays below 2^63.
const sizeCap = math.MaxInt >> 5

// satMul returns a*b for a, b >= 0, or sizeCap when that is larger.
func satMul(a, b int) int {
	if a == 0 || b == 0 {
		return 0
	}
	if a > sizeCap/b {
		return sizeCap
	}
	return min(a*b, sizeCap)
}

// satAdd returns a+b for 0 <= a, b <= sizeCap, or sizeCap when larger.
func satAdd(a, b int) int { return min(a+b, sizeCap) }

// compositions returns C(d+l, l), the number of compositions of d into l+1
// parts (0 for d < 0), in l steps, saturated at sizeCap.
func compositions(l, d int) int {
	if d < 0 {
		return 0
	}
	c := uint64(1)
	for i := 1; i <= l; i++ {
		// c*(d+i)/i is exact: C(d+i, i) = C(d+i-1, i-1) * (d+i) / i.
		hi, lo := bits.Mul64(c, uint64(d+i))
		if hi >= uint64(i) {
			return sizeCap
		}
		c, _ = bits.Div64(hi, lo, uint64(i))
		if c >= sizeCap {
			return sizeCap
		}
	}
	return int(c)
}

// exactLimbsUpTo is the largest n whose limb count is taken from n! itself;
// above it a bound from the log-gamma function is used, which is larger
// by at most a word and costs no time (30000! alone has 400,000 bits).
const exactLimbsUpTo = 4096

// limbsFor returns the words per coefficient of arrays in the step from
// G_(n-1) to G_n, for a system whose start has total weight at most
// scale * n_s! at n_s: enough for scale * n!. Each coefficient at n_s
// reaches at most n!/n_s! sequences of length n (a state with gaps a at
// length k has exactly k+1 moves and splits), so scale * n! bounds the sum
// of G_n, hence every coefficient, every running sum of G_n along a line,
// and every intermediate array of that step (each sums distinct terms of
// G_n's successors).
func limbsFor(n int, scale int64) int {
	if n <= exactLimbsUpTo {
		f := new(big.Int).MulRange(1, int64(max(n, 1)))
		f.Mul(f, big.NewInt(max(scale, 1)))
		return f.BitLen()/bits.UintSize + 1
	}
	// log2(n! * scale) with a margin far above float64's error at this size
	lg, _ := math.Lgamma(float64(n) + 1)
	bitsNeeded := lg/math.Ln2 + math.Log2(float64(max(scale, 1)))
	bitsNeeded += 2 + bitsNeeded*1e-12
	if bitsNeeded >= float64(sizeCap) {
		return sizeCap
	}
	return int(bitsNeeded)/bits.UintSize + 1
}
