// Package words is fixed-width arithmetic on little-endian magnitudes
// ([]big.Word), the storage of the transfer iterates. Callers size the
// destinations so that no carry leaves them; nothing here allocates.
package words

import (
	"math/big"
	"math/bits"
)

// Add adds src into dst (len(src) <= len(dst)). The main loop takes four
// words at a time: the carry then stays in the flags within a group, about
// twice as fast as one word at a time (measured on 20-word operands).
func Add(dst, src []big.Word) {
	var c uint
	i := 0
	for ; i+4 <= len(src); i += 4 {
		d, s := dst[i:i+4:i+4], src[i:i+4:i+4]
		var r0, r1, r2, r3 uint
		r0, c = bits.Add(uint(d[0]), uint(s[0]), c)
		r1, c = bits.Add(uint(d[1]), uint(s[1]), c)
		r2, c = bits.Add(uint(d[2]), uint(s[2]), c)
		r3, c = bits.Add(uint(d[3]), uint(s[3]), c)
		d[0], d[1], d[2], d[3] = big.Word(r0), big.Word(r1), big.Word(r2), big.Word(r3)
	}
	for ; i < len(src); i++ {
		var s uint
		s, c = bits.Add(uint(dst[i]), uint(src[i]), c)
		dst[i] = big.Word(s)
	}
	for ; c != 0 && i < len(dst); i++ {
		var s uint
		s, c = bits.Add(uint(dst[i]), 0, c)
		dst[i] = big.Word(s)
	}
}

// AddSub adds x - y into dst (len(x) = len(y) <= len(dst), x >= y).
func AddSub(dst, x, y []big.Word) {
	var c, b uint
	i := 0
	for ; i < len(x); i++ {
		var s, d uint
		s, c = bits.Add(uint(dst[i]), uint(x[i]), c)
		d, b = bits.Sub(s, uint(y[i]), b)
		dst[i] = big.Word(d)
	}
	for ; (c|b) != 0 && i < len(dst); i++ {
		var s, d uint
		s, c = bits.Add(uint(dst[i]), 0, c)
		d, b = bits.Sub(s, 0, b)
		dst[i] = big.Word(d)
	}
}

// SubInto sets dst = x - y, zero-extended (len(x) = len(y) <= len(dst),
// x >= y). dst may alias x or y.
func SubInto(dst, x, y []big.Word) {
	var b uint
	for i := range x {
		var d uint
		d, b = bits.Sub(uint(x[i]), uint(y[i]), b)
		dst[i] = big.Word(d)
	}
	clear(dst[len(x):])
}

// AddInto sets dst = x + y, zero-extended (len(x) = len(y) <= len(dst)).
// dst may alias x or y.
func AddInto(dst, x, y []big.Word) {
	var c uint
	i := 0
	for ; i+4 <= len(x); i += 4 {
		d, p, q := dst[i:i+4:i+4], x[i:i+4:i+4], y[i:i+4:i+4]
		var r0, r1, r2, r3 uint
		r0, c = bits.Add(uint(p[0]), uint(q[0]), c)
		r1, c = bits.Add(uint(p[1]), uint(q[1]), c)
		r2, c = bits.Add(uint(p[2]), uint(q[2]), c)
		r3, c = bits.Add(uint(p[3]), uint(q[3]), c)
		d[0], d[1], d[2], d[3] = big.Word(r0), big.Word(r1), big.Word(r2), big.Word(r3)
	}
	for ; i < len(x); i++ {
		var s uint
		s, c = bits.Add(uint(x[i]), uint(y[i]), c)
		dst[i] = big.Word(s)
	}
	if i < len(dst) {
		dst[i] = big.Word(c)
		clear(dst[i+1:])
	}
}

// Sub subtracts src from dst modulo 2^(W len(dst)) (len(src) <= len(dst)):
// a borrow out of dst is dropped, so sums of signed terms come out right
// whenever the final value fits.
func Sub(dst, src []big.Word) {
	var b uint
	i := 0
	for ; i+4 <= len(src); i += 4 {
		d, s := dst[i:i+4:i+4], src[i:i+4:i+4]
		var r0, r1, r2, r3 uint
		r0, b = bits.Sub(uint(d[0]), uint(s[0]), b)
		r1, b = bits.Sub(uint(d[1]), uint(s[1]), b)
		r2, b = bits.Sub(uint(d[2]), uint(s[2]), b)
		r3, b = bits.Sub(uint(d[3]), uint(s[3]), b)
		d[0], d[1], d[2], d[3] = big.Word(r0), big.Word(r1), big.Word(r2), big.Word(r3)
	}
	for ; i < len(src); i++ {
		var d uint
		d, b = bits.Sub(uint(dst[i]), uint(src[i]), b)
		dst[i] = big.Word(d)
	}
	for ; b != 0 && i < len(dst); i++ {
		var d uint
		d, b = bits.Sub(uint(dst[i]), 0, b)
		dst[i] = big.Word(d)
	}
}
