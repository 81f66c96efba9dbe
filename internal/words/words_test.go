package words

import (
	"math/big"
	"math/rand/v2"
	"testing"
)

// The operations agree with math/big on random operands (common practice,
// no source: math/big is the reference).
func TestAgainstBigInt(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	random := func(n int) []big.Word {
		w := make([]big.Word, n)
		for i := range w {
			w[i] = big.Word(rng.Uint64())
			if rng.IntN(4) == 0 {
				w[i] = ^big.Word(0) // long carry chains
			}
		}
		return w
	}
	toInt := func(w []big.Word) *big.Int { return new(big.Int).SetBits(append([]big.Word(nil), w...)) }
	for range 2000 {
		n := 1 + rng.IntN(12) // several groups of four words and a tail
		x, y := random(n), random(n)
		if toInt(x).Cmp(toInt(y)) < 0 {
			x, y = y, x
		}
		dst := append(random(n), 0, 0) // two words of room for carries
		dst[n], dst[n+1] = 0, 0
		want := new(big.Int).Add(toInt(dst), toInt(x))
		Add(dst, x)
		if toInt(dst).Cmp(want) != 0 {
			t.Fatalf("Add: got %v, want %v", toInt(dst), want)
		}
		want.Add(want, new(big.Int).Sub(toInt(x), toInt(y)))
		AddSub(dst, x, y)
		if toInt(dst).Cmp(want) != 0 {
			t.Fatalf("AddSub: got %v, want %v", toInt(dst), want)
		}
		SubInto(dst, x, y)
		if diff := new(big.Int).Sub(toInt(x), toInt(y)); toInt(dst).Cmp(diff) != 0 {
			t.Fatalf("SubInto: got %v, want %v", toInt(dst), diff)
		}
		AddInto(dst, x, y)
		if sum := new(big.Int).Add(toInt(x), toInt(y)); toInt(dst).Cmp(sum) != 0 {
			t.Fatalf("AddInto: got %v, want %v", toInt(dst), sum)
		}
		// Sub wraps modulo 2^(64 len(dst)): adding src back restores dst.
		before := toInt(dst)
		Sub(dst, y)
		mod := new(big.Int).Lsh(big.NewInt(1), uint(64*len(dst)))
		if want := new(big.Int).Mod(new(big.Int).Sub(before, toInt(y)), mod); toInt(dst).Cmp(want) != 0 {
			t.Fatalf("Sub: got %v, want %v", toInt(dst), want)
		}
	}
}
