package celltransfer

import (
	"context"
	"fmt"
	"math/big"

	"avoidcert/internal/par"
	"avoidcert/internal/words"
	"avoidcert/pattern"
)

// move is one allowed way to extend cell sigma backwards: a new first
// value t in gap j of sigma's sorted entries, giving an allowed window,
// whose first m entries have cell tau.
//
// Writing l and r for the numbers of other values below and above t inside
// gap j (l + r = a_j - 1), the index of the shorter permutation on tau is
// b_i = a[src[0][i]] + a[src[1][i]] (the sigma gaps merged into tau's gap
// i; index m+1 stands for none and reads 0), plus l at i = u-1 and r at
// i = u, where u is t's rank in tau. Summing G_k[tau] along that line is
// one or two lookups in its prefix sums along direction e_{u-1} - e_u.
type move struct {
	j   int
	tau int
	u   int
	src [2][]int
}

// Engine advances iterates of one System. It is read-only after New and safe
// for concurrent use.
type Engine struct {
	sys   System
	cells int
	moves [][]move // per sigma
	dirU  []int    // per tau: the rank of its first entry (the prefix-sum direction)
}

// New prepares the moves of a system.
func New(sys System) *Engine {
	m := sys.M
	e := &Engine{sys: sys, cells: sys.Cells()}
	e.moves = make([][]move, e.cells)
	e.dirU = make([]int, e.cells)
	for tau := range e.cells {
		if m > 0 {
			e.dirU[tau] = pattern.Unrank(m, tau)[0]
		}
	}
	if m == 0 {
		return e // only the pattern 1 has length 1: nothing is allowed
	}
	for sigma := range e.cells {
		x := pattern.Unrank(m, sigma)
		for j := 0; j <= m; j++ {
			// window (t, x_1..x_m) with t above exactly j of the x's
			win := make(pattern.Perm, m+1)
			win[0] = j + 1
			for i, v := range x {
				win[i+1] = v
				if v > j {
					win[i+1] = v + 1
				}
			}
			if !sys.Allowed[pattern.Rank(win)] {
				continue
			}
			e.moves[sigma] = append(e.moves[sigma], newMove(win, j, m))
		}
	}
	return e
}

// newMove derives the gap bookkeeping of one window. Around the sorted
// values z_1 < ... < z_{m+1} of the window there are m+2 gaps: sigma's gaps
// before j keep their index, gap j splits into the pieces below (L) and
// above (R) t = z_{j+1}, later gaps shift by one. Dropping x_m = z_p merges
// the two gaps beside it.
func newMove(win pattern.Perm, j, m int) move {
	const pieceL, pieceR = -1, -2
	g := make([]int, m+2) // source of each gap: a sigma gap, or a piece
	for i := range g {
		switch {
		case i < j:
			g[i] = i
		case i == j:
			g[i] = pieceL
		case i == j+1:
			g[i] = pieceR
		default:
			g[i] = i - 1
		}
	}
	p := win[m] // rank of x_m among the window
	var h [][]int
	for i := 0; i < m+2; i++ {
		if i == p {
			h[p-1] = append(h[p-1], g[i])
			continue
		}
		h = append(h, []int{g[i]})
	}
	mv := move{j: j, tau: pattern.Rank(pattern.Standardize(win[:m]))}
	none := m + 1
	for t := range mv.src {
		mv.src[t] = []int{}
	}
	for i, srcs := range h {
		merged := []int{none, none}
		n := 0
		for _, s := range srcs {
			switch s {
			case pieceL:
				mv.u = i + 1
			case pieceR:
				if mv.u != i {
					panic("transfer: pieces of the split gap are not adjacent")
				}
			default:
				merged[n] = s
				n++
			}
		}
		mv.src[0] = append(mv.src[0], merged[0])
		mv.src[1] = append(mv.src[1], merged[1])
	}
	return mv
}

// Start returns G_0: one coefficient per cell, 1 where the start vector is
// 1.
func (e *Engine) Start() *Iterate {
	g := newIterate(0, e.sys.M, e.cells, 1, limbsFor(e.sys.M, 0))
	for c, ok := range e.sys.Start {
		if ok {
			g.Words(c, 0)[0] = 1
		}
	}
	return g
}

// IterateBytes returns the bytes of the coefficients of G_k.
func (e *Engine) IterateBytes(k int) int64 {
	m := e.sys.M
	return 8 * int64(e.cells) * int64(NewIndexer(m, k).Count(k)) * int64(limbsFor(m, k))
}

// Footprint estimates the bytes Next needs to produce G_{k+1} from G_k:
// the input, its prefix sums and the output. Advance needs two thirds of
// it or less, since the prefix sums overwrite the input.
func (e *Engine) Footprint(k int) int64 {
	return 2*e.IterateBytes(k) + e.IterateBytes(k+1)
}

// CountsFootprint estimates the peak bytes of Counts(ctx, s, n): the last
// two iterates, with the spare capacity that recycled storage keeps.
func CountsFootprint(s pattern.Set, n int) int64 {
	sys := FromSet(s)
	if n <= sys.M {
		return 0
	}
	e := New(sys)
	k := n - sys.M
	return (e.IterateBytes(k-1) + e.IterateBytes(k)) * (headroomDiv + 1) / headroomDiv
}

// chunk is the number of output coefficients one task computes.
const chunk = 2048

// Next returns G_{k+1} computed from g = G_k, leaving g unchanged. It stops
// early with the context's error when ctx is cancelled.
func (e *Engine) Next(ctx context.Context, g *Iterate) (*Iterate, error) {
	if err := e.owns(g); err != nil {
		return nil, err
	}
	prefix := newIterate(g.K, g.M, g.Cells, g.PerCell, g.Limbs)
	return e.step(ctx, g, prefix, nil)
}

// Advance returns G_{k+1} like Next but consumes g: g's storage is
// overwritten by its prefix sums, and the result reuses the storage of
// recycle (an iterate of this engine that the caller no longer needs; nil
// allocates). Holding two iterates instead of three is what lets long
// counting runs fit in memory. After the call g and recycle must not be
// used.
func (e *Engine) Advance(ctx context.Context, g, recycle *Iterate) (*Iterate, error) {
	if err := e.owns(g); err != nil {
		return nil, err
	}
	return e.step(ctx, g, g, recycle)
}

func (e *Engine) owns(g *Iterate) error {
	if g.M != e.sys.M || g.Cells != e.cells {
		return fmt.Errorf("transfer: iterate of cell length %d does not belong to this engine (cell length %d)", g.M, e.sys.M)
	}
	return nil
}

// step writes the prefix sums of g into prefix (which may be g itself),
// then fills the next iterate, in the storage of recycle when it is large
// enough.
func (e *Engine) step(ctx context.Context, g, prefix, recycle *Iterate) (*Iterate, error) {
	m, k := e.sys.M, g.K
	ix := NewIndexer(m, k+1)
	out := reuseIterate(recycle, k+1, m, e.cells, ix.Count(k+1), limbsFor(m, k+1))
	if m == 0 {
		clear(out.words)
		return out, nil
	}
	err := par.Run(ctx, e.cells, func() func(int) {
		return func(tau int) { e.prefixSums(ix, g, prefix, tau) }
	})
	if err != nil {
		return nil, err
	}
	perCellTasks := (out.PerCell + chunk - 1) / chunk
	err = par.Run(ctx, e.cells*perCellTasks, func() func(int) {
		return func(task int) {
			sigma, part := task/perCellTasks, task%perCellTasks
			lo := part * chunk
			e.fill(ix, prefix, out, sigma, lo, min(lo+chunk, out.PerCell))
		}
	})
	if err != nil {
		return nil, err
	}
	return out, nil
}

// prefixSums writes P[b] = sum_{i=0}^{b_{u-1}} G[b - i e_{u-1} + i e_u] for
// one cell (prefix may alias g). In storage order the point
// b - e_{u-1} + e_u comes earlier, at rank r - C(s_{u-1}+u-2, u-1).
func (e *Engine) prefixSums(ix *Indexer, g, prefix *Iterate, tau int) {
	m, k := g.M, g.K
	u := e.dirU[tau]
	a := make([]int, m+1)
	a[m] = k
	inPlace := prefix == g
	for r := 0; r < g.PerCell; r++ {
		dst := prefix.Words(tau, r)
		if !inPlace {
			copy(dst, g.Words(tau, r))
		}
		if a[u-1] > 0 {
			s := 0
			for i := 0; i < u; i++ {
				s += a[i]
			}
			words.Add(dst, prefix.Words(tau, r-ix.binom[s+u-2][u-1]))
		}
		ix.Next(a)
	}
}

// fill computes output coefficients lo..hi-1 of cell sigma. For each move
// it forms the partial sums s_i of the far end of the line (l = a_j - 1)
// and its rank directly; the point just before the line (l = -1) differs
// only in s_{u-1}, which is lower by a_j.
func (e *Engine) fill(ix *Indexer, prefix, out *Iterate, sigma, lo, hi int) {
	m := out.M
	a := make([]int, m+2) // a[m+1] stays 0: the "no source" slot
	ix.Unrank(out.K, lo, a[:m+1])
	binom := ix.binom
	for r := lo; r < hi; r++ {
		dst := out.Words(sigma, r)
		empty := true // dst not yet written: the first term is stored, not added
		for _, mv := range e.moves[sigma] {
			aj := a[mv.j]
			if aj == 0 {
				continue
			}
			src0, src1 := mv.src[0][:m], mv.src[1][:m]
			s, end, sU, base := 0, 0, 0, 0
			for i := range m {
				bi := a[src0[i]] + a[src1[i]]
				if i == mv.u-1 {
					base = bi
					bi += aj - 1
					s += bi
					sU = s
				} else {
					s += bi
				}
				end += binom[s+i][i+1]
			}
			x := prefix.Words(mv.tau, end)
			if base == 0 {
				if empty {
					copy(dst, x)
					clear(dst[len(x):])
				} else {
					words.Add(dst, x)
				}
			} else {
				u := mv.u
				before := end - binom[sU+u-1][u] + binom[sU-aj+u-1][u]
				y := prefix.Words(mv.tau, before)
				if empty {
					words.SubInto(dst, x, y)
				} else {
					words.AddSub(dst, x, y)
				}
			}
			empty = false
		}
		if empty {
			clear(dst)
		}
		ix.Next(a[:m+1])
	}
}

// Progress is called after each iterate is produced, with its degree and
// the last degree asked for.
type Progress func(k, last int)

// Counts returns a_0..a_N for the set: by enumeration below length m =
// w-1, and from the iterates G_0..G_{N-m} from there on.
func Counts(ctx context.Context, s pattern.Set, N int, progress Progress) ([]*big.Int, error) {
	sys := FromSet(s)
	counts := make([]*big.Int, 0, N+1)
	for n := 0; n <= N && n < sys.M; n++ {
		c := 0
		for _, ok := range s.AvoidingPerms(n) {
			if ok {
				c++
			}
		}
		counts = append(counts, big.NewInt(int64(c)))
	}
	if N < sys.M {
		return counts, nil
	}
	e := New(sys)
	g := e.Start()
	var spare *Iterate
	for {
		counts = append(counts, g.Sum())
		if progress != nil {
			progress(g.K, N-sys.M)
		}
		if g.K == N-sys.M {
			return counts, nil
		}
		next, err := e.Advance(ctx, g, spare)
		if err != nil {
			return nil, err
		}
		g, spare = next, g
	}
}
