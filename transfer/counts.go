package transfer

import (
	"context"
	"math/big"

	"avoidcert/pattern"
)

// Progress is called after each iterate is produced, with its length n
// and the last length asked for.
type Progress func(n, last int)

// Counts returns a_0..a_N for the set, the sums of the whole system's
// iterates G_0..G_N.
func Counts(ctx context.Context, s pattern.Set, N int, progress Progress) ([]*big.Int, error) {
	e := New(Whole(NewStates(s)))
	g, err := e.Start(ctx)
	if err != nil {
		return nil, err
	}
	counts := make([]*big.Int, 0, N+1)
	var spare *Iterate
	for {
		counts = append(counts, g.Sum())
		if progress != nil {
			progress(g.N, N)
		}
		if g.N >= N {
			return counts, nil
		}
		if !e.Recycles(spare, g.N+1) {
			spare = nil // let the collector have it while the step allocates
		}
		next, err := e.Advance(ctx, g, spare)
		if err != nil {
			return nil, err
		}
		g, spare = next, g
	}
}

// CountsFootprint estimates the peak bytes of Counts(ctx, s, N): the
// largest step's Footprint (the step recycles the storage of the iterate
// before its input, counted in its output). It takes time independent of N
// (Footprint), so any N is refused at once.
func CountsFootprint(s pattern.Set, N int) int64 {
	e := New(Whole(NewStates(s)))
	var peak int64
	for n := max(N-2, 0); n < N; n++ {
		peak = max(peak, e.Footprint(n))
	}
	return peak
}
