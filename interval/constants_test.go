package interval

import (
	"math/big"
	"strings"
	"testing"
)

// oeisDecimal joins the comma-separated digits of an OEIS decimal-expansion
// entry's %S, %T and %U lines and puts the point after intDigits digits (the
// entry's offset, from its %O line).
func oeisDecimal(intDigits int, lines ...string) string {
	ds := strings.ReplaceAll(strings.Join(lines, ","), ",", "")
	if intDigits == 0 {
		return "0." + ds
	}
	return ds[:intDigits] + "." + ds[intDigits:]
}

// Published decimal expansions, copied verbatim from the entries' data lines.
var (
	// OEIS A000796 (pi), %O 1,1.
	piDigits = oeisDecimal(1,
		"3,1,4,1,5,9,2,6,5,3,5,8,9,7,9,3,2,3,8,4,6,2,6,4,3,3,8,3,2,7,9,5,0,2",
		"8,8,4,1,9,7,1,6,9,3,9,9,3,7,5,1,0,5,8,2,0,9,7,4,9,4,4,5,9,2,3,0,7,8",
		"1,6,4,0,6,2,8,6,2,0,8,9,9,8,6,2,8,0,3,4,8,2,5,3,4,2,1,1,7,0,6,7,9,8,2,1,4")
	// OEIS A002193 (sqrt(2)), %O 1,2.
	sqrt2Digits = oeisDecimal(1,
		"1,4,1,4,2,1,3,5,6,2,3,7,3,0,9,5,0,4,8,8,0,1,6,8,8,7,2,4,2,0,9,6,9,8",
		"0,7,8,5,6,9,6,7,1,8,7,5,3,7,6,9,4,8,0,7,3,1,7,6,6,7,9,7,3,7,9,9,0,7",
		"3,2,4,7,8,4,6,2,1,0,7,0,3,8,8,5,0,3,8,7,5,3,4,3,2,7,6,4,1,5,7")
	// OEIS A002194 (sqrt(3)), %O 1,2.
	sqrt3Digits = oeisDecimal(1,
		"1,7,3,2,0,5,0,8,0,7,5,6,8,8,7,7,2,9,3,5,2,7,4,4,6,3,4,1,5,0,5,8,7,2",
		"3,6,6,9,4,2,8,0,5,2,5,3,8,1,0,3,8,0,6,2,8,0,5,5,8,0,6,9,7,9,4,5,1,9",
		"3,3,0,1,6,9,0,8,8,0,0,0,3,7,0,8,1,1,4,6,1,8,6,7,5,7,2,4,8,5,7,5,6,7,5,6,2,6,1,4,1,4,1,5,4")
	// OEIS A060294 (2/pi), %O 0,1.
	twoOverPiDigits = oeisDecimal(0,
		"6,3,6,6,1,9,7,7,2,3,6,7,5,8,1,3,4,3,0,7,5,5,3,5,0,5,3,4,9,0,0,5,7,4",
		"4,8,1,3,7,8,3,8,5,8,2,9,6,1,8,2,5,7,9,4,9,9,0,6,6,9,3,7,6,2,3,5,5,8",
		"7,1,9,0,5,3,6,9,0,6,1,4,0,3,6,0,4,5,5,2,1,1,0,6,5,0,1,2,3,4,3,8,2,4,2,9,1")
)

// truncatedRange is the interval an OEIS decimal expansion (leading digits of
// the true value, cut) stands for.
func truncatedRange(t *testing.T, digits string) Interval {
	t.Helper()
	lo, hi, err := ClaimRange(digits, true)
	if err != nil {
		t.Fatal(err)
	}
	return Interval{Lo: lo, Hi: hi}
}

// checkAgainst asserts that the computed enclosure lies inside the published
// range and is much narrower than it, so the comparison has teeth.
func checkAgainst(t *testing.T, name string, got, published Interval) {
	t.Helper()
	if !published.ContainsInterval(got) {
		t.Errorf("%s: computed %s is not inside the published %s", name, got.String(75), published.String(75))
	}
	if w := got.Width(); w.Cmp(new(big.Rat).Quo(published.Width(), big.NewRat(1000, 1))) > 0 {
		t.Errorf("%s: computed width %s is not far below the published precision", name, DecimalUp(w, 3))
	}
}

func TestPiAgainstOEIS(t *testing.T) {
	checkAgainst(t, "pi vs OEIS A000796", Pi(400), truncatedRange(t, piDigits))
	// Precision is honoured: width about 2^-prec.
	for _, prec := range []uint{10, 64, 200, 1000} {
		if w := Pi(prec).Width(); w.Cmp(fixedToRat(big.NewInt(1), prec)) > 0 {
			t.Errorf("Pi(%d) width %s exceeds 2^-%d", prec, DecimalUp(w, 3), prec)
		}
	}
}

func TestSqrtAgainstOEIS(t *testing.T) {
	checkAgainst(t, "sqrt(2) vs OEIS A002193", Sqrt(big.NewRat(2, 1), 400), truncatedRange(t, sqrt2Digits))
	checkAgainst(t, "sqrt(3) vs OEIS A002194", Sqrt(big.NewRat(3, 1), 400), truncatedRange(t, sqrt3Digits))
	// A wrong last digit must be caught.
	wrong := sqrt2Digits[:len(sqrt2Digits)-1] + "8"
	if truncatedRange(t, wrong).ContainsInterval(Sqrt(big.NewRat(2, 1), 400)) {
		t.Error("sqrt(2) fits a decimal with a wrong last digit")
	}
}

func TestClosedFormLambdasAgainstOEIS(t *testing.T) {
	// 2/pi, OEIS A060294 (Andre 1879: {123, 321} avoiders are alternating).
	checkAgainst(t, "LambdaAlternating vs OEIS A060294", LambdaAlternating(400), truncatedRange(t, twoOverPiDigits))
	// 3 sqrt(3) / (2 pi) evaluated in interval arithmetic from the published
	// digits of sqrt(3) (OEIS A002194) and pi (OEIS A000796).
	published := truncatedRange(t, sqrt3Digits).Mul(Point(big.NewRat(3, 2))).Mul(truncatedRange(t, piDigits).Inverse())
	checkAgainst(t, "Lambda123 vs OEIS A002194, A000796", Lambda123(400), published)
}

func TestBisect(t *testing.T) {
	square := func(c int64) func(*big.Rat, uint) Interval {
		return func(x *big.Rat, _ uint) Interval {
			return Point(new(big.Rat).Sub(new(big.Rat).Mul(x, x), big.NewRat(c, 1)))
		}
	}
	got, err := Bisect(square(2), big.NewRat(1, 1), big.NewRat(2, 1), 200)
	if err != nil {
		t.Fatal(err)
	}
	two := big.NewRat(2, 1)
	if new(big.Rat).Mul(got.Lo, got.Lo).Cmp(two) >= 0 || new(big.Rat).Mul(got.Hi, got.Hi).Cmp(two) <= 0 {
		t.Errorf("Bisect for x^2 = 2 gave %s, which does not bracket sqrt(2)", got.String(30))
	}
	if !relativelyNarrow(got.Lo, got.Hi, 200) {
		t.Errorf("Bisect result %s wider than asked", got.String(10))
	}
	// Decreasing functions work too: the sign at the left end leads.
	neg := func(x *big.Rat, p uint) Interval {
		v := square(3)(x, p)
		return Interval{Lo: v.Hi.Neg(v.Hi), Hi: v.Lo.Neg(v.Lo)}
	}
	got, err = Bisect(neg, big.NewRat(1, 1), big.NewRat(2, 1), 100)
	three := big.NewRat(3, 1)
	if err != nil || new(big.Rat).Mul(got.Lo, got.Lo).Cmp(three) >= 0 || new(big.Rat).Mul(got.Hi, got.Hi).Cmp(three) <= 0 {
		t.Errorf("Bisect for 3 - x^2 = 0 gave %s, %v; want a bracket of sqrt(3)", got.String(20), err)
	}

	failures := []struct {
		name  string
		f     func(*big.Rat, uint) Interval
		a, b  int64
		fault string
	}{
		{"no sign change", square(-1), 0, 1, "same sign"},
		{"root at an endpoint", square(1), 1, 2, "cannot decide the sign"},
		{"empty bracket", square(2), 2, 1, "a < b"},
		{"enclosure too coarse", func(*big.Rat, uint) Interval { return Interval{Lo: big.NewRat(-1, 1), Hi: big.NewRat(1, 1)} }, 0, 1, "cannot decide the sign"},
	}
	for _, c := range failures {
		_, err := Bisect(c.f, big.NewRat(c.a, 1), big.NewRat(c.b, 1), 50)
		if err == nil || !strings.Contains(err.Error(), c.fault) {
			t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.fault)
		}
	}
}
