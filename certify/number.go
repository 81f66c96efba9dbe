package certify

import (
	"fmt"
	"math/big"
	"strings"
)

// The canonical number strings of a certificate:
//
//	integer   "0" or a non-zero digit followed by digits
//	rational  "p/q": p an integer, q a positive integer, gcd(p, q) = 1
//	decimal   see decimalOutward
//
// No sign, no spaces, no exponent: every non-negative value has exactly one
// spelling, so a tampered number cannot hide behind an equivalent form.

// parseInteger reads a canonical non-negative integer.
func parseInteger(s string) (*big.Int, error) {
	if len(s) > MaxNumberLength {
		return nil, fmt.Errorf("integer of %d characters is over the limit of %d", len(s), MaxNumberLength)
	}
	if s == "" {
		return nil, fmt.Errorf("empty integer")
	}
	for _, c := range s {
		if c < '0' || c > '9' {
			return nil, fmt.Errorf("integer %q has a character other than a digit", abbreviate(s))
		}
	}
	if len(s) > 1 && s[0] == '0' {
		return nil, fmt.Errorf("integer %q has a leading zero", abbreviate(s))
	}
	n, ok := new(big.Int).SetString(s, 10)
	if !ok {
		return nil, fmt.Errorf("integer %q does not parse", abbreviate(s))
	}
	return n, nil
}

// parseRational reads a canonical rational "p/q".
func parseRational(s string) (*big.Rat, error) {
	if len(s) > MaxNumberLength {
		return nil, fmt.Errorf("rational of %d characters is over the limit of %d", len(s), MaxNumberLength)
	}
	num, den, ok := strings.Cut(s, "/")
	if !ok {
		return nil, fmt.Errorf("rational %q is not written p/q", abbreviate(s))
	}
	p, err := parseInteger(num)
	if err != nil {
		return nil, fmt.Errorf("numerator: %v", err)
	}
	q, err := parseInteger(den)
	if err != nil {
		return nil, fmt.Errorf("denominator: %v", err)
	}
	if q.Sign() == 0 {
		return nil, fmt.Errorf("rational %q has denominator 0", abbreviate(s))
	}
	if new(big.Int).GCD(nil, nil, p, q).Cmp(big.NewInt(1)) != 0 {
		return nil, fmt.Errorf("rational %q is not in lowest terms", abbreviate(s))
	}
	return new(big.Rat).SetFrac(p, q), nil
}

// formatRational writes r as "p/q" in lowest terms ("0/1" for zero).
func formatRational(r *big.Rat) string {
	return r.Num().String() + "/" + r.Denom().String()
}

// decimalOutward returns r rounded outward to digits significant digits:
// down (toward zero) when up is false, up otherwise. The result is written
// in positional notation, without exponent, trailing zeros after the point
// removed and the point removed when nothing follows it: "0.82699", "1.5",
// "1200", "0". r must be non-negative and digits at least 1.
func decimalOutward(r *big.Rat, digits int, up bool) string {
	if r.Sign() == 0 {
		return "0"
	}
	e := decimalExponent(r)
	// scale r by 10^shift so that it has exactly digits digits before the point
	shift := digits - 1 - e
	v := new(big.Rat).Mul(r, pow10(shift))
	q, rem := new(big.Int).QuoRem(v.Num(), v.Denom(), new(big.Int))
	if up && rem.Sign() != 0 {
		q.Add(q, big.NewInt(1))
	}
	s := q.String()
	if shift <= 0 {
		return s + strings.Repeat("0", -shift)
	}
	if len(s) <= shift {
		s = strings.Repeat("0", shift-len(s)+1) + s
	}
	whole, frac := s[:len(s)-shift], strings.TrimRight(s[len(s)-shift:], "0")
	if frac == "" {
		return whole
	}
	return whole + "." + frac
}

// decimalExponent returns the E with 10^E <= r < 10^(E+1), for r > 0.
func decimalExponent(r *big.Rat) int {
	// the digit counts give E to within one; exact comparisons settle it
	e := len(r.Num().String()) - len(r.Denom().String())
	for r.Cmp(pow10(e)) < 0 {
		e--
	}
	for r.Cmp(pow10(e+1)) >= 0 {
		e++
	}
	return e
}

// pow10 returns 10^e exactly, for any integer e.
func pow10(e int) *big.Rat {
	n := int64(e)
	if n < 0 {
		n = -n
	}
	p := new(big.Int).Exp(big.NewInt(10), big.NewInt(n), nil)
	if e < 0 {
		return new(big.Rat).SetFrac(big.NewInt(1), p)
	}
	return new(big.Rat).SetInt(p)
}

// abbreviate shortens a long string for an error message.
func abbreviate(s string) string {
	const keep = 24
	if len(s) <= 2*keep+3 {
		return s
	}
	return s[:keep] + "..." + s[len(s)-keep:]
}
