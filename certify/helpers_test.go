package certify_test

import (
	"context"
	"math"
	"math/big"
	"testing"

	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/prove"
	"avoidcert/structure"
	"avoidcert/transfer"
)

// This file is a test-side producer: it brackets systems with the fast
// engine's iterates and forms the ratios with big.Rat, independently of
// the checker's code.

const testTool = "avoidcert certify tests"

// engineBracket is a bracket of lambda^d for the system of s on cells (nil:
// whole) at degree k, with lo and hi the exact extreme ratios, and the sum
// of G_k.
type engineBracket struct {
	certify.Bracket
	sum *big.Int
}

func bracketFromEngine(t testing.TB, s pattern.Set, cells []int, k, d int, upper bool) engineBracket {
	t.Helper()
	sys := transfer.FromSet(s)
	all := make([]int, sys.Cells())
	for c := range all {
		all[c] = c
	}
	if cells != nil {
		in := make([]bool, sys.Cells())
		for _, c := range cells {
			in[c] = true
		}
		sys = sys.Restrict(in)
	} else {
		cells = all
	}
	eng := transfer.New(sys)
	g := eng.Start()
	var gk *transfer.Iterate
	for i := 0; ; i++ {
		if i == k {
			gk = g
		}
		if i == k+d {
			break
		}
		var err error
		if g, err = eng.Next(context.Background(), g); err != nil {
			t.Fatal(err)
		}
	}
	m := sys.M
	ix := transfer.NewIndexer(m, k+d)
	// elevate G_k d times: H'[a] = sum_t a_t H[a - e_t]
	h := make([][]*big.Int, sys.Cells())
	for c := range h {
		for r := range ix.Count(k) {
			h[c] = append(h[c], gk.Int(c, r))
		}
	}
	a := make([]int, m+1)
	for D := k + 1; D <= k+d; D++ {
		for c := range h {
			next := make([]*big.Int, ix.Count(D))
			for r := range next {
				ix.Unrank(D, r, a)
				next[r] = new(big.Int)
				for i := range a {
					if a[i] > 0 {
						a[i]--
						next[r].Add(next[r], new(big.Int).Mul(big.NewInt(int64(a[i]+1)), h[c][ix.Rank(a)]))
						a[i]++
					}
				}
			}
			h[c] = next
		}
	}
	var lo, hi *big.Rat
	infinite := false
	for c := range h {
		for r, den := range h[c] {
			num := g.Int(c, r)
			if den.Sign() == 0 {
				infinite = infinite || num.Sign() > 0
				continue
			}
			q := new(big.Rat).SetFrac(num, den)
			if lo == nil || q.Cmp(lo) < 0 {
				lo = q
			}
			if hi == nil || q.Cmp(hi) > 0 {
				hi = q
			}
		}
	}
	if lo == nil { // G_k is zero: nothing to bound from below, G_{k+d} is zero too
		lo, hi = new(big.Rat), new(big.Rat)
	}
	if infinite {
		hi = nil
	}
	return engineBracket{
		Bracket: certify.Bracket{Cells: cells, Step: d, K: k, Lo: lo, Hi: hi, Upper: upper, IterateDigest: gk.Digest()},
		sum:     gk.Sum(),
	}
}

// assemble builds a certificate from brackets: lambda.lo from the best
// lower bracket, lambda.hi from the brackets marked upper, the all-n bounds
// from the first whole-system step-1 bracket, 12 significant digits, and
// the structure section from the structure pass (format version 2).
func assemble(t testing.TB, given []string, brackets []engineBracket) *certify.Certificate {
	t.Helper()
	s, err := pattern.ParseSet(given)
	if err != nil {
		t.Fatal(err)
	}
	return assembleWith(t, given, brackets, structureOf(t, s))
}

// assembleWith is assemble with the given structure section (nil: a
// format version 1 certificate).
func assembleWith(t testing.TB, given []string, brackets []engineBracket, st *certify.Structure) *certify.Certificate {
	t.Helper()
	s, err := pattern.ParseSet(given)
	if err != nil {
		t.Fatal(err)
	}
	m := s.Window() - 1
	c := &certify.Certificate{Tool: testTool, Statement: certify.Statement{Given: given}}
	lamLo, lamHi := new(big.Rat), new(big.Rat)
	allN := false
	for _, b := range brackets {
		c.Evidence.Brackets = append(c.Evidence.Brackets, b.Bracket)
		if r := root(b.Lo, b.Step, false); r.Cmp(lamLo) > 0 {
			lamLo = r
		}
		if b.Upper {
			if r := root(b.Hi, b.Step, true); r.Cmp(lamHi) > 0 {
				lamHi = r
			}
		}
		if !allN && len(b.Cells) == pattern.Factorial(m) && b.Step == 1 {
			allN = true
			c.Statement.AllN = certify.AllN{N0: m + b.K, AN0: b.sum, MuLo: b.Lo, MuHi: b.Hi}
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
	c.Structure = st
	if err := certify.Derive(c); err != nil {
		t.Fatal(err)
	}
	return c
}

// analyze runs the structure pass, with witnesses where a certificate
// keeps them (m <= 4).
func analyze(t testing.TB, s pattern.Set) *structure.Report {
	t.Helper()
	rep, err := structure.Analyze(context.Background(), s, structure.Options{Witnesses: s.Window() <= 5})
	if err != nil {
		t.Fatal(err)
	}
	return rep
}

func structureOf(t testing.TB, s pattern.Set) *certify.Structure {
	t.Helper()
	return prove.Structure(analyze(t, s))
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

// wholeCert is the certificate of one whole-system step-1 bracket at k.
func wholeCert(t testing.TB, given string, k int) *certify.Certificate {
	t.Helper()
	s, err := pattern.ParseSet([]string{given})
	if err != nil {
		t.Fatal(err)
	}
	return assemble(t, []string{given}, []engineBracket{bracketFromEngine(t, s, nil, k, 1, true)})
}
