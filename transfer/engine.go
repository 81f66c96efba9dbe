package transfer

import (
	"context"
	"fmt"
	"math/big"

	"avoidcert/internal/par"
	"avoidcert/internal/words"
)

// Engine advances the iterates of one system. It is read-only after New
// and safe for concurrent use.
type Engine struct {
	sys    System
	st     *States
	member []bool
	scale  int64    // start weight factor of limbsFor
	single [][]term // per target state: the moves of one op
	multi  []term   // moves of several ops (several drops)
	needs  []need   // running sums of G_n that single ops and first ops read
}

// term is a move of the system with its ops resolved for pulling.
type term struct {
	mv   Move
	ops  []resolved
	need int // index into Engine.needs of ops[0]'s source, or -1 (G_n itself)
}

// resolved is an op whose "none" source coordinate points at a slot that
// holds 0: a*_t = c[s0[t]] + c[s1[t]] + off[t], c padded by one zero.
type resolved struct {
	prefix bool
	u, v   int
	s0, s1 []int
	off    []int
}

// need is one array of running sums of G_n: state p along (u, v).
type need struct{ p, u, v int }

func resolve(o op, dstParts int) resolved {
	r := resolved{prefix: o.prefix, u: o.u, v: o.v, off: o.off,
		s0: make([]int, len(o.src)), s1: make([]int, len(o.src))}
	for t, s := range o.src {
		r.s0[t], r.s1[t] = s[0], s[1]
		if s[0] < 0 {
			r.s0[t] = dstParts
		}
		if s[1] < 0 {
			r.s1[t] = dstParts
		}
	}
	return r
}

// New prepares the moves of a system.
func New(sys System) *Engine {
	st := sys.States
	e := &Engine{sys: sys, st: st, member: make([]bool, st.Len()), scale: 1,
		single: make([][]term, st.Len())}
	for _, p := range sys.Members {
		e.member[p] = true
	}
	if sys.Start == StartOnes {
		n := sys.StartN()
		var k int64
		for _, p := range sys.Members {
			k += int64(NewIndexer(st.Length(p), n).Count(n - st.Length(p)))
		}
		e.scale = k
	}
	needAt := map[need]int{}
	for _, p := range sys.Members {
		for _, mv := range st.Moves(p) {
			if !e.member[mv.To] {
				continue
			}
			t := term{mv: mv, need: -1}
			for k, o := range mv.ops {
				dstParts := len(o.src) // the split adds a gap, a drop takes one away
				if k == 0 {
					dstParts++
				}
				if o.prefix {
					dstParts--
				}
				t.ops = append(t.ops, resolve(o, dstParts))
			}
			if o := mv.ops[0]; o.prefix {
				key := need{p, o.u, o.v}
				i, ok := needAt[key]
				if !ok {
					i = len(e.needs)
					needAt[key] = i
					e.needs = append(e.needs, key)
				}
				t.need = i
			}
			if len(mv.ops) == 1 {
				e.single[mv.To] = append(e.single[mv.To], t)
			} else {
				e.multi = append(e.multi, t)
			}
		}
	}
	return e
}

// System returns the engine's system.
func (e *Engine) System() System { return e.sys }

// layout returns the blocks of an iterate at length n (no storage).
func (e *Engine) layout(n int) ([]block, int, int) {
	limbs := limbsFor(n, e.scale)
	blocks := make([]block, e.st.Len())
	total := 0
	for _, p := range e.sys.Members {
		L := e.st.Length(p)
		if L > n {
			continue
		}
		c := NewIndexer(L, n-L).Count(n - L)
		blocks[p] = block{l: L, deg: n - L, limbs: limbs, count: c}
		total += c * limbs
	}
	for p := range blocks {
		if blocks[p].count == 0 {
			blocks[p] = block{l: e.st.Length(p), deg: n - e.st.Length(p), limbs: limbs}
		}
	}
	return blocks, limbs, total
}

// headroomDiv sets the spare capacity of new storage, 1/headroomDiv of its
// size, so that storage can be recycled for a step or two as it grows.
const headroomDiv = 8

// newIterate returns a zeroed iterate at length n, in the storage of
// recycle when it is large enough.
func (e *Engine) newIterate(n int, recycle *Iterate) *Iterate {
	blocks, limbs, total := e.layout(n)
	var w []big.Word
	if recycle != nil && cap(recycle.words) >= total {
		w = recycle.words[:total]
		clear(w)
	} else {
		w = make([]big.Word, total, total+total/headroomDiv)
	}
	off := 0
	for p := range blocks {
		b := &blocks[p]
		sz := b.count * limbs
		b.words = w[off : off+sz : off+sz]
		off += sz
	}
	return &Iterate{N: n, Limbs: limbs, states: e.st, blocks: blocks, words: w}
}

// IterateBytes returns the bytes of the coefficients of G_n.
func (e *Engine) IterateBytes(n int) int64 {
	_, _, total := e.layout(n)
	return 8 * int64(total)
}

// Footprint estimates the peak bytes of Next from G_n: G_n, the running
// sums it reads, G_(n+1), and the largest pair of intermediate arrays of a
// move with several drops.
func (e *Engine) Footprint(n int) int64 {
	in, _, _ := e.layout(n)
	limbs := limbsFor(n, e.scale)
	var sums int64
	for _, nd := range e.needs {
		sums += int64(in[nd.p].count * limbs)
	}
	var chain int64
	outLimbs := limbsFor(n+1, e.scale)
	for _, t := range e.multi {
		L := e.st.Length(t.mv.From)
		if L > n {
			continue
		}
		prev := int64(0)
		for k := 0; k < len(t.ops)-1; k++ {
			parts := len(t.ops[k+1].s0)
			size := int64(scratchCount(parts, n-L+1+k)) * int64(outLimbs)
			chain = max(chain, prev+size)
			prev = size
		}
	}
	return 8 * (int64(e.IterateBytes(n)/8) + sums + chain + e.IterateBytes(n+1)/8)
}

// scratchCount returns the number of compositions of deg into parts parts.
func scratchCount(parts, deg int) int { return NewIndexer(parts-1, deg).Count(deg) }

// Start returns the system's first iterate: G_0 for the whole system,
// G_(n_s) for a restricted one.
func (e *Engine) Start(ctx context.Context) (*Iterate, error) {
	switch e.sys.Start {
	case StartEmpty:
		g := e.newIterate(0, nil)
		g.blocks[0].at(0)[0] = 1
		return g, nil
	case StartOnes:
		g := e.newIterate(e.sys.StartN(), nil)
		for _, p := range e.sys.Members {
			b := &g.blocks[p]
			for r := range b.count {
				b.at(r)[0] = 1
			}
		}
		return g, nil
	}
	n := e.sys.StartN()
	w := New(Whole(e.st))
	whole, err := w.Start(ctx)
	for err == nil && whole.N < n {
		whole, err = w.Next(ctx, whole)
	}
	if err != nil {
		return nil, err
	}
	g := e.newIterate(n, nil)
	for _, p := range e.sys.Members {
		b := &g.blocks[p]
		for r := range b.count {
			copy(b.at(r), whole.blocks[p].at(r))
		}
	}
	return g, nil
}

// Next returns G_(n+1) computed from g = G_n, leaving g unchanged. It stops
// early with the context's error when ctx is cancelled.
func (e *Engine) Next(ctx context.Context, g *Iterate) (*Iterate, error) {
	return e.step(ctx, g, nil)
}

// Advance returns G_(n+1) like Next, in the storage of recycle (an iterate
// of this engine that the caller no longer needs; nil allocates). After
// the call recycle must not be used; g is unchanged.
func (e *Engine) Advance(ctx context.Context, g, recycle *Iterate) (*Iterate, error) {
	if recycle == g {
		return nil, fmt.Errorf("transfer: Advance cannot recycle its own input")
	}
	return e.step(ctx, g, recycle)
}

// chunk is the number of coefficients one task handles.
const chunk = 2048

func (e *Engine) step(ctx context.Context, g, recycle *Iterate) (*Iterate, error) {
	if g.states != e.st || len(g.blocks) != e.st.Len() {
		return nil, fmt.Errorf("transfer: the iterate does not belong to this engine's states")
	}
	n := g.N
	out := e.newIterate(n+1, recycle)
	ixs := make([]*Indexer, e.st.MaxLength()+2)
	for l := range ixs {
		ixs[l] = NewIndexer(l, n+2)
	}
	// Running sums of G_n, one array per need.
	sums := make([]block, len(e.needs))
	var tasks []func()
	for i, nd := range e.needs {
		src := g.blocks[nd.p]
		if src.count == 0 {
			continue
		}
		sums[i] = block{l: src.l, deg: src.deg, limbs: src.limbs, count: src.count,
			words: append([]big.Word(nil), src.words...)}
		tasks = append(tasks, runningSumTasks(&sums[i], ixs[src.l], nd.u, nd.v)...)
	}
	if err := runAll(ctx, tasks); err != nil {
		return nil, err
	}
	// Every move of one op pulls straight into G_(n+1).
	tasks = tasks[:0]
	for q := range e.single {
		dst := &out.blocks[q]
		terms := e.single[q]
		if dst.count == 0 || len(terms) == 0 {
			continue
		}
		srcs := make([]*block, len(terms))
		for k, t := range terms {
			if t.need >= 0 {
				srcs[k] = &sums[t.need]
			} else {
				srcs[k] = &g.blocks[t.mv.From]
			}
		}
		for lo := 0; lo < dst.count; lo += chunk {
			hi := min(lo+chunk, dst.count)
			tasks = append(tasks, func() {
				for k, t := range terms {
					pull(dst, srcs[k], t.ops[0], ixs, lo, hi)
				}
			})
		}
	}
	if err := runAll(ctx, tasks); err != nil {
		return nil, err
	}
	// Moves with several drops go through intermediate arrays, one drop at
	// a time, one move after another.
	limbs := out.Limbs
	for _, t := range e.multi {
		src := &sums[t.need]
		if src.count == 0 {
			continue
		}
		for k, o := range t.ops {
			var dst *block
			if k == len(t.ops)-1 {
				dst = &out.blocks[t.mv.To]
			} else {
				parts := len(t.ops[k+1].s0)
				deg := src.deg + 1
				c := scratchCount(parts, deg)
				dst = &block{l: parts - 1, deg: deg, limbs: limbs, count: c, words: make([]big.Word, c*limbs)}
			}
			if k > 0 {
				if err := runAll(ctx, runningSumTasks(src, ixs[src.l], o.u, o.v)); err != nil {
					return nil, err
				}
			}
			if err := runAll(ctx, pullTasks(dst, src, o, ixs)); err != nil {
				return nil, err
			}
			src = dst
		}
	}
	return out, nil
}

func runAll(ctx context.Context, tasks []func()) error {
	return par.Run(ctx, len(tasks), func() func(int) { return func(i int) { tasks[i]() } })
}

func pullTasks(dst, src *block, o resolved, ixs []*Indexer) []func() {
	var tasks []func()
	for lo := 0; lo < dst.count; lo += chunk {
		hi := min(lo+chunk, dst.count)
		tasks = append(tasks, func() { pull(dst, src, o, ixs, lo, hi) })
	}
	return tasks
}

// pull adds into dst's coefficients lo..hi-1 the source coefficients the
// op maps them to.
func pull(dst, src *block, o resolved, ixs []*Indexer, lo, hi int) {
	if src.count == 0 {
		return
	}
	c := make([]int, dst.l+2) // the last slot stays 0
	ixs[dst.l].Unrank(dst.deg, lo, c[:dst.l+1])
	binom := ixs[src.l].binom
	sl := src.l
	for r := lo; r < hi; r++ {
		rank, s, ok := 0, 0, true
		for t := 0; t < sl; t++ {
			x := c[o.s0[t]] + c[o.s1[t]] + o.off[t]
			if x < 0 {
				ok = false
				break
			}
			s += x
			rank += binom[s+t][t+1]
		}
		if ok && c[o.s0[sl]]+c[o.s1[sl]]+o.off[sl] >= 0 {
			words.Add(dst.at(r), src.at(rank))
		}
		ixs[dst.l].Next(c[:dst.l+1])
	}
}

// runningSumTasks returns tasks that replace b by its running sums along
// (u, v): P[a] = sum over t = 0..a_u of B[a - t e_u + t e_v]. Every line
// {a_u + a_v fixed, other parts fixed} is summed by the task whose rank
// range holds its start (a_u = 0), so tasks write disjoint coefficients.
func runningSumTasks(b *block, ix *Indexer, u, v int) []func() {
	var tasks []func()
	for lo := 0; lo < b.count; lo += chunk {
		hi := min(lo+chunk, b.count)
		tasks = append(tasks, func() {
			a := make([]int, b.l+1)
			ix.Unrank(b.deg, lo, a)
			w := make([]int, b.l+1)
			for r := lo; r < hi; r++ {
				if a[u] == 0 && a[v] > 0 {
					copy(w, a)
					prev := r
					for w[v] > 0 {
						w[u]++
						w[v]--
						cur := ix.Rank(w)
						words.Add(b.at(cur), b.at(prev))
						prev = cur
					}
				}
				ix.Next(a)
			}
		})
	}
	return tasks
}

// Limbs returns the words per coefficient of the iterate G_n.
func (e *Engine) Limbs(n int) int { return limbsFor(n, e.scale) }
