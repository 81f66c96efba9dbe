package certify

import (
	"math/big"
	"math/bits"
)

// A table holds one coefficient per composition a = (a_0, .., a_(K-1)) of a
// degree D into K non-negative parts, in lexicographic order of a (so
// (0, .., 0, D) first): the coefficients of one state at one n, with
// K = |p| + 1 and D = n - |p|. This is the order of the digest stream.
//
// Each coefficient is a fixed number of 64-bit words, least significant
// first: every table of an iterate G_n has the width wordsFor(n), large
// enough for every number at that n, so adding two coefficients is a loop
// over words with a carry, and no step allocates per coefficient.
type table struct {
	parts, degree int
	words         int
	w             []uint64 // coefficient r is w[r*words : (r+1)*words]
}

// at returns the words of coefficient r.
func (t *table) at(r int) []uint64 { return t.w[r*t.words : (r+1)*t.words] }

// size returns the number of coefficients.
func (t *table) size() int { return len(t.w) / t.words }

// wordsFor returns the width that holds every number of an iteration at
// n = top. Every coefficient of G_n of the whole system counts some of the
// avoiding permutations of length n, so it is at most n!. From start ones
// at n_s <= 8, each of the coefficients of G_(n_s) = 1 has at most
// (n_s+1)(n_s+2)..n = n!/n_s! descendants at n (one per gap and split of
// each new value), and there are at most 2^10 n_s! of them (the states of
// length l <= n_s number at most l!, each with at most C(n_s, l) <= 2^n_s
// coefficients, so sum_l l! 2^n_s <= 2 n_s! 2^n_s, and 2^(n_s+1) <= 2^10 for
// n_s <= 8), so the coefficients stay below 2^10 n!. A running sum is a
// partial sum of one output and a merge sums entries of one iterate. One
// elevation of a table of degree D gives each entry at most (D+1) times the
// largest, and D <= N, so the d-fold elevation of G_N stays below
// 2^10 (N+d)! as well. Two words beyond (top)! are a margin over the factor
// 2^10.
func wordsFor(top int) int {
	f := new(big.Int).MulRange(1, int64(max(top, 1)))
	return f.BitLen()/64 + 3
}

// addWords adds src to dst (len(src) <= len(dst)), carrying into dst's
// upper words.
func addWords(dst, src []uint64) {
	var c uint64
	for i, x := range src {
		dst[i], c = bits.Add64(dst[i], x, c)
	}
	for i := len(src); c != 0 && i < len(dst); i++ {
		dst[i], c = bits.Add64(dst[i], 0, c)
	}
}

// subWords subtracts src from dst (len(src) <= len(dst)) modulo
// 2^(64 len(dst)): a difference table's entries may wrap below zero, and
// its running sums come back to the true non-negative values.
func subWords(dst, src []uint64) {
	var b uint64
	for i, x := range src {
		dst[i], b = bits.Sub64(dst[i], x, b)
	}
	for i := len(src); b != 0 && i < len(dst); i++ {
		dst[i], b = bits.Sub64(dst[i], 0, b)
	}
}

// mulAddWords adds m times src to dst (len(src) <= len(dst)).
func mulAddWords(dst, src []uint64, m uint64) {
	var carry uint64
	for i, x := range src {
		hi, lo := bits.Mul64(x, m)
		lo, c := bits.Add64(lo, carry, 0)
		hi += c
		dst[i], c = bits.Add64(dst[i], lo, 0)
		carry = hi + c
	}
	for i := len(src); carry != 0 && i < len(dst); i++ {
		dst[i], carry = bits.Add64(dst[i], carry, 0)
	}
}

func isZeroWords(x []uint64) bool {
	for _, v := range x {
		if v != 0 {
			return false
		}
	}
	return true
}

// appendBytes appends the big-endian bytes of x without leading zero
// bytes (none for 0).
func appendBytes(buf []byte, x []uint64) []byte {
	started := false
	for i := len(x) - 1; i >= 0; i-- {
		for s := 56; s >= 0; s -= 8 {
			b := byte(x[i] >> s)
			if started || b != 0 {
				started = true
				buf = append(buf, b)
			}
		}
	}
	return buf
}

// toBig returns x as a big.Int.
func toBig(x []uint64) *big.Int {
	return new(big.Int).SetBytes(appendBytes(nil, x))
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
	return binomials{c: c}
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

func (b binomials) newTable(K, D, words int) *table {
	return &table{parts: K, degree: D, words: words, w: make([]uint64, b.count(K, D)*words)}
}

// scratch recycles the temporary tables of one goroutine's steps, so
// that a step does not allocate (and the garbage collector does not
// clear) fresh memory for every move.
type scratch struct {
	free [][]uint64
}

// table returns a zeroed table of K parts, degree D and the given width
// in the smallest recycled buffer that holds it, or a new one.
func (sc *scratch) table(b binomials, K, D, words int) *table {
	return &table{parts: K, degree: D, words: words, w: sc.words(b.count(K, D) * words)}
}

// words returns n zeroed words from the smallest recycled buffer that
// holds them, or new ones.
func (sc *scratch) words(n int) []uint64 {
	best := -1
	for i, buf := range sc.free {
		if cap(buf) >= n && (best < 0 || cap(buf) < cap(sc.free[best])) {
			best = i
		}
	}
	if best < 0 {
		// room to grow: the tables of a state grow by a few percent per
		// step, so the buffer serves the next steps too
		return make([]uint64, n, n+n/8)
	}
	buf := sc.free[best][:n]
	sc.free[best] = sc.free[len(sc.free)-1]
	sc.free = sc.free[:len(sc.free)-1]
	clear(buf)
	return buf
}

// keptBuffers is how many released buffers a scratch keeps: a move holds
// at most two large temporary tables at once (the others are far smaller).
const keptBuffers = 2

// release returns a temporary table's memory for reuse.
func (sc *scratch) release(t *table) { sc.releaseWords(t.w) }

// releaseWords returns words for reuse, keeping the largest keptBuffers
// buffers (the tables grow with n).
func (sc *scratch) releaseWords(buf []uint64) {
	sc.free = append(sc.free, buf)
	if len(sc.free) > keptBuffers {
		least := 0
		for i, buf := range sc.free {
			if cap(buf) < cap(sc.free[least]) {
				least = i
			}
		}
		sc.free[least] = sc.free[len(sc.free)-1]
		sc.free = sc.free[:len(sc.free)-1]
	}
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

// spreadAdd adds into dst (K+1 parts, degree D, at least src's width) the
// new value put into gap i of src (K parts, degree D): dst[c] += src[a], a
// being c with c_i and c_(i+1) joined into one gap. Each c has exactly one
// such a.
func (b binomials) spreadAdd(dst, src *table, i int) {
	c := make([]int, dst.parts)
	a := make([]int, src.parts)
	firstComposition(c, dst.degree)
	for r := 0; ; r++ {
		copy(a[:i], c[:i])
		a[i] = c[i] + c[i+1]
		copy(a[i+1:], c[i+2:])
		addWords(dst.at(r), src.at(b.rank(a)))
		if !nextComposition(c) {
			return
		}
	}
}

// merge drops the value between gaps j and j+1 of src (K parts, degree
// D): the result (K-1 parts, degree D+1, the given width, at least src's)
// has the one gap a_j + a_(j+1) + 1 in their place and sums every src
// entry that lands there.
func (b binomials) merge(sc *scratch, src *table, j, words int) *table {
	out := sc.table(b, src.parts-1, src.degree+1, words)
	a := make([]int, src.parts)
	e := make([]int, out.parts)
	firstComposition(a, src.degree)
	for r := 0; ; r++ {
		if x := src.at(r); !isZeroWords(x) {
			copy(e[:j], a[:j])
			e[j] = a[j] + a[j+1] + 1
			copy(e[j+1:], a[j+2:])
			addWords(out.at(b.rank(e)), x)
		}
		if !nextComposition(a) {
			return out
		}
	}
}

// insertMergeAdd adds into dst (K parts, degree D+1, at least src's
// width) what putting the new value into gap i of src (K parts, degree D)
// makes when the value next to that gap is dropped at once: the one below
// it (side -1, the value of rank i) or the one above it (side +1, rank i+1
// before the insertion). Below, the gaps are (.., a_(i-1) + b + 1, a_i - b,
// ..) over the splits b, so
//
//	out[.., u, v, ..] = sum_{b=0}^{u-1} src[.., u-1-b, v+b, ..]
//	                  = src[.., u-1, v, ..] + out[.., u-1, v+1, ..],
//
// a running sum along the line u + v = T with the other parts fixed, in
// increasing u. Above, the gaps are (.., b, a_i - b + a_(i+1) + 1, ..), and
//
//	out[.., u, v, ..] = src[.., u, v-1, ..] + out[.., u+1, v-1, ..],
//
// the same line in decreasing u. So the lines are walked one by one with
// one running value, added into dst as it goes: every entry costs O(1)
// additions and no temporary table.
func (b binomials) insertMergeAdd(dst, src *table, i, side int) {
	lo := i - 1 // the two parts (u, v) of dst that the sum runs along
	if side > 0 {
		lo = i
	}
	line := make([]int, dst.parts-1) // dst's parts with u and v joined into T
	e := make([]int, dst.parts)
	run := make([]uint64, dst.words)
	firstComposition(line, dst.degree)
	for {
		T := line[lo]
		copy(e[:lo], line[:lo])
		copy(e[lo+2:], line[lo+1:])
		clear(run)
		for k := 0; k <= T; k++ {
			u := k // side -1: u = 0, 1, .., T
			if side > 0 {
				u = T - k // side +1: u = T, .., 0
			}
			v := T - u
			if side < 0 && u > 0 {
				e[lo], e[lo+1] = u-1, v
				addWords(run, src.at(b.rank(e)))
			}
			if side > 0 && v > 0 {
				e[lo], e[lo+1] = u, v-1
				addWords(run, src.at(b.rank(e)))
			}
			e[lo], e[lo+1] = u, v
			addWords(dst.at(b.rank(e)), run)
		}
		if !nextComposition(line) {
			return
		}
	}
}

// pushToOne adds into diff what a move that drops every old value makes
// of src (K parts, degree D): the new value, in gap i, is then the only
// one kept, and its gaps are (below + b, rest - b) with below = a_0 + .. +
// a_(i-1) + i (the other values and the old values under gap i) and b =
// 0..a_i. Those are the consecutive entries below .. below + a_i of the
// one-value state's table (its compositions (x, D+K-1-x) in order of x),
// so the move adds src[a] at diff[below] and subtracts it at
// diff[below + a_i + 1]; running sums of diff give the table.
func pushToOne(diff []uint64, words int, src *table, i int) {
	a := make([]int, src.parts)
	firstComposition(a, src.degree)
	for r := 0; ; r++ {
		if x := src.at(r); !isZeroWords(x) {
			below := i
			for _, v := range a[:i] {
				below += v
			}
			addWords(diff[below*words:(below+1)*words], x)
			end := below + a[i] + 1
			subWords(diff[end*words:(end+1)*words], x)
		}
		if !nextComposition(a) {
			return
		}
	}
}

// elevate returns the integer degree elevation of t: out[a] = sum over
// parts j with a_j > 0 of a_j t[a - e_j] (K parts, degree D+1, the given
// width, at least t's).
func (b binomials) elevate(t *table, words int) *table {
	out := b.newTable(t.parts, t.degree+1, words)
	a := make([]int, t.parts)
	firstComposition(a, out.degree)
	for r := 0; ; r++ {
		for j := range a {
			if a[j] == 0 {
				continue
			}
			a[j]--
			src := t.at(b.rank(a))
			a[j]++
			mulAddWords(out.at(r), src, uint64(a[j]))
		}
		if !nextComposition(a) {
			return out
		}
	}
}
