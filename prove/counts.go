package prove

import (
	"context"
	"fmt"
	"math/big"

	"avoidcert/certify"
	"avoidcert/internal/bytesize"
	"avoidcert/internal/par"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// Counts returns a_0..a_n for set, computed twice, by the fast engine
// (transfer.Counts) and by the checker's own iteration (certify.Counts, on
// opts.Typed when set: the patterns as the user typed them), at the same
// time. It returns the counts only when the two agree;
// otherwise the error names the first n where they differ. A count whose
// engine iterates would need more than opts.MaxMemory is refused before
// the work (ErrBudget).
func Counts(ctx context.Context, set pattern.Set, n int, opts Options) ([]*big.Int, error) {
	if n < 0 {
		return nil, fmt.Errorf("prove: counts up to n = %d: n must not be negative", n)
	}
	if need := transfer.CountsFootprint(set, n); need > opts.maxMemory() {
		return nil, fmt.Errorf("%w: counting %s to n = %d needs %s, over the memory budget of %s",
			ErrBudget, set, n, bytesize.About(need), bytesize.Format(opts.maxMemory()))
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
	engine, err := transfer.Counts(ctx, set, n, nil)
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

func countAt(c []*big.Int, i int) string {
	if i < len(c) {
		return c[i].String()
	}
	return "none"
}
