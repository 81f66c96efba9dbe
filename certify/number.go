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
	// Find the shift s for which q = floor(r 10^s) has exactly digits
	// digits; the digit counts of r's numerator and denominator give a
	// first guess, and the count of q moves by at most one per step.
	s := digits - (len(r.Num().String()) - len(r.Denom().String()))
	var q, rem *big.Int
	for {
		q, rem = scaled(r, s)
		if n := len(q.String()); q.Sign() == 0 || n < digits {
			s++
		} else if n > digits {
			s--
		} else {
			break
		}
	}
	if up && rem.Sign() != 0 {
		q.Add(q, big.NewInt(1))
	}
	// q 10^-s in positional notation
	text := q.String()
	if s <= 0 {
		return text + strings.Repeat("0", -s)
	}
	if len(text) <= s {
		text = strings.Repeat("0", s-len(text)+1) + text
	}
	whole, frac := text[:len(text)-s], strings.TrimRight(text[len(text)-s:], "0")
	if frac == "" {
		return whole
	}
	return whole + "." + frac
}

// scaled returns the quotient and remainder of r 10^s, for any integer s.
func scaled(r *big.Rat, s int) (q, rem *big.Int) {
	num, den := new(big.Int).Set(r.Num()), new(big.Int).Set(r.Denom())
	ten := big.NewInt(10)
	if s >= 0 {
		num.Mul(num, new(big.Int).Exp(ten, big.NewInt(int64(s)), nil))
	} else {
		den.Mul(den, new(big.Int).Exp(ten, big.NewInt(int64(-s)), nil))
	}
	return num.QuoRem(num, den, new(big.Int))
}

// abbreviate shortens a long string for an error message.
func abbreviate(s string) string {
	const keep = 24
	if len(s) <= 2*keep+3 {
		return s
	}
	return s[:keep] + "..." + s[len(s)-keep:]
}
