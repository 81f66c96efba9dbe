package certify_test

import (
	"math"
	"math/big"
	"testing"

	"avoidcert/certify"
	"avoidcert/internal/brute"
)

// The tests' producer: certificates assembled from brackets that
// certify.MakeBracket computes with the checker's own iteration (exact
// least and largest ratios). The engine's producer is prove/produce.go; its
// agreement with the checker is tested in internal/conformance.

const testTool = "avoidcert certify tests"

// spec names one bracket: its system (nil states: whole), start, step, N,
// and whether it carries the upper bound.
type spec struct {
	states []int
	start  certify.Start
	step   int
	n      int
	upper  bool
}

func wholeSpec(n, d int, upper bool) spec {
	return spec{start: certify.StartEmpty, step: d, n: n, upper: upper}
}

// assemble builds and derives the certificate of the given patterns from
// the brackets: lambda.lo from the best lower end (whole system or start
// whole), lambda.hi from the brackets marked upper, the all-n bounds from
// the first whole-system step-1 bracket, 12 significant digits, and the
// structure section st (nil: none).
func assemble(t testing.TB, given []string, specs []spec, st *certify.Structure) *certify.Certificate {
	t.Helper()
	c := &certify.Certificate{Tool: testTool, Statement: certify.Statement{Given: given}, Structure: st}
	lamLo, lamHi := new(big.Rat), new(big.Rat)
	allN := false
	for _, sp := range specs {
		b, sum := certify.MakeBracket(given, sp.states, sp.start, sp.step, sp.n, sp.upper)
		c.Evidence.Brackets = append(c.Evidence.Brackets, b)
		if sp.start != certify.StartOnes {
			if r := root(b.Lo, b.Step, false); r.Cmp(lamLo) > 0 {
				lamLo = r
			}
		}
		if b.Upper {
			if b.Hi == nil {
				t.Fatalf("%v: bracket %+v has no finite hi", given, sp)
			}
			if r := root(b.Hi, b.Step, true); r.Cmp(lamHi) > 0 {
				lamHi = r
			}
		}
		if !allN && sp.states == nil && b.Step == 1 {
			allN = true
			c.Statement.AllN = certify.AllN{N0: b.N, AN0: sum, MuLo: b.Lo, MuHi: b.Hi}
		}
	}
	c.Statement.Lambda = certify.Range{Lo: lamLo, Hi: lamHi, Digits: 12}
	c.Statement.Radius = certify.Range{Lo: new(big.Rat), Digits: 12}
	if lamHi.Sign() > 0 {
		c.Statement.Radius.Lo = new(big.Rat).Inv(lamHi)
	}
	if lamLo.Sign() > 0 {
		c.Statement.Radius.Hi = new(big.Rat).Inv(lamLo)
	}
	if err := certify.Derive(c); err != nil {
		t.Fatal(err)
	}
	return c
}

// wholeCert is the certificate of one whole-system step-1 bracket at n,
// without a structure section.
func wholeCert(t testing.TB, given string, n int) *certify.Certificate {
	t.Helper()
	return assemble(t, []string{given}, []spec{wholeSpec(n, 1, true)}, nil)
}

// root returns a rational r with r^d <= x (up false) or r^d >= x (up
// true), within about 2^-100 relative of the real root.
func root(x *big.Rat, d int, up bool) *big.Rat {
	if d == 1 || x.Sign() == 0 {
		return new(big.Rat).Set(x)
	}
	// Newton on y^d = x from the float64 root, then step outward until exact
	xf, _ := x.Float64()
	y := new(big.Float).SetPrec(256).SetFloat64(math.Pow(xf, 1/float64(d)))
	xb := new(big.Float).SetPrec(256).SetRat(x)
	for range 12 {
		// y <- y - (y^d - x)/(d y^(d-1))
		yd1 := new(big.Float).SetPrec(256).SetInt64(1)
		for range d - 1 {
			yd1.Mul(yd1, y)
		}
		num := new(big.Float).SetPrec(256).Mul(yd1, y)
		num.Sub(num, xb)
		den := new(big.Float).SetPrec(256).Mul(yd1, big.NewFloat(float64(d)))
		y.Sub(y, num.Quo(num, den))
	}
	r, _ := y.Rat(nil)
	step := new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), 100))
	factor := new(big.Rat).Add(big.NewRat(1, 1), step)
	if !up {
		factor.Sub(big.NewRat(1, 1), step)
	}
	for {
		p := new(big.Rat).SetInt64(1)
		for range d {
			p.Mul(p, r)
		}
		if (up && p.Cmp(x) >= 0) || (!up && p.Cmp(x) <= 0) {
			return r
		}
		r.Mul(r, factor)
	}
}

// parsePats reads digit patterns ("132") for the brute force of
// internal/brute (an enumeration that shares no code with the checker).
func parsePats(given []string) [][]int {
	var out [][]int
	for _, g := range given {
		var p []int
		for _, c := range g {
			p = append(p, int(c-'0'))
		}
		out = append(out, p)
	}
	return out
}

func bruteCount(given []string, n int) *big.Int {
	return big.NewInt(int64(brute.Count(n, parsePats(given))))
}

// lexRank returns the lexicographic rank of the pattern of a sequence of
// distinct numbers among the permutations of its length.
func lexRank(x []int) int {
	r := 0
	for i, v := range x {
		below := 0
		for _, u := range x[i+1:] {
			if u < v {
				below++
			}
		}
		r = r*(len(x)-i) + below
	}
	return r
}

func factorial(n int) int {
	f := 1
	for i := 2; i <= n; i++ {
		f *= i
	}
	return f
}

// structure123 is the structure section of {123} (docs/prefix-states.md,
// "Small cases"): recurrent states (1) and (12) (numbers 1 and 2), |D| =
// C(2,1) + 2 C(3,1) + C(4,2) = 14, primitive with exponent 4, and the
// cyclic avoider 321 (its cyclic windows 321, 213, 132 avoid 123).
func structure123() *certify.Structure {
	return &certify.Structure{Class: certify.ClassPrimitive, Exponent: 4, Lambda: certify.LambdaPositive,
		Recurrent: []int{1, 2}, Configurations: 14, CyclicAvoider: []int{3, 2, 1}}
}
