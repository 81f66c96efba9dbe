package structure

import (
	"context"
	"math/bits"
	"slices"

	"avoidcert/pattern"
)

// The joint-pattern test.
//
// Definition. For k >= m and an avoiding permutation p of length m+k, the
// joint pattern of p is the pattern of the 2m entries
// (p_1..p_m, p_{k+1}..p_{k+m}): its start window x followed by its current
// window y, an element of S_2m indexed by pattern.Rank. R_k is the set of
// joint patterns of the avoiding permutations of length m+k. For k < m the
// two windows share m-k entries; the kernel of T^k is then carried by the
// null set where y_i = x_{i+k}, so it is never a.e. positive, and the test
// starts at k = m, where the windows are disjoint and R_m is the set of
// avoiding permutations of length 2m themselves.
//
// Step. From r in R_k the value z appended to p lies in one of the 2m+1
// gaps g of r's 2m values (z above exactly g of them). The new window
// (y_1..y_m, z) is allowed or not by the pattern of y and the number of
// y's below z, so by (r, g) alone; the joint pattern of the extension is
// the pattern of (x, y_2..y_m, z). Claim: R_{k+1} is exactly the set of
// these results. Every avoiding p' of length m+k+1 is such an extension of
// its prefix (whose joint pattern lies in R_k). Conversely, given a
// realisation p of r and an allowed gap g, pick a real z in gap g of the
// 2m tracked values, distinct from the other entries of p, and
// standardise: the windows of p are unchanged and the only new window is
// (y, z), allowed. The claim is checked by enumeration in the tests.
//
// Kernel. For k >= m, T^k has kernel K_k(x, y) = volume of the middle
// entries t with (x, t, y) avoiding. When the joint order of (x, y) is
// r in R_k, a realisation of r maps onto any (x, y) with that joint order
// (choose the middle values in the same gaps), so K_k > 0 there;
// otherwise K_k = 0. So K_k > 0 a.e. on the start cells exactly when R_k
// holds every joint pattern whose two halves are start cells (the domain;
// it is all of S_2m when every pattern has the longest length).

// Ranks. pattern.Rank counts, for each entry, the later entries below it,
// so it gives the rank of the pattern of any distinct values without
// standardising them; the code below relies on that
// (TestRankHelpersMatchPattern checks it).

// jointSpace holds the tables of the joint-pattern test of one system.
type jointSpace struct {
	m, n   int   // n = 2m
	size   int   // n!
	fact   []int // fact[i] = i!, i <= n
	sys    Windows
	extend []bool // extend[cell*(m+1)+j]: window (y, z) allowed, y in cell, j of y below z
	domain bitset // joint patterns whose two halves are start cells
}

// maxExactM is the largest m for which the joint-pattern test runs:
// (2m)! = 10! = 3628800 bits per R_k at m = 5; at m = 6 it would be 12!
// bits (60 MB) per step and about 6*10^9 transitions per step.
const maxExactM = 5

func newJointSpace(sys Windows) *jointSpace {
	m := sys.M
	js := &jointSpace{m: m, n: 2 * m, sys: sys, fact: factorials(2 * m)}
	js.size = js.fact[js.n]
	js.extend = make([]bool, sys.Cells()*(m+1))
	w := make([]int, m+1)
	for cell := range sys.Cells() {
		sigma := pattern.Unrank(m, cell)
		for j := 0; j <= m; j++ {
			for i, v := range sigma {
				w[i] = v
				if v > j {
					w[i]++
				}
			}
			w[m] = j + 1
			js.extend[cell*(m+1)+j] = sys.Allowed[pattern.Rank(w)]
		}
	}
	js.domain = newBitset(js.size)
	if !slices.Contains(sys.Start, false) {
		for r := range js.size {
			js.domain.set(r)
		}
		return js
	}
	c := js.newCursor()
	for r := range js.size {
		c.seek(r)
		if sys.Start[pattern.Rank(c.q[:m])] && sys.Start[pattern.Rank(c.q[m:])] {
			js.domain.set(r)
		}
	}
	return js
}

// unrank writes into q (len n) the permutation of 1..n of rank r and into
// d its Lehmer digits: d[i] = #{j > i: q[j] < q[i]}, r = sum d[i] (n-1-i)!.
func (js *jointSpace) unrank(r int, q, d []int) {
	var used uint32
	n := js.n
	for i := range n {
		f := js.fact[n-1-i]
		d[i] = r / f
		r %= f
		for v, left := 1, d[i]; ; v++ {
			if used&(1<<v) == 0 {
				if left == 0 {
					q[i] = v
					used |= 1 << v
					break
				}
				left--
			}
		}
	}
}

// cursor walks joint patterns in increasing rank, keeping the permutation
// and its Lehmer digits; moving to a nearby rank uses the next-permutation
// step (amortised O(1)), a far one unranks afresh.
type cursor struct {
	js   *jointSpace
	r    int
	q, d []int
}

func (js *jointSpace) newCursor() *cursor {
	c := &cursor{js: js, q: make([]int, js.n), d: make([]int, js.n)}
	js.unrank(0, c.q, c.d)
	return c
}

func (c *cursor) seek(r int) {
	if r < c.r || r-c.r > 16 {
		c.js.unrank(r, c.q, c.d)
		c.r = r
		return
	}
	for c.r < r {
		c.next()
	}
}

// next moves to rank r+1 (r+1 < n!): the pivot i is the last position with
// a larger entry after it, which is also the last digit that can grow.
func (c *cursor) next() {
	q, d, n := c.q, c.d, len(c.q)
	i := n - 2
	for q[i] > q[i+1] {
		i--
	}
	j := n - 1
	for q[j] < q[i] {
		j--
	}
	q[i], q[j] = q[j], q[i]
	for a, b := i+1, n-1; a < b; a, b = a+1, b-1 {
		q[a], q[b] = q[b], q[a]
	}
	d[i]++
	for k := i + 1; k < n; k++ {
		d[k] = 0
	}
	c.r++
}

// initial returns R_m: the avoiding permutations of length 2m.
func (js *jointSpace) initial(ctx context.Context) (bitset, error) {
	r := newBitset(js.size)
	w := newWalker(ctx, js.sys, 0)
	_, err := w.run(js.n, func(seq []int) bool {
		r.set(pattern.Rank(seq))
		return true
	})
	return r, err
}

// step returns R_{k+1} from cur = R_k. When pred is not nil, pred[r']
// records, for each r' the first time it is reached (in rank order of its
// source), source*16 + gap.
func (js *jointSpace) step(ctx context.Context, cur bitset, pred []uint32) (bitset, error) {
	m, n, fact := js.m, js.n, js.fact
	next := newBitset(js.size)
	c := js.newCursor()
	q, d := c.q, c.d
	pos := make([]int, n+1)  // pos[v]: position of value v among the kept entries, -1 for y_1
	isY := make([]bool, n+1) // value v belongs to the current window y
	for wi, word := range cur {
		if wi&1023 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		for word != 0 {
			b := word & -word
			word ^= b
			r := wi*64 + bits.TrailingZeros64(b)
			c.seek(r)
			// The kept entries are x_1..x_m (positions 0..m-1) and y_2..y_m
			// (positions m..n-2); z goes to position n-1. Their Lehmer
			// digits come from q's: x_i loses y_1 if y_1 < x_i; y's entries
			// have only later y's after them, in q as in the kept sequence.
			y1 := q[m]
			base, cellY := 0, 0
			for i := range m {
				digit := d[i]
				if y1 < q[i] {
					digit--
				}
				base += digit * fact[n-1-i]
				pos[q[i]] = i
				isY[q[i]] = false
				cellY += d[m+i] * fact[m-1-i]
				isY[q[m+i]] = true
			}
			for i := m; i < n-1; i++ {
				base += d[i+1] * fact[n-1-i]
				pos[q[i+1]] = i
			}
			pos[y1] = -1
			// Gap g = n: z above everything. Lowering g past value g+1
			// puts z below that value, adding one to its Lehmer digit.
			rank, below := base, m
			ext := js.extend[cellY*(m+1) : cellY*(m+1)+m+1]
			for g := n; g >= 0; g-- {
				if g < n {
					v := g + 1
					if p := pos[v]; p >= 0 {
						rank += fact[n-1-p]
					}
					if isY[v] {
						below--
					}
				}
				if !ext[below] {
					continue
				}
				if pred != nil && !next.has(rank) {
					pred[rank] = uint32(r)*16 + uint32(g)
				}
				next.set(rank)
			}
		}
	}
	return next, nil
}

// closable reports whether the joint pattern q = (x, u) closes into a
// cyclic avoider: the m windows (u_i..u_m, x_1..x_i), i = 1..m, that wrap
// around from the current window back to the start window are allowed.
func (js *jointSpace) closable(q []int, buf []int) bool {
	m := js.m
	for i := 0; i < m; i++ {
		buf = append(buf[:0], q[m+i:]...)
		buf = append(buf, q[:i+1]...)
		if !js.sys.Allowed[pattern.Rank(buf)] {
			return false
		}
	}
	return true
}

// firstClosable returns the least r in set that is closable, or -1.
func (js *jointSpace) firstClosable(set bitset) int {
	c := js.newCursor()
	buf := make([]int, 0, js.m+1)
	for wi, word := range set {
		for word != 0 {
			b := word & -word
			word ^= b
			r := wi*64 + bits.TrailingZeros64(b)
			c.seek(r)
			if js.closable(c.q, buf) {
				return r
			}
		}
	}
	return -1
}

// predecessor finds, for r in R_{k+1}, some r' in prev = R_k and gap g with
// step(r', g) = r. It inserts the dropped value y_1 in each of the 2m+1
// gaps of r's values (values doubled so that y_1 = 2h+1 sits in gap h).
func (js *jointSpace) predecessor(r int, prev bitset) (src, gap int, ok bool) {
	m, n := js.m, js.n
	q, digits := make([]int, n), make([]int, n)
	js.unrank(r, q, digits)
	seq := make([]int, n)
	win := make([]int, m+1)
	z := 2 * q[n-1]
	for h := 0; h <= n; h++ {
		y1 := 2*h + 1
		for i := range m {
			seq[i] = 2 * q[i]
		}
		seq[m] = y1
		for i := m + 1; i < n; i++ {
			seq[i] = 2 * q[i-1]
		}
		copy(win, seq[m:])
		win[m] = z
		if !js.sys.Allowed[pattern.Rank(win)] {
			continue
		}
		src = pattern.Rank(seq)
		if !prev.has(src) {
			continue
		}
		gap = 0
		for _, v := range seq {
			if v < z {
				gap++
			}
		}
		return src, gap, true
	}
	return 0, 0, false
}

// realise builds the avoiding permutation whose prefix of length 2m is
// first (a member of R_m) and whose later entries are placed, one by one,
// in the given gaps of the 2m tracked entries (first m and last m).
func realise(m int, first []int, gaps []int) pattern.Perm {
	seq := append(pattern.Perm(nil), first...)
	tracked := make([]int, 0, 2*m)
	for _, g := range gaps {
		tracked = append(tracked[:0], seq[:m]...)
		tracked = append(tracked, seq[len(seq)-m:]...)
		slices.Sort(tracked)
		a := 0 // z goes just above the g-th smallest tracked value
		if g > 0 {
			a = tracked[g-1]
		}
		for i, v := range seq {
			if v > a {
				seq[i] = v + 1
			}
		}
		seq = append(seq, a+1)
	}
	return seq
}

// Joint returns the joint pattern of a permutation of length at least 2m:
// the pattern of its first m entries followed by its last m entries.
func Joint(p []int, m int) pattern.Perm {
	if len(p) < 2*m {
		panic("structure: Joint needs a sequence of length at least 2m")
	}
	seq := append(append([]int(nil), p[:m]...), p[len(p)-m:]...)
	return pattern.Standardize(seq)
}
