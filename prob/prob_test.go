package prob

import (
	"context"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/internal/settest"
	"avoidcert/pattern"
	"avoidcert/prove"
	"avoidcert/transfer"
)

// runsTriangle reads the rows of OEIS A008304 from ../testdata/oeis:
// rows[n][k-1] = T(n,k), the permutations of [n] whose longest increasing
// run has length k.
func runsTriangle(t *testing.T) map[int][]int64 {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "testdata", "oeis", "A008304.txt"))
	if err != nil {
		t.Fatal(err)
	}
	var terms []int64
	for _, line := range strings.Split(string(data), "\n") {
		if rest, ok := strings.CutPrefix(line, "terms: "); ok {
			for _, s := range strings.Split(rest, ",") {
				v, ok := new(big.Int).SetString(s, 10)
				if !ok {
					t.Fatalf("A008304: term %q", s)
				}
				terms = append(terms, v.Int64())
			}
		}
	}
	rows := map[int][]int64{}
	for n, i := 1, 0; i < len(terms); n++ {
		end := min(i+n, len(terms))
		rows[n] = terms[i:end]
		i = end
	}
	return rows
}

// increasing returns the pattern 12...k.
func increasing(k int) pattern.Set {
	p := make(pattern.Perm, k)
	for i := range p {
		p[i] = i + 1
	}
	return pattern.NewSet(p)
}

// A permutation avoids 12...k consecutively exactly when no increasing run
// reaches length k, i.e. its longest increasing run is at most k-1: so
// a_n(12...k) = T(n,1) + ... + T(n,k-1) in OEIS A008304, and a_n/n! is that
// sum over n!. Rows 1..10 are complete in the entry's data (row 11 is not
// used); patterns have at most 7 entries, so k <= min(n, 7): 39 values.
func TestExactAgainstA008304(t *testing.T) {
	rows := runsTriangle(t)
	checked := 0
	for n := 1; n <= 10; n++ {
		row := rows[n]
		if len(row) != n {
			t.Fatalf("A008304 row %d has %d terms", n, len(row))
		}
		for k := 2; k <= min(n, 7); k++ {
			want := big.NewInt(0)
			for _, v := range row[:k-1] {
				want.Add(want, big.NewInt(v))
			}
			a, p, err := Exact(context.Background(), increasing(k), n, prove.Options{})
			if err != nil {
				t.Fatal(err)
			}
			if a.Cmp(want) != 0 {
				t.Errorf("a_%d(12..%d) = %s, OEIS A008304 row sums give %s", n, k, a, want)
			}
			if p.Cmp(new(big.Rat).SetFrac(want, factorial(n))) != 0 {
				t.Errorf("a_%d/%d! = %s, want %s/%d!", n, n, p.RatString(), want, n)
			}
			checked++
		}
	}
	if checked != 39 {
		t.Fatalf("only %d entries of A008304 checked", checked)
	}
}

func TestExactRefusesOutsideRange(t *testing.T) {
	set := settest.Must(t, "1342")
	if _, _, err := Exact(context.Background(), set, MaxExactN+1, prove.Options{}); err == nil {
		t.Error("N past MaxExactN accepted")
	}
	if _, _, err := Exact(context.Background(), set, 300, prove.Options{MaxMemory: 1 << 20}); err == nil {
		t.Error("a count over the memory limit accepted")
	}
}

// The interval from the certificate's bound for every n must contain the
// exact a_N/N! wherever both exist: here at N = 400 (exact count) with a
// certificate whose N0 is far below.
func TestEncloseContainsExact(t *testing.T) {
	ctx := context.Background()
	for _, tc := range []struct {
		args []string
		N    int // seconds of counting each
	}{{[]string{"123"}, 400}, {[]string{"1342"}, 120}, {[]string{"132", "213"}, 200}} {
		set, N := settest.Must(t, tc.args...), tc.N
		counts, err := transfer.Counts(ctx, set, N, nil)
		if err != nil {
			t.Fatal(err)
		}
		exact := new(big.Rat).SetFrac(counts[N], factorial(N))
		res, err := prove.Certify(ctx, set, prove.Options{Digits: 12})
		if err != nil {
			t.Fatal(err)
		}
		n0 := res.Certificate.Statement.AllN.N0
		if n0 >= N {
			t.Fatalf("%s: N0 = %d is not below N = %d", set, n0, N)
		}
		x, err := Enclose(res.Certificate, N)
		if err != nil {
			t.Fatal(err)
		}
		lo, hi := x.Lo.Rat(), x.Hi.Rat()
		if exact.Cmp(lo) < 0 || exact.Cmp(hi) > 0 {
			t.Errorf("%s: a_%d/%d! = %s is outside [%s, %s]", set, N, N, exact.FloatString(8), lo.FloatString(8), hi.FloatString(8))
		}
		// the outward decimals enclose it too
		dlo, _ := new(big.Rat).SetString(x.Lo.Decimal(8, false))
		dhi, _ := new(big.Rat).SetString(x.Hi.Decimal(8, true))
		if dlo == nil || dhi == nil || exact.Cmp(dlo) < 0 || exact.Cmp(dhi) > 0 {
			t.Errorf("%s: a_%d/%d! outside the printed [%s, %s]", set, N, N, x.Lo.Decimal(8, false), x.Hi.Decimal(8, true))
		}
		if _, err := Enclose(res.Certificate, n0-1); err == nil {
			t.Errorf("%s: N below N0 accepted", set)
		}
	}
}

// Certify tightens the bracket until the relative width at N is below the
// target; at N = 10^9 that takes about 18 digits of lambda.
func TestCertifyNarrowAtBillion(t *testing.T) {
	set := settest.Must(t, "123")
	c, err := Certify(context.Background(), set, MaxN, 1e-6, prove.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !c.Narrow {
		t.Fatalf("relative width %s at N = 10^9 is not below 1e-6", c.Interval.RelativeWidth().FloatString(12))
	}
	// a_N/N! ~ c lambda^N with lambda = 0.8269933431... and c = 1.5138...
	// (the bound command's estimate): the decimal exponent is
	// floor(N log10 lambda + log10 c), computed here in float64 (an
	// orientation value, far from an integer boundary).
	want := int(math.Floor(1e9*math.Log10(0.82699334313268807) + math.Log10(1.5138)))
	for _, s := range []string{c.Interval.Lo.Decimal(10, false), c.Interval.Hi.Decimal(10, true)} {
		_, exp, ok := strings.Cut(s, "e")
		if !ok || exp != strconv.Itoa(want) {
			t.Errorf("a_N/N! at N = 10^9 printed %s, want exponent %d", s, want)
		}
	}
}

// occurrencesBrute counts, for each permutation of 1..n, the windows that
// match a member, and tallies the permutations by that number.
func occurrencesBrute(set pattern.Set, n int) map[int]int64 {
	tally := map[int]int64{}
	brute.Permutations(n, func(p []int) {
		c := 0
		for _, m := range set.Patterns() {
			for i := 0; i+len(m) <= n; i++ {
				if pattern.OrderIsomorphic(p[i:i+len(m)], m) {
					c++
				}
			}
		}
		tally[c]++
	})
	return tally
}

func TestOccurrencesAgainstBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 4))
	sets := []pattern.Set{settest.Must(t, "123"), settest.Must(t, "1342"), settest.Must(t, "132", "2413"), settest.Must(t, "12", "321"), settest.Must(t, "1"), settest.Must(t, "21")}
	for range 8 {
		sets = append(sets, settest.Random(rng, 3, 4))
	}
	for _, set := range sets {
		for n := 0; n <= 8; n++ {
			want := occurrencesBrute(set, n)
			J := n + 1
			got, err := Occurrences(context.Background(), set, n, J)
			if err != nil {
				t.Fatal(err)
			}
			for j := 0; j <= J; j++ {
				if got[j].Int64() != want[j] {
					t.Errorf("%s, n = %d: %d permutations with %d matches, brute force %d", set, n, got[j], j, want[j])
				}
			}
		}
	}
}

// Layer 0 is a_N: the permutations with no match avoid the set.
func TestOccurrencesLayerZeroIsCount(t *testing.T) {
	for _, args := range [][]string{{"1342"}, {"123", "321"}, {"2413"}} {
		set := settest.Must(t, args...)
		counts, err := transfer.Counts(context.Background(), set, 30, nil)
		if err != nil {
			t.Fatal(err)
		}
		got, err := Occurrences(context.Background(), set, 30, 2)
		if err != nil {
			t.Fatal(err)
		}
		if got[0].Cmp(counts[30]) != 0 {
			t.Errorf("%s: layer 0 at n = 30 is %s, a_30 = %s", set, got[0], counts[30])
		}
	}
}

// With J = N the layers hold every permutation, so they sum to N!: the
// distribution sums to 1. Its mean is (N-k+1)|S|/k! for a set S of
// length-k patterns, by linearity of expectation: each of the N-k+1
// windows has each of the k! orders with probability 1/k! under i.i.d.
// continuous draws, and a window matches at most one member.
func TestOccurrencesSumAndMean(t *testing.T) {
	for _, tc := range []struct {
		args []string
		N    int
	}{{[]string{"123"}, 40}, {[]string{"132", "231"}, 30}, {[]string{"1342", "2413", "3142"}, 16}} {
		set := settest.Must(t, tc.args...)
		N, k := tc.N, set.Window()
		got, err := Occurrences(context.Background(), set, N, N)
		if err != nil {
			t.Fatal(err)
		}
		sum, weighted := new(big.Int), new(big.Int)
		for j, c := range got {
			sum.Add(sum, c)
			weighted.Add(weighted, new(big.Int).Mul(c, big.NewInt(int64(j))))
		}
		if sum.Cmp(factorial(N)) != 0 {
			t.Errorf("%s, N = %d: layers sum to %s, not N!", set, N, sum)
		}
		mean := new(big.Rat).SetFrac(weighted, factorial(N))
		want := new(big.Rat).SetFrac(big.NewInt(int64((N-k+1)*len(set.Patterns()))), factorial(k))
		if mean.Cmp(want) != 0 {
			t.Errorf("%s, N = %d: mean %s, want (N-k+1)|S|/k! = %s", set, N, mean.RatString(), want.RatString())
		}
	}
}
