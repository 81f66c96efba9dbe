// Package words is fixed-width arithmetic on little-endian magnitudes
// ([]big.Word), the storage of the transfer iterates. Callers size the
// destinations so that no carry leaves them; nothing here allocates.
package words

import (
	"math/big"
	"math/bits"
)

// Add adds src into dst (len(src) <= len(dst)).
func Add(dst, src []big.Word) {
	var c uint
	i := 0
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
