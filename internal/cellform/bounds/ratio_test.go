package cellbounds

import (
	"context"
	"math/big"
	"math/rand"
	"testing"

	transfer "avoidcert/internal/cellform/transfer"
)

// fill writes x into the words of a table entry.
func fillWords(dst []big.Word, x *big.Int) {
	clear(dst)
	copy(dst, x.Bits())
}

// naiveRaise returns H_d from H_0 = base as big.Ints per cell and rank,
// straight from the definition H_{i+1}[a] = sum_t a_t H_i[a-e_t].
func naiveRaise(m, k, d, cells int, base [][]*big.Int) [][]*big.Int {
	ix := transfer.NewIndexer(m, k+d)
	h := base
	for i := 1; i <= d; i++ {
		deg := k + i
		next := make([][]*big.Int, cells)
		a := make([]int, m+1)
		for c := range cells {
			next[c] = make([]*big.Int, ix.Count(deg))
			for r := range next[c] {
				ix.Unrank(deg, r, a)
				sum := new(big.Int)
				for t := range a {
					if a[t] == 0 {
						continue
					}
					a[t]--
					sum.Add(sum, new(big.Int).Mul(big.NewInt(int64(a[t]+1)), h[c][ix.Rank(a)]))
					a[t]++
				}
				next[c][r] = sum
			}
		}
		h = next
	}
	return h
}

// TestExtremesAgreeWithNaive checks the screened tournament against a plain
// big.Rat minimum and maximum on random coefficient tables, including
// tables built so that many ratios tie exactly or agree to far beyond
// float64 precision (common practice, no source: a randomized
// differential test).
func TestExtremesAgreeWithNaive(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	exactUsed := 0
	for trial := range 300 {
		m := 1 + rng.Intn(3)
		k := rng.Intn(6)
		d := 1 + rng.Intn(3)
		cells := 1 + rng.Intn(3)
		baseLimbs := 1 + rng.Intn(3)
		ix := transfer.NewIndexer(m, k+d)
		base := newTable(cells, ix.Count(k), baseLimbs)
		baseInts := make([][]*big.Int, cells)
		for c := range cells {
			baseInts[c] = make([]*big.Int, ix.Count(k))
			for r := range baseInts[c] {
				x := new(big.Int)
				if rng.Intn(4) != 0 {
					x.Rand(rng, new(big.Int).Lsh(big.NewInt(1), uint(64*baseLimbs-1)))
				}
				baseInts[c][r] = x
				fillWords(base.Words(c, r), x)
			}
		}
		h := naiveRaise(m, k, d, cells, baseInts)
		mode := trial % 4
		// centre c = q/2^200 with a long fraction, so that ratios near it
		// differ only far beyond float64 precision.
		q := new(big.Int).Rand(rng, new(big.Int).Lsh(big.NewInt(1), 200))
		numLimbs := baseLimbs + d + 4
		num := newTable(cells, ix.Count(k+d), numLimbs)
		var wantLo, wantHi *big.Rat
		unbounded := false
		for c := range cells {
			for r := range h[c] {
				n := new(big.Int)
				switch mode {
				case 0: // independent random numerators
					if rng.Intn(5) != 0 {
						n.Rand(rng, new(big.Int).Lsh(big.NewInt(1), uint(64*(baseLimbs+d))))
					}
				case 1, 2: // n = floor(c*D), plus small noise in mode 1
					n.Mul(h[c][r], q)
					n.Rsh(n, 200)
					if mode == 1 {
						n.Add(n, big.NewInt(int64(rng.Intn(3))))
					}
				case 3: // n = 3D with a few offsets by one: exact ties
					n.Mul(h[c][r], big.NewInt(3))
					if rng.Intn(10) == 0 && n.Sign() > 0 {
						n.Add(n, big.NewInt(int64(rng.Intn(3)-1)))
					}
				}
				if h[c][r].Sign() == 0 && rng.Intn(8) == 0 {
					n.SetInt64(int64(rng.Intn(2)))
				}
				fillWords(num.Words(c, r), n)
				if h[c][r].Sign() == 0 {
					if n.Sign() > 0 {
						unbounded = true
					}
					continue
				}
				ratio := new(big.Rat).SetFrac(n, h[c][r])
				if wantLo == nil || ratio.Cmp(wantLo) < 0 {
					wantLo = ratio
				}
				if wantHi == nil || ratio.Cmp(wantHi) > 0 {
					wantHi = ratio
				}
			}
		}
		if wantLo == nil {
			wantLo, wantHi = new(big.Rat), new(big.Rat)
		}
		if unbounded {
			wantHi = nil
		}
		allCells := make([]int, cells)
		for c := range allCells {
			allCells[c] = c
		}
		got, err := extremes(context.Background(), ratioProblem{m: m, k: k, d: d, cells: allCells, num: num, base: base, numLimbs: numLimbs, baseLimbs: baseLimbs})
		if err != nil {
			t.Fatal(err)
		}
		exactUsed += got.exact
		if got.lo.Cmp(wantLo) != 0 {
			t.Fatalf("trial %d (m=%d k=%d d=%d mode %d): lo = %s, naive %s", trial, m, k, d, mode, got.lo.RatString(), wantLo.RatString())
		}
		if (got.hi == nil) != (wantHi == nil) || (wantHi != nil && got.hi.Cmp(wantHi) != 0) {
			t.Fatalf("trial %d (m=%d k=%d d=%d mode %d): hi = %v, naive %v", trial, m, k, d, mode, got.hi, wantHi)
		}
	}
	if exactUsed == 0 {
		t.Error("no comparison reached exact arithmetic: the near-tie tables do not exercise it")
	}
	t.Logf("%d comparisons decided exactly", exactUsed)
}
