package brute

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

func TestPermutations(t *testing.T) {
	fact := 1
	for n := 0; n <= 7; n++ {
		if n > 0 {
			fact *= n
		}
		seen := make(map[string]bool)
		var prev []int
		Permutations(n, func(p []int) {
			used := make([]bool, n+1)
			for _, v := range p {
				if v < 1 || v > n || used[v] {
					t.Fatalf("n=%d: %v is not a permutation", n, p)
				}
				used[v] = true
			}
			if len(seen) > 0 && !lexLess(prev, p) {
				t.Fatalf("n=%d: %v comes after %v, out of lexicographic order", n, p, prev)
			}
			seen[fmt.Sprint(p)] = true
			prev = append(prev[:0], p...)
		})
		if len(seen) != fact {
			t.Fatalf("n=%d: %d distinct permutations, want %d", n, len(seen), fact)
		}
	}
}

func lexLess(a, b []int) bool {
	for i := range a {
		if a[i] != b[i] {
			return a[i] < b[i]
		}
	}
	return false
}

func TestContains(t *testing.T) {
	// OEIS A111004, %e: 2431 contains 132; 1342 has no consecutive 132.
	if !Contains([]int{2, 4, 3, 1}, []int{1, 3, 2}) || Contains([]int{1, 3, 4, 2}, []int{1, 3, 2}) {
		t.Error("Contains disagrees with the OEIS A111004 example")
	}
	if !Contains([]int{5}, []int{1}) || Contains(nil, []int{1}) || Contains([]int{1, 2}, []int{1, 2, 3}) {
		t.Error("Contains on short texts")
	}
}

func TestCounts(t *testing.T) {
	// OEIS A049774 (123) and A111004 (132), a(0..8)
	tests := []struct {
		pattern []int
		want    []int
	}{
		{[]int{1, 2, 3}, []int{1, 1, 2, 5, 17, 70, 349, 2017, 13358}},
		{[]int{1, 3, 2}, []int{1, 1, 2, 5, 16, 63, 296, 1623, 10176}},
	}
	for _, tc := range tests {
		for n, want := range tc.want {
			if got := Count(n, [][]int{tc.pattern}); got != want {
				t.Errorf("Count(%d, %v) = %d, want %d", n, tc.pattern, got, want)
			}
		}
	}
}

// The census must agree with direct counting for any set.
func TestCensusMatchesCount(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for n := 0; n <= 7; n++ {
		cs := NewCensus(n)
		if cs.N() != n {
			t.Fatalf("N() = %d, want %d", cs.N(), n)
		}
		for range 30 {
			pats := RandomPatterns[[]int](rng, 4, 1, CensusMaxLength)
			if got, want := CensusCount(cs, pats), Count(n, pats); got != want {
				t.Fatalf("n=%d %v: census %d, direct %d", n, pats, got, want)
			}
		}
	}
}
