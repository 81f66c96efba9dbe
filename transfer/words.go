package transfer

import (
	"math/big"
	"math/bits"
)

// addWords adds src into dst (len(src) <= len(dst)). The caller sizes dst
// so that no carry leaves it.
func addWords(dst, src []big.Word) {
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

// subWords subtracts src from dst (len(src) <= len(dst), dst >= src).
func subWords(dst, src []big.Word) {
	var b uint
	i := 0
	for ; i < len(src); i++ {
		var s uint
		s, b = bits.Sub(uint(dst[i]), uint(src[i]), b)
		dst[i] = big.Word(s)
	}
	for ; b != 0 && i < len(dst); i++ {
		var s uint
		s, b = bits.Sub(uint(dst[i]), 0, b)
		dst[i] = big.Word(s)
	}
}

// addSubWords adds x - y into dst (len(x) = len(y) <= len(dst), x >= y).
func addSubWords(dst, x, y []big.Word) {
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

// subInto sets dst = x - y (len(x) = len(y) <= len(dst), x >= y).
func subInto(dst, x, y []big.Word) {
	var b uint
	for i := range x {
		var d uint
		d, b = bits.Sub(uint(x[i]), uint(y[i]), b)
		dst[i] = big.Word(d)
	}
	clear(dst[len(x):])
}

// limbsFor returns the words per coefficient of G_k for cell length m:
// enough for 2 (m+k)!, which bounds every coefficient, every prefix sum of
// G_k and every partial sum while G_{k+1} is accumulated from G_k's
// prefix sums (those stay below (m+k+1)! + (m+k)!, and G_{k+1} gets
// limbsFor(m, k+1)).
func limbsFor(m, k int) int {
	f := big.NewInt(1)
	for i := 2; i <= m+k; i++ {
		f.Mul(f, big.NewInt(int64(i)))
	}
	return (f.BitLen()+1)/bits.UintSize + 1
}
