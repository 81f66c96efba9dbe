package interval

import (
	"fmt"
	"math/big"
)

// RoundDown returns the largest dyadic rational m*2^e <= r whose integer m
// has at most prec bits (prec >= 1). Use it to keep endpoints short; the
// relative change is below 2^(1-prec).
func RoundDown(r *big.Rat, prec uint) *big.Rat {
	return roundDyadic(r, prec, false)
}

// RoundUp returns the smallest dyadic rational m*2^e >= r whose integer m has
// at most prec bits (prec >= 1; a carry may give m = 2^prec, which is one
// significant bit).
func RoundUp(r *big.Rat, prec uint) *big.Rat {
	return roundDyadic(r, prec, true)
}

func roundDyadic(r *big.Rat, prec uint, up bool) *big.Rat {
	if prec < 1 {
		panic("interval: rounding needs prec >= 1")
	}
	switch r.Sign() {
	case 0:
		return new(big.Rat)
	case -1:
		x := roundDyadic(new(big.Rat).Neg(r), prec, !up)
		return x.Neg(x)
	}
	// Choose e so that m = r/2^e has exactly prec bits before rounding.
	e := r.Num().BitLen() - r.Denom().BitLen() - int(prec)
	for {
		num, den := shiftedFraction(r, -e)
		m, rem := new(big.Int).QuoRem(num, den, new(big.Int))
		if m.BitLen() > int(prec) {
			e++
			continue
		}
		if m.BitLen() < int(prec) {
			e--
			continue
		}
		if up && rem.Sign() != 0 {
			m.Add(m, big.NewInt(1))
		}
		return dyadic(m, e)
	}
}

// shiftedFraction returns num/den = r*2^s as integers.
func shiftedFraction(r *big.Rat, s int) (num, den *big.Int) {
	num, den = new(big.Int).Set(r.Num()), new(big.Int).Set(r.Denom())
	if s >= 0 {
		num.Lsh(num, uint(s))
	} else {
		den.Lsh(den, uint(-s))
	}
	return num, den
}

// dyadic returns m*2^e.
func dyadic(m *big.Int, e int) *big.Rat {
	x := new(big.Rat).SetInt(m)
	if e >= 0 {
		return x.SetInt(new(big.Int).Lsh(m, uint(e)))
	}
	return x.SetFrac(m, new(big.Int).Lsh(big.NewInt(1), uint(-e)))
}

// PowDown returns a value <= r^e for r >= 0 and e >= 0, a dyadic rational
// with at most prec bits. It uses binary powering with RoundDown after every
// product (all factors are nonnegative, so rounding each one down keeps the
// result below) at prec + bitlen(e) + 2 working bits, which absorbs the
// amplification of early errors by the exponent (about 2e roundings' worth):
// the relative error stays below about 2^(2-prec). It panics for r < 0 or
// e < 0.
func PowDown(r *big.Rat, e int, prec uint) *big.Rat {
	return powRounded(r, e, prec, false)
}

// PowUp returns a value >= r^e for r >= 0 and e >= 0, as PowDown rounding up.
func PowUp(r *big.Rat, e int, prec uint) *big.Rat {
	return powRounded(r, e, prec, true)
}

func powRounded(r *big.Rat, e int, prec uint, up bool) *big.Rat {
	if r.Sign() < 0 || e < 0 {
		panic(fmt.Sprintf("interval: directed power needs r >= 0 and e >= 0, got r = %s, e = %d", r.RatString(), e))
	}
	work := prec + uint(big.NewInt(int64(e)).BitLen()) + 2
	result := big.NewRat(1, 1)
	base := roundDyadic(r, work, up)
	for ; e > 0; e >>= 1 {
		if e&1 == 1 {
			result = roundDyadic(new(big.Rat).Mul(result, base), work, up)
		}
		if e > 1 {
			base = roundDyadic(new(big.Rat).Mul(base, base), work, up)
		}
	}
	return roundDyadic(result, prec, up)
}

// RootDown returns a value <= r^(1/d) for r >= 0 and d >= 1, with relative
// error about 2^-prec. With r = p/q it takes the exact integer floor of the
// d-th root of p*q^(d-1)*2^(d*K): r^(1/d) = (p*q^(d-1))^(1/d)/q, and the scale
// 2^K makes the root at least prec+1 bits long. It panics for r < 0 or d < 1.
func RootDown(r *big.Rat, d int, prec uint) *big.Rat {
	lo, _ := rootBracket(r, d, prec)
	return lo
}

// RootUp returns a value >= r^(1/d), as RootDown.
func RootUp(r *big.Rat, d int, prec uint) *big.Rat {
	_, hi := rootBracket(r, d, prec)
	return hi
}

// Sqrt returns an enclosure of the square root of r >= 0 with relative width
// about 2^-prec, from the exact integer square root (big.Int.Sqrt). It panics
// for r < 0.
func Sqrt(r *big.Rat, prec uint) Interval {
	lo, hi := rootBracket(r, 2, prec)
	return Interval{Lo: lo, Hi: hi}
}

func rootBracket(r *big.Rat, d int, prec uint) (lo, hi *big.Rat) {
	if r.Sign() < 0 || d < 1 {
		panic(fmt.Sprintf("interval: root needs r >= 0 and d >= 1, got r = %s, d = %d", r.RatString(), d))
	}
	if r.Sign() == 0 {
		return new(big.Rat), new(big.Rat)
	}
	p, q := r.Num(), r.Denom()
	n := new(big.Int).Exp(q, big.NewInt(int64(d-1)), nil)
	n.Mul(n, p)
	// The root of n*2^(d*K) has about (bitlen(n)+d*K)/d bits; ask for prec+2.
	k := 0
	if need := d*(int(prec)+2) - n.BitLen(); need > 0 {
		k = (need + d - 1) / d
	}
	n.Lsh(n, uint(d*k))
	s := integerRoot(n, d)
	den := new(big.Int).Lsh(q, uint(k))
	lo = new(big.Rat).SetFrac(s, den)
	if new(big.Int).Exp(s, big.NewInt(int64(d)), nil).Cmp(n) == 0 {
		return lo, new(big.Rat).Set(lo) // exact root
	}
	hi = new(big.Rat).SetFrac(new(big.Int).Add(s, big.NewInt(1)), den)
	// Shorten the endpoints; each moves outward by at most 2^-(prec+2) relative.
	return RoundDown(lo, prec+3), RoundUp(hi, prec+3)
}

// integerRoot returns floor(n^(1/d)) for n >= 0, d >= 1.
func integerRoot(n *big.Int, d int) *big.Int {
	if d == 1 || n.Sign() == 0 {
		return new(big.Int).Set(n)
	}
	if d == 2 {
		return new(big.Int).Sqrt(n)
	}
	// Integer Newton iteration x <- ((d-1)x + n/x^(d-1))/d from a start above
	// the root decreases strictly until it reaches the floor of the root
	// (by the AM-GM inequality each iterate stays >= the floor).
	x := new(big.Int).Lsh(big.NewInt(1), uint((n.BitLen()+d-1)/d))
	dm1 := big.NewInt(int64(d - 1))
	bd := big.NewInt(int64(d))
	for {
		y := new(big.Int).Exp(x, dm1, nil)
		y.Quo(n, y)
		y.Add(y, new(big.Int).Mul(dm1, x))
		y.Quo(y, bd)
		if y.Cmp(x) >= 0 {
			break
		}
		x = y
	}
	return x
}
