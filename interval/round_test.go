package interval

import (
	"math/big"
	"math/rand"
	"testing"
)

// isDyadicWithin reports whether x = m*2^e with |m| < 2^prec+1 (at most prec
// significant bits, or the carry 2^prec).
func isDyadicWithin(x *big.Rat, prec uint) bool {
	d := x.Denom()
	if d.BitLen()-1 != int(d.TrailingZeroBits()) {
		return false // denominator not a power of two
	}
	m := new(big.Int).Abs(x.Num())
	if m.Sign() == 0 {
		return true
	}
	m.Rsh(m, m.TrailingZeroBits())
	return m.BitLen() <= int(prec)
}

// Hand cases: 1/3 = 0.010101..._2, so its 4-bit roundings are 0.01010_2 =
// 5/16 and 0.01011_2 = 11/32 (common practice, no source).
func TestRoundHandCases(t *testing.T) {
	ratString := func(f func(*big.Rat, uint) *big.Rat) func(*big.Rat, int) string {
		return func(r *big.Rat, prec int) string { return f(r, uint(prec)).RatString() }
	}
	checkDownUp(t, "Round", ratString(RoundDown), ratString(RoundUp), []downUpCase{
		{"1/3", 4, "5/16", "11/32"},
		{"-1/3", 4, "-11/32", "-5/16"},
		{"3/4", 10, "3/4", "3/4"},
		{"0", 3, "0", "0"},
		{"1000", 3, "896", "1024"},
	})
}

func TestRoundProperty(t *testing.T) {
	rng := rand.New(rand.NewSource(3))
	for i := 0; i < 2000; i++ {
		r := randomRat(rng)
		prec := uint(1 + rng.Intn(120))
		down, up := RoundDown(r, prec), RoundUp(r, prec)
		if down.Cmp(r) > 0 || r.Cmp(up) > 0 {
			t.Fatalf("prec %d: %s <= %s <= %s fails", prec, down.RatString(), r.RatString(), up.RatString())
		}
		if !isDyadicWithin(down, prec) || !isDyadicWithin(up, prec) {
			t.Fatalf("prec %d: %s or %s is not a %d-bit dyadic", prec, down.RatString(), up.RatString(), prec)
		}
		// Gap at most 2^(1-prec) |r|.
		gap := new(big.Rat).Sub(up, down)
		limit := new(big.Rat).Abs(r)
		limit.Mul(limit, fixedToRat(big.NewInt(2), prec))
		if gap.Cmp(limit) > 0 {
			t.Fatalf("prec %d, r = %s: gap %s too wide", prec, r.RatString(), gap.RatString())
		}
	}
}

func TestPowBrackets(t *testing.T) {
	rng := rand.New(rand.NewSource(4))
	for i := 0; i < 300; i++ {
		r := new(big.Rat).Abs(randomRat(rng))
		r.Mul(r, pow10Rat(-decimalExponentOrZero(r))) // r in [1, 10) or 0
		e := rng.Intn(40)
		prec := uint(20 + rng.Intn(100))
		exact := ratPow(r, e)
		down, up := PowDown(r, e, prec), PowUp(r, e, prec)
		if down.Cmp(exact) > 0 || exact.Cmp(up) > 0 {
			t.Fatalf("%s^%d at %d bits: [%s, %s] misses the exact power", r.RatString(), e, prec, down.FloatString(10), up.FloatString(10))
		}
		// Relative gap below 2^(3-prec): each end within about 2^(2-prec).
		gap := new(big.Rat).Sub(up, down)
		limit := new(big.Rat).Mul(exact, fixedToRat(big.NewInt(8), prec))
		if gap.Cmp(limit) > 0 {
			t.Fatalf("%s^%d at %d bits: gap %s too wide", r.RatString(), e, prec, gap.FloatString(30))
		}
	}
}

func decimalExponentOrZero(r *big.Rat) int {
	if r.Sign() == 0 {
		return 0
	}
	return decimalExponent(r)
}

func TestRootBrackets(t *testing.T) {
	rng := rand.New(rand.NewSource(5))
	for i := 0; i < 300; i++ {
		r := new(big.Rat).Abs(randomRat(rng))
		d := 1 + rng.Intn(7)
		prec := uint(10 + rng.Intn(150))
		down, up := RootDown(r, d, prec), RootUp(r, d, prec)
		if ratPow(down, d).Cmp(r) > 0 || r.Cmp(ratPow(up, d)) > 0 {
			t.Fatalf("%d-th root of %s at %d bits: [%s, %s] misses it", d, r.RatString(), prec, down.RatString(), up.RatString())
		}
		if r.Sign() > 0 {
			gap := new(big.Rat).Sub(up, down)
			limit := new(big.Rat).Mul(up, fixedToRat(big.NewInt(1), prec))
			if gap.Cmp(limit) > 0 {
				t.Fatalf("%d-th root of %s at %d bits: gap %s too wide", d, r.RatString(), prec, gap.FloatString(30))
			}
		}
	}
	// Exact roots come back exact: 27/8 = (3/2)^3.
	if lo, hi := RootDown(rat("27/8"), 3, 50), RootUp(rat("27/8"), 3, 50); lo.Cmp(rat("3/2")) != 0 || hi.Cmp(rat("3/2")) != 0 {
		t.Errorf("cube root of 27/8 = [%s, %s], want exactly 3/2", lo.RatString(), hi.RatString())
	}
}

func TestIntegerRootIsFloor(t *testing.T) {
	rng := rand.New(rand.NewSource(6))
	for i := 0; i < 500; i++ {
		n := new(big.Int).Rand(rng, new(big.Int).Lsh(big.NewInt(1), uint(1+rng.Intn(300))))
		d := 1 + rng.Intn(9)
		s := integerRoot(n, d)
		next := new(big.Int).Add(s, big.NewInt(1))
		if new(big.Int).Exp(s, big.NewInt(int64(d)), nil).Cmp(n) > 0 || new(big.Int).Exp(next, big.NewInt(int64(d)), nil).Cmp(n) <= 0 {
			t.Fatalf("integerRoot(%s, %d) = %s is not the floor", n, d, s)
		}
	}
}

func TestIntervalArithmetic(t *testing.T) {
	x := Interval{Lo: rat("-1"), Hi: rat("2")}
	y := Interval{Lo: rat("3"), Hi: rat("5")}
	checks := []struct {
		name   string
		got    Interval
		lo, hi string
	}{
		{"x+y", x.Add(y), "2", "7"},
		{"x-y", x.Sub(y), "-6", "-1"},
		{"x*y", x.Mul(y), "-5", "10"},
		{"x*x", x.Mul(x), "-2", "4"}, // hull of endpoint products, not the range of t^2
		{"1/y", y.Inverse(), "1/5", "1/3"},
	}
	for _, c := range checks {
		if c.got.Lo.Cmp(rat(c.lo)) != 0 || c.got.Hi.Cmp(rat(c.hi)) != 0 {
			t.Errorf("%s = [%s, %s], want [%s, %s]", c.name, c.got.Lo.RatString(), c.got.Hi.RatString(), c.lo, c.hi)
		}
	}
	if !y.Contains(rat("4")) || y.Contains(rat("6")) || !y.ContainsInterval(Point(rat("3"))) || y.ContainsInterval(x) {
		t.Error("Contains/ContainsInterval wrong")
	}
	if y.Width().Cmp(rat("2")) != 0 {
		t.Error("Width wrong")
	}
	if got := (Interval{Lo: rat("1/3"), Hi: rat("2/3")}).String(3); got != "[0.333, 0.667]" {
		t.Errorf("String = %q", got)
	}
	// Aliasing: results are fresh; changing them leaves the operands alone.
	s := x.Add(y)
	s.Lo.SetInt64(100)
	if x.Lo.Cmp(rat("-1")) != 0 || y.Lo.Cmp(rat("3")) != 0 {
		t.Error("Add result shares memory with an operand")
	}
}
