package interval

import "math/big"

// Interval is the closed interval [Lo, Hi] with exact rational endpoints,
// Lo <= Hi. Methods never modify their receiver or arguments and always
// return freshly allocated values, so results may be kept and changed freely;
// the receiver's endpoints may be shared with the caller.
type Interval struct{ Lo, Hi *big.Rat }

// Point returns the degenerate interval [r, r] (a copy of r).
func Point(r *big.Rat) Interval {
	return Interval{Lo: new(big.Rat).Set(r), Hi: new(big.Rat).Set(r)}
}

// Contains reports whether Lo <= r <= Hi.
func (x Interval) Contains(r *big.Rat) bool {
	return x.Lo.Cmp(r) <= 0 && r.Cmp(x.Hi) <= 0
}

// ContainsInterval reports whether y is a subset of x.
func (x Interval) ContainsInterval(y Interval) bool {
	return x.Lo.Cmp(y.Lo) <= 0 && y.Hi.Cmp(x.Hi) <= 0
}

// Width returns Hi - Lo.
func (x Interval) Width() *big.Rat {
	return new(big.Rat).Sub(x.Hi, x.Lo)
}

// Inverse returns [1/Hi, 1/Lo], the exact image of x under t -> 1/t. It
// panics unless 0 < Lo.
func (x Interval) Inverse() Interval {
	if x.Lo.Sign() <= 0 {
		panic("interval: Inverse needs an interval of positive numbers, got lower end " + x.Lo.RatString())
	}
	return Interval{Lo: new(big.Rat).Inv(x.Hi), Hi: new(big.Rat).Inv(x.Lo)}
}

// Add returns the exact sum x + y.
func (x Interval) Add(y Interval) Interval {
	return Interval{Lo: new(big.Rat).Add(x.Lo, y.Lo), Hi: new(big.Rat).Add(x.Hi, y.Hi)}
}

// Sub returns the exact difference x - y.
func (x Interval) Sub(y Interval) Interval {
	return Interval{Lo: new(big.Rat).Sub(x.Lo, y.Hi), Hi: new(big.Rat).Sub(x.Hi, y.Lo)}
}

// Mul returns the exact product x*y (the hull of the four endpoint products).
func (x Interval) Mul(y Interval) Interval {
	lo := new(big.Rat).Mul(x.Lo, y.Lo)
	hi := new(big.Rat).Set(lo)
	for _, p := range []*big.Rat{
		new(big.Rat).Mul(x.Lo, y.Hi),
		new(big.Rat).Mul(x.Hi, y.Lo),
		new(big.Rat).Mul(x.Hi, y.Hi),
	} {
		if p.Cmp(lo) < 0 {
			lo = p
		}
		if p.Cmp(hi) > 0 {
			hi = p
		}
	}
	return Interval{Lo: lo, Hi: hi}
}

// Round returns [RoundDown(Lo, prec), RoundUp(Hi, prec)], an enclosure of x
// with short dyadic endpoints.
func (x Interval) Round(prec uint) Interval {
	return Interval{Lo: RoundDown(x.Lo, prec), Hi: RoundUp(x.Hi, prec)}
}

// String returns "[DecimalDown(Lo, digits), DecimalUp(Hi, digits)]", a
// printed interval that still encloses x.
func (x Interval) String(digits int) string {
	return "[" + DecimalDown(x.Lo, digits) + ", " + DecimalUp(x.Hi, digits) + "]"
}
