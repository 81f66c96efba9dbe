// Package settest builds pattern sets for tests: from strings, failing the
// test on a parse error, and at random.
package settest

import (
	"math/rand/v2"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/pattern"
)

// Must parses a set from command-line style arguments or fails the test.
func Must(t testing.TB, args ...string) pattern.Set {
	t.Helper()
	s, err := pattern.ParseSet(args)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// List parses one set per argument (each a comma list, "123,321") or
// fails the test.
func List(t testing.TB, sets ...string) []pattern.Set {
	t.Helper()
	out := make([]pattern.Set, len(sets))
	for i, arg := range sets {
		out[i] = Must(t, arg)
	}
	return out
}

// Random draws one to maxCount patterns of lengths 2..maxLen.
func Random(rng *rand.Rand, maxCount, maxLen int) pattern.Set {
	return pattern.NewSet(brute.RandomPatterns[pattern.Perm](rng, maxCount, 2, maxLen)...)
}
