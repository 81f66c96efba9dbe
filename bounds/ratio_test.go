package bounds

import (
	"context"
	"math/big"
	"math/rand"
	"testing"

	"avoidcert/pattern"
	"avoidcert/transfer"
)

func mustPerms(t *testing.T, list string) []pattern.Perm {
	s, err := pattern.ParseSet([]string{list})
	if err != nil {
		t.Fatal(err)
	}
	return s.Patterns()
}

// fill writes x into the words of a table entry.
func fillWords(dst []big.Word, x *big.Int) {
	clear(dst)
	copy(dst, x.Bits())
}

// naiveRaise returns H_d from H_0 = base as big.Ints per state and rank,
// straight from the definition H_(i+1)[a] = sum_t a_t H_i[a-e_t].
func naiveRaise(st *transfer.States, n, d int, base [][]*big.Int) [][]*big.Int {
	h := base
	for i := 1; i <= d; i++ {
		next := make([][]*big.Int, st.Len())
		for p := range st.Len() {
			L := st.Length(p)
			ix := transfer.NewIndexer(L, n+d)
			deg := n + i - L
			a := make([]int, L+1)
			next[p] = make([]*big.Int, ix.Count(deg))
			for r := range next[p] {
				ix.Unrank(deg, r, a)
				sum := new(big.Int)
				for t := range a {
					if a[t] == 0 {
						continue
					}
					a[t]--
					sum.Add(sum, new(big.Int).Mul(big.NewInt(int64(a[t]+1)), h[p][ix.Rank(a)]))
					a[t]++
				}
				next[p][r] = sum
			}
		}
		h = next
	}
	return h
}

// tableAt returns a zero table of every state's coefficients at length n.
func tableAt(st *transfer.States, n, limbs int) *table {
	t := &table{limbs: limbs, offs: make([]int, st.Len())}
	total := 0
	for p := range st.Len() {
		t.offs[p] = total
		total += transfer.NewIndexer(st.Length(p), n).Count(n-st.Length(p)) * limbs
	}
	t.words = make([]big.Word, total)
	return t
}

// TestExtremesAgreeWithNaive checks the screened tournament against a plain
// big.Rat minimum and maximum on random coefficient tables over the states
// of small sets, including tables built so that many ratios tie exactly or
// agree to far beyond float64 precision (common practice, no source: a
// randomized differential test).
func TestExtremesAgreeWithNaive(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	exactUsed := 0
	sets := []string{"12", "123", "1342", "132,213", "2143,12345"}
	for trial := range 300 {
		st := transfer.NewStates(pattern.NewSet(mustPerms(t, sets[rng.Intn(len(sets))])...))
		n := st.MaxLength() + rng.Intn(5)
		d := 1 + rng.Intn(3)
		baseLimbs := 1 + rng.Intn(3)
		base := tableAt(st, n, baseLimbs)
		baseInts := make([][]*big.Int, st.Len())
		for p := range st.Len() {
			baseInts[p] = make([]*big.Int, transfer.NewIndexer(st.Length(p), n).Count(n-st.Length(p)))
			for r := range baseInts[p] {
				x := new(big.Int)
				if rng.Intn(4) != 0 {
					x.Rand(rng, new(big.Int).Lsh(big.NewInt(1), uint(64*baseLimbs-1)))
				}
				baseInts[p][r] = x
				fillWords(base.Words(p, r), x)
			}
		}
		h := naiveRaise(st, n, d, baseInts)
		mode := trial % 4
		// centre c = q/2^200 with a long fraction, so that ratios near it
		// differ only far beyond float64 precision.
		q := new(big.Int).Rand(rng, new(big.Int).Lsh(big.NewInt(1), 200))
		numLimbs := baseLimbs + d + 4
		num := tableAt(st, n+d, numLimbs)
		var wantLo, wantHi *big.Rat
		unbounded := false
		for c := range st.Len() {
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
		all := make([]int, st.Len())
		for p := range all {
			all[p] = p
		}
		got, err := extremes(context.Background(), ratioProblem{st: st, n: n, d: d, states: all, num: num, base: base, numLimbs: numLimbs, baseLimbs: baseLimbs})
		if err != nil {
			t.Fatal(err)
		}
		exactUsed += got.exact
		if got.lo.Cmp(wantLo) != 0 {
			t.Fatalf("trial %d (n=%d d=%d mode %d): lo = %s, naive %s", trial, n, d, mode, got.lo.RatString(), wantLo.RatString())
		}
		if (got.hi == nil) != (wantHi == nil) || (wantHi != nil && got.hi.Cmp(wantHi) != 0) {
			t.Fatalf("trial %d (n=%d d=%d mode %d): hi = %v, naive %v", trial, n, d, mode, got.hi, wantHi)
		}
	}
	if exactUsed == 0 {
		t.Error("no comparison reached exact arithmetic: the near-tie tables do not exercise it")
	}
	t.Logf("%d comparisons decided exactly", exactUsed)
}
