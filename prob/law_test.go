package prob

import (
	"context"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/internal/settest"
	"avoidcert/pattern"
	"avoidcert/prove"
	"avoidcert/transfer"
)

// bruteLaws tallies all n! permutations by their count of windows that
// match a member, for the delays 1..maxDelay (window x_i, x_(i+t), ...).
func bruteLaws(set pattern.Set, n, maxDelay int) []map[int]int64 {
	tallies := make([]map[int]int64, maxDelay+1)
	for t := range tallies {
		tallies[t] = map[int]int64{}
	}
	w := make([]int, pattern.MaxLength)
	brute.Permutations(n, func(p []int) {
		for t := 1; t <= maxDelay; t++ {
			c := 0
			for _, m := range set.Patterns() {
				for i := 0; i+(len(m)-1)*t < len(p); i++ {
					for j := range m {
						w[j] = p[i+j*t]
					}
					if pattern.OrderIsomorphic(w[:len(m)], m) {
						c++
					}
				}
			}
			tallies[t][c]++
		}
	})
	return tallies
}

// momentsOf returns the exact mean and variance of a tally over n!.
func momentsOf(tally map[int]int64, n int) Moments {
	total := factorial(n)
	s1, s2 := new(big.Int), new(big.Int)
	for c, w := range tally {
		s1.Add(s1, big.NewInt(int64(c)*w))
		s2.Add(s2, big.NewInt(int64(c*c)*w))
	}
	mean := new(big.Rat).SetFrac(s1, total)
	variance := new(big.Rat).SetFrac(s2, total)
	return Moments{Mean: mean, Variance: variance.Sub(variance, new(big.Rat).Mul(mean, mean))}
}

// testSets are fixed and random patterns and sets for the brute-force
// comparisons: one length and mixed lengths, overlapping and not.
func testSets(t *testing.T) []pattern.Set {
	rng := rand.New(rand.NewPCG(18, 3))
	sets := []pattern.Set{settest.Must(t, "21"), settest.Must(t, "123"), settest.Must(t, "132"), settest.Must(t, "1342"),
		settest.Must(t, "2143"), settest.Must(t, "12345"), settest.Must(t, "123", "321"), settest.Must(t, "12", "321"),
		settest.Must(t, "1324", "2413"), settest.Must(t, "1")}
	for range 8 {
		sets = append(sets, settest.Random(rng, 3, 5))
	}
	return sets
}

// Brute force over all N! orders, N <= 9: the closed-form mean and
// variance, and the whole law, with delay 1, 2 and 3.
func TestMomentsAndLawAgainstBruteForce(t *testing.T) {
	ctx := context.Background()
	for _, set := range testSets(t) {
		for n := 0; n <= 9; n++ {
			tallies := bruteLaws(set, n, 3)
			for delay := 1; delay <= 3; delay++ {
				tally := tallies[delay]
				want := momentsOf(tally, n)
				lengths := Interleave(n, delay)
				got := InterleavedMoments(set, lengths)
				if got.Mean.Cmp(want.Mean) != 0 || got.Variance.Cmp(want.Variance) != 0 {
					t.Errorf("%s, N = %d, delay %d: mean %s, variance %s; brute force %s, %s", set, n, delay,
						got.Mean.RatString(), got.Variance.RatString(), want.Mean.RatString(), want.Variance.RatString())
				}
				J := n + 1
				law, err := InterleavedLaw(ctx, set, lengths, J)
				if err != nil {
					t.Fatal(err)
				}
				// the law counts tuples of subsequence orders; the brute
				// force counts orders of all n values: scale by n!/Total
				for j := 0; j <= J; j++ {
					lhs := new(big.Int).Mul(law.Ways[j], factorial(n))
					rhs := new(big.Int).Mul(big.NewInt(tally[j]), law.Total)
					if lhs.Cmp(rhs) != 0 {
						t.Errorf("%s, N = %d, delay %d: P(count = %d) = %s/%s, brute force %d/%d!", set, n, delay, j, law.Ways[j], law.Total, tally[j], n)
					}
				}
			}
		}
	}
}

// eulerian reads OEIS A008292 from ../testdata/oeis: rows 1..10 as printed,
// rows 11 and 12 from the entry's explicit formula, which must first
// reproduce rows 1..10.
func eulerian(t *testing.T) map[int][]*big.Int {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "testdata", "oeis", "A008292.txt"))
	if err != nil {
		t.Fatal(err)
	}
	var terms []*big.Int
	for _, line := range strings.Split(string(data), "\n") {
		if rest, ok := strings.CutPrefix(line, "terms: "); ok {
			for _, s := range strings.Split(rest, ",") {
				v, ok := new(big.Int).SetString(s, 10)
				if !ok {
					t.Fatalf("A008292: term %q", s)
				}
				terms = append(terms, v)
			}
		}
	}
	// %F: T(n, k) = Sum_{j=0..k} (-1)^j * (k-j)^n * binomial(n+1, j)
	formula := func(n, k int) *big.Int {
		sum := new(big.Int)
		for j := 0; j <= k; j++ {
			term := new(big.Int).Exp(big.NewInt(int64(k-j)), big.NewInt(int64(n)), nil)
			term.Mul(term, new(big.Int).Binomial(int64(n+1), int64(j)))
			if j%2 == 1 {
				term.Neg(term)
			}
			sum.Add(sum, term)
		}
		return sum
	}
	rows := map[int][]*big.Int{}
	for n, i := 1, 0; i < len(terms); n++ {
		rows[n] = terms[i : i+n]
		for k := 1; k <= n; k++ {
			if f := formula(n, k); f.Cmp(rows[n][k-1]) != 0 {
				t.Fatalf("A008292: the formula gives T(%d,%d) = %s, the entry prints %s", n, k, f, rows[n][k-1])
			}
		}
		i += n
	}
	if len(rows) != 10 {
		t.Fatalf("A008292: %d complete rows, want 10", len(rows))
	}
	for n := 11; n <= 12; n++ {
		for k := 1; k <= n; k++ {
			rows[n] = append(rows[n], formula(n, k))
		}
	}
	return rows
}

// A window matches 21 where the permutation descends, and T(n,k) of OEIS
// A008292 counts the permutations of [n] with k-1 rises, by complement
// also those with k-1 descents: the law of the count of 21 in N draws is
// T(N, j+1)/N!, N = 1..12.
func TestDescentsAreEulerian(t *testing.T) {
	rows := eulerian(t)
	set := settest.Must(t, "21")
	for n := 1; n <= 12; n++ {
		got, err := Occurrences(context.Background(), set, n, n)
		if err != nil {
			t.Fatal(err)
		}
		for j := 0; j <= n; j++ {
			want := new(big.Int)
			if j < n {
				want = rows[n][j]
			}
			if got[j].Cmp(want) != 0 {
				t.Errorf("N = %d: %s permutations with %d descents, OEIS A008292 T(%d,%d) = %s", n, got[j], j, n, j+1, want)
			}
		}
	}
}

// The mean is (N-k+1)/k! for one pattern of length k, by linearity of
// expectation (common practice, no source): each window has each of the k!
// orders with probability 1/k!.
func TestMeanByLinearity(t *testing.T) {
	for _, p := range []string{"1", "12", "132", "2413", "13524", "246135", "1324657"} {
		set := settest.Must(t, p)
		k := len(p)
		for _, n := range []int{0, 1, k - 1, k, 2*k - 1, 100, 10_000} {
			want := big.NewRat(int64(max(n-k+1, 0)), int64(pattern.Factorial(k)))
			if got := WindowMoments(set, n).Mean; got.Cmp(want) != 0 {
				t.Errorf("%s, N = %d: mean %s, want (N-k+1)/k! = %s", p, n, got.RatString(), want.RatString())
			}
		}
	}
}

// Past brute force: the whole law from the layered iteration (J = N) has
// the closed-form mean and variance, here at N = 30 to 60.
func TestLawHasClosedFormMoments(t *testing.T) {
	for _, tc := range []struct {
		args []string
		N    int
	}{{[]string{"132"}, 60}, {[]string{"1342"}, 30}, {[]string{"123", "2413"}, 35}, {[]string{"12", "321"}, 40}} {
		set := settest.Must(t, tc.args...)
		law, err := InterleavedLaw(context.Background(), set, []int{tc.N}, tc.N)
		if err != nil {
			t.Fatal(err)
		}
		got := lawMoments(law)
		want := WindowMoments(set, tc.N)
		if got.Mean.Cmp(want.Mean) != 0 || got.Variance.Cmp(want.Variance) != 0 {
			t.Errorf("%s, N = %d: the law's mean and variance are %s, %s; closed form %s, %s", set, tc.N,
				got.Mean.FloatString(6), got.Variance.FloatString(6), want.Mean.FloatString(6), want.Variance.FloatString(6))
		}
	}
}

func lawMoments(l Law) Moments {
	s0, s1, s2 := new(big.Int), new(big.Int), new(big.Int)
	for j, w := range l.Ways {
		s0.Add(s0, w)
		s1.Add(s1, new(big.Int).Mul(w, big.NewInt(int64(j))))
		s2.Add(s2, new(big.Int).Mul(w, big.NewInt(int64(j*j))))
	}
	if s0.Cmp(l.Total) != 0 {
		panic("the law is not whole")
	}
	mean := new(big.Rat).SetFrac(s1, l.Total)
	variance := new(big.Rat).SetFrac(s2, l.Total)
	return Moments{Mean: mean, Variance: variance.Sub(variance, new(big.Rat).Mul(mean, mean))}
}

// The number of descents of n >= 2 draws has variance (n+1)/12 (common
// practice, no source; it also follows from the Eulerian numbers).
func TestDescentVariance(t *testing.T) {
	for n := 2; n <= 50; n++ {
		if got := WindowMoments(settest.Must(t, "21"), n).Variance; got.Cmp(big.NewRat(int64(n+1), 12)) != 0 {
			t.Errorf("N = %d: variance %s, want (N+1)/12", n, got.RatString())
		}
	}
}

// Reversal and complement keep the law; the iteration picks the image
// that keeps the fewest values (1342 keeps all three, its images fewer),
// and a monotone pattern keeps one value in every state.
func TestImagesAndKeptValues(t *testing.T) {
	for _, p := range []string{"1342", "2143", "12453", "132"} {
		set := settest.Must(t, p)
		var first []*big.Int
		for _, img := range set.Symmetric() {
			a := newAutomaton(img)
			got, err := a.run(context.Background(), 14, 14)
			if err != nil {
				t.Fatal(err)
			}
			if first == nil {
				first = got
				continue
			}
			for j := range got {
				if got[j].Cmp(first[j]) != 0 {
					t.Errorf("%s: image %s has %s permutations with %d matches, %s has %s", set, img, got[j], j, set, first[j])
				}
			}
		}
	}
	for k := 2; k <= 7; k++ {
		p := make(pattern.Perm, k)
		for i := range p {
			p[i] = i + 1
		}
		for _, st := range newAutomaton(pattern.NewSet(p)).states[1:] {
			if st.kept != 1 {
				t.Errorf("%s: state %s keeps %d values, want 1", p, st.full, st.kept)
			}
		}
	}
}

// Assess: exact tails are the law's, images share one law, and with no
// budget the tails are the normal approximation.
func TestAssess(t *testing.T) {
	ctx := context.Background()
	obs := []Observation{{settest.Must(t, "132"), 3}, {settest.Must(t, "231"), 7}, {settest.Must(t, "123"), 0}}
	lengths := []int{20}
	as, err := Assess(ctx, obs, lengths, Budget{Work: 1e12, Memory: 1e9})
	if err != nil {
		t.Fatal(err)
	}
	for i, o := range obs {
		law, err := InterleavedLaw(ctx, o.Set, lengths, 20)
		if err != nil {
			t.Fatal(err)
		}
		a := as[i]
		if !a.Exact || a.AtMost.Cmp(law.AtMost(o.Observed)) != 0 || a.AtLeast.Cmp(law.AtLeast(o.Observed)) != 0 {
			t.Errorf("%s seen %d: P(<=) = %v, P(>=) = %v; the law gives %s, %s", o.Set, o.Observed, a.AtMost, a.AtLeast,
				law.AtMost(o.Observed).RatString(), law.AtLeast(o.Observed).RatString())
		}
		lo, hi, ok := law.Central(big.NewRat(1, 40))
		if !a.CentralKnown || !ok || a.Central != [2]int{lo, hi} {
			t.Errorf("%s: central range %v (%v), the law's %d..%d (%v)", o.Set, a.Central, a.CentralKnown, lo, hi, ok)
		}
	}
	none, err := Assess(ctx, obs, lengths, Budget{})
	if err != nil {
		t.Fatal(err)
	}
	for i, a := range none {
		le, ge := NormalTails(a.Moments, obs[i].Observed)
		if a.Exact || a.AtMost != nil || a.ApproxAtMost != le || a.ApproxAtLeast != ge || a.Need.Work <= 0 {
			t.Errorf("%s without a budget: %+v", obs[i].Set, a)
		}
	}
}

// Central on a law with known quantiles: the count of 21 in 4 draws is 0,
// 1, 2, 3 in 1, 11, 11, 1 of 24 orders (OEIS A008292, row 4).
func TestCentral(t *testing.T) {
	law := Law{Ways: []*big.Int{big.NewInt(1), big.NewInt(11), big.NewInt(11), big.NewInt(1)}, Total: big.NewInt(24)}
	for _, tc := range []struct {
		tail   *big.Rat
		lo, hi int
	}{{big.NewRat(1, 40), 0, 3}, {big.NewRat(1, 24), 1, 2}, {big.NewRat(1, 20), 1, 2}, {big.NewRat(1, 10), 1, 2}} {
		lo, hi, ok := law.Central(tc.tail)
		if !ok || lo != tc.lo || hi != tc.hi {
			t.Errorf("tail %s: %d..%d (%v), want %d..%d", tc.tail.RatString(), lo, hi, ok, tc.lo, tc.hi)
		}
	}
	if _, _, ok := (Law{Ways: law.Ways[:2], Total: law.Total}).Central(big.NewRat(1, 40)); ok {
		t.Error("a law known to 1 gave a central range")
	}
}

// AvoidAll: exact within the counting range (a product of a_n/n!), and a
// certified product that contains the exact value beyond it.
func TestAvoidAll(t *testing.T) {
	ctx := context.Background()
	set := settest.Must(t, "123")
	counts, err := transfer.Counts(ctx, set, 300, nil)
	if err != nil {
		t.Fatal(err)
	}
	ratio := func(n int) *big.Rat { return new(big.Rat).SetFrac(counts[n], factorial(n)) }
	exact, err := AvoidAll(ctx, set, []int{30, 29, 29}, prove.DefaultMaxMemory, 1e-6, prove.Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := new(big.Rat).Mul(ratio(30), new(big.Rat).Mul(ratio(29), ratio(29)))
	if exact.Exact == nil || exact.Exact.Cmp(want) != 0 {
		t.Fatalf("exact avoidance %v, want %s", exact.Exact, want.FloatString(20))
	}
	lengths := []int{300, 299, 5}
	// 1 MiB counts 123 to n = 5 but not to 300
	cert, err := AvoidAll(ctx, set, lengths, 1<<20, 1e-6, prove.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if cert.Exact != nil || cert.Certified == nil || !cert.Certified.Narrow {
		t.Fatalf("with no memory for counting: %+v", cert)
	}
	want = new(big.Rat).Mul(ratio(300), new(big.Rat).Mul(ratio(299), ratio(5)))
	if want.Cmp(cert.Interval.Lo.Rat()) < 0 || want.Cmp(cert.Interval.Hi.Rat()) > 0 {
		t.Errorf("the certified product does not contain the exact %s", want.FloatString(12))
	}
}
