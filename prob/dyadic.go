package prob

import (
	"math"
	"math/big"

	"avoidcert/interval"
)

// Dyadic is the number M*2^E (M >= 0). a_N/N! at N = 10^9 is near
// 10^(-10^8); as a big.Rat its denominator would have hundreds of millions
// of bits, so the enclosure is kept as short dyadics with directed rounding:
// M never has more than prec bits after a rounded operation.
type Dyadic struct {
	M *big.Int
	E int
}

// dyadicOf returns r rounded to prec bits, down or up, as a Dyadic (r >= 0).
func dyadicOf(r *big.Rat, prec uint, up bool) Dyadic {
	if r.Sign() == 0 {
		return Dyadic{M: new(big.Int)}
	}
	// r = num/den; scale by 2^s so the quotient has about prec bits.
	s := int(prec) - (r.Num().BitLen() - r.Denom().BitLen())
	num, den := new(big.Int).Set(r.Num()), new(big.Int).Set(r.Denom())
	if s >= 0 {
		num.Lsh(num, uint(s))
	} else {
		den.Lsh(den, uint(-s))
	}
	q, rem := new(big.Int).QuoRem(num, den, new(big.Int))
	if up && rem.Sign() != 0 {
		q.Add(q, big.NewInt(1))
	}
	return Dyadic{M: q, E: -s}
}

// round cuts M to prec bits, toward 0 or away from it.
func (x Dyadic) round(prec uint, up bool) Dyadic {
	extra := x.M.BitLen() - int(prec)
	if extra <= 0 {
		return x
	}
	m := new(big.Int).Rsh(x.M, uint(extra))
	if up && new(big.Int).Lsh(m, uint(extra)).Cmp(x.M) != 0 {
		m.Add(m, big.NewInt(1))
	}
	return Dyadic{M: m, E: x.E + extra}
}

func (x Dyadic) mul(y Dyadic, prec uint, up bool) Dyadic {
	return Dyadic{M: new(big.Int).Mul(x.M, y.M), E: x.E + y.E}.round(prec, up)
}

// pow returns x^n rounded down or up; every product is rounded in the same
// direction, and all factors are >= 0, so the result stays on its side.
func (x Dyadic) pow(n int, prec uint, up bool) Dyadic {
	result := Dyadic{M: big.NewInt(1)}
	for base := x; n > 0; n >>= 1 {
		if n&1 == 1 {
			result = result.mul(base, prec, up)
		}
		if n > 1 {
			base = base.mul(base, prec, up)
		}
	}
	return result
}

// Rat returns x exactly. Only for moderate E: 2^|E| is built in full.
func (x Dyadic) Rat() *big.Rat {
	r := new(big.Rat).SetInt(x.M)
	p := new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), uint(abs(x.E))))
	if x.E >= 0 {
		return r.Mul(r, p)
	}
	return r.Quo(r, p)
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}

// Decimal prints x rounded outward (down, or up) to digits significant
// digits, in interval.DecimalDown's format. It scales x by a power of ten
// 10^-F (rounded in the same direction) into about [1, 10^4) so that only
// a short number goes through the exact decimal printer, which adds F to
// the printed exponent.
func (x Dyadic) Decimal(digits int, up bool) string {
	if x.M.Sign() == 0 {
		return "0"
	}
	const prec = 192
	log10 := (float64(x.M.BitLen()) + float64(x.E)) * math.Log10(2) // a choice of scale only
	F := int(math.Floor(log10)) - 2                                 // so x/10^F lies in [1, 10^4) despite the estimate
	if F > -20 && F < 20 {
		if up {
			return interval.DecimalUp(x.Rat(), digits)
		}
		return interval.DecimalDown(x.Rat(), digits)
	}
	ten := Dyadic{M: big.NewInt(10)}
	var scaled Dyadic
	if F < 0 {
		scaled = x.mul(ten.pow(-F, prec, up), prec, up)
	} else {
		// x / 10^F: divide by a power rounded the other way
		d := ten.pow(F, prec, !up)
		q := new(big.Rat).Quo(x.Rat0(), d.Rat0())
		scaled = dyadicOf(q, prec, up)
		scaled.E += x.E - d.E
	}
	return interval.DecimalScaled(scaled.Rat(), F, digits, up)
}

// Rat0 is M as a rational (the exponent left aside).
func (x Dyadic) Rat0() *big.Rat { return new(big.Rat).SetInt(x.M) }
