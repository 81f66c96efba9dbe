package certify

import (
	"math/bits"
	"strings"
)

// This file recomputes the joint-pattern sets R_k with plain bitset code,
// sharing nothing with package structure.
//
// A joint pattern is a permutation of 1..2m: the relative order of the
// first m entries x and the last m entries y of a permutation of length
// m+k >= 2m (disjoint windows). R_k is the set of joint patterns of the
// avoiding permutations of length m+k; R_m is the set of avoiding
// permutations of length 2m themselves. The domain D is the set of joint
// patterns whose two halves avoid the shorter members of the set (all of
// S_2m when every member has the longest length); R_k is a subset of D.
//
// Step. An avoiding permutation of length m+k+1 is an avoiding permutation
// of length m+k with one more entry z. Given the joint pattern r of the
// shorter one, z lies in one of the 2m+1 gaps g of r's values (above
// exactly g of them); the only new window is (y_1..y_m, z), allowed or not
// by the cell of y and the number of y's below z; the new joint pattern is
// the order of (x_1..x_m, y_2..y_m, z). Every realisation of r admits z in
// every gap (choose a real value in the gap, away from the other entries,
// and standardise), so R_{k+1} is exactly the set of these results for r
// in R_k and allowed (r, g).
//
// Fullness is kept: if R_k = D then R_{k+1} = D. For (x, y') in D, the
// cell y' ends some allowed window (t, y'_1..y'_m) (the last window of a
// realisation at length 2m in D), t can be put into the order of x and y'
// at its place among y', and stepping from that joint pattern, in D = R_k,
// gives (x, y'). So the least k with R_k = D is found by stepping up.

// bitset is a set of joint-pattern ranks; bits past the size stay zero.
type bitset []uint64

func newBitset(size int) bitset { return make(bitset, (size+63)/64) }

func (b bitset) has(i int) bool { return b[i>>6]&(1<<(uint(i)&63)) != 0 }
func (b bitset) set(i int)      { b[i>>6] |= 1 << (uint(i) & 63) }

func (b bitset) count() int {
	n := 0
	for _, w := range b {
		n += bits.OnesCount64(w)
	}
	return n
}

// each calls f with every member in increasing order until f returns false.
func (b bitset) each(f func(i int) bool) {
	for wi, w := range b {
		for w != 0 {
			low := w & -w
			w ^= low
			if !f(wi*64 + bits.TrailingZeros64(low)) {
				return
			}
		}
	}
}

// firstNotIn returns the least member of b that c lacks, or -1.
func (b bitset) firstNotIn(c bitset) int {
	for i := range b {
		if d := b[i] &^ c[i]; d != 0 {
			return i*64 + bits.TrailingZeros64(d)
		}
	}
	return -1
}

// firstIn returns the least member of b that c holds too, or -1.
func (b bitset) firstIn(c bitset) int {
	for i := range b {
		if d := b[i] & c[i]; d != 0 {
			return i*64 + bits.TrailingZeros64(d)
		}
	}
	return -1
}

func (b bitset) equal(c bitset) bool {
	for i := range b {
		if b[i] != c[i] {
			return false
		}
	}
	return true
}

// or adds the members of c to b.
func (b bitset) or(c bitset) {
	for i := range b {
		b[i] |= c[i]
	}
}

// key returns the contents as a string, for finding repeated sets.
func (b bitset) key() string {
	var sb strings.Builder
	sb.Grow(8 * len(b))
	for _, w := range b {
		for s := 0; s < 64; s += 8 {
			sb.WriteByte(byte(w >> s))
		}
	}
	return sb.String()
}

// rankOf returns the lexicographic rank of the pattern of a sequence of
// distinct values (equal to pattern.Rank(pattern.Standardize(seq))): the
// sum over positions i of c_i (n-1-i)!, c_i the number of later entries
// below entry i, evaluated in Horner form.
func rankOf(seq []int) int {
	n, r := len(seq), 0
	for i, v := range seq {
		c := 0
		for _, u := range seq[i+1:] {
			if u < v {
				c++
			}
		}
		r = r*(n-i) + c
	}
	return r
}

// unrankInto writes into q the permutation of 1..len(q) of rank r and into
// d its digits d_i = #{j > i: q_j < q_i} (fact[i] = i!).
func unrankInto(r int, q, d, fact []int) {
	n := len(q)
	var used uint64
	for i := range n {
		f := fact[n-1-i]
		d[i], r = r/f, r%f
		left := d[i]
		for v := 1; ; v++ {
			if used&(1<<v) != 0 {
				continue
			}
			if left == 0 {
				q[i] = v
				used |= 1 << v
				break
			}
			left--
		}
	}
}

// nextPerm advances q to the next permutation in lexicographic order and
// returns the pivot, the position of the first entry it changes; -1 when q
// was the last permutation (q is then unchanged). The pivot is the last
// position with a larger entry after it.
func nextPerm(q []int) int {
	i := len(q) - 2
	for i >= 0 && q[i] > q[i+1] {
		i--
	}
	if i < 0 {
		return -1
	}
	j := len(q) - 1
	for q[j] < q[i] {
		j--
	}
	q[i], q[j] = q[j], q[i]
	for a, b := i+1, len(q)-1; a < b; a, b = a+1, b-1 {
		q[a], q[b] = q[b], q[a]
	}
	return i
}

// nextDigits updates the digits d_i = #{j > i: q_j < q_i} of a permutation
// to those of its successor, given the pivot: the rank grows by one, in the
// factorial base. The digits after the pivot were maximal (a decreasing
// suffix) and become 0 (an increasing one); the pivot's new entry is the
// next larger value of the suffix, so its digit gains one.
func nextDigits(d []int, pivot int) {
	d[pivot]++
	clear(d[pivot+1:])
}

func identity(n int) []int {
	q := make([]int, n)
	for i := range q {
		q[i] = i + 1
	}
	return q
}

// jointPatterns holds the checker's tables for the R_k of one set (m >= 1).
type jointPatterns struct {
	m, n   int // n = 2m
	size   int // n!
	fact   []int
	win    windows
	domain bitset
	first  bitset // R_m
	// extend[cell*(m+1)+j]: the window (y, z) is allowed, for y in the cell
	// and z above exactly j entries of y
	extend []bool
}

func newJointPatterns(win windows) *jointPatterns {
	m := win.m
	jp := &jointPatterns{m: m, n: 2 * m, win: win, fact: []int{1}}
	for i := 1; i <= jp.n; i++ {
		jp.fact = append(jp.fact, jp.fact[i-1]*i)
	}
	jp.size = jp.fact[jp.n]
	cells := jp.fact[m]
	jp.extend = make([]bool, cells*(m+1))
	w := make([]int, m+1)
	y := identity(m)
	for cell := 0; cell < cells; cell++ { // y runs through the cells in rank order
		for j := 0; j <= m; j++ {
			for i, v := range y { // values 2v for y, 2j+1 for z
				w[i] = 2 * v
			}
			w[m] = 2*j + 1
			jp.extend[cell*(m+1)+j] = win.allowed[rankOf(w)]
		}
		nextPerm(y)
	}
	jp.domain, jp.first = newBitset(jp.size), newBitset(jp.size)
	q := identity(jp.n)
	for r := 0; r < jp.size; r++ { // q runs through S_2m in rank order
		if win.good[rankOf(q[:m])] && win.good[rankOf(q[m:])] {
			jp.domain.set(r)
		}
		if jp.forbiddenWindow(q) < 0 {
			jp.first.set(r)
		}
		nextPerm(q)
	}
	return jp
}

// forbiddenWindow returns the start of the first window of length m+1 of
// seq that is not allowed, or -1. For len(seq) >= m+1, -1 means that seq
// avoids every member of the set.
func (jp *jointPatterns) forbiddenWindow(seq []int) int {
	for i := 0; i+jp.m < len(seq); i++ {
		if !jp.win.allowed[rankOf(seq[i:i+jp.m+1])] {
			return i
		}
	}
	return -1
}

// step returns R_{k+1} from cur = R_k.
//
// For r in cur with entries q (Lehmer digits d), the kept entries are
// s = (q_0..q_{m-1}, q_{m+1}..q_{n-1}) (y_1 = q_m is dropped) and z goes
// last. The rank of (s, z) is sum_i (c_i + [z < s_i]) (n-1-i)!, with c_i
// the later entries of s below s_i: c_i = d_i - [q_m < q_i] for i < m and
// d_{i+1} for the kept y's. With z in gap g, z < s_i exactly when s_i > g,
// so lowering g past the value g+1 adds the weight of that value's
// position, if it is kept.
func (jp *jointPatterns) step(cur bitset) bitset {
	m, n, fact := jp.m, jp.n, jp.fact
	next := newBitset(jp.size)
	q, d := identity(n), make([]int, n) // rank 0; its digits are 0
	weight := make([]int, n+1)          // weight[v]: (n-1-position of v in s)!, 0 for y_1
	inY := make([]bool, n+1)
	for r := 0; r < jp.size; r++ {
		if r > 0 {
			nextDigits(d, nextPerm(q))
		}
		if !cur.has(r) {
			continue
		}
		base, cellY := 0, 0
		for i := range m {
			c := d[i]
			if q[m] < q[i] {
				c--
			}
			base += c * fact[n-1-i]
			weight[q[i]], inY[q[i]] = fact[n-1-i], false
			cellY += d[m+i] * fact[m-1-i] // y's digits count later y's only
			inY[q[m+i]] = true
		}
		for i := m; i < n-1; i++ {
			base += d[i+1] * fact[n-1-i]
			weight[q[i+1]] = fact[n-1-i]
		}
		weight[q[m]] = 0
		ext := jp.extend[cellY*(m+1) : (cellY+1)*(m+1)]
		rank, below := base, m // g = n: z above everything
		for g := n; ; g-- {
			if ext[below] {
				next.set(rank)
			}
			if g == 0 {
				break
			}
			rank += weight[g] // the value g now lies above z
			if inY[g] {
				below--
			}
		}
	}
	return next
}

// closable reports whether the joint pattern q = (x, u) closes into a
// cyclic avoider: the m windows (u_i..u_m, x_1..x_i), i = 1..m, that wrap
// around from the last entries to the first are allowed.
func (jp *jointPatterns) closable(q, buf []int) bool {
	m := jp.m
	for i := range m {
		buf = append(append(buf[:0], q[m+i:]...), q[:i+1]...)
		if !jp.win.allowed[rankOf(buf)] {
			return false
		}
	}
	return true
}
