package celltransfer_test

import (
	"avoidcert/internal/settest"
	"fmt"
	"math/big"
	"math/rand/v2"
	"testing"

	"avoidcert/internal/brute"
	transfer "avoidcert/internal/cellform/transfer"
	"avoidcert/pattern"
)

// classify returns, for a permutation p of 1..m+k, the cell of its last m
// entries (by pattern.Rank) and how many of its other k values fall into
// each gap of those entries: a_0 below the smallest, ..., a_m above the
// largest.
func classify(p []int, m int) (cell int, gaps []int) {
	k := len(p) - m
	last := p[k:]
	gaps = make([]int, m+1)
	for _, v := range p[:k] {
		below := 0
		for _, y := range last {
			if y < v {
				below++
			}
		}
		gaps[below]++
	}
	return pattern.Rank(pattern.Standardize(last)), gaps
}

// expectedIterate counts, by enumeration, the permutations of 1..m+k that
// keep(p) accepts, per cell and Bernstein index.
func expectedIterate(m, k int, keep func(p []int) bool) [][]int64 {
	ix := transfer.NewIndexer(m, k)
	want := make([][]int64, pattern.Factorial(m))
	for c := range want {
		want[c] = make([]int64, ix.Count(k))
	}
	brute.Permutations(m+k, func(p []int) {
		if keep(p) {
			cell, gaps := classify(p, m)
			want[cell][ix.Rank(gaps)]++
		}
	})
	return want
}

func compareIterate(t *testing.T, what string, g *transfer.Iterate, want [][]int64) {
	t.Helper()
	ix := transfer.NewIndexer(g.M, g.K)
	a := make([]int, g.M+1)
	for cell := range want {
		if g.PerCell != len(want[cell]) {
			t.Fatalf("%s: %d coefficients per cell, want %d", what, g.PerCell, len(want[cell]))
		}
		for r, w := range want[cell] {
			if got := g.Int(cell, r); got.Cmp(big.NewInt(w)) != 0 {
				ix.Unrank(g.K, r, a)
				t.Fatalf("%s: G_%d[%v][%v] = %v, enumeration counts %d", what, g.K, pattern.Unrank(g.M, cell), a, got, w)
			}
		}
	}
}

// transfer/doc.go: G_k[sigma][a] is the number of avoiding permutations of
// length m+k whose last m entries have pattern sigma and whose other k
// values fall a_0..a_m into the gaps of those entries. Every coefficient
// is compared, zeros included.
func TestIterateCountsPermutationsByLastWindowAndGaps(t *testing.T) {
	const maxLen = 8 // 8! permutations per (set, k) at most
	for _, args := range []string{"12", "123", "132", "123,321", "1342", "2413", "213,1234", "1324,3412", "12345", "21,2413", "13254,2413,321"} {
		s := settest.Must(t, args)
		members := s.Patterns()
		sys := transfer.FromSet(s)
		m := sys.M
		e := transfer.New(sys)
		g := e.Start()
		for k := 0; m+k <= maxLen; k++ {
			if k > 0 {
				next, err := e.Next(t.Context(), g)
				if err != nil {
					t.Fatal(err)
				}
				g = next
			}
			want := expectedIterate(m, k, func(p []int) bool { return brute.Avoids(p, members) })
			compareIterate(t, fmt.Sprintf("{%v} k=%d", s, k), g, want)
		}
	}
}

// A restricted system counts the avoiding permutations all of whose length-m
// windows lie in the chosen cells (for k >= 1; G_0 is 1 on every chosen
// cell).
func TestRestrictCountsPermutationsInsideTheCells(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 18))
	for _, args := range []string{"123", "1342", "213,1234", "2143,3412"} {
		s := settest.Must(t, args)
		members := s.Patterns()
		full := transfer.FromSet(s)
		m := full.M
		for range 3 {
			cells := make([]bool, full.Cells())
			for c := range cells {
				cells[c] = rng.IntN(3) > 0
			}
			sys := full.Restrict(cells)
			inside := func(p []int) bool {
				if !brute.Avoids(p, members) {
					return false
				}
				for i := 0; i+m <= len(p); i++ {
					if !cells[pattern.Rank(pattern.Standardize(p[i:i+m]))] {
						return false
					}
				}
				return true
			}
			g0 := iterate(t, sys, 0)
			for c, in := range cells {
				want := int64(0)
				if in {
					want = 1
				}
				if g0.Int(c, 0).Int64() != want {
					t.Fatalf("{%v} restricted to %v: G_0 on cell %d = %v, want %d", s, cells, c, g0.Int(c, 0), want)
				}
			}
			for k := 1; m+k <= 7; k++ {
				compareIterate(t, fmt.Sprintf("{%v} restricted to %v, k=%d", s, cells, k), iterate(t, sys, k), expectedIterate(m, k, inside))
			}
		}
	}
}
