package prob

import (
	"context"
	"fmt"
	"math"
	"math/big"

	"avoidcert/certify"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// MaxN is the largest N that Enclose and Certified accept.
const MaxN = 1_000_000_000

// powPrec is the relative precision (bits) of the outward-rounded powers:
// far below any relative width this package reports.
const powPrec = 128

// Enclosure is a proved interval [Lo, Hi] for a_N/N!.
type Enclosure struct{ Lo, Hi Dyadic }

// Enclose returns an interval that contains a_N/N!, from the explicit bound
// for every n >= N0 of the checked certificate c:
// A MuLo^(N-N0) <= a_N/N! <= A MuHi^(N-N0) with A = AN0/N0!. It refuses
// N < N0, N > MaxN and a certificate without an upper bound.
func Enclose(c *certify.Certificate, N int) (Enclosure, error) {
	a := c.Statement.AllN
	switch {
	case N > MaxN:
		return Enclosure{}, fmt.Errorf("prob: N = %d is past %d", N, MaxN)
	case a.AN0 == nil || a.MuLo == nil:
		return Enclosure{}, fmt.Errorf("prob: the certificate states no bound for every n")
	case N < a.N0:
		return Enclosure{}, fmt.Errorf("prob: the certificate's bound holds from n = %d on, not at N = %d", a.N0, N)
	case a.MuHi == nil:
		return Enclosure{}, fmt.Errorf("prob: the certificate states no upper bound for every n")
	}
	A := new(big.Rat).SetFrac(a.AN0, factorial(a.N0))
	e := N - a.N0
	lo := dyadicOf(A, powPrec, false).mul(dyadicOf(a.MuLo, powPrec, false).pow(e, powPrec, false), powPrec, false)
	hi := dyadicOf(A, powPrec, true).mul(dyadicOf(a.MuHi, powPrec, true).pow(e, powPrec, true), powPrec, true)
	return Enclosure{Lo: lo, Hi: hi}, nil
}

// RelativeWidth returns an upper bound of (Hi - Lo)/Lo, or nil when Lo is 0.
func (x Enclosure) RelativeWidth() *big.Rat {
	if x.Lo.M.Sign() == 0 {
		return nil
	}
	// (Hi - Lo)/Lo = Hi/Lo - 1, computed on the mantissas: the exponents
	// only enter as one power of two.
	q := new(big.Rat).SetFrac(x.Hi.M, x.Lo.M)
	d := x.Hi.E - x.Lo.E
	p := new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), uint(abs(d))))
	if d >= 0 {
		q.Mul(q, p)
	} else {
		q.Quo(q, p)
	}
	q.Sub(q, big.NewRat(1, 1))
	return interval.RoundUp(q, 64)
}

// Certified is a certified interval for a_N/N! and the checked certificate
// it was read from.
type Certified struct {
	Interval Enclosure
	Result   *prove.Result
	// Digits is the bracket's target in significant digits of lambda.
	Digits int
	// Narrow reports whether the relative width met the target. It is
	// false when the lower end is 0, which more digits do not change:
	// lambda = 0 (the bound for every n has mu_lo = 0), or a_n = 0.
	Narrow bool
}

// DigitsFor returns the significant digits of lambda that make the relative
// width of the interval at N about target: the width of mu^(N-N0) grows
// like (N-N0) times the relative width of mu, so log10(N) digits more than
// the target's, and three to spare.
func DigitsFor(N int, target float64) int {
	d := int(math.Ceil(math.Log10(float64(max(N, 1))) - math.Log10(target)))
	return max(d+3, 10)
}

// maxTries bounds how often Certify tightens a bracket that fell short.
const maxTries = 3

// Certify brackets set with prove.Certify to DigitsFor(N, target) digits,
// encloses a_N/N! from the checked certificate's bound for every n, and
// tightens the bracket (more digits) while the relative width is above
// target and the budgets of opts allow. A result whose width is still above
// target has Narrow false; it is still a proved enclosure.
func Certify(ctx context.Context, set pattern.Set, N int, target float64, opts prove.Options) (*Certified, error) {
	if N < 0 || N > MaxN {
		return nil, fmt.Errorf("prob: N = %d is outside 0..%d", N, MaxN)
	}
	digits := DigitsFor(N, target)
	var best *Certified
	for try := 0; try < maxTries && digits <= certify.MaxDigits-5; try++ {
		o := opts
		o.Digits = digits
		res, err := prove.Certify(ctx, set, o)
		if err != nil {
			if best != nil && ctx.Err() == nil {
				return best, nil
			}
			return nil, err
		}
		x, err := Enclose(res.Certificate, N)
		if err != nil {
			return nil, err
		}
		best = &Certified{Interval: x, Result: res, Digits: digits, Narrow: below(x.RelativeWidth(), target)}
		if best.Narrow || !res.Done() || x.Lo.M.Sign() == 0 {
			// a lower end 0 (lambda = 0, or a_n = 0 from some n on) is
			// not narrowed by more digits
			return best, nil
		}
		digits += 5
	}
	return best, nil
}

func below(w *big.Rat, target float64) bool {
	if w == nil {
		return false
	}
	t := new(big.Rat)
	t.SetFloat64(target)
	return w.Cmp(t) <= 0
}
