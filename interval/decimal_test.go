package interval

import (
	"math"
	"math/big"
	"math/rand"
	"strings"
	"testing"
)

func rat(s string) *big.Rat {
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		panic("bad test rational " + s)
	}
	return r
}

// downUpCase is a hand-worked pair of directed results: down(r, n) and up(r, n).
type downUpCase struct {
	r        string
	n        int
	down, up string
}

func checkDownUp(t *testing.T, name string, down, up func(*big.Rat, int) string, cases []downUpCase) {
	t.Helper()
	for _, c := range cases {
		if got := down(rat(c.r), c.n); got != c.down {
			t.Errorf("%sDown(%s, %d) = %q, want %q", name, c.r, c.n, got, c.down)
		}
		if got := up(rat(c.r), c.n); got != c.up {
			t.Errorf("%sUp(%s, %d) = %q, want %q", name, c.r, c.n, got, c.up)
		}
	}
}

// Hand-worked cases (common practice, no source: each is checked by hand
// against the definition "largest/smallest d-digit decimal below/above r").
func TestDecimalDownUpHandCases(t *testing.T) {
	checkDownUp(t, "Decimal", DecimalDown, DecimalUp, []downUpCase{
		{"1/3", 3, "0.333", "0.334"},
		{"2/3", 3, "0.666", "0.667"},
		{"-2/3", 3, "-0.667", "-0.666"},
		{"0", 4, "0", "0"},
		{"7/2", 5, "3.5", "3.5"},
		{"-9/4", 3, "-2.25", "-2.25"},
		{"-9/4", 2, "-2.3", "-2.2"},
		{"1/7", 1, "0.1", "0.2"},
		{"1234567", 3, "1230000", "1240000"},
		{"9999999/10000000", 3, "0.999", "1"},
		{"999999999999999999999", 3, "999000000000000000000", "1e+21"},
		{"2000000000000000000000000000000", 3, "2e+30", "2e+30"},
		{"1/1000000", 3, "0.000001", "0.000001"},
		{"999/1000000000", 3, "9.99e-7", "9.99e-7"},
		{"1/7000000000000000000000000000000000000000", 5, "1.4285e-40", "1.4286e-40"},
		{"-1/7000000000000000000000000000000000000000", 5, "-1.4286e-40", "-1.4285e-40"},
		{"82699334313/100000000000", 8, "0.82699334", "0.82699335"},
		{"100", 1, "100", "100"},
		{"101", 2, "100", "110"},
	})
}

// significantDigits counts the digits of a printed decimal from its first
// nonzero digit to its last digit written after the point, or to its last
// nonzero digit for an integer.
func significantDigits(s string) int {
	s = strings.TrimPrefix(s, "-")
	if i := strings.IndexByte(s, 'e'); i >= 0 {
		s = s[:i]
	}
	if !strings.Contains(s, ".") {
		s = strings.TrimRight(s, "0") // zeros before the point fix the magnitude only
	}
	s = strings.ReplaceAll(s, ".", "")
	return len(strings.TrimLeft(s, "0"))
}

func randomRat(rng *rand.Rand) *big.Rat {
	num := new(big.Int).Rand(rng, new(big.Int).Lsh(big.NewInt(1), uint(1+rng.Intn(200))))
	den := new(big.Int).Rand(rng, new(big.Int).Lsh(big.NewInt(1), uint(1+rng.Intn(200))))
	den.Add(den, big.NewInt(1))
	r := new(big.Rat).SetFrac(num, den)
	r.Mul(r, pow10Rat(rng.Intn(81)-40))
	if rng.Intn(2) == 0 {
		r.Neg(r)
	}
	return r
}

// Property: DecimalDown(r, d) <= r <= DecimalUp(r, d) exactly, both have at
// most d significant digits, and they are adjacent d-digit decimals (their
// gap is one unit of the d-th digit at r's magnitude) or both equal r.
func TestDecimalOutwardProperty(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	for i := 0; i < 2000; i++ {
		r := randomRat(rng)
		d := 1 + rng.Intn(30)
		ds, us := DecimalDown(r, d), DecimalUp(r, d)
		down, err := ParseDecimal(ds)
		if err != nil {
			t.Fatalf("DecimalDown(%s, %d) = %q does not parse: %v", r.RatString(), d, ds, err)
		}
		up, err := ParseDecimal(us)
		if err != nil {
			t.Fatalf("DecimalUp(%s, %d) = %q does not parse: %v", r.RatString(), d, us, err)
		}
		if down.Cmp(r) > 0 || r.Cmp(up) > 0 {
			t.Fatalf("r = %s, d = %d: %s <= r <= %s fails", r.RatString(), d, ds, us)
		}
		if significantDigits(ds) > d || significantDigits(us) > d {
			t.Fatalf("r = %s, d = %d: %q or %q has more than %d digits", r.RatString(), d, ds, us, d)
		}
		if r.Sign() == 0 {
			continue
		}
		unit := pow10Rat(decimalExponent(new(big.Rat).Abs(r)) - d + 1)
		gap := new(big.Rat).Sub(up, down)
		if down.Cmp(up) == 0 {
			if down.Cmp(r) != 0 {
				t.Fatalf("r = %s, d = %d: equal ends %s differ from r", r.RatString(), d, ds)
			}
		} else if gap.Cmp(unit) != 0 {
			t.Fatalf("r = %s, d = %d: %s and %s are not adjacent (gap %s, unit %s)", r.RatString(), d, ds, us, gap.RatString(), unit.RatString())
		}
		// Round trip: the printed decimal is a fixed point of printing.
		if again := DecimalDown(down, d); again != ds {
			t.Fatalf("round trip of %q gave %q", ds, again)
		}
	}
}

func TestDecimalDigitsMustBePositive(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("DecimalDown with 0 digits did not panic")
		}
	}()
	DecimalDown(big.NewRat(1, 3), 0)
}

func TestParseDecimal(t *testing.T) {
	good := []struct{ s, want string }{
		{"0.5", "1/2"}, {"-1.25", "-5/4"}, {"3", "3"}, {"1.2e-3", "3/2500"},
		{"7E+2", "700"}, {"+.5", "1/2"}, {"5.", "5"}, {"-0", "0"}, {"1e0", "1"},
		{"007.50", "15/2"}, {"2e+30", "2000000000000000000000000000000"},
	}
	for _, c := range good {
		got, err := ParseDecimal(c.s)
		if err != nil {
			t.Errorf("ParseDecimal(%q): %v", c.s, err)
			continue
		}
		if got.Cmp(rat(c.want)) != 0 {
			t.Errorf("ParseDecimal(%q) = %s, want %s", c.s, got.RatString(), c.want)
		}
	}
	bad := []struct{ s, fault string }{
		{"", "empty"},
		{" 1", "space"},
		{"1 ", "space"},
		{"1.2.3", "more than one decimal point"},
		{"abc", "invalid character 'a'"},
		{"0x10", "invalid character 'x'"},
		{"1,5", "invalid character ','"},
		{"-", "no digits"},
		{".", "no digits"},
		{"e5", "no digits"},
		{"1e", "exponent after 'e' has no digits"},
		{"1e+", "exponent after 'e' has no digits"},
		{"1e5e3", "more than one exponent marker"},
		{"1.5e2.5", "whole number"},
		{"1e1x", "invalid character 'x' in the exponent"},
		{"1e99999", "exponent out of range"},
		{"100E9999", "value is out of range"}, // found by FuzzParseDecimal
		{"0." + strings.Repeat("9", MaxDigits), "over the limit of 1000 digits"},
		{"-0.01e-9999", "value is out of range"},
		{"inf", "invalid character"},
		{"NaN", "invalid character"},
	}
	for _, c := range bad {
		_, err := ParseDecimal(c.s)
		if err == nil {
			t.Errorf("ParseDecimal(%q) succeeded, want an error about %q", c.s, c.fault)
			continue
		}
		if !strings.Contains(err.Error(), c.fault) {
			t.Errorf("ParseDecimal(%q) error %q does not name the fault %q", c.s, err, c.fault)
		}
	}
}

func TestClaimRange(t *testing.T) {
	cases := []struct {
		s         string
		truncated bool
		lo, hi    string
	}{
		{"0.83", false, "0.825", "0.835"},
		{"0.83", true, "0.83", "0.84"},
		{"1.2e-3", false, "0.00115", "0.00125"},
		{"1.2e-3", true, "0.0012", "0.0013"},
		{"-0.5", false, "-0.55", "-0.45"},
		{"-0.5", true, "-0.6", "-0.5"},
		{"-0.0", true, "-0.1", "0"},
		{"7E+2", false, "650", "750"},
		{"3", true, "3", "4"},
		{"1200", false, "1199.5", "1200.5"},
	}
	for _, c := range cases {
		lo, hi, err := ClaimRange(c.s, c.truncated)
		if err != nil {
			t.Errorf("ClaimRange(%q, %v): %v", c.s, c.truncated, err)
			continue
		}
		if lo.Cmp(rat(c.lo)) != 0 || hi.Cmp(rat(c.hi)) != 0 {
			t.Errorf("ClaimRange(%q, %v) = [%s, %s], want [%s, %s]", c.s, c.truncated, lo.FloatString(6), hi.FloatString(6), c.lo, c.hi)
		}
	}
	if _, _, err := ClaimRange("1.2.3", false); err == nil || !strings.Contains(err.Error(), "more than one decimal point") {
		t.Errorf("ClaimRange(\"1.2.3\") error = %v", err)
	}
}

func TestCommonDigits(t *testing.T) {
	cases := []struct {
		lo, hi string
		want   int
	}{
		{"0.82699", "0.82701", 2},
		{"1.2345", "1.2349", 4},
		{"0.12", "0.12999", 2},
		{"0.99", "1.01", 0}, // different magnitude
		{"1", "2", 0},       // different first digit
		{"1", "1.999", 1},   // truncations agree in the first digit only
		{"-0.12346", "-0.12345", 4},
		{"-0.5", "-0.4", 0},
		{"2", "1", 0},  // lo > hi
		{"-1", "1", 0}, // straddles 0
		{"0", "1", 0},  // lo = 0
		{"123456789", "123456790", 7},
	}
	for _, c := range cases {
		if got := CommonDigits(rat(c.lo), rat(c.hi)); got != c.want {
			t.Errorf("CommonDigits(%s, %s) = %d, want %d", c.lo, c.hi, got, c.want)
		}
	}
	if got := CommonDigits(rat("1/3"), rat("1/3")); got != math.MaxInt {
		t.Errorf("CommonDigits(1/3, 1/3) = %d, want math.MaxInt", got)
	}
}

func FuzzParseDecimal(f *testing.F) {
	for _, s := range []string{"0.5", "-1.25", "3", "1.2e-3", "7E+2", "1.2.3", "", "e", "1e99999", "+.5e-7", "--1"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, err := ParseDecimal(s)
		if err != nil {
			if v != nil || !strings.Contains(err.Error(), "cannot read") {
				t.Fatalf("ParseDecimal(%q): error %q without a clear message, or a value beside it", s, err)
			}
			return
		}
		lo, hi, err := ClaimRange(s, false)
		if err != nil || lo.Cmp(v) > 0 || v.Cmp(hi) > 0 {
			t.Fatalf("ClaimRange(%q) = [%v, %v], %v does not hold the value %s", s, lo, hi, err, v.RatString())
		}
		printed := DecimalDown(v, 30)
		back, err := ParseDecimal(printed)
		if err != nil || back.Cmp(v) > 0 {
			t.Fatalf("DecimalDown(%s) = %q does not parse back below the value: %v", v.RatString(), printed, err)
		}
	})
}

// The extreme accepted magnitudes print back to text that parses.
func TestDecimalRangeRoundTrip(t *testing.T) {
	for _, s := range []string{"1e10000", "-1e10000", "1e-10000", "-9.999e9999", "1.5e-10000"} {
		v, err := ParseDecimal(s)
		if err != nil {
			t.Fatalf("ParseDecimal(%q): %v", s, err)
		}
		for _, printed := range []string{DecimalDown(v, 3), DecimalUp(v, 3)} {
			if _, err := ParseDecimal(printed); err != nil {
				t.Errorf("%s prints as %q, which does not parse back: %v", s, printed, err)
			}
		}
	}
}

// DecimalScaled(r, e, ...) prints what DecimalDown/Up print for r*10^e,
// whenever the product is small enough to build.
func TestDecimalScaled(t *testing.T) {
	for _, c := range []struct {
		r string
		e int
	}{{"22/7", -3}, {"1/3", -40}, {"123456789/1000", 25}, {"7", 0}, {"99999/100000", -7}} {
		r, _ := new(big.Rat).SetString(c.r)
		p := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(abs(c.e))), nil))
		full := new(big.Rat).Mul(r, p)
		if c.e < 0 {
			full.Quo(r, p)
		}
		for _, d := range []int{1, 4, 12} {
			if got, want := DecimalScaled(r, c.e, d, false), DecimalDown(full, d); got != want {
				t.Errorf("DecimalScaled(%s, %d, %d, down) = %s, want %s", c.r, c.e, d, got, want)
			}
			if got, want := DecimalScaled(r, c.e, d, true), DecimalUp(full, d); got != want {
				t.Errorf("DecimalScaled(%s, %d, %d, up) = %s, want %s", c.r, c.e, d, got, want)
			}
		}
	}
}

// DecimalEnds rounds each end outward and keeps an unbounded end nil
// (1/3 at 3 digits: 0.333 below, 0.334 above; common practice, no source).
func TestDecimalEnds(t *testing.T) {
	third := big.NewRat(1, 3)
	lo, hi := DecimalEnds(third, third, 3)
	if lo == nil || hi == nil || *lo != "0.333" || *hi != "0.334" {
		t.Errorf("DecimalEnds(1/3, 1/3, 3) = %v, %v; want 0.333, 0.334", lo, hi)
	}
	if lo, hi := DecimalEnds(nil, nil, 3); lo != nil || hi != nil {
		t.Errorf("DecimalEnds(nil, nil) = %v, %v; want nil, nil", lo, hi)
	}
}
