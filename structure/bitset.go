package structure

import "math/bits"

// bitset is a fixed-size set of small non-negative integers
// (configurations). Bits past the size are always zero, so equal sets
// have equal words.
type bitset []uint64

func newBitset(size int) bitset { return make(bitset, (size+63)/64) }

func (b bitset) has(i int) bool { return b[i>>6]&(1<<(uint(i)&63)) != 0 }

func (b bitset) set(i int) { b[i>>6] |= 1 << (uint(i) & 63) }

func (b bitset) count() int {
	n := 0
	for _, w := range b {
		n += bits.OnesCount64(w)
	}
	return n
}

func (b bitset) equal(c bitset) bool {
	for i := range b {
		if b[i] != c[i] {
			return false
		}
	}
	return true
}

// intersects reports whether b and c share an element.
func (b bitset) intersects(c bitset) bool {
	for i := range b {
		if b[i]&c[i] != 0 {
			return true
		}
	}
	return false
}

// or adds the elements of c to b.
func (b bitset) or(c bitset) {
	for i := range b {
		b[i] |= c[i]
	}
}

// subsetOf reports whether every element of b is in c.
func (b bitset) subsetOf(c bitset) bool {
	for i := range b {
		if b[i]&^c[i] != 0 {
			return false
		}
	}
	return true
}

// firstMissing returns the least element of within that b lacks, or -1.
func (b bitset) firstMissing(within bitset) int {
	for i := range b {
		if d := within[i] &^ b[i]; d != 0 {
			return i*64 + bits.TrailingZeros64(d)
		}
	}
	return -1
}

// hash mixes the words (FNV-1a over 64-bit words); equal sets hash alike.
func (b bitset) hash() uint64 {
	h := uint64(14695981039346656037)
	for _, w := range b {
		h ^= w
		h *= 1099511628211
	}
	return h
}

// each calls f with every element of b, increasing.
func each(b bitset, f func(r int)) {
	for w, word := range b {
		for word != 0 {
			f(w*64 + bits.TrailingZeros64(word))
			word &= word - 1
		}
	}
}
