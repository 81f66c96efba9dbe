package transfer_test

import (
	"math/big"
	"testing"

	"avoidcert/internal/settest"
	"avoidcert/transfer"
)

// Counts of compositions are exact below transfer.MaxCount and capped at
// it above (binomials from math/big as the reference): with 9 gaps
// (patterns of length 9) C(n, 8) would pass the int64 range near n = 800.
func TestIndexerCountCapped(t *testing.T) {
	for _, l := range []int{2, 6, 8} {
		ix := transfer.NewIndexer(l, 1000)
		for D := 0; D <= 1000; D += 7 {
			exact := new(big.Int).Binomial(int64(D+l), int64(l))
			want := int64(transfer.MaxCount)
			if exact.IsInt64() && exact.Int64() < want {
				want = exact.Int64()
			}
			if got := ix.Count(D); int64(got) != want {
				t.Fatalf("l = %d, D = %d: count %d, want %d (C(D+l, l) = %v)", l, D, got, want, exact)
			}
		}
	}
}

// Memory estimates grow with n and stay positive where the true sizes
// would pass the int64 range: counting a pattern of length 9 to n = 1000
// (C(1000, 8) coefficients of about 134 words each) is refused by any
// budget, never wrapped around to a small number.
func TestFootprintDoesNotWrap(t *testing.T) {
	s := settest.Must(t, "123456789")
	prev := int64(0)
	for _, n := range []int{20, 100, 300, 600, 800, 1000} {
		need := transfer.CountsFootprint(s, n)
		if need < prev || need <= 0 {
			t.Fatalf("estimate %d at n = %d after %d", need, n, prev)
		}
		prev = need
	}
	if prev < 8*transfer.MaxCount {
		t.Errorf("counting 123456789 to n = 1000 estimated at %d bytes, below the cap's %d", prev, 8*transfer.MaxCount)
	}
}
