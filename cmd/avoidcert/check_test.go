package main

import (
	"math"
	"testing"
)

// --max-work is a float (1e12 reads better than 1000000000000); values
// beyond int64 must clamp, not wrap around to a negative number that the
// checker would read as its default.
func TestWorkLimit(t *testing.T) {
	for _, tc := range []struct {
		flag float64
		want int64
		ok   bool
	}{
		{1, 1, true},
		{1e12, 1_000_000_000_000, true},
		{9.2e18, 9_200_000_000_000_000_000, true},
		{1e30, math.MaxInt64, true},
		{math.Inf(1), math.MaxInt64, true},
		{0, 0, false},
		{0.5, 0, false},
		{-1e30, 0, false},
		{math.NaN(), 0, false},
	} {
		got, err := workLimit(tc.flag)
		if (err == nil) != tc.ok || got != tc.want {
			t.Errorf("workLimit(%g) = %d, %v; want %d, ok=%v", tc.flag, got, err, tc.want, tc.ok)
		}
	}
}
