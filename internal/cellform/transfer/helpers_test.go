package celltransfer_test

import (
	"context"
	"math/big"
	"testing"

	transfer "avoidcert/internal/cellform/transfer"
	"avoidcert/pattern"
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

// iterate returns G_k of the set's system, advanced with Next.
func iterate(t testing.TB, sys transfer.System, k int) *transfer.Iterate {
	t.Helper()
	e := transfer.New(sys)
	g := e.Start()
	for g.K < k {
		var err error
		if g, err = e.Next(context.Background(), g); err != nil {
			t.Fatal(err)
		}
	}
	return g
}
