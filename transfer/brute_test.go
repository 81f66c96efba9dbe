package transfer_test

import (
	"avoidcert/internal/settest"
	"math/rand/v2"
	"sync"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/pattern"
)

// bruteMaxN is the longest length checked against full enumeration:
// 9! = 362880 permutations, enumerated once and shared by every set.
const bruteMaxN = 9

var censuses = sync.OnceValue(func() []*brute.Census {
	out := make([]*brute.Census, bruteMaxN+1)
	for n := range out {
		out[n] = brute.NewCensus(n)
	}
	return out
})

func checkAgainstCensus(t *testing.T, s pattern.Set) {
	t.Helper()
	got := counts(t, s, bruteMaxN)
	for n, cs := range censuses() {
		if want := brute.CensusCount(cs, s.Patterns()); !got[n].IsInt64() || got[n].Int64() != int64(want) {
			t.Fatalf("%v: a_%d = %v, brute force counts %d", s, n, got[n], want)
		}
	}
}

// Every single pattern of length 2..5, n = 0..9.
func TestCountsSinglePatternsMatchBruteForce(t *testing.T) {
	for k := 2; k <= 5; k++ {
		for _, p := range pattern.All(k) {
			checkAgainstCensus(t, pattern.NewSet(p))
		}
	}
}

// 200 random sets of one to six patterns of lengths 2..5, n = 0..9.
func TestCountsRandomSetsMatchBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(2026, 5))
	for range 200 {
		checkAgainstCensus(t, settest.Random(rng, 6, 5))
	}
}

// 40 random sets of one to four patterns of lengths 2..6 (mixed), against
// direct enumeration up to n = 8.
func TestCountsRandomMixedSetsToLength6MatchBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(2026, 6))
	for range 40 {
		s := settest.Random(rng, 4, 6)
		got := counts(t, s, 8)
		for n := 0; n <= 8; n++ {
			if want := brute.Count(n, s.Patterns()); got[n].Int64() != int64(want) {
				t.Fatalf("%v: a_%d = %v, brute force counts %d", s, n, got[n], want)
			}
		}
	}
}

// Patterns of length 6 and 7, beyond the census, against direct counting
// up to n = 8.
func TestCountsLongPatternsMatchBruteForce(t *testing.T) {
	for _, args := range [][]string{{"123456"}, {"135246"}, {"1234567"}, {"2461357"}, {"21,654321"}, {"132,1234567"}, {"7654321,3412"}} {
		s := settest.Must(t, args...)
		got := counts(t, s, 8)
		for n := 0; n <= 8; n++ {
			if want := brute.Count(n, s.Patterns()); got[n].Int64() != int64(want) {
				t.Fatalf("%v: a_%d = %v, brute force counts %d", s, n, got[n], want)
			}
		}
	}
}

// Pattern 1 is contained in every non-empty permutation; 12 and 21 leave
// only the decreasing and the increasing one; both together leave lengths
// 0 and 1.
func TestCountsTrivialPatterns(t *testing.T) {
	upTo := func(last int) func(int) int64 {
		return func(n int) int64 {
			if n <= last {
				return 1
			}
			return 0
		}
	}
	always := func(int) int64 { return 1 }
	for _, tc := range []struct {
		set  string
		want func(n int) int64
	}{
		{"1", upTo(0)},
		{"12", always},
		{"21", always},
		{"12,21", upTo(1)},
	} {
		got := counts(t, settest.Must(t, tc.set), 30)
		for n, c := range got {
			if !c.IsInt64() || c.Int64() != tc.want(n) {
				t.Errorf("{%s}: a_%d = %v, want %d", tc.set, n, c, tc.want(n))
			}
		}
	}
}
