// Package interval provides rigorous real arithmetic for avoidcert: closed
// intervals with exact rational endpoints, directed rounding to short dyadic
// rationals, outward decimal output and input, root isolation by bisection on
// certified signs, and reference enclosures of published growth constants.
//
// # Guarantees
//
//   - Every returned Interval encloses the true value. Enclosures are proved
//     by exact rational arithmetic (math/big), by integer roots, or by
//     directed rounding whose direction is chosen so the true value stays
//     inside; series are cut with a tail bound proved in the doc comment of
//     the function that uses it. Floating point (float64, big.Float) is never
//     used inside a bound.
//   - DecimalDown and DecimalUp print outward: the printed lower end is <= the
//     exact value and the printed upper end >= it, so a printed interval still
//     encloses. (big.Rat and big.Float formatting round to nearest and must
//     not be used for bounds.)
//   - RoundDown, RoundUp, PowDown, PowUp, RootDown and RootUp return values on
//     the stated side of the exact result.
//   - Functions that take a precision prec aim at a width of about 2^-prec
//     relative to the value; the width is a target, the enclosure is proved.
//
// # Aliasing
//
// No function or method modifies its arguments or receiver. Results are
// freshly allocated and never share memory with arguments, so callers may
// modify them; an Interval value's endpoints may be shared by copies of the
// value itself, as with any struct of pointers.
//
// # Reference constants
//
// Lambda123, Lambda132, LambdaMonotone, LambdaNonOverlapping and
// LambdaAlternating enclose growth rates lambda (a_n/n! ~ c lambda^n) of
// pattern sets for which the literature gives the exponential generating
// function; each doc comment names its source. PublishedGrowth returns digits
// as printed in OEIS entries, for tests that compare certified brackets with
// the literature; those digits are published values, not computed here.
package interval
