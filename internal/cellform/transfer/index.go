package celltransfer

// Bernstein indices of degree D in m+1 parts are stored in colex order of
// the m-subset {s_0, s_1+1, ..., s_{m-1}+m-1} where s_i = a_0+...+a_i.
// The rank is then sum_i C(s_i+i, i+1) (the combinatorial number system),
// which does not depend on D: degree D holds ranks 0..C(D+m,m)-1.

// Indexer ranks and enumerates Bernstein indices in storage order. It is
// read-only after construction and safe for concurrent use.
type Indexer struct {
	m     int
	binom [][]int // binom[n][r] = C(n, r) for r <= m+1
}

// NewIndexer returns an Indexer for m+1 parts and degrees up to maxD.
func NewIndexer(m, maxD int) *Indexer {
	n := maxD + m + 2
	b := make([][]int, n+1)
	for i := range b {
		b[i] = make([]int, m+2)
		b[i][0] = 1
		for r := 1; r <= m+1 && i > 0; r++ {
			b[i][r] = b[i-1][r-1] + b[i-1][r]
		}
	}
	return &Indexer{m: m, binom: b}
}

// Count returns the number of indices of degree D: C(D+m, m).
func (ix *Indexer) Count(D int) int { return ix.binom[D+ix.m][ix.m] }

// Rank returns the storage position of the composition a (len m+1).
func (ix *Indexer) Rank(a []int) int {
	r, s := 0, 0
	for i := 0; i < ix.m; i++ {
		s += a[i]
		r += ix.binom[s+i][i+1]
	}
	return r
}

// Unrank writes into a (len m+1) the composition of D at storage position r.
func (ix *Indexer) Unrank(D, r int, a []int) {
	prev := D // s_m = D
	for i := ix.m - 1; i >= 0; i-- {
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

// Next advances a (a composition of D in m+1 parts) to the next one in
// storage order and reports false after the last.
func (ix *Indexer) Next(a []int) bool {
	// In storage order the partial sums s_i change like a colex
	// successor: find the first i whose s_i can grow by one while staying
	// <= s_{i+1}, grow it and reset the earlier ones to 0.
	m := ix.m
	for i := 0; i < m; i++ {
		if a[i+1] > 0 {
			// s_i += 1, s_0..s_{i-1} = 0: move one unit from a_{i+1} to a_i
			// and everything before i into a_i too.
			moved := 0
			for t := 0; t < i; t++ {
				moved += a[t]
				a[t] = 0
			}
			a[i] += moved + 1
			a[i+1]--
			// s_t for t < i must be 0, so a_i = s_i, a_{i+1} shrinks.
			return true
		}
	}
	return false
}
