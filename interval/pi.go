package interval

import "math/big"

// Pi returns an enclosure of pi of width about 2^-prec, from Machin's formula
// pi = 16 arctan(1/5) - 4 arctan(1/239). Each arctangent is the alternating
// series sum (-1)^n / ((2n+1) q^(2n+1)) with decreasing terms, so the
// remainder after any term is at most the next term; every term is rounded
// outward in fixed point.
func Pi(prec uint) Interval {
	p := prec + 16
	aLo, aHi := arctanInverse(5, p)
	bLo, bHi := arctanInverse(239, p)
	lo := new(big.Int).Mul(aLo, big.NewInt(16))
	lo.Sub(lo, new(big.Int).Mul(bHi, big.NewInt(4)))
	hi := new(big.Int).Mul(aHi, big.NewInt(16))
	hi.Sub(hi, new(big.Int).Mul(bLo, big.NewInt(4)))
	return Interval{Lo: fixedToRat(lo, p), Hi: fixedToRat(hi, p)}
}

// arctanInverse returns lo <= 2^p * arctan(1/q) <= hi for an integer q >= 2.
func arctanInverse(q int64, p uint) (lo, hi *big.Int) {
	one := new(big.Int).Lsh(big.NewInt(1), p)
	lo, hi = new(big.Int), new(big.Int)
	qq := big.NewInt(q * q)
	power := big.NewInt(q) // q^(2n+1)
	for n := int64(0); ; n++ {
		den := new(big.Int).Mul(power, big.NewInt(2*n+1))
		down, up := quoFloorCeil(one, den)
		if up.Cmp(big.NewInt(1)) <= 0 {
			// This term is at most 2^-p and bounds the remainder of the
			// partial sum through term n-1.
			lo.Sub(lo, up)
			hi.Add(hi, up)
			return lo, hi
		}
		if n%2 == 0 {
			lo.Add(lo, down)
			hi.Add(hi, up)
		} else {
			lo.Sub(lo, up)
			hi.Sub(hi, down)
		}
		power.Mul(power, qq)
	}
}

// quoFloorCeil returns floor(a/b) and ceil(a/b) for a >= 0, b > 0.
func quoFloorCeil(a, b *big.Int) (down, up *big.Int) {
	down, rem := new(big.Int).QuoRem(a, b, new(big.Int))
	up = new(big.Int).Set(down)
	if rem.Sign() != 0 {
		up.Add(up, big.NewInt(1))
	}
	return down, up
}

// fixedToRat returns m / 2^p.
func fixedToRat(m *big.Int, p uint) *big.Rat {
	return new(big.Rat).SetFrac(m, new(big.Int).Lsh(big.NewInt(1), p))
}
