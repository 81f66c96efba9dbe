package conformance_test

import (
	"context"
	"math"
	"math/big"
	"math/rand/v2"
	"strings"
	"testing"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/internal/brute"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prove"
	"avoidcert/structure"
	"avoidcert/transfer"
)

var ctx = context.Background()

// randomSets returns every single pattern of length 3 and 4 and random
// sets of mixed lengths 2 to 5.
func randomSets(seed uint64, count int) []pattern.Set {
	var sets []pattern.Set
	for n := 3; n <= 4; n++ {
		for _, p := range pattern.All(n) {
			sets = append(sets, pattern.NewSet(p))
		}
	}
	rng := rand.New(rand.NewPCG(seed, 7))
	for range count {
		sets = append(sets, pattern.NewSet(brute.RandomPatterns[pattern.Perm](rng, 4, 2, 5)...))
	}
	return sets
}

// TestCountsAgree compares certify.Counts with the engine's counts.
func TestCountsAgree(t *testing.T) {
	for _, s := range randomSets(1, 40) {
		want, err := certify.Counts(ctx, s.Strings(), 16)
		if err != nil {
			t.Fatal(err)
		}
		e := transfer.New(transfer.Whole(transfer.NewStates(s)))
		g, err := e.Start(ctx)
		if err != nil {
			t.Fatal(err)
		}
		for n := 0; n <= 16; n++ {
			if n > 0 {
				if g, err = e.Next(ctx, g); err != nil {
					t.Fatal(err)
				}
			}
			if g.Sum().Cmp(want[n]) != 0 {
				t.Fatalf("%s: a_%d = %s by the engine, %s by the checker", s, n, g.Sum(), want[n])
			}
		}
	}
}

// engineCertificate assembles a certificate from engine brackets taken at
// fixed n (whole system step 1 for the all-n bounds; blocks for reducible
// sets; step p for periodic ones) and the structure pass's section.
func engineCertificate(t *testing.T, s pattern.Set, n int) (*certify.Certificate, *structure.Report) {
	t.Helper()
	rep, err := structure.Analyze(ctx, s, structure.Options{Witnesses: s.Window() <= 5})
	if err != nil {
		t.Fatal(err)
	}
	st := transfer.NewStates(s)
	n = max(n, st.MaxLength())
	var brackets []*bounds.Bracket
	whole, err := bounds.BracketAt(ctx, transfer.Whole(st), n, 1, 128)
	if err != nil {
		t.Fatal(err)
	}
	whole.Upper = whole.Hi != nil
	brackets = append(brackets, whole)
	if rep.Class == structure.Periodic {
		b, err := bounds.BracketAt(ctx, transfer.Whole(st), n, rep.Period, 128)
		if err != nil {
			t.Fatal(err)
		}
		whole.Upper, b.Upper = false, b.Hi != nil
		brackets = append(brackets, b)
	}
	if rep.Class == structure.Reducible || rep.Class == structure.Subexponential || (whole.Hi == nil && rep.Class != structure.Periodic) {
		// blocks of the state digraph: start ones above, start whole below
		whole.Upper = false
		for _, block := range bounds.Blocks(st) {
			for _, start := range []transfer.Start{transfer.StartOnes, transfer.StartWhole} {
				sys, err := st.Restrict(block, start)
				if err != nil {
					t.Fatal(err)
				}
				b, err := bounds.BracketAt(ctx, sys, max(n, sys.StartN()), 1, 128)
				if err != nil {
					t.Fatal(err)
				}
				b.Upper = start == transfer.StartOnes
				brackets = append(brackets, b)
			}
		}
	}
	c := &certify.Certificate{Tool: "avoidcert conformance tests", Statement: certify.Statement{Given: s.Strings()}}
	if rep.M >= 0 {
		c.Structure = prove.Structure(rep)
	}
	lo, hi := new(big.Rat), new(big.Rat)
	for _, b := range brackets {
		c.Evidence.Brackets = append(c.Evidence.Brackets, certify.Bracket{States: b.States, Start: certify.Start(b.Start),
			Step: b.Step, N: b.N, Lo: b.Lo, Hi: b.Hi, Upper: b.Upper, IterateDigest: b.Digest})
		if b.Step == 1 && b.Start != transfer.StartOnes && b.Lo.Cmp(lo) > 0 {
			lo = b.Lo
		}
		if b.Upper {
			if b.Hi == nil {
				return nil, rep // no finite upper end at this n
			}
			h := root(b.Hi, b.Step)
			if h.Cmp(hi) > 0 {
				hi = h
			}
		}
	}
	c.Statement.Lambda = certify.Range{Lo: lo, Hi: hi, Digits: 6}
	c.Statement.Radius = certify.Range{Lo: new(big.Rat), Digits: 6}
	if hi.Sign() > 0 {
		c.Statement.Radius.Lo = new(big.Rat).Inv(hi)
	}
	if lo.Sign() > 0 {
		c.Statement.Radius.Hi = new(big.Rat).Inv(lo)
	}
	c.Statement.AllN = certify.AllN{N0: whole.N, AN0: whole.Sum, MuLo: whole.Lo, MuHi: whole.Hi}
	if err := certify.Derive(c); err != nil {
		t.Fatal(err)
	}
	return c, rep
}

// root returns a rational at least x^(1/d) (d = 1 or 2 here), from a
// float64 square root stepped up until its square is at least x.
func root(x *big.Rat, d int) *big.Rat {
	if d == 1 {
		return x
	}
	f, _ := x.Float64()
	r := new(big.Rat).SetFloat64(math.Pow(f, 1/float64(d)))
	for {
		p := new(big.Rat).SetInt64(1)
		for range d {
			p.Mul(p, r)
		}
		if p.Cmp(x) >= 0 {
			return r
		}
		r.Mul(r, big.NewRat(1000001, 1000000))
	}
}

// TestEngineCertificatesCheck builds certificates from the engine's
// brackets (whole system, periodic steps, blocks with both starts) and the
// structure pass, and has the checker verify them: every digest, a_n0,
// every ratio bound and every structural claim is recomputed by the
// checker's own code, so any disagreement is a refusal.
func TestEngineCertificatesCheck(t *testing.T) {
	checked, classes := 0, map[structure.Class]int{}
	sets := randomSets(2011, 60)
	for _, given := range [][]string{{"123", "321"}, {"132", "231"}, {"231", "1243"}, {"1243", "1342", "2314", "2413", "3421", "4132"}, {"213", "312"}, {"12345"}, {"21453"}} {
		s, err := pattern.ParseSet(given)
		if err != nil {
			t.Fatal(err)
		}
		sets = append(sets, s)
	}
	for _, s := range sets {
		c, rep := engineCertificate(t, s, 8)
		if c == nil {
			continue
		}
		if err := certify.Check(ctx, c, certify.CheckOptions{Expect: s.Strings()}); err != nil {
			t.Fatalf("%s (%s): %v", s, rep.Class, err)
		}
		checked++
		classes[rep.Class]++
	}
	t.Logf("%d certificates checked; classes %v", checked, classes)
	if checked < 60 || len(classes) < 5 {
		t.Fatalf("only %d certificates (classes %v)", checked, classes)
	}
}

// TestParsingAgrees compares the checker's own parsing (irredundant set
// and canonical representative) with package pattern on random token
// lists, digits and dotted.
func TestParsingAgrees(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 2))
	for range 2000 {
		var given []string
		for _, p := range brute.RandomPatterns[pattern.Perm](rng, 5, 1, 7) {
			tok := p.String()
			if rng.IntN(3) == 0 {
				tok = ""
				for i, v := range p {
					if i > 0 {
						tok += "."
					}
					tok += string(rune('0' + v))
				}
			}
			given = append(given, tok)
		}
		set, err := pattern.ParseSet(given)
		if err != nil {
			t.Fatal(err)
		}
		c := &certify.Certificate{Statement: certify.Statement{Given: given,
			Lambda: certify.Range{Digits: 1}, Radius: certify.Range{Digits: 1}}}
		if err := certify.Derive(c); err != nil {
			t.Fatalf("%v: %v", given, err)
		}
		patterns, canonical := c.Statement.Patterns, c.Statement.Canonical
		if got, want := patterns, set.Strings(); !equal(got, want) {
			t.Fatalf("%v: irredundant set %v, pattern gives %v", given, got, want)
		}
		if got, want := canonical, set.Canonical().Strings(); !equal(got, want) {
			t.Fatalf("%v: canonical %v, pattern gives %v", given, got, want)
		}
		// The same tokens typed as one comma list, as the commands hand
		// them to the checker.
		typed := []string{strings.Join(given, ",")}
		if again, err := pattern.ParseSet(typed); err != nil || !equal(again.Strings(), set.Strings()) {
			t.Fatalf("%v: pattern reads the comma list as %v, %v", typed, again.Strings(), err)
		}
		if got, err := certify.ParsePatterns(typed); err != nil || !equal(got, set.Strings()) {
			t.Fatalf("%v: the checker reads the comma list as %v, %v; pattern gives %v", typed, got, err, set.Strings())
		}
	}
}

func equal(a, b []string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestDecimalsAgree compares the certificate's outward decimals (as Derive
// fills them) with the interval package's independent implementation.
func TestDecimalsAgree(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 9))
	for range 2000 {
		r := big.NewRat(rng.Int64N(1e12)+1, rng.Int64N(1e12)+1)
		digits := 1 + rng.IntN(25)
		c := &certify.Certificate{Statement: certify.Statement{Given: []string{"123"},
			Lambda: certify.Range{Lo: r, Hi: r, Digits: digits}, Radius: certify.Range{Lo: r, Digits: digits}}}
		if err := certify.Derive(c); err != nil {
			t.Fatal(err)
		}
		if want := interval.DecimalDown(r, digits); c.Statement.Lambda.LoDecimal != want {
			t.Fatalf("%s at %d digits: down %s, interval.DecimalDown %s", r, digits, c.Statement.Lambda.LoDecimal, want)
		}
		if want := interval.DecimalUp(r, digits); c.Statement.Lambda.HiDecimal != want {
			t.Fatalf("%s at %d digits: up %s, interval.DecimalUp %s", r, digits, c.Statement.Lambda.HiDecimal, want)
		}
	}
}
