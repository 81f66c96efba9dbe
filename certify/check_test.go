package certify_test

import (
	"context"
	"errors"
	"math"
	"math/big"
	"runtime"
	"strings"
	"testing"

	"avoidcert/certify"
)

var bg = context.Background()

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
	specs     []spec
	published float64 // 0: none
	oeis      string  // counts for the all-n check; "": brute force
}

func validCases() []validCase {
	return []validCase{
		{"123", []string{"123"}, []spec{wholeSpec(14, 1, true)}, lambda123, "A049774"},
		{"132", []string{"132"}, []spec{wholeSpec(14, 1, true)}, lambda132, "A111004"},
		{"1234", []string{"1234"}, []spec{wholeSpec(12, 1, true)}, lambda1234, "A117158"},
		{"alternating, step 2", []string{"123", "321"}, []spec{wholeSpec(12, 1, false), wholeSpec(12, 2, true)},
			lambdaAlternating, "A001250"}, // a_n = 2 E_n = A001250(n) for n >= 2
		{"mixed lengths, redundant given", []string{"123", "2413", "1234"}, []spec{wholeSpec(7, 1, true)}, 0, ""},
		{"restricted lower bracket, start whole", []string{"1342"}, []spec{wholeSpec(8, 1, true),
			{states: []int{1, 2, 3}, start: certify.StartWhole, step: 1, n: 8}}, 0, "A117156"},
		{"the pattern 1 (no move, a_n = 0)", []string{"1"}, []spec{wholeSpec(3, 1, true)}, 0, ""},
		{"acyclic blocks, start ones", []string{"213", "312"}, []spec{wholeSpec(8, 1, false),
			{states: []int{0, 1}, start: certify.StartOnes, step: 1, n: 8, upper: true},
			{states: []int{2}, start: certify.StartOnes, step: 1, n: 6, upper: true}}, 0, ""},
	}
}

func TestValidCertificatesPass(t *testing.T) {
	for _, tc := range validCases() {
		t.Run(tc.name, func(t *testing.T) {
			c := assemble(t, tc.given, tc.specs, nil)
			if err := certify.Check(bg, c, certify.CheckOptions{Expect: tc.given}); err != nil {
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
			if err := certify.Check(bg, back, certify.CheckOptions{Expect: tc.given}); err != nil {
				t.Fatalf("certificate read back rejected: %v", err)
			}
			if tc.published != 0 && !contains(back.Statement.Lambda, tc.published) {
				t.Fatalf("certified [%s, %s] misses the published value %.16g", back.Statement.Lambda.LoDecimal, back.Statement.Lambda.HiDecimal, tc.published)
			}
			checkAllNAgainstCounts(t, tc.given, tc.oeis, back.Statement.AllN)
		})
	}
}

// checkAllNAgainstCounts tests the explicit bounds against the counts of
// an OEIS table, or of the tests' brute force up to n = 9.
func checkAllNAgainstCounts(t *testing.T, given []string, oeis string, a certify.AllN) {
	t.Helper()
	count, last := func(n int) *big.Int { return bruteCount(given, n) }, 9
	if oeis != "" {
		terms, offset := oeisTerms(t, oeis)
		count, last = func(n int) *big.Int { return terms[n-offset] }, offset+len(terms)-1
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
	for n := a.N0; n <= min(last, a.N0+60); n++ {
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
func resealed(t *testing.T, c *certify.Certificate, change func(c *certify.Certificate)) *certify.Certificate {
	t.Helper()
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

// TestFalseBoundsRejected changes one claim or one derived field at a
// time, re-deriving everything else, and expects the refusal that names
// it: every inequality the checker verifies and every derived field.
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
		{"hi true but not proved at this n", claimHi(above), "hi is below the ratio"},
		{"lambda.hi below the bracket", func(c *certify.Certificate) {
			c.Statement.Lambda.Hi = below
			c.Statement.Radius.Lo = new(big.Rat).Inv(below)
		}, "lambda.hi^1 is below"},
		{"lambda.lo above lambda.hi", func(c *certify.Certificate) {
			c.Statement.Lambda.Lo = new(big.Rat).Add(c.Statement.Lambda.Hi, big.NewRat(1, 100))
		}, "lo is above hi"},
		{"lambda.lo above every bracket", func(c *certify.Certificate) {
			c.Statement.Lambda.Lo = new(big.Rat).Add(c.Evidence.Brackets[0].Lo, big.NewRat(1, 1000000))
			c.Statement.Radius.Hi = new(big.Rat).Inv(c.Statement.Lambda.Lo)
		}, "no bracket of the whole system or with start whole has lo"},
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
		{"radius.hi missing", func(c *certify.Certificate) { c.Statement.Radius.Hi = nil }, "radius.hi: missing"},
		{"mu_hi below the bracket", func(c *certify.Certificate) { c.Statement.AllN.MuHi = below }, "mu_hi"},
		{"mu_lo above the bracket", func(c *certify.Certificate) { c.Statement.AllN.MuLo = above }, "mu_lo"},
		{"a_n0 off by one", func(c *certify.Certificate) { c.Statement.AllN.AN0.Add(c.Statement.AllN.AN0, big.NewInt(1)) }, "a_n0"},
		{"n0 of no bracket", func(c *certify.Certificate) { c.Statement.AllN.N0++ }, "n0"},
		{"n changed", func(c *certify.Certificate) { c.Evidence.Brackets[0].N++; c.Statement.AllN.N0++ }, "iterate_sha256"},
		{"digest changed", func(c *certify.Certificate) { c.Evidence.Brackets[0].IterateDigest[5] ^= 1 }, "iterate_sha256"},
		{"other set", func(c *certify.Certificate) { c.Statement.Given = []string{"132"} }, "not for the expected set"},
		{"no upper bracket", func(c *certify.Certificate) { c.Evidence.Brackets[0].Upper = false }, "no bracket is marked upper"},
		{"cyclic blocks", func(c *certify.Certificate) {
			// 123: states (), 1, 12; the blocks {(), 12} and {1} lead into
			// each other
			b1, _ := certify.MakeBracket([]string{"123"}, []int{0, 2}, certify.StartOnes, 1, 8, true)
			b2, _ := certify.MakeBracket([]string{"123"}, []int{1}, certify.StartOnes, 1, 8, true)
			c.Evidence.Brackets = append(c.Evidence.Brackets[:1], b1, b2)
			c.Evidence.Brackets[0].Upper = false
		}, "not in block-triangular order"},
		{"upper block with start whole", func(c *certify.Certificate) {
			b, _ := certify.MakeBracket([]string{"123"}, []int{1, 2}, certify.StartWhole, 1, 8, true)
			c.Evidence.Brackets = append(c.Evidence.Brackets, b)
		}, "bounds lambda from below only"},
		{"start ones on the whole system", func(c *certify.Certificate) { c.Evidence.Brackets[0].Start = certify.StartOnes }, "starts empty"},
		{"start empty on a restricted system", func(c *certify.Certificate) {
			b, _ := certify.MakeBracket([]string{"123"}, []int{1, 2}, certify.StartWhole, 1, 8, false)
			b.Start = certify.StartEmpty
			c.Evidence.Brackets = append(c.Evidence.Brackets, b)
		}, "a restricted system starts ones or whole"},
		{"n below the longest state", func(c *certify.Certificate) {
			b, _ := certify.MakeBracket([]string{"123"}, nil, certify.StartEmpty, 1, 1, false)
			c.Evidence.Brackets = append(c.Evidence.Brackets, b)
		}, "n is below 2"},
		{"lower end from a ones bracket", func(c *certify.Certificate) {
			// {1, 12} with start ones: its lo does not bound lambda from below
			b, _ := certify.MakeBracket([]string{"123"}, []int{1, 2}, certify.StartOnes, 1, 8, false)
			b.Lo = big.NewRat(9, 10)
			c.Evidence.Brackets = append(c.Evidence.Brackets, b)
			c.Statement.Lambda.Lo = big.NewRat(9, 10)
			c.Statement.Lambda.Hi = big.NewRat(9, 10)
			c.Statement.Radius.Hi = big.NewRat(10, 9)
			c.Statement.Radius.Lo = big.NewRat(10, 9)
		}, "no bracket of the whole system or with start whole"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			wantRefusal(t, certify.Check(bg, resealed(t, cert123(t), tc.change), certify.CheckOptions{Expect: []string{"123"}}), tc.reason)
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
	// Restricted to the state 12 alone, {123} has no move (12 grows into
	// 123, 132 or 231, none of which returns to 12 alone), so G_n = 0 after
	// the start and the inequalities hold for every lo; they must not count.
	c := cert123(t)
	empty, _ := certify.MakeBracket([]string{"123"}, []int{2}, certify.StartWhole, 1, 3, false)
	empty.Lo = big.NewRat(1, 1)
	c.Evidence.Brackets = append(c.Evidence.Brackets, empty)
	c.Statement.Lambda.Lo = big.NewRat(1, 1)
	c.Statement.Radius.Hi = big.NewRat(1, 1)
	c.Statement.Lambda.Hi = big.NewRat(1, 1) // keep lo <= hi
	c.Statement.Radius.Lo = big.NewRat(1, 1)
	if err := certify.Derive(c); err != nil {
		t.Fatal(err)
	}
	err := certify.Check(bg, c, certify.CheckOptions{})
	if err == nil || !(strings.Contains(err.Error(), "is zero") || strings.Contains(err.Error(), "hi is below") || strings.Contains(err.Error(), "lo is above")) {
		t.Fatalf("got %v, want a refusal of lo > 0", err)
	}
}

func TestExpectBindsTheSet(t *testing.T) {
	c := cert123(t)
	for _, tc := range []struct {
		expect []string
		ok     bool
	}{
		{[]string{"123"}, true}, {[]string{"123,1234"}, true}, {[]string{"1.2.3", "1234"}, true}, {[]string{" 123 "}, true},
		{[]string{"321"}, false}, {[]string{"132"}, false}, {[]string{"123,321"}, false}, {[]string{"12x"}, false},
	} {
		err := certify.Check(bg, c, certify.CheckOptions{Expect: tc.expect})
		if (err == nil) != tc.ok {
			t.Errorf("Expect %q: got %v, want ok=%v", tc.expect, err, tc.ok)
		}
	}
}

func TestLimits(t *testing.T) {
	c := wholeCert(t, "1234", 10)
	err := certify.Check(bg, c, certify.CheckOptions{MaxWork: 1000})
	var le *certify.LimitError
	if !errors.Is(err, certify.ErrLimit) || !errors.As(err, &le) || le.Resource != "work" || !strings.Contains(err.Error(), "raise the work limit") {
		t.Fatalf("got %v, want a work-limit refusal naming what to raise", err)
	}
	err = certify.Check(bg, c, certify.CheckOptions{MaxMemory: 1000})
	if !errors.As(err, &le) || le.Resource != "memory" || !strings.Contains(err.Error(), "raise the memory limit") {
		t.Fatalf("got %v, want a memory-limit refusal naming what to raise", err)
	}
	if err := certify.Check(bg, c, certify.CheckOptions{}); err != nil {
		t.Fatalf("default limits: %v", err)
	}
}

func TestCancelAndProgress(t *testing.T) {
	c := wholeCert(t, "1234", 20)
	var last, total int64
	calls := 0
	err := certify.Check(bg, c, certify.CheckOptions{Progress: func(done, tot int64) {
		if done < last || done > tot {
			t.Errorf("progress %d of %d after %d", done, tot, last)
		}
		last, total = done, tot
		calls++
	}})
	if err != nil {
		t.Fatal(err)
	}
	if calls < 20 || last != total || total <= 0 {
		t.Fatalf("progress: %d calls, ended at %d of %d", calls, last, total)
	}
	ctx, cancel := context.WithCancel(bg)
	cancel()
	if err := certify.Check(ctx, c, certify.CheckOptions{}); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled check: got %v", err)
	}
}

// BenchmarkCheck times the checker on one whole-system certificate of 1342
// at N = 120 (about 50 digits; the certificate is built once, outside the
// timing): go test ./certify/ -run X -bench Check -benchtime 1x
func BenchmarkCheck(b *testing.B) {
	for _, tc := range []struct {
		given string
		n     int
	}{{"1342", 120}, {"12345", 60}} {
		b.Run(tc.given, func(b *testing.B) {
			c := wholeCert(b, tc.given, tc.n)
			var total int64
			certify.Check(bg, c, certify.CheckOptions{MaxWork: 1, Progress: func(_, t int64) { total = t }})
			err := certify.Check(bg, c, certify.CheckOptions{MaxWork: 1})
			b.Log(err)
			b.ResetTimer()
			for range b.N {
				if err := certify.Check(bg, c, certify.CheckOptions{}); err != nil {
					b.Fatal(err)
				}
			}
			_ = total
		})
	}
}

// TestSameVerdictOnAnyCores: the iteration's goroutines never change a
// verdict or a message.
func TestSameVerdictOnAnyCores(t *testing.T) {
	good := wholeCert(t, "1342", 12)
	bad := wholeCert(t, "1342", 12)
	bad.Evidence.Brackets[0].Hi = new(big.Rat).Mul(bad.Evidence.Brackets[0].Hi, big.NewRat(999999, 1000000))
	bad.Statement.Lambda.Hi, bad.Statement.AllN.MuHi = bad.Evidence.Brackets[0].Hi, bad.Evidence.Brackets[0].Hi
	bad.Statement.Radius.Lo = new(big.Rat).Inv(bad.Evidence.Brackets[0].Hi)
	if err := certify.Derive(bad); err != nil {
		t.Fatal(err)
	}
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	var messages []string
	for _, procs := range []int{1, 2, 3, 7} {
		runtime.GOMAXPROCS(procs)
		if err := certify.Check(bg, good, certify.CheckOptions{}); err != nil {
			t.Fatalf("GOMAXPROCS %d: %v", procs, err)
		}
		err := certify.Check(bg, bad, certify.CheckOptions{})
		if err == nil {
			t.Fatalf("GOMAXPROCS %d: a lowered hi accepted", procs)
		}
		messages = append(messages, err.Error())
	}
	for _, m := range messages[1:] {
		if m != messages[0] {
			t.Fatalf("messages differ with the number of goroutines: %q and %q", messages[0], m)
		}
	}
}

// TestDocumentedRefusals: the two refusals that docs/certificate.md quotes
// ("What the checker verifies") are the checker's own words.
func TestDocumentedRefusals(t *testing.T) {
	lowered := goldenCert(t)
	hi := big.NewRat(83, 100)
	lowered.Statement.Lambda.Hi, lowered.Evidence.Brackets[0].Hi, lowered.Statement.AllN.MuHi = hi, hi, hi
	lowered.Statement.Radius.Lo = new(big.Rat).Inv(hi)
	if err := certify.Derive(lowered); err != nil {
		t.Fatal(err)
	}
	exponent := goldenCert(t)
	exponent.Structure.Exponent = 3
	for c, want := range map[*certify.Certificate]string{
		lowered:  "certificate rejected: evidence.brackets[0] (whole system, step 1, n 8): hi is below the ratio G_9/elevated G_8 = 5553/6684 at state 1, index [4 4]",
		exponent: "certificate rejected: statement.structure.primitivity_exponent: R_3 lacks the configuration (start 12, current 12, overlap 0, order 1234) of D (recomputed), so T'^3 has no a.e.-positive kernel",
	} {
		if err := certify.Check(bg, c, certify.CheckOptions{}); err == nil || err.Error() != want {
			t.Errorf("got %v, the documentation quotes %q", err, want)
		}
	}
}
