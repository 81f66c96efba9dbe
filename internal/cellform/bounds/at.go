package cellbounds

import (
	"context"
	"fmt"
	"math/big"

	transfer "avoidcert/internal/cellform/transfer"
)

// Ratios returns the exact extremes of R_a = G_{k+d}[a] / D_a over the
// indices a of degree k+d with D_a > 0 on the given cells (nil: all),
// for gk = G_k and gkd = G_{k+d} of one system: lambda^d lies in [lo, hi].
// hi is nil when some index has D_a = 0 < G_{k+d}[a] (no upper bound at this
// k); lo = hi = 0 when G_k vanishes on the cells. The iterates are only
// read. The cells must hold all of G_k's nonzero coefficients.
func Ratios(ctx context.Context, gk, gkd *transfer.Iterate, cells []int) (lo, hi *big.Rat, err error) {
	if gk.M != gkd.M || gk.Cells != gkd.Cells || gkd.K <= gk.K {
		return nil, nil, fmt.Errorf("bounds: Ratios needs G_k and G_{k+d}, d >= 1, of one system; got degrees %d and %d", gk.K, gkd.K)
	}
	if cells == nil {
		cells = make([]int, gk.Cells)
		for c := range cells {
			cells[c] = c
		}
	}
	for _, c := range cells {
		if c < 0 || c >= gk.Cells {
			return nil, nil, fmt.Errorf("bounds: cell %d outside 0..%d", c, gk.Cells-1)
		}
	}
	res, err := extremes(ctx, ratioProblem{m: gk.M, k: gk.K, d: gkd.K - gk.K, cells: cells, num: gkd, base: gk, numLimbs: gkd.Limbs, baseLimbs: gk.Limbs})
	if err != nil {
		return nil, nil, err
	}
	return res.lo, res.hi, nil
}

// BracketAt iterates the whole system to G_{k+d} and returns its bracket at
// k with step d, Lambda rounded outward to prec bits.
func BracketAt(ctx context.Context, sys transfer.System, k, d int, prec uint) (*Bracket, error) {
	if k < 0 || d < 1 {
		return nil, fmt.Errorf("bounds: BracketAt needs k >= 0 and d >= 1, got k = %d, d = %d", k, d)
	}
	e := transfer.New(sys)
	g := e.Start()
	var gk *transfer.Iterate
	var spare *transfer.Iterate
	for g.K < k+d {
		var next *transfer.Iterate
		var err error
		if g.K == k {
			gk = g
			next, err = e.Next(ctx, g)
		} else {
			next, err = e.Advance(ctx, g, spare)
			spare = g
		}
		if err != nil {
			return nil, err
		}
		g = next
	}
	if gk == nil {
		gk = g
	}
	lo, hi, err := Ratios(ctx, gk, g, nil)
	if err != nil {
		return nil, err
	}
	cells := make([]int, sys.Cells())
	for c := range cells {
		cells[c] = c
	}
	return &Bracket{Cells: cells, M: sys.M, K: k, Step: d, Lo: lo, Hi: hi,
		Lambda: lambdaOf(lo, hi, d, prec), Prec: prec, Sum: gk.Sum(), Digest: gk.Digest()}, nil
}
