package transfer_test

import (
	"context"
	"crypto/sha256"
	"math/big"
	"testing"

	"avoidcert/pattern"
	"avoidcert/transfer"
)

func counts(t testing.TB, s pattern.Set, N int) []*big.Int {
	t.Helper()
	c, err := transfer.Counts(context.Background(), s, N, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(c) != N+1 {
		t.Fatalf("%v: Counts(%d) returned %d values, want %d", s, N, len(c), N+1)
	}
	return c
}

// iterate returns G_n of a system, advanced with Next from its start.
func iterate(t testing.TB, sys transfer.System, n int) *transfer.Iterate {
	t.Helper()
	e := transfer.New(sys)
	g, err := e.Start(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	for g.N < n {
		if g, err = e.Next(context.Background(), g); err != nil {
			t.Fatal(err)
		}
	}
	return g
}

func sha256Of(b []byte) [32]byte { return sha256.Sum256(b) }
