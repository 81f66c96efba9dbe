package bounds

import (
	"context"
	"fmt"
	"math/big"

	"avoidcert/internal/memory"
	"avoidcert/transfer"
)

// Ratios returns the exact extremes of R = G_(n+d)[p][a] / H over the
// states of the system and the compositions a with H > 0 (H = G_n[p]
// raised d degrees), for gn = G_n and gnd = G_(n+d) of one system: see
// Bracket for what [lo, hi] proves. hi is nil when some index has
// H = 0 < G_(n+d)[p][a]; lo = hi = 0 when G_n vanishes. The iterates are
// only read.
func Ratios(ctx context.Context, sys transfer.System, gn, gnd *transfer.Iterate) (lo, hi *big.Rat, err error) {
	if gn.States() != sys.States || gnd.States() != sys.States || gnd.N <= gn.N {
		return nil, nil, fmt.Errorf("bounds: Ratios needs G_n and G_(n+d), d >= 1, of one system; got lengths %d and %d", gn.N, gnd.N)
	}
	for _, p := range sys.Members {
		if sys.States.Length(p) > gn.N {
			return nil, nil, fmt.Errorf("bounds: a bracket at n = %d is below the longest state of the system (%d)", gn.N, sys.States.Length(p))
		}
	}
	res, err := extremes(ctx, ratioProblem{st: sys.States, n: gn.N, d: gnd.N - gn.N, states: sys.Members,
		num: gnd, base: gn, numLimbs: gnd.Limbs, baseLimbs: gn.Limbs})
	if err != nil {
		return nil, nil, err
	}
	return res.lo, res.hi, nil
}

// AtNeed estimates the peak bytes of BracketAt(ctx, sys, n, d, prec), in
// time independent of n, so that a caller can refuse it before the work.
func AtNeed(sys transfer.System, n, d int) int64 {
	r := &runner{sys: sys, eng: transfer.New(sys), d: max(d, 1)}
	return r.needFrom(sys.StartN(), n)
}

// BracketAt iterates a system from its start to G_(n+d) and returns its
// bracket at n with step d, Lambda rounded outward to prec bits, with the
// digest of G_n.
func BracketAt(ctx context.Context, sys transfer.System, n, d int, prec uint) (*Bracket, error) {
	if n < sys.StartN() || d < 1 {
		return nil, fmt.Errorf("bounds: BracketAt needs n >= %d (the system's start) and d >= 1, got n = %d, d = %d", sys.StartN(), n, d)
	}
	e := transfer.New(sys)
	g, err := e.Start(ctx)
	if err != nil {
		return nil, err
	}
	var gn, spare *transfer.Iterate
	for g.N < n+d {
		var next *transfer.Iterate
		if g.N == n {
			gn, spare = g, nil // G_n is kept; nothing else but the step's own storage
			next, err = e.Next(ctx, g)
		} else {
			if !e.Recycles(spare, g.N+1) {
				spare = nil // let the collector have it while the step allocates
			}
			next, err = e.Advance(ctx, g, spare)
			spare = g
		}
		if err != nil {
			return nil, err
		}
		g = next
	}
	spare = nil
	memory.Collect(AtNeed(sys, n, d))
	lo, hi, err := Ratios(ctx, sys, gn, g)
	if err != nil {
		return nil, err
	}
	return &Bracket{States: sys.Members, Start: sys.Start, Step: d, N: n, Lo: lo, Hi: hi,
		Upper: sys.Start != transfer.StartWhole, Lambda: lambdaOf(lo, hi, d, prec), Prec: prec,
		Sum: gn.Sum(), Digest: gn.Digest()}, nil
}
