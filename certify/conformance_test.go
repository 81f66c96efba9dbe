package certify_test

import (
	"context"
	"math/rand/v2"
	"testing"

	"avoidcert/certify"
	"avoidcert/internal/brute"
	transfer "avoidcert/internal/cellform/transfer"
	"avoidcert/pattern"
)

// TestConformanceWithEngine compares the checker's recomputed iterates with
// the fast engine's: the same digest (docs/certificate.md, canonical byte
// stream of G_k) and the same sum, for random sets, whole and restricted.
func TestConformanceWithEngine(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 7))
	ctx := context.Background()
	positive := 0
	for trial := range 60 {
		s := pattern.NewSet(brute.RandomPatterns[pattern.Perm](rng, 4, 2, 5)...)
		m := s.Window() - 1
		sys := transfer.FromSet(s)
		var cells []int // nil: whole system
		if trial%2 == 1 {
			in := make([]bool, sys.Cells())
			for c := range in {
				if rng.IntN(2) == 0 {
					in[c] = true
					cells = append(cells, c)
				}
			}
			if cells == nil {
				in[0], cells = true, []int{0}
			}
			sys = sys.Restrict(in)
		}
		eng := transfer.New(sys)
		g := eng.Start()
		maxK := map[int]int{1: 14, 2: 10, 3: 8, 4: 6}[m]
		for k := 0; k <= maxK; k++ {
			if k > 0 {
				var err error
				if g, err = eng.Next(ctx, g); err != nil {
					t.Fatal(err)
				}
			}
			digest, sum := certify.IterateDigest(s, cells, k)
			if digest != g.Digest() {
				t.Fatalf("set %s cells %v k=%d: checker digest %x, engine %x", s, cells, k, digest, g.Digest())
			}
			if sum.Cmp(g.Sum()) != 0 {
				t.Fatalf("set %s cells %v k=%d: checker sum %s, engine %s", s, cells, k, sum, g.Sum())
			}
			if k == maxK && sum.Sign() > 0 {
				positive++
			}
		}
	}
	if positive < 20 {
		t.Fatalf("only %d of 60 systems have a non-zero last iterate: the comparison is too weak", positive)
	}
}
