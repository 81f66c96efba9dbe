package certify

import (
	"math/bits"
	"strings"
)

// This file recomputes the joint-pattern sets R_k (docs/certificate.md,
// "Joint patterns and the window digraph") with its own layout.
//
// A joint pattern, the relative order of the first m entries x and the
// last m entries y of an avoiding permutation, is stored as three parts:
//
//	xc    the cell of x (the rank of its pattern among the m! cells),
//	yc    the cell of y,
//	mask  which of the 2m values, in increasing order, belong to y
//	      (bit t set: the (t+1)-th smallest of the 2m values is in y),
//
// and numbered (slot(mask)*cells + xc)*cells + yc, slot being the place of
// mask among the C(2m, m) masks with m bits set, in increasing order.
//
// Step. One more entry z lies above exactly g of the 2m values (g = 0..2m),
// so above j = (bits of mask below g) entries of y. The new window is
// (y, z): allowed or not by yc and j. The new joint pattern keeps xc; its
// y-part is (y_2, .., y_m, z), whose cell follows from yc and j; its mask
// loses y_1's bit (the bit of the y-value whose rank among y is y_1's) and
// gains z's bit, at its place among the 2m-1 values left. Every
// realisation of a joint pattern admits z in every gap, so R_(k+1) is
// exactly the set of these results over R_k and the allowed gaps.
//
// R_k = D (the domain: both halves start cells) is kept by the step: for
// (x, y') in D the cell of y' ends some allowed window (t, y'), t can be
// placed among x and y' at its place among y', and that joint pattern,
// in D = R_k, steps to (x, y'). So the least k with R_k = D is found by
// stepping up from R_m.

// bitset is a set of joint-pattern numbers; bits past the size stay zero.
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

// jointPatterns holds the checker's tables for the R_k of one set (m >= 1).
type jointPatterns struct {
	m, cells int
	size     int      // C(2m, m) * cells * cells
	masks    []uint32 // the masks with m of 2m bits set, increasing
	cellPerm [][]int  // the permutation of each cell
	win      windows
	domain   bitset
	first    bitset // R_m
	// per y-cell and j = 0..m (z above exactly j entries of y):
	extends []bool // the window (y, z) is allowed
	nextY   []int  // the cell of (y_2, .., y_m, z)
	// after[(slot*m + r)*(2m+1) + g]: the slot of the new mask when y's
	// entry of rank r+1 leaves and z comes above g of the 2m values
	after []int
}

func newJointPatterns(win windows) *jointPatterns {
	m := win.m
	jp := &jointPatterns{m: m, cells: factorial(m), win: win}
	slot := map[uint32]int{}
	for mask := uint32(0); mask < 1<<(2*m); mask++ {
		if bits.OnesCount32(mask) == m {
			slot[mask] = len(jp.masks)
			jp.masks = append(jp.masks, mask)
		}
	}
	jp.size = len(jp.masks) * jp.cells * jp.cells
	for c := range jp.cells {
		jp.cellPerm = append(jp.cellPerm, unrank(m, c))
	}
	for _, y := range jp.cellPerm {
		for j := 0; j <= m; j++ {
			w := make([]int, 0, m+1) // y in doubled values, z between them
			for _, v := range y {
				w = append(w, 2*v)
			}
			w = append(w, 2*j+1)
			jp.extends = append(jp.extends, win.allowed[rankOf(w)])
			jp.nextY = append(jp.nextY, rankOf(w[1:]))
		}
	}
	for _, mask := range jp.masks {
		for r := range m {
			leave := nthSetBit(mask, r)
			rest := removeBit(mask, leave)
			for g := 0; g <= 2*m; g++ {
				at := g // z's place among the 2m-1 values left
				if leave < g {
					at--
				}
				jp.after = append(jp.after, slot[insertBit(rest, at)])
			}
		}
	}
	jp.domain, jp.first = newBitset(jp.size), newBitset(jp.size)
	for s := range jp.masks {
		for xc := range jp.cells {
			for yc := range jp.cells {
				if win.good[xc] && win.good[yc] {
					jp.domain.set(jp.number(s, xc, yc))
				}
			}
		}
	}
	q := identity(2 * m)
	for { // R_m: the avoiding permutations of length 2m themselves
		if jp.forbiddenWindow(q) < 0 {
			jp.first.set(jp.numberOf(q))
		}
		if nextPerm(q) < 0 {
			return jp
		}
	}
}

// nthSetBit returns the position of the (r+1)-th lowest set bit.
func nthSetBit(mask uint32, r int) int {
	for range r {
		mask &= mask - 1
	}
	return bits.TrailingZeros32(mask)
}

// removeBit deletes position p, moving the higher bits down.
func removeBit(mask uint32, p int) uint32 {
	low := mask & (1<<p - 1)
	return low | (mask>>(p+1))<<p
}

// insertBit inserts a set bit at position p, moving the higher bits up.
func insertBit(mask uint32, p int) uint32 {
	low := mask & (1<<p - 1)
	return low | 1<<p | (mask>>p)<<(p+1)
}

func (jp *jointPatterns) number(slot, xc, yc int) int {
	return (slot*jp.cells+xc)*jp.cells + yc
}

// numberOf returns the number of the joint pattern of q (length 2m: x then
// y, distinct values).
func (jp *jointPatterns) numberOf(q []int) int {
	m := jp.m
	var mask uint32
	for _, v := range q[m:] {
		below := 0
		for _, u := range q {
			if u < v {
				below++
			}
		}
		mask |= 1 << below
	}
	s := 0
	for jp.masks[s] != mask {
		s++
	}
	return jp.number(s, rankOf(q[:m]), rankOf(q[m:]))
}

// perm returns the joint pattern of a number as a permutation of 1..2m.
func (jp *jointPatterns) perm(n int) []int {
	m := jp.m
	yc := n % jp.cells
	xc := (n / jp.cells) % jp.cells
	mask := jp.masks[n/jp.cells/jp.cells]
	var xPlaces, yPlaces []int // the values of x's and y's slots, increasing
	for t := range 2 * m {
		if mask&(1<<t) != 0 {
			yPlaces = append(yPlaces, t+1)
		} else {
			xPlaces = append(xPlaces, t+1)
		}
	}
	q := make([]int, 0, 2*m)
	for _, r := range jp.cellPerm[xc] {
		q = append(q, xPlaces[r-1])
	}
	for _, r := range jp.cellPerm[yc] {
		q = append(q, yPlaces[r-1])
	}
	return q
}

// describe writes the joint pattern of a number, for messages.
func (jp *jointPatterns) describe(n int) string { return formatPerm(jp.perm(n)) }

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

// step returns R_(k+1) from cur = R_k.
func (jp *jointPatterns) step(cur bitset) bitset {
	m := jp.m
	next := newBitset(jp.size)
	cur.each(func(n int) bool {
		yc := n % jp.cells
		xc := (n / jp.cells) % jp.cells
		s := n / jp.cells / jp.cells
		mask := jp.masks[s]
		leaving := jp.cellPerm[yc][0] - 1 // y_1's rank among y, from 0
		after := jp.after[(s*m+leaving)*(2*m+1):]
		for g := 0; g <= 2*m; g++ {
			j := bits.OnesCount32(mask & (1<<g - 1))
			if jp.extends[yc*(m+1)+j] {
				next.set(jp.number(after[g], xc, jp.nextY[yc*(m+1)+j]))
			}
		}
		return true
	})
	return next
}

// closable reports whether the joint pattern q = (x, u) closes into a
// cyclic avoider: the m windows (u_i..u_m, x_1..x_i), i = 1..m, that wrap
// around from the last entries to the first are allowed.
func (jp *jointPatterns) closable(q []int) bool {
	m := jp.m
	buf := make([]int, 0, m+1)
	for i := range m {
		buf = append(append(buf[:0], q[m+i:]...), q[:i+1]...)
		if !jp.win.allowed[rankOf(buf)] {
			return false
		}
	}
	return true
}

// rankOf returns the lexicographic rank of the pattern of a sequence of
// distinct values: the sum over positions i of c_i (n-1-i)!, c_i the
// number of later entries below entry i, evaluated in Horner form.
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

// nextPerm advances q to the next permutation in lexicographic order and
// returns the position of the first entry it changes; -1 when q was the
// last permutation (q is then unchanged).
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

func identity(n int) []int {
	q := make([]int, n)
	for i := range q {
		q[i] = i + 1
	}
	return q
}
