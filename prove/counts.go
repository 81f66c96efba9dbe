package prove

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"

	"avoidcert/certify"
	"avoidcert/internal/memory"
	"avoidcert/internal/par"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// Counts returns a_0..a_n for set, computed twice, by the fast engine
// (transfer.Counts) and by the checker's own iteration (certify.Counts, on
// opts.Typed when set: the patterns as the user typed them), at the same
// time. It returns the counts only when the two agree;
// otherwise the error names the first n where they differ. A count whose
// estimated memory (CountsMemory) is over opts.MaxMemory is refused before
// the work with a *BudgetError.
func Counts(ctx context.Context, set pattern.Set, n int, opts Options) ([]*big.Int, error) {
	if n < 0 {
		return nil, fmt.Errorf("prove: counts up to n = %d: n must not be negative", n)
	}
	need := CountsMemory(set, n, opts)
	if need > opts.maxMemory() {
		return nil, &BudgetError{Budget: BudgetMemory, What: fmt.Sprintf("counting %s to n = %d (the engine and the checker side by side)", set, n),
			Need: float64(need), Limit: float64(opts.maxMemory()), err: errors.New("counts over the memory budget")}
	}
	type counted struct {
		counts []*big.Int
		err    error
	}
	ownDone := make(chan counted, 1)
	var panicked par.PanicBox
	go func() {
		defer func() {
			if panicked.Caught(recover()) {
				ownDone <- counted{}
			}
		}()
		c, err := certify.Counts(ctx, opts.given(set), n)
		ownDone <- counted{c, err}
	}()
	// The checker's iteration allocates each iterate anew: in the second
	// half of a large count, where the iterates are largest, the collector
	// runs before each of the engine's steps so that the checker's dead
	// iterates do not pile up next to both live ones.
	collect := func(k, last int) {
		if 2*k >= last {
			memory.Collect(need)
		}
	}
	engine, err := transfer.Counts(ctx, set, n, collect)
	own := <-ownDone
	panicked.Raise()
	switch {
	case err != nil:
		return nil, err
	case own.err != nil:
		return nil, own.err
	}
	for i := range engine {
		if i >= len(own.counts) || engine[i].Cmp(own.counts[i]) != 0 {
			return nil, fmt.Errorf("prove: the engine and the checker disagree on %s first at n = %d (engine %s, checker %s); please report this", set, i, engine[i], countAt(own.counts, i))
		}
	}
	return engine, nil
}

// CountsMemory estimates the peak bytes of Counts(ctx, set, n, opts), in
// time independent of n: the engine's (transfer.CountsFootprint) and the
// checker's, which counts with the iteration it re-checks brackets with:
// its estimate for a bracket at n - 1 with step 1 (certify.Estimate), which
// iterates the same G_0 .. G_n and holds one table more.
func CountsMemory(set pattern.Set, n int, opts Options) int64 {
	engine := transfer.CountsFootprint(set, n)
	_, checker, err := certify.Estimate(opts.given(set), nil, []certify.Planned{{Start: certify.StartEmpty, Step: 1, N: max(n-1, 0)}}, 64)
	if err != nil {
		return engine // the checker cannot read the set: its count will say so
	}
	return engine + int64(min(checker, math.MaxInt64/2))
}

func countAt(c []*big.Int, i int) string {
	if i < len(c) {
		return c[i].String()
	}
	return "none"
}
