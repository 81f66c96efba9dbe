package transfer

import (
	"math/big"
	"math/bits"
	"testing"

	"avoidcert/internal/settest"
)

// compositions agrees with the Indexer's table and with math/big's
// binomial, and saturates instead of overflowing.
func TestCompositions(t *testing.T) {
	for l := 0; l <= 7; l++ {
		ix := NewIndexer(l, 60)
		for d := -1; d <= 60; d++ {
			if got, want := compositions(l, d), ix.Count(d); got != want {
				t.Fatalf("compositions(%d, %d) = %d, want %d", l, d, got, want)
			}
		}
	}
	for _, c := range []struct{ l, d int }{{6, 3_000_000}, {2, 100_000_000}, {7, 1 << 40}} {
		want := new(big.Int).Binomial(int64(c.d+c.l), int64(c.l))
		got := compositions(c.l, c.d)
		switch {
		case want.IsInt64() && want.Int64() < sizeCap && int64(got) != want.Int64():
			t.Errorf("compositions(%d, %d) = %d, want %s", c.l, c.d, got, want)
		case (!want.IsInt64() || want.Int64() >= sizeCap) && got != sizeCap:
			t.Errorf("compositions(%d, %d) = %d, want the cap %d (the value is %s)", c.l, c.d, got, sizeCap, want)
		}
	}
}

// Above exactLimbsUpTo the closed-form limb count is never below the exact
// one, and at most one word above it.
func TestLimbsForBound(t *testing.T) {
	for _, n := range []int{exactLimbsUpTo + 1, exactLimbsUpTo + 2, 5000, 7777, 20000} {
		for _, scale := range []int64{1, 7, 1 << 40} {
			f := new(big.Int).MulRange(1, int64(n))
			f.Mul(f, big.NewInt(scale))
			exact := f.BitLen()/bits.UintSize + 1
			if got := limbsFor(n, scale); got < exact || got > exact+1 {
				t.Errorf("limbsFor(%d, %d) = %d, exact %d", n, scale, got, exact)
			}
		}
	}
}

// The footprint of lengths no machine could hold is a huge number, not an
// overflow, and is computed without building anything of that size (the
// command line once spent minutes here for 123 to n = 10^8).
func TestFootprintSaturates(t *testing.T) {
	for _, c := range []struct {
		pats []string
		n    int
	}{{[]string{"123"}, 100_000_000}, {[]string{"1234567"}, 3_000_000}, {[]string{"1342"}, 1 << 40}} {
		s := settest.Must(t, c.pats...)
		if got := CountsFootprint(s, c.n); got < 1<<50 {
			t.Errorf("CountsFootprint(%v, %d) = %d, want more than 2^50", c.pats, c.n, got)
		}
	}
}
