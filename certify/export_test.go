package certify

import (
	"context"
	"math/big"
)

// Exports for the tests of package certify_test. The tests build their
// certificates with MakeBracket, from the checker's own iteration: the
// producer of real certificates is the engine's (certify/produce), and the
// engine's agreement with the checker is tested in internal/conformance.

// Iterate returns G_n of the system on states (nil: whole) with the given
// start, as one slice of coefficients per state (nil outside the system or
// for states longer than n), its digest and its sum.
func Iterate(given []string, states []int, start Start, n int) (coef [][]*big.Int, digest [32]byte, sum *big.Int) {
	sys, g := iterateTo(given, states, start, n)
	for _, t := range g.tables {
		var c []*big.Int
		if t != nil {
			for r := range t.size() {
				c = append(c, toBig(t.at(r)))
			}
		}
		coef = append(coef, c)
	}
	return coef, sys.digest(g), g.sum()
}

func iterateTo(given []string, states []int, start Start, n int) (*system, *iterate) {
	s, err := parseSet(given)
	if err != nil {
		panic(err)
	}
	sp := newStateSpace(s)
	sys := newSystem(sp, states, n+MaxStep)
	var g *iterate
	from := 0
	for _, p := range states {
		from = max(from, len(sp.states[p]))
	}
	switch start {
	case StartEmpty:
		g = sys.emptyStart()
	case StartOnes:
		g = sys.onesStart(from)
	case StartWhole:
		whole := newSystem(sp, nil, from)
		g = whole.emptyStart()
		for g.n < from {
			g, _ = whole.next(context.Background(), g)
		}
		g = sys.restrict(g)
	}
	for g.n < n {
		g, _ = sys.next(context.Background(), g)
	}
	return sys, g
}

// MakeBracket returns the bracket of the system on states (nil: whole)
// with the given start, step d and N, with Lo and Hi the exact least and
// largest ratios G_(N+d)/H (Hi nil where some H is 0 under a positive
// G_(N+d)), and the sum of G_N.
func MakeBracket(given []string, states []int, start Start, d, N int, upper bool) (Bracket, *big.Int) {
	sys, g := iterateTo(given, states, start, N)
	h, _ := sys.elevated(context.Background(), g, d)
	next := g
	for next.n < N+d {
		next, _ = sys.next(context.Background(), next)
	}
	var lo, hi *big.Rat
	infinite := false
	for p, t := range next.tables {
		if t == nil {
			continue
		}
		for r := range t.size() {
			N, H := toBig(t.at(r)), new(big.Int)
			if h.tables[p] != nil {
				H = toBig(h.tables[p].at(r))
			}
			if H.Sign() == 0 {
				infinite = infinite || N.Sign() > 0
				continue
			}
			ratio := new(big.Rat).SetFrac(N, H)
			if lo == nil || ratio.Cmp(lo) < 0 {
				lo = ratio
			}
			if hi == nil || ratio.Cmp(hi) > 0 {
				hi = ratio
			}
		}
	}
	if lo == nil {
		lo, hi = new(big.Rat), new(big.Rat)
	}
	if infinite {
		hi = nil
	}
	all := states
	if all == nil {
		for p := range sys.in {
			all = append(all, p)
		}
	}
	return Bracket{States: all, Start: start, Step: d, N: N, Lo: lo, Hi: hi, Upper: upper, IterateDigest: sys.digest(g)}, g.sum()
}
