package interval

import (
	"math/big"
	"strings"
	"testing"
)

// countsFromReciprocal returns n! [z^n] 1/w for n < len(want), from the exact
// coefficients of w (w_0 = 1): a_0 = 1, a_n = -sum_{i=1..n} w_i a_(n-i).
func countsFromReciprocal(w powerSeries, terms int) []*big.Int {
	a := []*big.Rat{big.NewRat(1, 1)}
	var counts []*big.Int
	fact := big.NewInt(1)
	for n := 0; n < terms; n++ {
		if n > 0 {
			s := new(big.Rat)
			for i := 1; i <= n; i++ {
				s.Add(s, new(big.Rat).Mul(w.coef(i), a[n-i]))
			}
			a = append(a, s.Neg(s))
			fact.Mul(fact, big.NewInt(int64(n)))
		}
		c := new(big.Rat).Mul(a[n], new(big.Rat).SetInt(fact))
		if !c.IsInt() {
			return nil
		}
		counts = append(counts, new(big.Int).Set(c.Num()))
	}
	return counts
}

// The reciprocal of each series must generate the published counts: this
// checks the series (and the recurrence derived in LambdaNonOverlapping)
// against the outside world, term by term.
func TestSeriesGenerateOEISCounts(t *testing.T) {
	cases := []struct {
		name   string
		w      powerSeries
		counts string // the entry's %S line, verbatim
	}{
		{"123, OEIS A049774", &monotoneSeries{k: 3}, "1,1,2,5,17,70,349,2017,13358,99377,822041,7477162,74207209,797771521"},
		{"1234, OEIS A117158", &monotoneSeries{k: 4}, "1,1,2,6,23,111,642,4326,33333,288901,2782082,29471046,340568843"},
		{"12345, OEIS A177523", &monotoneSeries{k: 5}, "1,1,2,6,24,119,709,4928,39144,349776,3472811,37928331,451891992"},
		{"123456, OEIS A177533", &monotoneSeries{k: 6}, "1,1,2,6,24,120,719,5027,40168,361080,3606480,39623760,474915803"},
		{"132, OEIS A111004", newNonOverlappingSeries(3, 2), "1,1,2,5,16,63,296,1623,10176,71793,562848,4853949,45664896,465403791"},
		{"1342, OEIS A117156", newNonOverlappingSeries(4, 2), "1,1,2,6,23,110,630,4210,32150,276210,2636720,27687440,317169270"},
		{"1243, OEIS A117226", newNonOverlappingSeries(4, 3), "1,1,2,6,23,110,630,4204,32054,274914,2619692,27459344,313990182"},
		{"12354, OEIS A202213", newNonOverlappingSeries(5, 4), "1,1,2,6,24,119,708,4914,38976,347765,3447712,37598286,447294144"},
	}
	for _, c := range cases {
		want := strings.Split(c.counts, ",")
		got := countsFromReciprocal(c.w, len(want))
		if len(got) != len(want) {
			t.Errorf("%s: reciprocal series has non-integer counts", c.name)
			continue
		}
		for n, g := range got {
			if g.String() != want[n] {
				t.Errorf("%s: a(%d) = %s, published %s", c.name, n, g, want[n])
				break
			}
		}
	}
}

// The Kummer form used by Lambda132 satisfies h(z) exp(-z^2/2) = 1 - F(z),
// the series LambdaNonOverlapping(3, 2) expands directly (Lambda132's doc
// derives it); checked coefficientwise to degree 60.
func TestKummerIdentity(t *testing.T) {
	h, w := &kummerSeries{}, newNonOverlappingSeries(3, 2)
	const degree = 60
	gauss := make([]*big.Rat, degree+1) // exp(-z^2/2) = sum (-1/2)^m z^(2m)/m!
	for n := range gauss {
		gauss[n] = new(big.Rat)
	}
	term := big.NewRat(1, 1)
	for m := 0; 2*m <= degree; m++ {
		gauss[2*m].Set(term)
		term = new(big.Rat).Mul(term, big.NewRat(-1, int64(2*(m+1))))
	}
	for n := 0; n <= degree; n++ {
		s := new(big.Rat)
		for i := 0; i <= n; i++ {
			s.Add(s, new(big.Rat).Mul(h.coef(i), gauss[n-i]))
		}
		if s.Cmp(w.coef(n)) != 0 {
			t.Fatalf("coefficient %d: h*exp(-z^2/2) = %s, 1 - F = %s", n, s.RatString(), w.coef(n).RatString())
		}
	}
}

// The ratio bounds behind every tail estimate, checked exactly:
// m_(n'+s) X^s <= ratio(n, X) m_(n') for n <= n' < n+40, at X = 2 (the scan
// limit), for each series and its derivative.
func TestTailRatioBounds(t *testing.T) {
	x := searchLimit
	series := map[string]powerSeries{
		"monotone 3":         &monotoneSeries{k: 3},
		"monotone 6":         &monotoneSeries{k: 6},
		"kummer":             &kummerSeries{},
		"non-overlapping 32": newNonOverlappingSeries(3, 2),
		"non-overlapping 43": newNonOverlappingSeries(4, 3),
		"non-overlapping 54": newNonOverlappingSeries(5, 4),
		"non-overlapping 75": newNonOverlappingSeries(7, 5),
	}
	for name, ps := range series {
		for _, s := range []powerSeries{ps, derivative{ps}} {
			step := s.step()
			for n := 0; n < 60; n++ {
				rho := s.ratio(n, x)
				for np := n; np < n+40; np++ {
					lhs := new(big.Rat).Mul(s.majorant(np+step), ratPow(x, step))
					rhs := new(big.Rat).Mul(rho, s.majorant(np))
					if lhs.Cmp(rhs) > 0 {
						t.Fatalf("%s: ratio bound fails at n = %d, n' = %d", name, n, np)
					}
					if new(big.Rat).Abs(s.coef(np)).Cmp(s.majorant(np)) > 0 {
						t.Fatalf("%s: majorant below |c_%d|", name, np)
					}
				}
			}
		}
	}
}

// The fixed-point evaluation agrees with an exact partial sum plus its own
// tail bound, and is as narrow as asked.
func TestEvaluatorAgreesWithExactSum(t *testing.T) {
	x := big.NewRat(5, 4)
	for _, ps := range []powerSeries{&monotoneSeries{k: 4}, &kummerSeries{}, newNonOverlappingSeries(4, 3)} {
		got := newEvaluator(ps, searchLimit).eval(x, x, 100)
		const M = 120
		exact := new(big.Rat)
		for n := M; n >= 0; n-- { // Horner, exact
			exact.Mul(exact, x)
			exact.Add(exact, ps.coef(n))
		}
		tail := tailBound(ps, M, x)
		ref := Interval{Lo: new(big.Rat).Sub(exact, tail), Hi: new(big.Rat).Add(exact, tail)}
		if got.Hi.Cmp(ref.Lo) < 0 || ref.Hi.Cmp(got.Lo) < 0 {
			t.Errorf("%T: evaluator %s and exact sum %s are disjoint", ps, got.String(30), ref.String(30))
		}
		if w := got.Width(); w.Cmp(fixedToRat(big.NewInt(1), 96)) > 0 {
			t.Errorf("%T: width %s wider than about 2^-100", ps, DecimalUp(w, 3))
		}
	}
}

// testPolynomial is a finite series for checking the root scan.
type testPolynomial []*big.Rat

func (p testPolynomial) coef(n int) *big.Rat {
	if n < len(p) {
		return p[n]
	}
	return new(big.Rat)
}
func (p testPolynomial) majorant(n int) *big.Rat      { return new(big.Rat).Abs(p.coef(n)) }
func (p testPolynomial) step() int                    { return 1 }
func (p testPolynomial) ratio(int, *big.Rat) *big.Rat { return new(big.Rat) } // valid past the degree only; the tail starts there

// The scan finds the first of several roots, and refuses a double root where
// no sign change can be certified, or a root sitting exactly on a dyadic grid
// point where the sign is 0 (common practice, no source).
func TestSmallestPositiveRootScan(t *testing.T) {
	// (1 - 3z)(1 - z)(1 - 2z/3) has roots 1/3, 1, 3/2.
	p := testPolynomial{big.NewRat(1, 1), big.NewRat(-14, 3), big.NewRat(17, 3), big.NewRat(-2, 1)}
	a, b, err := smallestPositiveRoot(newEvaluator(p, searchLimit), newEvaluator(derivative{p}, searchLimit))
	if err != nil {
		t.Fatal(err)
	}
	third := big.NewRat(1, 3)
	if a.Cmp(third) >= 0 || b.Cmp(third) <= 0 || b.Cmp(big.NewRat(1, 1)) >= 0 {
		t.Errorf("first root cell [%s, %s] does not isolate 1/3", a.RatString(), b.RatString())
	}
	// (1 - 2z)(1 - z): the root 1/2 is a grid point; an error, not a guess.
	e := testPolynomial{big.NewRat(1, 1), big.NewRat(-3, 1), big.NewRat(2, 1)}
	if _, _, err := smallestPositiveRoot(newEvaluator(e, searchLimit), newEvaluator(derivative{e}, searchLimit)); err == nil || !strings.Contains(err.Error(), "cannot certify") {
		t.Errorf("scan with a root on the grid: %v", err)
	}
	// (1 - 2z)^2 touches 0 at 1/2 without changing sign.
	q := testPolynomial{big.NewRat(1, 1), big.NewRat(-4, 1), big.NewRat(4, 1)}
	if _, _, err := smallestPositiveRoot(newEvaluator(q, searchLimit), newEvaluator(derivative{q}, searchLimit)); err == nil {
		t.Error("scan accepted a double root")
	}
	// exp(-z) (the series of pattern 12) has no root: reported, not invented.
	if _, _, err := smallestPositiveRoot(newEvaluator(&monotoneSeries{k: 2}, searchLimit), newEvaluator(derivative{&monotoneSeries{k: 2}}, searchLimit)); err == nil || !strings.Contains(err.Error(), "no sign change") {
		t.Errorf("scan of exp(-z): %v", err)
	}
}

// Two independent methods for the same constant must agree.
func TestCrossChecks(t *testing.T) {
	const prec = 400
	pairs := []struct {
		name string
		x, y Interval
	}{
		{"132: Kummer series vs Elizalde-Noy ODE", Lambda132(prec), LambdaNonOverlapping(3, 2, prec)},
		{"123: closed form vs David-Barton series", Lambda123(prec), LambdaMonotone(3, prec)},
	}
	for _, p := range pairs {
		if p.x.Hi.Cmp(p.y.Lo) < 0 || p.y.Hi.Cmp(p.x.Lo) < 0 {
			t.Errorf("%s: %s and %s are disjoint", p.name, p.x.String(50), p.y.String(50))
		}
	}
}

func lambdaFunctions() map[string]func(uint) Interval {
	return map[string]func(uint) Interval{
		"123":    Lambda123,
		"132":    Lambda132,
		"123321": LambdaAlternating,
		"1234":   func(p uint) Interval { return LambdaMonotone(4, p) },
		"12345":  func(p uint) Interval { return LambdaMonotone(5, p) },
		"123456": func(p uint) Interval { return LambdaMonotone(6, p) },
		"1342":   func(p uint) Interval { return LambdaNonOverlapping(4, 2, p) },
		"1243":   func(p uint) Interval { return LambdaNonOverlapping(4, 3, p) },
		"12354":  func(p uint) Interval { return LambdaNonOverlapping(5, 4, p) },
	}
}

func TestLambdaWidths(t *testing.T) {
	for name, f := range lambdaFunctions() {
		for _, prec := range []uint{30, 400} {
			x := f(prec)
			if !relativelyNarrow(x.Lo, x.Hi, prec-2) || x.Lo.Cmp(x.Hi) > 0 || x.Lo.Sign() <= 0 {
				t.Errorf("%s at %d bits: %s is not a positive interval of relative width 2^-%d", name, prec, x.String(20), prec-2)
			}
		}
	}
	if x := LambdaMonotone(2, 50); x.Lo.Sign() != 0 || x.Hi.Sign() != 0 {
		t.Errorf("LambdaMonotone(2) = %s, want [0, 0]", x.String(5))
	}
}

// Computed growth rates against the digits printed in OEIS entries (the
// embedded published_growth.json records each entry line).
func TestLambdaAgainstPublishedGrowth(t *testing.T) {
	fs := lambdaFunctions()
	for _, pattern := range []string{"132", "1234", "1243", "1342", "12345", "123456"} {
		c, ok := PublishedGrowth(pattern)
		if !ok {
			t.Errorf("no published constant recorded for %s", pattern)
			continue
		}
		checkAgainst(t, pattern+" vs "+c.Source(), fs[pattern](400), c.LambdaRange())
	}
	// OEIS A202213 (12354) prints counts but no growth constant; the counts
	// test above covers its series.
	if _, ok := PublishedGrowth("12354"); ok {
		t.Error("a published constant for 12354 appeared; compare it here")
	}
}

// Each record quotes its entry line, and the digits appear in it as printed.
func TestPublishedRecordsQuoteTheirLines(t *testing.T) {
	want := []string{"1234", "12345", "123456", "1243", "132", "1324", "1342", "1423", "2143"}
	got := PublishedPatterns()
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("PublishedPatterns() = %v, want %v", got, want)
	}
	for _, p := range got {
		c, _ := PublishedGrowth(p)
		if !strings.HasPrefix(c.Line, "%") || !strings.Contains(c.Line, " "+c.OEIS+" ") {
			t.Errorf("%s: line %q is not from entry %s", p, c.Line, c.OEIS)
		}
		if !strings.Contains(c.Line, "= "+c.Digits+"...") {
			t.Errorf("%s: digits %s not printed in the line", p, c.Digits)
		}
		if c.Quantity != "lambda" && c.Quantity != "1/lambda" {
			t.Errorf("%s: quantity %q", p, c.Quantity)
		}
		r := c.LambdaRange()
		if r.Lo.Cmp(big.NewRat(3, 4)) < 0 || r.Hi.Cmp(big.NewRat(1, 1)) > 0 {
			t.Errorf("%s: published lambda range %s outside (3/4, 1)", p, r.String(10))
		}
	}
}

// orderPattern returns the relative order of the entries of p as a string
// of ranks 1..len(p).
func orderPattern(p []int) string {
	out := make([]byte, len(p))
	for i, x := range p {
		rank := 1
		for _, y := range p {
			if y < x {
				rank++
			}
		}
		out[i] = byte('0' + rank)
	}
	return string(out)
}

// nonOverlappingEnds reports whether pattern p (digits 1..k) is
// non-overlapping (no proper prefix of length >= 2 order-isomorphic to the
// suffix of the same length) and returns its length and last entry.
func nonOverlappingEnds(p string) (k, b int, ok bool) {
	d := make([]int, len(p))
	for i := range p {
		d[i] = int(p[i] - '0')
	}
	for l := 2; l < len(d); l++ {
		if orderPattern(d[:l]) == orderPattern(d[len(d)-l:]) {
			return 0, 0, false
		}
	}
	return len(d), d[len(d)-1], d[0] == 1
}

// Extremal theorem: among single patterns of length k, 12...k has the
// largest growth rate and 12...(k-2)k(k-1) the smallest. Source: Elizalde,
// "The most and the least avoided consecutive patterns" (2013).
func TestExtremalPatternsOrder(t *testing.T) {
	const prec = 100
	for _, c := range []struct {
		least  string   // 12...(k-2)k(k-1)
		others []string // other non-overlapping patterns starting with 1
	}{
		{"1243", []string{"1342"}},
		{"12354", []string{"12453", "13452"}},
	} {
		lambda := func(p string) Interval {
			k, b, ok := nonOverlappingEnds(p)
			if !ok {
				t.Fatalf("%s is not a non-overlapping pattern starting with 1", p)
			}
			return LambdaNonOverlapping(k, b, prec)
		}
		least := lambda(c.least)
		most := LambdaMonotone(len(c.least), prec)
		for _, p := range c.others {
			x := lambda(p)
			if least.Hi.Cmp(x.Lo) >= 0 || x.Hi.Cmp(most.Lo) >= 0 {
				t.Errorf("want lambda(%s) %s < lambda(%s) %s < lambda(12...k) %s", c.least, least.String(8), p, x.String(8), most.String(8))
			}
		}
	}
	// Long monotone patterns: the root scan copes with z0 within 1/k! of 1,
	// and lambda(12...k) increases towards 1 (from memory, no source).
	// (1 - lambda is about 4e-60 at k = 47: 300 bits resolve it.)
	prev := LambdaMonotone(20, 300)
	for _, k := range []int{31, 47} {
		x := LambdaMonotone(k, 300)
		if x.Lo.Cmp(prev.Hi) <= 0 || x.Hi.Cmp(big.NewRat(1, 1)) >= 0 {
			t.Errorf("LambdaMonotone(%d) = %s does not lie above the previous and below 1", k, x.String(10))
		}
		prev = x
	}
}
