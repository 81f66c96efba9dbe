package certify_test

import (
	"errors"
	"math"
	"math/big"
	"strings"
	"testing"

	"avoidcert/certify"
	"avoidcert/internal/brute"
	"avoidcert/pattern"
)

// Published growth rates (float64 accuracy, enough for brackets of width
// 1e-6 and more).
var (
	// Elizalde and Noy, "Consecutive patterns in permutations", Adv. Appl.
	// Math. 30 (2003): lambda(123) = 3 sqrt(3)/(2 pi).
	lambda123 = 3 * math.Sqrt(3) / (2 * math.Pi)
	// Same source: 1/lambda(132) is the root z of integral_0^z exp(-t^2/2) dt
	// = 1, that is sqrt(pi/2) erf(z/sqrt 2) = 1.
	lambda132 = 1 / (math.Sqrt2 * math.Erfinv(math.Sqrt(2/math.Pi)))
	// Andre (1879): avoiders of {123, 321} are twice the alternating
	// permutations, whose EGF sec z + tan z has its pole at pi/2.
	lambdaAlternating = 2 / math.Pi
	// David and Barton, Combinatorial Chance (1962): the EGF of 1234-avoiders
	// is 2/(cos z - sin z + exp(-z)); 1/lambda is its first positive pole.
	lambda1234 = 1 / bisect(func(z float64) float64 { return math.Cos(z) - math.Sin(z) + math.Exp(-z) }, 1, 2)
)

// bisect finds a root of f in [a, b] where f changes sign.
func bisect(f func(float64) float64, a, b float64) float64 {
	for range 200 {
		mid := (a + b) / 2
		if (f(a) < 0) == (f(mid) < 0) {
			a = mid
		} else {
			b = mid
		}
	}
	return (a + b) / 2
}

// contains reports whether the real v lies in [lo, hi] up to float64
// rounding of v.
func contains(r certify.Range, v float64) bool {
	lo, _ := r.Lo.Float64()
	hi, _ := r.Hi.Float64()
	return lo <= v*(1+1e-14) && v*(1-1e-14) <= hi
}

type validCase struct {
	name      string
	given     []string
	brackets  func(t testing.TB, s pattern.Set) []engineBracket
	published float64 // 0: none
	oeis      string  // counts for the all-n check; "": enumeration
}

func whole(k, d int, upper bool) func(testing.TB, pattern.Set) []engineBracket {
	return func(t testing.TB, s pattern.Set) []engineBracket {
		return []engineBracket{bracketFromEngine(t, s, nil, k, d, upper)}
	}
}

func validCases() []validCase {
	return []validCase{
		{"123", []string{"123"}, whole(10, 1, true), lambda123, "A049774"},
		{"132", []string{"132"}, whole(10, 1, true), lambda132, "A111004"},
		{"1234", []string{"1234"}, whole(6, 1, true), lambda1234, "A117158"},
		{"alternating, step 2", []string{"123", "321"}, func(t testing.TB, s pattern.Set) []engineBracket {
			return []engineBracket{bracketFromEngine(t, s, nil, 10, 1, false), bracketFromEngine(t, s, nil, 10, 2, true)}
		}, lambdaAlternating, "A001250"}, // a_n = 2 E_n = A001250(n) for n >= 2
		{"mixed lengths, redundant given", []string{"123", "2413", "1234"}, whole(5, 1, true), 0, ""},
		{"restricted lower bracket", []string{"1342"}, func(t testing.TB, s pattern.Set) []engineBracket {
			return []engineBracket{bracketFromEngine(t, s, nil, 6, 1, true), bracketFromEngine(t, s, []int{0, 1, 2, 4}, 6, 1, false)}
		}, 0, "A117156"},
		{"the pattern 1 (m = 0, a_n = 0)", []string{"1"}, whole(3, 1, true), 0, ""},
		{"acyclic blocks", []string{"213", "312"}, func(t testing.TB, s pattern.Set) []engineBracket {
			return []engineBracket{bracketFromEngine(t, s, nil, 6, 1, false),
				bracketFromEngine(t, s, []int{0}, 8, 1, true), bracketFromEngine(t, s, []int{1}, 6, 1, true)}
		}, 0, ""},
	}
}

func TestValidCertificatesPass(t *testing.T) {
	for _, tc := range validCases() {
		t.Run(tc.name, func(t *testing.T) {
			s, err := pattern.ParseSet(tc.given)
			if err != nil {
				t.Fatal(err)
			}
			c := assemble(t, tc.given, tc.brackets(t, s))
			if err := certify.Check(c, certify.CheckOptions{Expect: s}); err != nil {
				t.Fatalf("valid certificate rejected: %v", err)
			}
			data, err := certify.Marshal(c)
			if err != nil {
				t.Fatal(err)
			}
			back, err := certify.Read(strings.NewReader(string(data)))
			if err != nil {
				t.Fatalf("Read of Marshal: %v", err)
			}
			if err := certify.Check(back, certify.CheckOptions{Expect: s}); err != nil {
				t.Fatalf("certificate read back rejected: %v", err)
			}
			if tc.published != 0 && !contains(back.Statement.Lambda, tc.published) {
				t.Fatalf("certified [%s, %s] misses the published value %.16g", back.Statement.Lambda.LoDecimal, back.Statement.Lambda.HiDecimal, tc.published)
			}
			checkAllNAgainstCounts(t, s, tc.oeis, back.Statement.AllN)
		})
	}
}

// checkAllNAgainstCounts tests the explicit bounds against the counts of
// an OEIS table, or of enumeration (internal/brute) up to n = 9.
func checkAllNAgainstCounts(t *testing.T, s pattern.Set, oeis string, a certify.AllN) {
	t.Helper()
	count, last := func(n int) *big.Int {
		var pats [][]int
		for _, p := range s.Patterns() {
			pats = append(pats, p)
		}
		return big.NewInt(int64(brute.Count(n, pats)))
	}, 9
	if oeis != "" {
		terms := oeisTerms(t, oeis)
		count, last = func(n int) *big.Int { return terms[n] }, len(terms)-1
	}
	if a.N0 > last {
		t.Fatalf("no reference count for n0 = %d", a.N0)
	}
	fact := func(n int) *big.Int { return new(big.Int).MulRange(1, int64(max(n, 1))) }
	if want := count(a.N0); a.AN0.Cmp(want) != 0 {
		t.Fatalf("a_%d = %s, the reference gives %s", a.N0, a.AN0, want)
	}
	A := new(big.Rat).SetFrac(a.AN0, fact(a.N0))
	lo, hi := new(big.Rat).Set(A), new(big.Rat).Set(A)
	for n := a.N0; n <= last; n++ {
		x := new(big.Rat).SetFrac(count(n), fact(n))
		if x.Cmp(lo) < 0 || (a.MuHi != nil && x.Cmp(hi) > 0) {
			t.Fatalf("a_%d/%d! = %s is outside the all-n bounds [%s, %s]", n, n, x.FloatString(12), lo.FloatString(12), hi.FloatString(12))
		}
		lo.Mul(lo, a.MuLo)
		if a.MuHi != nil {
			hi.Mul(hi, a.MuHi)
		}
	}
}

func cert123(t testing.TB) *certify.Certificate { return wholeCert(t, "123", 8) }

// resealed returns the certificate after change, re-derived: what an
// attacker who recomputes every derivable field and the digest would write.
func resealed(t *testing.T, change func(c *certify.Certificate)) *certify.Certificate {
	t.Helper()
	c := cert123(t)
	change(c)
	if err := certify.Derive(c); err != nil {
		t.Fatal(err)
	}
	data, err := certify.Marshal(c)
	if err != nil {
		t.Fatal(err)
	}
	back, err := certify.Read(strings.NewReader(string(data)))
	if err != nil {
		t.Fatalf("resealed certificate unreadable: %v", err)
	}
	return back
}

// claimHi sets every upper bound of a one-bracket certificate to hi,
// consistently, as a forger would.
func claimHi(hi *big.Rat) func(c *certify.Certificate) {
	return func(c *certify.Certificate) {
		c.Statement.Lambda.Hi = hi
		c.Evidence.Brackets[0].Hi = hi
		c.Statement.AllN.MuHi = hi
		c.Statement.Radius.Lo = new(big.Rat).Inv(hi)
	}
}

func TestFalseBoundsRejected(t *testing.T) {
	// lambda(123) = 3 sqrt(3)/(2 pi) (Elizalde-Noy 2003); 1e-6 below it and
	// above it, as exact rationals.
	below := new(big.Rat).SetFloat64(lambda123 - 1e-6)
	above := new(big.Rat).SetFloat64(lambda123 + 1e-6)
	ref := cert123(t)
	minRatio := ref.Evidence.Brackets[0].Lo
	for _, tc := range []struct {
		name   string
		change func(c *certify.Certificate)
		reason string
	}{
		{"hi below the published value", claimHi(below), "hi is below the ratio"},
		{"hi = the min ratio", claimHi(minRatio), "hi is below the ratio"},
		{"hi true but not proved at this k", claimHi(above), "hi is below the ratio"},
		{"lambda.hi below the bracket", func(c *certify.Certificate) {
			c.Statement.Lambda.Hi = below
			c.Statement.Radius.Lo = new(big.Rat).Inv(below)
		}, "lambda.hi^1 is below"},
		{"lo above the published value", func(c *certify.Certificate) {
			c.Statement.Lambda.Lo = above
			c.Statement.Lambda.Hi = new(big.Rat).Add(above, above)
			c.Evidence.Brackets[0].Lo = above
			c.Statement.AllN.MuLo = above
			c.Statement.Radius.Hi = new(big.Rat).Inv(above)
			c.Statement.Radius.Lo = new(big.Rat).Inv(c.Statement.Lambda.Hi)
		}, "lo is above the ratio"},
		{"radius.lo too large", func(c *certify.Certificate) {
			c.Statement.Radius.Lo = new(big.Rat).Inv(below)
		}, "radius.lo"},
		{"radius.hi too small", func(c *certify.Certificate) {
			c.Statement.Radius.Hi = new(big.Rat).Inv(above)
		}, "radius.hi"},
		{"mu_hi below the bracket", func(c *certify.Certificate) { c.Statement.AllN.MuHi = below }, "mu_hi"},
		{"mu_lo above the bracket", func(c *certify.Certificate) { c.Statement.AllN.MuLo = above }, "mu_lo"},
		{"a_n0 off by one", func(c *certify.Certificate) { c.Statement.AllN.AN0.Add(c.Statement.AllN.AN0, big.NewInt(1)) }, "a_n0"},
		{"n0 of no bracket", func(c *certify.Certificate) { c.Statement.AllN.N0++ }, "n0"},
		{"k changed", func(c *certify.Certificate) { c.Evidence.Brackets[0].K++; c.Statement.AllN.N0++ }, "iterate_sha256"},
		{"digest changed", func(c *certify.Certificate) { c.Evidence.Brackets[0].IterateDigest[5] ^= 1 }, "iterate_sha256"},
		{"other set", func(c *certify.Certificate) { c.Statement.Given = []string{"132"} }, "not for the expected set"},
		{"no upper bracket", func(c *certify.Certificate) { c.Evidence.Brackets[0].Upper = false }, "no bracket is marked upper"},
		{"cyclic blocks", func(c *certify.Certificate) {
			s, _ := pattern.ParseSet([]string{"123"})
			c.Evidence.Brackets = append(c.Evidence.Brackets[:1],
				bracketFromEngine(t, s, []int{0}, 8, 1, true).Bracket, bracketFromEngine(t, s, []int{1}, 8, 1, true).Bracket)
			c.Evidence.Brackets[0].Upper = false
		}, "not in block-triangular order"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, _ := pattern.ParseSet([]string{"123"})
			wantRefusal(t, certify.Check(resealed(t, tc.change), certify.CheckOptions{Expect: s}), tc.reason)
		})
	}
}

// wantRefusal fails unless err is a one-line refusal naming the reason.
func wantRefusal(t *testing.T, err error, reason string) {
	t.Helper()
	if err == nil {
		t.Fatal("accepted")
	}
	if !strings.Contains(err.Error(), reason) {
		t.Fatalf("rejected for %q, want a reason containing %q", err, reason)
	}
	if strings.Contains(err.Error(), "\n") {
		t.Fatalf("message is not one line: %q", err)
	}
}

func TestZeroLowerBoundNeedsNonZeroIterate(t *testing.T) {
	// Restricted to cell 12, the set {123} has no window: G_k = 0 for k >= 1,
	// so the bracket inequalities hold for every lo and must not count.
	s, _ := pattern.ParseSet([]string{"123"})
	c := cert123(t)
	empty := bracketFromEngine(t, s, []int{0}, 3, 1, false)
	empty.Lo = big.NewRat(1, 1)
	c.Evidence.Brackets = append(c.Evidence.Brackets, empty.Bracket)
	c.Statement.Lambda.Lo = big.NewRat(1, 1)
	c.Statement.Radius.Hi = big.NewRat(1, 1)
	c.Statement.Radius.Lo = new(big.Rat).Inv(c.Statement.Lambda.Hi)
	c.Statement.Lambda.Hi = big.NewRat(1, 1) // keep lo <= hi
	c.Statement.Radius.Lo = big.NewRat(1, 1)
	if err := certify.Derive(c); err != nil {
		t.Fatal(err)
	}
	err := certify.Check(c, certify.CheckOptions{})
	if err == nil || !strings.Contains(err.Error(), "is zero") {
		t.Fatalf("got %v, want a refusal of lo > 0 over a zero iterate", err)
	}
}

func TestExpectBindsTheSet(t *testing.T) {
	c := cert123(t)
	for _, tc := range []struct {
		expect string
		ok     bool
	}{{"123", true}, {"123,1234", true}, {"321", false}, {"132", false}, {"123,321", false}} {
		s, err := pattern.ParseSet([]string{tc.expect})
		if err != nil {
			t.Fatal(err)
		}
		err = certify.Check(c, certify.CheckOptions{Expect: s})
		if (err == nil) != tc.ok {
			t.Errorf("Expect %s: got %v, want ok=%v", tc.expect, err, tc.ok)
		}
	}
}

func TestWorkLimit(t *testing.T) {
	c := wholeCert(t, "1234", 6)
	err := certify.Check(c, certify.CheckOptions{MaxWork: 1000})
	if !errors.Is(err, certify.ErrLimit) || !strings.Contains(err.Error(), "coefficient operations") {
		t.Fatalf("got %v, want a work-limit refusal", err)
	}
	err = certify.Check(c, certify.CheckOptions{MaxMemory: 1000})
	if !errors.Is(err, certify.ErrLimit) || !strings.Contains(err.Error(), "memory") {
		t.Fatalf("got %v, want a memory-limit refusal", err)
	}
	if err := certify.Check(c, certify.CheckOptions{}); err != nil {
		t.Fatalf("default limits: %v", err)
	}
}

// TestHostileValuesNoPanic feeds Check certificates that no producer would
// make; each must be refused with a message, never a panic.
func TestHostileValuesNoPanic(t *testing.T) {
	huge := new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), 20000))
	for _, tc := range []struct {
		name   string
		change func(c *certify.Certificate)
	}{
		{"nil lo", func(c *certify.Certificate) { c.Statement.Lambda.Lo = nil }},
		{"nil a_n0", func(c *certify.Certificate) { c.Statement.AllN.AN0 = nil }},
		{"negative lo", func(c *certify.Certificate) { c.Evidence.Brackets[0].Lo = big.NewRat(-1, 2) }},
		{"huge number", func(c *certify.Certificate) { c.Evidence.Brackets[0].Hi = huge }},
		{"no brackets", func(c *certify.Certificate) { c.Evidence.Brackets = nil }},
		{"no patterns", func(c *certify.Certificate) { c.Statement.Given = nil }},
		{"bad pattern", func(c *certify.Certificate) { c.Statement.Given = []string{"1223"} }},
		{"long pattern", func(c *certify.Certificate) { c.Statement.Given = []string{"123456789"} }},
		{"comma in token", func(c *certify.Certificate) { c.Statement.Given = []string{"123,132"} }},
		{"cell out of range", func(c *certify.Certificate) { c.Evidence.Brackets[0].Cells = []int{0, 2} }},
		{"negative cell", func(c *certify.Certificate) { c.Evidence.Brackets[0].Cells = []int{-1, 1} }},
		{"unsorted cells", func(c *certify.Certificate) { c.Evidence.Brackets[0].Cells = []int{1, 0} }},
		{"step 0", func(c *certify.Certificate) { c.Evidence.Brackets[0].Step = 0 }},
		{"negative k", func(c *certify.Certificate) { c.Evidence.Brackets[0].K = -1 }},
		{"huge k", func(c *certify.Certificate) { c.Evidence.Brackets[0].K = 1 << 40 }},
		{"digits 0", func(c *certify.Certificate) { c.Statement.Lambda.Digits = 0 }},
		{"tool with quote", func(c *certify.Certificate) { c.Tool = `a"b` }},
		{"empty tool", func(c *certify.Certificate) { c.Tool = "" }},
		{"cell length", func(c *certify.Certificate) { c.Evidence.CellLength = 3 }},
		{"duplicate bracket", func(c *certify.Certificate) {
			c.Evidence.Brackets = append(c.Evidence.Brackets, c.Evidence.Brackets[0])
		}},
		{"decimal not derived", func(c *certify.Certificate) { c.Statement.Lambda.LoDecimal = "0.5" }},
		{"canonical not derived", func(c *certify.Certificate) { c.Statement.Canonical = []string{"321"} }},
		{"nil witness", func(c *certify.Certificate) { c.Structure.Witnesses[3] = nil }},
		{"empty witness list", func(c *certify.Certificate) { c.Structure.Witnesses = []pattern.Perm{} }},
		{"negative entry", func(c *certify.Certificate) { c.Structure.Witnesses[0] = pattern.Perm{-1, 2, 3, 4, 5, 6} }},
		{"long witness", func(c *certify.Certificate) { c.Structure.Witnesses[0] = make(pattern.Perm, certify.MaxPermLength+1) }},
		{"nil cell pair", func(c *certify.Certificate) { c.Structure.Unreached = &certify.CellPair{} }},
		{"negative exponent", func(c *certify.Certificate) { c.Structure.Exponent = -4 }},
		{"huge exponent", func(c *certify.Certificate) { c.Structure.Exponent = 1 << 40 }},
		{"cycle start without length", func(c *certify.Certificate) { c.Structure.CycleStart = 3 }},
		{"empty class", func(c *certify.Certificate) { c.Structure.Class = "" }},
		{"empty lambda status", func(c *certify.Certificate) { c.Structure.Lambda = "" }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := cert123(t)
			tc.change(c)
			if err := certify.Check(c, certify.CheckOptions{}); err == nil {
				t.Fatal("accepted")
			} else if strings.Contains(err.Error(), "\n") {
				t.Fatalf("message is not one line: %q", err)
			} else {
				t.Log(err)
			}
		})
	}
	if err := certify.Check(nil, certify.CheckOptions{}); err == nil {
		t.Fatal("nil certificate accepted")
	}
}

// BenchmarkCheck times the checker on the whole system of 12345 at k = 14
// (m = 4, 24 cells); run briefly: go test ./certify/ -run X -bench Check -benchtime 1x
func BenchmarkCheck(b *testing.B) {
	c := wholeCert(b, "12345", 14)
	b.Log(certify.Check(c, certify.CheckOptions{MaxWork: 1}))
	b.ResetTimer()
	for range b.N {
		if err := certify.Check(c, certify.CheckOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// TestCheckProgress: the progress hook sees the work done grow to the
// total, once per recomputed iterate.
func TestCheckProgress(t *testing.T) {
	const k = 12
	c := wholeCert(t, "1342", k)
	var calls int
	var last, total int64
	opts := certify.CheckOptions{Progress: func(done, all int64) {
		if done < last || done > all || (total != 0 && all != total) {
			t.Errorf("progress %d of %d after %d of %d", done, all, last, total)
		}
		calls, last, total = calls+1, done, all
	}}
	if err := certify.Check(c, opts); err != nil {
		t.Fatal(err)
	}
	if calls != k+1 || last != total || total <= 0 {
		t.Fatalf("%d calls ending at %d of %d; want %d calls ending at the total", calls, last, total, k+1)
	}
}
