package interval

import (
	"fmt"
	"math/big"
)

// powerSeries is a power series sum c_n z^n with exactly known coefficients
// and a majorant m_n >= |c_n| with a ratio bound: for all n' >= n and
// 0 <= x <= X,
//
//	m_{n'+s} X^s <= ratio(n, X) * m_{n'},   s = step().
//
// The bound makes the tail after any index a sum of s geometric series, one
// per residue class mod s (a class whose majorant vanishes once vanishes for
// good, since its later terms are bounded by a multiple of zero).
type powerSeries interface {
	coef(n int) *big.Rat
	majorant(n int) *big.Rat
	step() int
	ratio(n int, x *big.Rat) *big.Rat
}

// tailBound returns an upper bound for sum_{n>N} m_n X^n, namely
// sum_{r=1..s} m_{N+r} X^{N+r} / (1 - ratio(N+r, X)), or nil when some ratio
// bound is not below 1 yet (take more terms).
func tailBound(ps powerSeries, N int, x *big.Rat) *big.Rat {
	total := new(big.Rat)
	one := big.NewRat(1, 1)
	for r := 1; r <= ps.step(); r++ {
		m := ps.majorant(N + r)
		if m.Sign() == 0 {
			continue
		}
		rho := ps.ratio(N+r, x)
		if rho.Cmp(one) >= 0 {
			return nil
		}
		t := new(big.Rat).Mul(m, ratPow(x, N+r))
		t.Quo(t, new(big.Rat).Sub(one, rho))
		total.Add(total, t)
	}
	return total
}

func ratPow(x *big.Rat, e int) *big.Rat {
	n := new(big.Int).Exp(x.Num(), big.NewInt(int64(e)), nil)
	d := new(big.Int).Exp(x.Denom(), big.NewInt(int64(e)), nil)
	return new(big.Rat).SetFrac(n, d)
}

// derivative is the series of d/dz of its base: c'_n = (n+1) c_{n+1},
// majorant m'_n = (n+1) m_{n+1}. Its ratio bound follows from the base's:
// m'_{n'+s} X^s / m'_{n'} = (n'+s+1)/(n'+1) * m_{n'+1+s} X^s / m_{n'+1}
// <= (n+s+1)/(n+1) * ratio(n+1, X) for n' >= n, the first factor falling in n'.
type derivative struct{ base powerSeries }

func (d derivative) coef(n int) *big.Rat {
	return new(big.Rat).Mul(d.base.coef(n+1), big.NewRat(int64(n+1), 1))
}

func (d derivative) majorant(n int) *big.Rat {
	return new(big.Rat).Mul(d.base.majorant(n+1), big.NewRat(int64(n+1), 1))
}

func (d derivative) step() int { return d.base.step() }

func (d derivative) ratio(n int, x *big.Rat) *big.Rat {
	s := d.base.step()
	r := new(big.Rat).Mul(d.base.ratio(n+1, x), big.NewRat(int64(n+s+1), int64(n+1)))
	return r
}

// evaluator encloses a power series on [0, limit] in fixed-point arithmetic:
// values are integers scaled by 2^work, every rounding is directed.
type evaluator struct {
	ps    powerSeries
	limit *big.Rat
	cache map[uint]*fixedPoly
}

// fixedPoly is the truncation of a series to degree N at one precision: the
// positive coefficients and the magnitudes of the negative ones, each rounded
// down and up, plus the rounded-up tail bound, all scaled by 2^work.
type fixedPoly struct {
	work           uint
	posDown, posUp []*big.Int
	negDown, negUp []*big.Int
	tail           *big.Int
}

func newEvaluator(ps powerSeries, limit *big.Rat) *evaluator {
	return &evaluator{ps: ps, limit: limit, cache: map[uint]*fixedPoly{}}
}

// maxTerms bounds the truncation degree; reaching it means the series was
// asked for more than this package supports (see the Lambda functions).
const maxTerms = 20000

func (e *evaluator) poly(prec uint) *fixedPoly {
	if fp, ok := e.cache[prec]; ok {
		return fp
	}
	target := fixedToRat(big.NewInt(1), prec+2)
	N := 0
	var tail *big.Rat
	for ; ; N++ {
		if N > maxTerms {
			panic(fmt.Sprintf("interval: series needs more than %d terms at %d bits", maxTerms, prec))
		}
		if tail = tailBound(e.ps, N, e.limit); tail != nil && tail.Cmp(target) <= 0 {
			break
		}
	}
	// Horner multiplies earlier rounding errors by x <= limit at each of N
	// steps: guard bits N*log2(limit) keep the width near 2^-prec.
	limitBits := 0
	for pow := big.NewRat(1, 1); pow.Cmp(e.limit) < 0; pow.Mul(pow, big.NewRat(2, 1)) {
		limitBits++
	}
	work := prec + uint(N*limitBits+big.NewInt(int64(N)).BitLen()+4)
	scale := new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), work))
	fp := &fixedPoly{work: work, tail: ceilRat(new(big.Rat).Mul(tail, scale))}
	zero := new(big.Int)
	for n := 0; n <= N; n++ {
		c := e.ps.coef(n)
		scaled := new(big.Rat).Mul(new(big.Rat).Abs(c), scale)
		down, up := floorRat(scaled), ceilRat(scaled)
		if c.Sign() >= 0 {
			fp.posDown, fp.posUp = append(fp.posDown, down), append(fp.posUp, up)
			fp.negDown, fp.negUp = append(fp.negDown, zero), append(fp.negUp, zero)
		} else {
			fp.posDown, fp.posUp = append(fp.posDown, zero), append(fp.posUp, zero)
			fp.negDown, fp.negUp = append(fp.negDown, down), append(fp.negUp, up)
		}
	}
	e.cache[prec] = fp
	return fp
}

// eval returns an enclosure of the series' values on [u, v], 0 <= u <= v <=
// limit, of width about 2^-prec when u = v. With P the positive part and Q
// the negated negative part of the truncation (both increasing on x >= 0),
// the value lies in [P(u) - Q(v) - T, P(v) - Q(u) + T], T the tail bound.
func (e *evaluator) eval(u, v *big.Rat, prec uint) Interval {
	if u.Sign() < 0 || u.Cmp(v) > 0 || v.Cmp(e.limit) > 0 {
		panic(fmt.Sprintf("interval: series evaluated outside [0, %s]", e.limit.RatString()))
	}
	fp := e.poly(prec)
	scale := new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), fp.work))
	xd := floorRat(new(big.Rat).Mul(u, scale))
	xu := ceilRat(new(big.Rat).Mul(v, scale))
	lo := horner(fp.posDown, xd, fp.work, false)
	lo.Sub(lo, horner(fp.negUp, xu, fp.work, true))
	lo.Sub(lo, fp.tail)
	hi := horner(fp.posUp, xu, fp.work, true)
	hi.Sub(hi, horner(fp.negDown, xd, fp.work, false))
	hi.Add(hi, fp.tail)
	return Interval{Lo: fixedToRat(lo, fp.work), Hi: fixedToRat(hi, fp.work)}
}

// horner evaluates sum a_n x^n for nonnegative fixed-point a_n and x, every
// product shifted with floor (or ceiling when up), so the result is a lower
// (upper) bound of the exact value of the rounded coefficients at x.
func horner(a []*big.Int, x *big.Int, work uint, up bool) *big.Int {
	acc := new(big.Int).Set(a[len(a)-1])
	roundUp := new(big.Int).Sub(new(big.Int).Lsh(big.NewInt(1), work), big.NewInt(1))
	for n := len(a) - 2; n >= 0; n-- {
		acc.Mul(acc, x)
		if up {
			acc.Add(acc, roundUp)
		}
		acc.Rsh(acc, work)
		acc.Add(acc, a[n])
	}
	return acc
}

// scanPrec is the precision of the certified scan for the first sign change.
const scanPrec = 64

// smallestPositiveRoot returns [a, b] holding the smallest positive root of
// the series w, which must be positive at 0, and proves that it is the first
// sign change: w > 0 on [0, a], and on [a, b] w is strictly decreasing
// (derivative enclosure below 0) with w(b) < 0, so the root there is unique.
// Cells of width 1/16 from 0 to limit are proved positive or split.
func smallestPositiveRoot(w *evaluator, dw *evaluator) (a, b *big.Rat, err error) {
	zero := new(big.Rat)
	if w.eval(zero, zero, scanPrec).Lo.Sign() <= 0 {
		return nil, nil, fmt.Errorf("interval: series is not certified positive at 0")
	}
	h := big.NewRat(1, 16)
	for u := new(big.Rat); u.Cmp(w.limit) < 0; u = new(big.Rat).Add(u, h) {
		v := new(big.Rat).Add(u, h)
		if v.Cmp(w.limit) > 0 {
			v.Set(w.limit)
		}
		a, b, err := scanCell(w, dw, u, v, 0)
		if err != nil || a != nil {
			return a, b, err
		}
	}
	return nil, nil, fmt.Errorf("interval: no sign change of the series on [0, %s]", w.limit.RatString())
}

// maxScanDepth bounds cell splitting in the scan.
const maxScanDepth = 40

// scanCell decides, given w > 0 on [0, u], whether [u, v] holds the first
// root, returning the subcell [a, b] that isolates it, or proves w > 0 on all
// of [u, v] (a == nil), splitting the cell as needed.
func scanCell(w, dw *evaluator, u, v *big.Rat, depth int) (a, b *big.Rat, err error) {
	if w.eval(u, v, scanPrec).Lo.Sign() > 0 {
		return nil, nil, nil
	}
	if dw.eval(u, v, scanPrec).Hi.Sign() < 0 {
		// w is strictly decreasing on [u, v] and w(u) > 0, so the sign of
		// w(v) settles the cell; w(v) may be tiny (the root of 12...k is
		// within about 1/k! of 1), hence the rising precision.
		point := func(x *big.Rat, p uint) Interval { return w.eval(x, x, p) }
		switch s, err := certifiedSign(point, v, scanPrec); {
		case err == nil && s > 0:
			return nil, nil, nil
		case err == nil && s < 0:
			return u, v, nil
		}
	}
	if depth >= maxScanDepth {
		return nil, nil, fmt.Errorf("interval: cannot certify the sign of the series near [%s, %s]", DecimalDown(u, 12), DecimalUp(v, 12))
	}
	mid := new(big.Rat).Add(u, v)
	mid.Mul(mid, big.NewRat(1, 2))
	if a, b, err = scanCell(w, dw, u, mid, depth+1); a != nil || err != nil {
		return a, b, err
	}
	return scanCell(w, dw, mid, v, depth+1)
}
