package prove

import (
	"fmt"
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
// with the period (periodic), the primitivity exponent (primitive), the
// first n with a_n = 0 (finite) and the number of blocks of recurrent
// states (reducible); class "undecided" when the certificate has no
// structure section.
type Form struct {
	Class    certify.StructureClass
	Period   int
	Exponent int
	N1       int
	Blocks   int
}

// FormOf reads the structure section of a checked certificate. It is the
// one place that reads a certificate's structure class.
func FormOf(c *certify.Certificate) Form {
	if c.Structure == nil {
		return Form{Class: certify.ClassUndecided}
	}
	s := c.Structure
	return Form{Class: s.Class, Period: s.Period, Exponent: s.Exponent, N1: s.N1, Blocks: len(s.Blocks)}
}

// Words states the form in one line of plain text: the class and the
// asymptotics it proves.
func (f Form) Words() string {
	switch f.Class {
	case certify.ClassPrimitive:
		return fmt.Sprintf("primitive, primitivity exponent k = %d (the least k with T^k positive): a_n/n! = c lambda^n (1 + O(theta^n)) with c > 0, theta < 1", f.Exponent)
	case certify.ClassPeriodic:
		return fmt.Sprintf("periodic, period %d: a_n/n! = lambda^n (c_(n mod %d) + o(1)) with constants c_r >= 0 (proved); one constant for every n is not proved; lambda bracketed through T^%d",
			f.Period, f.Period, f.Period)
	case certify.ClassReducible:
		blocks := "1 block"
		if f.Blocks != 1 {
			blocks = fmt.Sprintf("%d blocks", f.Blocks)
		}
		return fmt.Sprintf("reducible (%s of recurrent states): lambda is the largest over the blocks; a_n/n! ~ c lambda^n is not proved", blocks)
	case certify.ClassFinite:
		return fmt.Sprintf("finite: a_n = 0 for every n >= %d", f.N1)
	case certify.ClassSubexponential:
		return "subexponential: lambda = 0 proved, a_n > 0 for every n"
	}
	return "undecided: primitivity and the period are not proved"
}

// LambdaZero reports whether a checked certificate proves lambda = 0 (its
// structure section, or an upper end of 0): then 1/lambda has no value
// (Enclosure gives it as +infinity).
func LambdaZero(c *certify.Certificate) bool {
	return Enclosure(c, bounds.QuantityLambda).Hi.Sign() == 0
}

// Impossible says why no set of patterns has its quantity in the claimed
// interval, when the claim misses what every set satisfies: 0 <= a_n <= n!
// gives 0 <= lambda <= 1, so 1/lambda >= 1 (and none at all when
// lambda = 0). It returns "" when the claim is possible. Such a claim is
// refuted without a certificate.
func Impossible(claim interval.Interval, of bounds.Quantity) string {
	zero, one := new(big.Rat), big.NewRat(1, 1)
	const every = "every set has 0 <= lambda <= 1, since 0 <= a_n <= n!"
	switch {
	case of == bounds.QuantityRadius && claim.Hi.Cmp(one) < 0:
		return "every set has 1/lambda >= 1, since 0 <= a_n <= n!, and the claim lies below 1"
	case of != bounds.QuantityRadius && claim.Hi.Cmp(zero) < 0:
		return every + ", and the claim lies below 0"
	case of != bounds.QuantityRadius && claim.Lo.Cmp(one) > 0:
		return every + ", and the claim lies above 1"
	}
	return ""
}
