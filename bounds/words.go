package bounds

import (
	"math"
	"math/big"
	"math/bits"
)

// mulAddWords adds x*y into z. The caller sizes z (len(z) > len(x)) so that
// no carry leaves it.
func mulAddWords(z, x []big.Word, y uint) {
	var carry uint
	i := 0
	for ; i < len(x); i++ {
		hi, lo := bits.Mul(uint(x[i]), y)
		var c uint
		lo, c = bits.Add(lo, carry, 0)
		hi += c
		lo, c = bits.Add(uint(z[i]), lo, 0)
		z[i] = big.Word(lo)
		carry = hi + c
	}
	for ; carry != 0 && i < len(z); i++ {
		var s uint
		s, carry = bits.Add(uint(z[i]), carry, 0)
		z[i] = big.Word(s)
	}
}

// compareWords returns the sign of x - y for magnitudes of equal length.
func compareWords(x, y []big.Word) int {
	for i := len(x) - 1; i >= 0; i-- {
		switch {
		case x[i] > y[i]:
			return 1
		case x[i] < y[i]:
			return -1
		}
	}
	return 0
}

// isZero reports whether all words are zero.
func isZero(w []big.Word) bool {
	for _, x := range w {
		if x != 0 {
			return false
		}
	}
	return true
}

// equalWords reports whether two magnitudes are equal (leading zero words
// allowed).
func equalWords(x, y []big.Word) bool {
	if len(x) < len(y) {
		x, y = y, x
	}
	for i := len(y); i < len(x); i++ {
		if x[i] != 0 {
			return false
		}
	}
	for i := range y {
		if x[i] != y[i] {
			return false
		}
	}
	return true
}

// approx is a floating-point stand-in f*2^e for an exact ratio, with
// f = 0 exactly when the ratio is exactly 0 and 0.5 <= |f| < 1 otherwise.
// Its relative error is below 2^-49 (see approxQuo), which the screen in
// compareApprox allows for.
type approx struct {
	f float64
	e int
}

// wordBase is 2^W as a float64, W the word size.
const wordBase = float64(1 << bits.UintSize)

// topFloat returns t and e with |w| ~ t*2^e for a non-zero magnitude w,
// taking the highest words until more than 64 bits are covered. Each
// float64 rounding (at most five, three on 64-bit machines) and the
// truncated tail contribute below 2^-53 relative, so the relative error is
// below 2^-50.
func topFloat(w []big.Word) (float64, int) {
	i := len(w) - 1
	for w[i] == 0 {
		i--
	}
	t := float64(w[i])
	j := i
	for covered := bits.UintSize; covered < 64+bits.UintSize && j > 0; covered += bits.UintSize {
		j--
		t = t*wordBase + float64(w[j])
	}
	return t, j * bits.UintSize
}

// approxQuo returns the approx of num/den (num given by its sign and
// magnitude words, den > 0). Error: two topFloat values (2^-51 each) and one
// float64 division (2^-53), below 2^-49 in all.
func approxQuo(num []big.Word, negative bool, den []big.Word) approx {
	if isZero(num) {
		return approx{}
	}
	tn, en := topFloat(num)
	td, ed := topFloat(den)
	f, e := math.Frexp(tn / td)
	if negative {
		f = -f
	}
	return approx{f: f, e: e + en - ed}
}

// screenTolerance is the relative gap two approx values must show before
// their order is trusted: far above twice their relative errors (2^-49).
const screenTolerance = 0x1p-44

// compareApprox orders two approx values when their errors cannot change the
// answer: it returns the sign of a-b and true, or false when the values are
// too close to call (then compare exactly).
func compareApprox(a, b approx) (int, bool) {
	sa, sb := sign(a.f), sign(b.f)
	if sa != sb {
		// Signs are exact: a zero f stands for an exact zero.
		if sa < sb {
			return -1, true
		}
		return 1, true
	}
	if sa == 0 {
		return 0, true
	}
	if d := a.e - b.e; d >= 2 || d <= -2 {
		// The magnitudes differ by a factor of two or more.
		if (d > 0) == (sa > 0) {
			return 1, true
		}
		return -1, true
	}
	x := math.Ldexp(a.f, a.e-b.e)
	diff := x - b.f
	if math.Abs(diff) <= screenTolerance*(math.Abs(x)+math.Abs(b.f)) {
		return 0, false
	}
	if diff < 0 {
		return -1, true
	}
	return 1, true
}

func sign(f float64) int {
	switch {
	case f < 0:
		return -1
	case f > 0:
		return 1
	}
	return 0
}
