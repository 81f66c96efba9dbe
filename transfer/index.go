package transfer

import "avoidcert/internal/bytesize"

// Compositions of D into L+1 parts (the gaps a_0..a_L of a state of length
// L) are stored in colex order of the L-subset {s_0, s_1+1, ..., s_(L-1)+L-1}
// where s_i = a_0+...+a_i. The rank is then sum_i C(s_i+i, i+1) (the
// combinatorial number system), which does not depend on D: degree D holds
// ranks 0..C(D+L, L)-1.

// Indexer ranks and enumerates compositions into a fixed number of parts in
// storage order. It is read-only after construction and safe for
// concurrent use.
type Indexer struct {
	l     int     // parts - 1
	binom [][]int // binom[n][r] = min(C(n, r), MaxCount) for r <= l+1
}

// MaxCount caps the binomials of an Indexer: a count of compositions at or
// above it is MaxCount. No array of that many coefficients can be held
// (2^36 of at least 8 bytes each, bytesize.Beyond), so every size computed
// from counts (memory estimates, in bytes) stays far below the int64
// range, and an estimate that reaches the cap is refused by any memory
// budget rather than wrapping around; it is then a lower bound, and
// messages say "more than" (bytesize.About). With 9 gaps (patterns of
// length 9) C(n, 8) passes the int64 range near n = 800.
const MaxCount = bytesize.Beyond / 8

// NewIndexer returns an Indexer for l+1 parts and degrees up to maxD.
func NewIndexer(l, maxD int) *Indexer {
	n := max(maxD, 0) + l + 2
	b := make([][]int, n+1)
	for i := range b {
		b[i] = make([]int, l+2)
		b[i][0] = 1
		for r := 1; r <= l+1 && i > 0; r++ {
			b[i][r] = min(b[i-1][r-1]+b[i-1][r], MaxCount)
		}
	}
	return &Indexer{l: l, binom: b}
}

// Count returns the number of compositions of D: C(D+l, l), 0 for D < 0,
// or MaxCount when that is larger.
func (ix *Indexer) Count(D int) int {
	if D < 0 {
		return 0
	}
	return ix.binom[D+ix.l][ix.l]
}

// Rank returns the storage position of the composition a (len l+1).
func (ix *Indexer) Rank(a []int) int {
	r, s := 0, 0
	for i := 0; i < ix.l; i++ {
		s += a[i]
		r += ix.binom[s+i][i+1]
	}
	return r
}

// Unrank writes into a (len l+1) the composition of D at storage position r.
func (ix *Indexer) Unrank(D, r int, a []int) {
	prev := D // s_l = D
	for i := ix.l - 1; i >= 0; i-- {
		c := i // largest c with C(c, i+1) <= r
		for c+1 <= D+i && ix.binom[c+1][i+1] <= r {
			c++
		}
		r -= ix.binom[c][i+1]
		s := c - i
		a[i+1] = prev - s
		prev = s
	}
	a[0] = prev
}

// Next advances a (a composition in l+1 parts) to the next one in storage
// order and reports false after the last.
func (ix *Indexer) Next(a []int) bool {
	// In storage order the partial sums s_i change like a colex successor:
	// find the first i whose s_i can grow by one while staying <= s_(i+1),
	// grow it and reset the earlier ones to 0.
	for i := 0; i < ix.l; i++ {
		if a[i+1] > 0 {
			moved := 0
			for t := 0; t < i; t++ {
				moved += a[t]
				a[t] = 0
			}
			a[i] += moved + 1
			a[i+1]--
			return true
		}
	}
	return false
}

// forEachLex calls fn for every composition of rest into a[i:], in
// lexicographic order.
func forEachLex(a []int, i, rest int, fn func()) {
	if i == len(a)-1 {
		a[i] = rest
		fn()
		return
	}
	for v := 0; v <= rest; v++ {
		a[i] = v
		forEachLex(a, i+1, rest-v, fn)
	}
}
