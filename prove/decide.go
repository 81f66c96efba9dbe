package prove

import (
	"math/big"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/interval"
)

// Enclosure returns what a certificate proves about lambda or 1/lambda,
// from its statement and its structure section: lambda in [lo, hi], and
// lambda = 0 exactly when the structure section says so. The radius is
// the exact reciprocal: [1/hi, 1/lo], with Hi nil (+infinity) when lo is
// 0, and Lo nil too (the value +infinity) when lambda = 0. Only call it on
// a certificate the checker accepted: the function reads, it proves
// nothing.
func Enclosure(c *certify.Certificate, of bounds.Quantity) bounds.Enclosure {
	lo, hi := c.Statement.Lambda.Lo, c.Statement.Lambda.Hi
	if c.Structure != nil && c.Structure.Lambda == certify.LambdaZero {
		lo, hi = new(big.Rat), new(big.Rat)
	}
	if of != bounds.QuantityRadius {
		return bounds.Enclosure{Lo: lo, Hi: hi}
	}
	var r bounds.Enclosure
	if hi.Sign() > 0 {
		r.Lo = new(big.Rat).Inv(hi)
	}
	if lo.Sign() > 0 {
		r.Hi = new(big.Rat).Inv(lo)
	}
	return r
}

// Decide judges the claim "the value lies in the closed interval claim"
// against the enclosure q of a checked certificate (Enclosure), by the
// rule the bracket runs aim for (bounds.Decide): proved when q lies inside
// the claim, refuted when it misses it, undecided when they overlap.
func Decide(q bounds.Enclosure, claim interval.Interval) bounds.Verdict {
	return bounds.Decide(q, claim)
}

// DecideOrder judges lambda(first) < lambda(second) from two checked
// certificates: proved when first's upper end is below second's lower
// end, refuted when first's lower end is at or above second's upper end.
func DecideOrder(first, second *certify.Certificate) bounds.Verdict {
	a, b := Enclosure(first, bounds.QuantityLambda), Enclosure(second, bounds.QuantityLambda)
	switch {
	case a.Hi.Cmp(b.Lo) < 0:
		return bounds.Proved
	case a.Lo.Cmp(b.Hi) >= 0:
		return bounds.Refuted
	}
	return bounds.Undecided
}

// Form is the structure class a checked certificate states: its class,
// with the period (periodic) and the exponent (primitive); class
// "undecided" when the certificate has no structure section.
type Form struct {
	Class    certify.StructureClass
	Period   int
	Exponent int
}

// FormOf reads the structure section of a checked certificate.
func FormOf(c *certify.Certificate) Form {
	if c.Structure == nil {
		return Form{Class: certify.ClassUndecided}
	}
	return Form{Class: c.Structure.Class, Period: c.Structure.Period, Exponent: c.Structure.Exponent}
}
