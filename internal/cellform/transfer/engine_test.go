package celltransfer_test

import (
	"avoidcert/internal/settest"
	"context"
	"crypto/sha256"
	"encoding/binary"
	"errors"
	"fmt"
	"math/big"
	"runtime"
	"slices"
	"strings"
	"testing"

	transfer "avoidcert/internal/cellform/transfer"
)

// advanced returns the digests of G_0..G_k computed with Advance,
// recycling storage the way a long counting run does.
func advanced(t *testing.T, sys transfer.System, k int) [][32]byte {
	t.Helper()
	e := transfer.New(sys)
	g := e.Start()
	var spare *transfer.Iterate
	digests := [][32]byte{g.Digest()}
	for g.K < k {
		next, err := e.Advance(context.Background(), g, spare)
		if err != nil {
			t.Fatal(err)
		}
		g, spare = next, g
		digests = append(digests, g.Digest())
	}
	return digests
}

// Sets and degrees large enough that a step is split into several tasks
// per cell (more than 2048 coefficients per cell).
var determinismCases = []struct {
	set string
	k   int
}{
	{"123", 80},       // C(82,2) = 3321 per cell
	{"1342", 25},      // C(28,3) = 3276
	{"2413,1324", 30}, // C(33,3) = 5456
	{"12345", 14},     // C(18,4) = 3060
}

// The iterate does not depend on GOMAXPROCS (transfer/doc.go).
func TestDigestIndependentOfGOMAXPROCS(t *testing.T) {
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	for _, tc := range determinismCases {
		sys := transfer.FromSet(settest.Must(t, tc.set))
		var want [32]byte
		for i, procs := range []int{1, 2, 3} {
			runtime.GOMAXPROCS(procs)
			got := iterate(t, sys, tc.k).Digest()
			if adv := advanced(t, sys, tc.k); adv[tc.k] != got {
				t.Errorf("{%s} GOMAXPROCS=%d: Advance and Next give different G_%d", tc.set, procs, tc.k)
			}
			if i == 0 {
				want = got
			} else if got != want {
				t.Errorf("{%s}: G_%d digest differs between GOMAXPROCS=1 and %d", tc.set, tc.k, procs)
			}
		}
	}
}

// Next leaves its input alone, and Advance (which consumes it and
// recycles storage) yields the same iterates at every step.
func TestNextAndAdvanceAgree(t *testing.T) {
	for _, set := range []string{"123", "132", "1342", "213,1234", "12345", "1"} {
		sys := transfer.FromSet(settest.Must(t, set))
		e := transfer.New(sys)
		adv := advanced(t, sys, 12)
		g := e.Start()
		for k := 0; k <= 12; k++ {
			if g.Digest() != adv[k] {
				t.Fatalf("{%s}: Next and Advance differ at k=%d", set, k)
			}
			before := g.Digest()
			next, err := e.Next(context.Background(), g)
			if err != nil {
				t.Fatal(err)
			}
			if g.Digest() != before {
				t.Fatalf("{%s}: Next modified its input G_%d", set, k)
			}
			g = next
		}
	}
}

// lexOrder lists the compositions of D into m+1 parts in lexicographic
// order of (a_0, ..., a_m), from the Indexer's storage order.
func lexOrder(ix *transfer.Indexer, m, D int) [][]int {
	var all [][]int
	a := make([]int, m+1)
	a[m] = D
	for {
		all = append(all, slices.Clone(a))
		if !ix.Next(a) {
			break
		}
	}
	slices.SortFunc(all, slices.Compare)
	return all
}

// The digest is the SHA-256 of the byte stream its doc comment states.
func TestDigestFollowsItsSpec(t *testing.T) {
	for _, tc := range []struct {
		set string
		k   int
	}{{"132", 9}, {"1342", 6}, {"213,1234", 5}, {"1", 3}} {
		g := iterate(t, transfer.FromSet(settest.Must(t, tc.set)), tc.k)
		h := sha256.New()
		h.Write([]byte(transfer.DigestHeader))
		h.Write(binary.AppendUvarint(nil, uint64(g.M)))
		h.Write(binary.AppendUvarint(nil, uint64(g.K)))
		ix := transfer.NewIndexer(g.M, g.K)
		order := lexOrder(ix, g.M, g.K)
		for cell := range g.Cells {
			for _, a := range order {
				b := g.Int(cell, ix.Rank(a)).Bytes()
				h.Write(binary.AppendUvarint(nil, uint64(len(b))))
				h.Write(b)
			}
		}
		if got := g.Digest(); !slices.Equal(got[:], h.Sum(nil)) {
			t.Errorf("{%s} k=%d: Digest %x, the documented stream hashes to %x", tc.set, tc.k, got, h.Sum(nil))
		}
	}
}

func TestSumsAndProgress(t *testing.T) {
	s := settest.Must(t, "1342")
	var seen [][2]int
	c, err := transfer.Counts(context.Background(), s, 12, func(k, last int) { seen = append(seen, [2]int{k, last}) })
	if err != nil {
		t.Fatal(err)
	}
	for k := 0; k <= 9; k++ {
		if seen[k] != [2]int{k, 9} {
			t.Fatalf("progress calls %v, want (k, 9) for k = 0..9", seen)
		}
		g := iterate(t, transfer.FromSet(s), k)
		total := new(big.Int)
		for cell := range g.Cells {
			total.Add(total, g.CellSum(cell))
		}
		if g.Sum().Cmp(total) != 0 || g.Sum().Cmp(c[3+k]) != 0 {
			t.Fatalf("k=%d: Sum %v, cell sums add to %v, a_%d = %v", k, g.Sum(), total, 3+k, c[3+k])
		}
	}
	if len(seen) != 10 {
		t.Fatalf("%d progress calls, want 10", len(seen))
	}
}

// Footprint must at least cover G_k and G_{k+1}, which a step holds.
func TestFootprintCoversTheIterates(t *testing.T) {
	sys := transfer.FromSet(settest.Must(t, "2413"))
	e := transfer.New(sys)
	for k := 0; k <= 10; k++ {
		g, next := iterate(t, sys, k), iterate(t, sys, k+1)
		if fp := e.Footprint(k); fp < g.Bytes()+next.Bytes() {
			t.Errorf("Footprint(%d) = %d, below the %d bytes of G_%d and G_%d", k, fp, g.Bytes()+next.Bytes(), k, k+1)
		}
	}
}

func TestCancelledAndForeignIterates(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := transfer.Counts(ctx, settest.Must(t, "123"), 10, nil); !errors.Is(err, context.Canceled) {
		t.Errorf("Counts with a cancelled context: error %v, want context.Canceled", err)
	}
	e := transfer.New(transfer.FromSet(settest.Must(t, "123")))
	if _, err := e.Next(ctx, e.Start()); !errors.Is(err, context.Canceled) {
		t.Errorf("Next with a cancelled context: error %v, want context.Canceled", err)
	}
	if _, err := e.Advance(ctx, e.Start(), nil); !errors.Is(err, context.Canceled) {
		t.Errorf("Advance with a cancelled context: error %v, want context.Canceled", err)
	}

	other := transfer.New(transfer.FromSet(settest.Must(t, "1342"))).Start()
	for name, step := range map[string]func() (*transfer.Iterate, error){
		"Next":    func() (*transfer.Iterate, error) { return e.Next(context.Background(), other) },
		"Advance": func() (*transfer.Iterate, error) { return e.Advance(context.Background(), other, nil) },
	} {
		if _, err := step(); err == nil || !strings.Contains(err.Error(), "cell length 3") {
			t.Errorf("%s with another engine's iterate: error %v, want one naming cell length 3", name, err)
		}
	}
}

// Indexer: Next walks the ranks 0..Count(D)-1 in order, Rank and Unrank
// invert each other, and every composition of D appears once.
func TestIndexer(t *testing.T) {
	for m := 0; m <= 5; m++ {
		ix := transfer.NewIndexer(m, 8)
		for D := 0; D <= 8; D++ {
			a := make([]int, m+1)
			a[m] = D // rank 0
			seen := make(map[string]bool)
			r := 0
			for {
				if got := ix.Rank(a); got != r {
					t.Fatalf("m=%d D=%d: Rank(%v) = %d, want %d", m, D, a, got, r)
				}
				b := make([]int, m+1)
				ix.Unrank(D, r, b)
				if !slices.Equal(a, b) {
					t.Fatalf("m=%d D=%d: Unrank(%d) = %v, want %v", m, D, r, b, a)
				}
				sum := 0
				for _, v := range a {
					if v < 0 {
						t.Fatalf("m=%d D=%d: negative part in %v", m, D, a)
					}
					sum += v
				}
				key := fmt.Sprint(a)
				if sum != D || seen[key] {
					t.Fatalf("m=%d D=%d: %v repeated or not a composition of %d", m, D, a, D)
				}
				seen[key] = true
				r++
				if !ix.Next(a) {
					break
				}
			}
			// C(D+m, m) compositions
			want := new(big.Int).Binomial(int64(D+m), int64(m)).Int64()
			if int64(r) != want || int64(ix.Count(D)) != want {
				t.Fatalf("m=%d D=%d: walked %d, Count %d, want C(%d,%d) = %d", m, D, r, ix.Count(D), D+m, m, want)
			}
		}
	}
}
