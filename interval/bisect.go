package interval

import (
	"fmt"
	"math/big"
)

// maxPrecisionRetries is how many times Bisect doubles the working precision
// before it gives up deciding the sign of f at one point.
const maxPrecisionRetries = 3

// Bisect isolates a root of a continuous function by bisection on certified
// signs. f(x, p) must return an enclosure of the function's value at the
// exact rational x, of width roughly 2^-p (for values of order one). The
// enclosures at a and b must exclude 0 with opposite signs; each midpoint
// replaces the endpoint whose sign it shares, so the returned [lo, hi]
// always holds a sign change of f (a root, f being continuous). Bisection
// stops when hi - lo <= 2^-prec * max(|lo|, |hi|).
//
// f is called at working precision prec+32 first; when its enclosure at a
// point contains 0 the precision is doubled, up to three times. If the sign
// still cannot be decided (the point may be an exact root, or f may be too
// coarse), Bisect returns the bracket reached so far together with an error
// naming the point.
func Bisect(f func(x *big.Rat, prec uint) Interval, a, b *big.Rat, prec uint) (Interval, error) {
	lo, hi := new(big.Rat).Set(a), new(big.Rat).Set(b)
	if lo.Cmp(hi) >= 0 {
		return Interval{Lo: lo, Hi: hi}, fmt.Errorf("interval: Bisect needs a < b, got [%s, %s]", a.RatString(), b.RatString())
	}
	work := prec + 32
	sLo, err := certifiedSign(f, lo, work)
	if err != nil {
		return Interval{Lo: lo, Hi: hi}, err
	}
	sHi, err := certifiedSign(f, hi, work)
	if err != nil {
		return Interval{Lo: lo, Hi: hi}, err
	}
	if sLo == sHi {
		return Interval{Lo: lo, Hi: hi}, fmt.Errorf("interval: Bisect found the same sign (%+d) at both ends of [%s, %s]; no sign change to isolate", sLo, DecimalDown(lo, 20), DecimalUp(hi, 20))
	}
	half := big.NewRat(1, 2)
	for !relativelyNarrow(lo, hi, prec) {
		mid := new(big.Rat).Add(lo, hi)
		mid.Mul(mid, half)
		s, err := certifiedSign(f, mid, work)
		if err != nil {
			return Interval{Lo: lo, Hi: hi}, err
		}
		if s == sLo {
			lo = mid
		} else {
			hi = mid
		}
	}
	return Interval{Lo: lo, Hi: hi}, nil
}

// certifiedSign returns the sign of f at x proved by an enclosure excluding 0.
func certifiedSign(f func(x *big.Rat, prec uint) Interval, x *big.Rat, work uint) (int, error) {
	p := work
	for try := 0; try <= maxPrecisionRetries; try++ {
		v := f(x, p)
		if v.Lo.Sign() > 0 {
			return 1, nil
		}
		if v.Hi.Sign() < 0 {
			return -1, nil
		}
		p *= 2
	}
	return 0, fmt.Errorf("interval: cannot decide the sign of the function at x = %s even at %d bits; x may be an exact root, or the enclosure is too coarse", x.RatString(), p/2)
}

// relativelyNarrow reports whether hi - lo <= 2^-prec * max(|lo|, |hi|).
func relativelyNarrow(lo, hi *big.Rat, prec uint) bool {
	scale := new(big.Rat).Abs(lo)
	if h := new(big.Rat).Abs(hi); h.Cmp(scale) > 0 {
		scale = h
	}
	w := new(big.Rat).Sub(hi, lo)
	w.Mul(w, new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), prec)))
	return w.Cmp(scale) <= 0
}
