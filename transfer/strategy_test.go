package transfer

import (
	"context"
	"math/rand/v2"
	"testing"

	"avoidcert/internal/settest"
)

// Pushing and chaining a move that forgets several values give the same
// iterate: every such move pushed, every one chained, and the default
// mix, on random mixed-length sets (lengths 2..6) to n = 16 (common
// practice, no source: two implementations of one sum cross-checked).
func TestPushAndChainAgree(t *testing.T) {
	defer func(f int64) { pushFactor = f }(pushFactor)
	rng := rand.New(rand.NewPCG(8, 4))
	for range 12 {
		s := settest.Random(rng, 4, 6)
		var digests [][32]byte
		for _, f := range []int64{0, 4, 1 << 40} { // always push, default, never push
			pushFactor = f
			e := New(Whole(NewStates(s)))
			g, err := e.Start(context.Background())
			for err == nil && g.N < 16 {
				g, err = e.Next(context.Background(), g)
			}
			if err != nil {
				t.Fatal(err)
			}
			digests = append(digests, g.Digest())
		}
		if digests[0] != digests[1] || digests[1] != digests[2] {
			t.Fatalf("%v: digests at n = 16 differ between push, default and chain: %x %x %x", s, digests[0][:4], digests[1][:4], digests[2][:4])
		}
	}
}
