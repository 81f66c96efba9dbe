package certify

import "math/big"

// A table holds one coefficient per composition a = (a_0, .., a_(K-1)) of a
// degree D into K non-negative parts, in lexicographic order of a (so
// (0, .., 0, D) first): the coefficients of one state at one n, with
// K = |p| + 1 and D = n - |p|. This is the order of the digest stream.
type table struct {
	parts, degree int
	v             []big.Int
}

// binomials is a table of binomial coefficients C(n, k) for n < len(c),
// k <= maxK, enough to count and rank every composition the checker
// indexes.
type binomials struct{ c [][]int64 }

func newBinomials(maxN int) binomials {
	const maxK = MaxPatternLength + 1
	c := make([][]int64, maxN+1)
	for n := range c {
		c[n] = make([]int64, maxK+1)
		c[n][0] = 1
		for k := 1; k <= maxK && k <= n; k++ {
			c[n][k] = c[n-1][k-1] + c[n-1][k]
		}
	}
	return binomials{c}
}

// count returns the number of compositions of D into K parts,
// C(D+K-1, K-1).
func (b binomials) count(K, D int) int { return int(b.c[D+K-1][K-1]) }

// rank returns the position of a in lexicographic order. The compositions
// before it that agree with it up to part t and have a smaller part t
// number sum over v < a_t of C(R - v + j - 1, j - 1), R the rest of the
// degree from part t on and j = K-1-t the parts after t; by the hockey
// stick identity that is C(R + j, j) - C(R - a_t + j, j).
func (b binomials) rank(a []int) int {
	R, r := 0, int64(0)
	for _, x := range a {
		R += x
	}
	for t := 0; t+1 < len(a); t++ {
		j := len(a) - 1 - t
		r += b.c[R+j][j] - b.c[R-a[t]+j][j]
		R -= a[t]
	}
	return int(r)
}

func (b binomials) newTable(K, D int) *table {
	return &table{parts: K, degree: D, v: make([]big.Int, b.count(K, D))}
}

// firstComposition sets a to (0, .., 0, D).
func firstComposition(a []int, D int) {
	clear(a)
	a[len(a)-1] = D
}

// nextComposition advances a to the next composition in lexicographic
// order and reports false after the last, (D, 0, .., 0). The next one
// raises the last part t < K-1 that has something after it by one and
// puts the rest, less one, into the last part.
func nextComposition(a []int) bool {
	K := len(a)
	tail := a[K-1]
	for t := K - 2; t >= 0; t-- {
		if tail > 0 {
			a[t]++
			clear(a[t+1:])
			a[K-1] = tail - 1
			return true
		}
		tail += a[t]
	}
	return false
}

// spreadAdd adds into dst (K+1 parts, degree D) the new value put into gap
// i of src (K parts, degree D): dst[c] += src[a], a being c with c_i and
// c_(i+1) joined into one gap. Each c has exactly one such a.
func (b binomials) spreadAdd(dst, src *table, i int) {
	c := make([]int, dst.parts)
	a := make([]int, src.parts)
	firstComposition(c, dst.degree)
	for r := 0; ; r++ {
		copy(a[:i], c[:i])
		a[i] = c[i] + c[i+1]
		copy(a[i+1:], c[i+2:])
		dst.v[r].Add(&dst.v[r], &src.v[b.rank(a)])
		if !nextComposition(c) {
			return
		}
	}
}

// merge drops the value between gaps j and j+1 of src (K parts, degree
// D): the result (K-1 parts, degree D+1) has the one gap a_j + a_(j+1) + 1
// in their place and sums every src entry that lands there.
func (b binomials) merge(src *table, j int) *table {
	out := b.newTable(src.parts-1, src.degree+1)
	a := make([]int, src.parts)
	e := make([]int, out.parts)
	firstComposition(a, src.degree)
	for r := 0; ; r++ {
		if src.v[r].Sign() != 0 {
			copy(e[:j], a[:j])
			e[j] = a[j] + a[j+1] + 1
			copy(e[j+1:], a[j+2:])
			x := &out.v[b.rank(e)]
			x.Add(x, &src.v[r])
		}
		if !nextComposition(a) {
			return out
		}
	}
}

// insertMerge puts the new value into gap i of src (K parts, degree D) and
// at once drops the value next to that gap, below it (side -1, the value
// of rank i) or above it (side +1, rank i+1 before the insertion). The
// result has K parts and degree D+1. Below: the gaps are
// (.., a_(i-1) + b + 1, a_i - b, ..) over the splits b, so
//
//	out[.., u, v, ..] = sum_{b=0}^{u-1} src[.., u-1-b, v+b, ..]
//	                  = src[.., u-1, v, ..] + out[.., u-1, v+1, ..],
//
// a running sum along the line u + v = const. Above: the gaps are
// (.., b, a_i - b + a_(i+1) + 1, ..), and
//
//	out[.., u, v, ..] = src[.., u, v-1, ..] + out[.., u+1, v-1, ..].
//
// Every entry costs O(1) additions.
func (b binomials) insertMerge(src *table, i, side int) *table {
	out := b.newTable(src.parts, src.degree+1)
	lo := i - 1 // the two parts (u, v) of out that the sum runs along
	if side > 0 {
		lo = i
	}
	partner := make([]int, len(out.v)) // the entry the running sum continues, or -1
	e := make([]int, out.parts)
	firstComposition(e, out.degree)
	for r := 0; ; r++ {
		u, v := e[lo], e[lo+1]
		partner[r] = -1
		if side < 0 && u > 0 {
			e[lo] = u - 1
			out.v[r].Set(&src.v[b.rank(e)])
			e[lo+1] = v + 1
			partner[r] = b.rank(e)
		}
		if side > 0 && v > 0 {
			e[lo+1] = v - 1
			out.v[r].Set(&src.v[b.rank(e)])
			e[lo] = u + 1
			partner[r] = b.rank(e)
		}
		e[lo], e[lo+1] = u, v
		if !nextComposition(e) {
			break
		}
	}
	if side < 0 { // partners come earlier in lexicographic order
		for r := range out.v {
			if p := partner[r]; p >= 0 {
				out.v[r].Add(&out.v[r], &out.v[p])
			}
		}
	} else { // partners come later
		for r := len(out.v) - 1; r >= 0; r-- {
			if p := partner[r]; p >= 0 {
				out.v[r].Add(&out.v[r], &out.v[p])
			}
		}
	}
	return out
}

// elevate returns the integer degree elevation of t: out[a] = sum over
// parts j with a_j > 0 of a_j t[a - e_j] (K parts, degree D+1).
func (b binomials) elevate(t *table) *table {
	out := b.newTable(t.parts, t.degree+1)
	a := make([]int, t.parts)
	var term big.Int
	firstComposition(a, out.degree)
	for r := 0; ; r++ {
		for j := range a {
			if a[j] == 0 {
				continue
			}
			a[j]--
			term.SetInt64(int64(a[j] + 1))
			term.Mul(&term, &t.v[b.rank(a)])
			a[j]++
			out.v[r].Add(&out.v[r], &term)
		}
		if !nextComposition(a) {
			return out
		}
	}
}
