package interval

import (
	"fmt"
	"math"
	"math/big"
	"strings"

	"avoidcert/internal/brief"
)

// maxExponent bounds the decimal exponent ParseDecimal accepts, so that a
// mistyped claim such as "1e999999999" is refused instead of allocating a
// huge power of ten. It bounds the written exponent and the value alike:
// 10^-maxExponent <= |value| <= 10^maxExponent, so that whatever
// DecimalDown and DecimalUp print for an accepted value parses back (both
// bounds are powers of ten, so outward rounding never crosses them).
const maxExponent = 10000

// MaxDigits bounds the digits written in a decimal that ParseDecimal and
// ClaimRange accept. A claimed end near the growth rate enters the
// certificate that decides the claim as an exact fraction, and a
// certificate's numbers have at most 4096 characters (certify), which a
// fraction of a decimal of about 2,040 digits exceeds; 1000 digits keep
// every such fraction well inside, and beyond the 995 digits a bracket
// can be asked for.
const MaxDigits = 1000

// DecimalDown returns the largest decimal with at most digits significant
// digits that is <= r. It panics if digits < 1.
//
// Format: plain positional notation ("0.82699334", "3.5", "-2.25", "0",
// "1200") when 1e-6 <= |value| < 1e21, otherwise scientific notation with a
// single digit before the point and an explicitly signed exponent
// ("1.2345e-40", "2e+30"). Trailing zeros after the point are dropped, so a
// value that needs fewer digits than asked prints shorter ("0.5" at 5
// digits); zeros before the point are printed because they fix the magnitude.
func DecimalDown(r *big.Rat, digits int) string {
	return outwardDecimal(r, digits, false)
}

// DecimalUp returns the smallest decimal with at most digits significant
// digits that is >= r, in the format of DecimalDown. It panics if digits < 1.
func DecimalUp(r *big.Rat, digits int) string {
	return outwardDecimal(r, digits, true)
}

// DecimalEnds writes the closed interval [lo, hi] outward (lo with
// DecimalDown, hi with DecimalUp); a nil end, an unbounded one, stays nil.
// It is the one writing of certified ends in JSON.
func DecimalEnds(lo, hi *big.Rat, digits int) (loText, hiText *string) {
	if lo != nil {
		s := DecimalDown(lo, digits)
		loText = &s
	}
	if hi != nil {
		s := DecimalUp(hi, digits)
		hiText = &s
	}
	return loText, hiText
}

func outwardDecimal(r *big.Rat, digits int, up bool) string {
	if digits < 1 {
		panic(fmt.Sprintf("interval: decimal output needs at least 1 significant digit, got %d", digits))
	}
	switch r.Sign() {
	case 0:
		return "0"
	case -1:
		// Rounding a negative number down is rounding its magnitude up.
		return "-" + outwardDecimal(new(big.Rat).Neg(r), digits, !up)
	}
	e := decimalExponent(r)
	shift := digits - 1 - e
	m := scaledInteger(r, shift, up)
	return formatDecimal(m, -shift)
}

// decimalExponent returns E with 10^E <= r < 10^(E+1), for r > 0.
func decimalExponent(r *big.Rat) int {
	bits := r.Num().BitLen() - r.Denom().BitLen()
	e := int(math.Floor(float64(bits) * math.Log10(2))) // an estimate only; corrected exactly below
	for r.Cmp(pow10Rat(e)) < 0 {
		e--
	}
	for r.Cmp(pow10Rat(e+1)) >= 0 {
		e++
	}
	return e
}

// pow10Rat returns 10^e exactly.
func pow10Rat(e int) *big.Rat {
	p := pow10Int(abs(e))
	if e >= 0 {
		return new(big.Rat).SetInt(p)
	}
	return new(big.Rat).SetFrac(big.NewInt(1), p)
}

func pow10Int(e int) *big.Int {
	return new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(e)), nil)
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}

// scaledInteger returns floor(r*10^shift), or the ceiling when up is set.
func scaledInteger(r *big.Rat, shift int, up bool) *big.Int {
	x := new(big.Rat).Mul(r, pow10Rat(shift))
	if up {
		return ceilRat(x)
	}
	return floorRat(x)
}

// floorRat returns the largest integer <= x.
func floorRat(x *big.Rat) *big.Int {
	q, m := new(big.Int).QuoRem(x.Num(), x.Denom(), new(big.Int))
	if m.Sign() < 0 {
		q.Sub(q, big.NewInt(1))
	}
	return q
}

// ceilRat returns the smallest integer >= x.
func ceilRat(x *big.Rat) *big.Int {
	q, m := new(big.Int).QuoRem(x.Num(), x.Denom(), new(big.Int))
	if m.Sign() > 0 {
		q.Add(q, big.NewInt(1))
	}
	return q
}

// formatDecimal prints m*10^e10 for m > 0 in the format of DecimalDown.
func formatDecimal(m *big.Int, e10 int) string {
	ds := m.String()
	for len(ds) > 1 && ds[len(ds)-1] == '0' {
		ds = ds[:len(ds)-1]
		e10++
	}
	n := len(ds)
	x := e10 + n - 1 // decimal exponent of the value
	if x < -6 || x > 20 {
		var b strings.Builder
		b.WriteByte(ds[0])
		if n > 1 {
			b.WriteByte('.')
			b.WriteString(ds[1:])
		}
		if x < 0 {
			fmt.Fprintf(&b, "e-%d", -x)
		} else {
			fmt.Fprintf(&b, "e+%d", x)
		}
		return b.String()
	}
	switch point := n + e10; {
	case e10 >= 0:
		return ds + strings.Repeat("0", e10)
	case point > 0:
		return ds[:point] + "." + ds[point:]
	default:
		return "0." + strings.Repeat("0", -point) + ds
	}
}

// CommonDigits returns the number of leading significant decimal digits in
// which lo and hi agree when each is truncated (cut, not rounded) to that
// many digits. It returns 0 when they differ in decimal magnitude or in the
// first digit, or when the arguments are not 0 < lo <= hi or hi <= lo < 0
// (negative pairs are judged by their magnitudes). When lo == hi every digit
// agrees and the result is math.MaxInt.
//
// A digit target D is met by a bracket [lo, hi] when CommonDigits(lo, hi) >= D:
// then every number in the bracket starts with the same D digits.
func CommonDigits(lo, hi *big.Rat) int {
	if lo.Sign() < 0 && hi.Sign() < 0 {
		return CommonDigits(new(big.Rat).Neg(hi), new(big.Rat).Neg(lo))
	}
	if lo.Sign() <= 0 || lo.Cmp(hi) > 0 {
		return 0
	}
	if lo.Cmp(hi) == 0 {
		return math.MaxInt
	}
	e := decimalExponent(lo)
	if decimalExponent(hi) != e {
		return 0
	}
	agree := func(d int) bool {
		shift := d - 1 - e
		return scaledInteger(lo, shift, false).Cmp(scaledInteger(hi, shift, false)) == 0
	}
	if !agree(1) {
		return 0
	}
	// Agreement at d digits implies agreement at fewer digits, and lo < hi
	// forces disagreement once 10^(d-1-e)*(hi-lo) >= 1: find the edge by
	// doubling, then bisection.
	good, bad := 1, 2
	for agree(bad) {
		good, bad = bad, 2*bad
	}
	for bad-good > 1 {
		mid := good + (bad-good)/2
		if agree(mid) {
			good = mid
		} else {
			bad = mid
		}
	}
	return good
}

// decimalLiteral is a parsed decimal: value = sign * mantissa * 10^unitExp,
// where 10^unitExp is one unit of the last written digit.
type decimalLiteral struct {
	value    *big.Rat
	unitExp  int
	negative bool // the literal was written with a minus sign
}

// ParseDecimal returns the exact value of a decimal literal: an optional sign,
// digits with at most one decimal point (".5" and "5." are accepted), and an
// optional exponent introduced by e or E ("1.2e-3", "7E+2"), with at most
// MaxDigits digits before the exponent. The exponent must
// lie in [-10000, 10000], and a non-zero value in [1e-10000, 1e10000] in
// magnitude ("100e9999" is refused). Spaces, hexadecimal, "inf" and "nan" are refused;
// every refusal names the fault.
func ParseDecimal(s string) (*big.Rat, error) {
	d, err := parseDecimal(s)
	if err != nil {
		return nil, err
	}
	return d.value, nil
}

func parseDecimal(s string) (decimalLiteral, error) {
	fail := func(format string, args ...any) (decimalLiteral, error) {
		return decimalLiteral{}, fmt.Errorf("interval: cannot read %s as a decimal number: %s", brief.Quote(s), fmt.Sprintf(format, args...))
	}
	if s == "" {
		return fail("empty text; write a number such as 0.83 or 1.2e-3")
	}
	if strings.TrimSpace(s) != s {
		return fail("leading or trailing space; remove it")
	}
	i := 0
	negative := false
	if s[0] == '+' || s[0] == '-' {
		negative = s[0] == '-'
		i++
	}
	var mantissa strings.Builder
	fracDigits, points := 0, 0
	for ; i < len(s) && s[i] != 'e' && s[i] != 'E'; i++ {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			mantissa.WriteByte(c)
			if points > 0 {
				fracDigits++
			}
		case c == '.':
			points++
			if points > 1 {
				return fail("more than one decimal point")
			}
		default:
			return fail("invalid character %q at byte %d; only digits, one '.', a leading sign and an exponent like e-3 are allowed", c, i+1)
		}
	}
	if mantissa.Len() == 0 {
		return fail("no digits before the exponent or end")
	}
	if mantissa.Len() > MaxDigits {
		return fail("%d digits, over the limit of %d digits of a decimal", mantissa.Len(), MaxDigits)
	}
	exp := 0
	if i < len(s) {
		i++ // the exponent marker
		es := s[i:]
		if es == "" || es == "+" || es == "-" {
			return fail("the exponent after 'e' has no digits")
		}
		expNegative := false
		if es[0] == '+' || es[0] == '-' {
			expNegative = es[0] == '-'
			es = es[1:]
		}
		for j := 0; j < len(es); j++ {
			c := es[j]
			if c < '0' || c > '9' {
				if c == 'e' || c == 'E' {
					return fail("more than one exponent marker")
				}
				if c == '.' {
					return fail("the exponent must be a whole number")
				}
				return fail("invalid character %q in the exponent", c)
			}
			exp = 10*exp + int(c-'0')
			if exp > maxExponent {
				return fail("exponent out of range; its magnitude must be at most %d", maxExponent)
			}
		}
		if expNegative {
			exp = -exp
		}
	}
	m, _ := new(big.Int).SetString(mantissa.String(), 10) // only digits were collected
	if negative {
		m.Neg(m)
	}
	unitExp := exp - fracDigits
	v := new(big.Rat).SetInt(m)
	v.Mul(v, pow10Rat(unitExp))
	if size := new(big.Rat).Abs(v); size.Sign() > 0 &&
		(size.Cmp(pow10Rat(maxExponent)) > 0 || size.Cmp(pow10Rat(-maxExponent)) < 0) {
		return fail("the value is out of range; its magnitude must lie between 1e-%d and 1e%d", maxExponent, maxExponent)
	}
	return decimalLiteral{value: v, unitExp: unitExp, negative: negative}, nil
}

// ClaimRange returns the closed interval of true values that a claimed
// decimal X stands for. Let u be one unit of X's last written digit ("0.83":
// u = 0.01; "1.2e-3": u = 1e-4; "3": u = 1; "7E+2": u = 100).
//   - Rounded claim (truncated false): [X - u/2, X + u/2]. The interval is
//     closed, so a true value exactly halfway is accepted whichever way the
//     author broke the tie.
//   - Truncated claim (truncated true): X is the true value cut after its last
//     digit, so [X, X + u] when X was written without a minus sign and
//     [X - u, X] when it was written with one ("-0.0" truncated gives
//     [-0.1, 0]). Closed at both ends: the far end cannot be reached by a cut
//     value, but including it keeps the rule simple and only errs on the side
//     of accepting.
func ClaimRange(s string, truncated bool) (lo, hi *big.Rat, err error) {
	d, err := parseDecimal(s)
	if err != nil {
		return nil, nil, err
	}
	u := pow10Rat(d.unitExp)
	lo, hi = new(big.Rat).Set(d.value), new(big.Rat).Set(d.value)
	switch {
	case !truncated:
		half := new(big.Rat).Quo(u, big.NewRat(2, 1))
		lo.Sub(lo, half)
		hi.Add(hi, half)
	case d.negative:
		lo.Sub(lo, u)
	default:
		hi.Add(hi, u)
	}
	return lo, hi, nil
}

// DecimalScaled prints r*10^e10 rounded outward (down, or up with up set)
// to digits significant digits, in the format of DecimalDown, without
// building 10^e10: for values far below any big.Rat one would want to hold
// (a_N/N! at N = 10^9 is near 10^(-10^8)), given as a moderate r and a
// decimal exponent.
func DecimalScaled(r *big.Rat, e10, digits int, up bool) string {
	if r.Sign() <= 0 {
		return outwardDecimal(r, digits, up) // zero, or negative: no scaling needed by callers
	}
	e := decimalExponent(r)
	shift := digits - 1 - e
	return formatDecimal(scaledInteger(r, shift, up), e10-shift)
}
