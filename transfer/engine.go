package transfer

import (
	"context"
	"fmt"
	"math/big"
	"runtime"
	"slices"
	"sync"

	"avoidcert/internal/memory"
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

	mu    sync.Mutex
	spare [][]big.Word // scratch storage given back during a step, for reuse in it
}

// take returns scratch storage of n words, reused from earlier in the step
// when one is large enough; its contents are arbitrary.
func (e *Engine) take(n int) []big.Word {
	e.mu.Lock()
	defer e.mu.Unlock()
	// the smallest array that fits: a small request must not take the
	// array a large one of this step needs, or both are held at once
	best := -1
	for i, w := range e.spare {
		if cap(w) >= n && (best < 0 || cap(w) < cap(e.spare[best])) {
			best = i
		}
	}
	if best >= 0 {
		w := e.spare[best]
		e.spare = append(e.spare[:best], e.spare[best+1:]...)
		return w[:n]
	}
	// Kept arrays too small for this one are dropped rather than held
	// next to the new one.
	e.spare = slices.DeleteFunc(e.spare, func(w []big.Word) bool { return cap(w) < n })
	return make([]big.Word, n)
}

// give returns scratch storage for reuse; only the largest few are kept.
func (e *Engine) give(ws ...[]big.Word) {
	e.mu.Lock()
	defer e.mu.Unlock()
	for _, w := range ws {
		if w != nil {
			e.spare = append(e.spare, w)
		}
	}
	slices.SortFunc(e.spare, func(a, b []big.Word) int { return cap(b) - cap(a) })
	if len(e.spare) > maxSpare {
		clear(e.spare[maxSpare:])
		e.spare = e.spare[:maxSpare]
	}
}

// release drops the scratch storage kept for reuse.
func (e *Engine) release() {
	e.mu.Lock()
	defer e.mu.Unlock()
	e.spare = nil
}

// maxSpare is how many scratch arrays an engine keeps for reuse within a
// step.
const maxSpare = 3

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
			k += int64(compositions(st.Length(p), n-st.Length(p)))
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

// layout returns the blocks of an iterate at length n (no storage), in
// time independent of n; counts and the total saturate at sizeCap.
func (e *Engine) layout(n int) ([]block, int, int) {
	limbs := limbsFor(n, e.scale)
	blocks := make([]block, e.st.Len())
	total := 0
	for _, p := range e.sys.Members {
		L := e.st.Length(p)
		if L > n {
			continue
		}
		c := compositions(L, n-L)
		blocks[p] = block{l: L, deg: n - L, limbs: limbs, count: c}
		total = satAdd(total, satMul(c, limbs))
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

// newIterate returns an iterate at length n, in the storage of recycle
// when it is large enough (then its words are left as they were).
func (e *Engine) newIterate(n int, recycle *Iterate) *Iterate {
	blocks, limbs, total := e.layout(n)
	var w []big.Word
	if recycle != nil && cap(recycle.words) >= total {
		w = recycle.words[:total] // not cleared: Next writes every coefficient
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

// IterateBytes returns the bytes a new G_n holds: its coefficients and
// the spare capacity (1/headroomDiv) that lets a later step recycle its
// storage (saturated far beyond any memory). The storage of
// any iterate of this engine at n holds at most this much (Iterate.Bytes).
func (e *Engine) IterateBytes(n int) int64 {
	_, _, total := e.layout(n)
	return 8 * int64(withHeadroom(total))
}

// withHeadroom is words of storage with its spare capacity.
func withHeadroom(words int) int { return satAdd(words, words/headroomDiv) }

// Footprint estimates the peak bytes of Next and Advance from G_n: G_n
// and G_(n+1) (IterateBytes: the recycled storage of Advance is counted in
// G_(n+1)), the running sums the step reads, and the larger of the arrays
// of differences of pushed moves (one per goroutine and group) and the
// largest pair of intermediate arrays of a chained move. Between steps an
// engine holds nothing, so the caller's iterates are all the memory in
// use there. It takes time independent of n and saturates far beyond any
// memory, so that it can refuse any n at once.
func (e *Engine) Footprint(n int) int64 {
	in, limbs, inWords := e.layout(n)
	out, outLimbs, outWords := e.layout(n + 1)
	pushed, chained, used := e.plan(in, out)
	words := satAdd(withHeadroom(inWords), withHeadroom(outWords))
	for i, nd := range e.needs {
		if used[i] {
			words = satAdd(words, satMul(in[nd.p].count, limbs))
		}
	}
	procs := runtime.GOMAXPROCS(0)
	var chain, push int
	for _, grp := range pushed {
		push = max(push, satMul(procs, satMul(out[grp.to].count, outLimbs)))
	}
	for _, t := range chained {
		L := e.st.Length(t.mv.From)
		prev := 0
		for k := 0; k < len(t.ops)-1; k++ {
			size := satMul(scratchCount(len(t.ops[k+1].s0), n-L+1+k), outLimbs)
			chain = max(chain, satAdd(prev, size))
			prev = size
		}
	}
	return 8 * int64(satAdd(words, max(chain, push)))
}

// scratchCount returns the number of compositions of deg into parts parts.
func scratchCount(parts, deg int) int { return compositions(parts-1, deg) }

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

// Recycles reports whether Advance to G_n can write into the storage of
// g. When it cannot, a caller should drop g before the step, so that the
// collector may take it while the step allocates.
func (e *Engine) Recycles(g *Iterate, n int) bool {
	if g == nil {
		return false
	}
	_, _, total := e.layout(n)
	return cap(g.words) >= total
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
	// the storage of earlier steps goes back before this one allocates:
	// the step itself holds no more than its Footprint
	memory.Collect(e.Footprint(n))
	out := e.newIterate(n+1, recycle)
	ixs := make([]*Indexer, e.st.MaxLength()+2)
	for l := range ixs {
		ixs[l] = NewIndexer(l, n+2)
	}
	pushed, chained, used := e.plan(g.blocks, out.blocks)
	// Running sums of G_n, one array per need still read.
	sums := make([]block, len(e.needs))
	var tasks []func()
	for i, nd := range e.needs {
		src := &g.blocks[nd.p]
		if src.count == 0 || !used[i] {
			continue
		}
		sums[i] = block{l: src.l, deg: src.deg, limbs: src.limbs, count: src.count,
			words: e.take(len(src.words))} // every word is written
		tasks = append(tasks, runningSumTasks(&sums[i], src, ixs[src.l], nd.u, nd.v)...)
	}
	if err := runAll(ctx, tasks); err != nil {
		return nil, err
	}
	// Every move of one op pulls straight into G_(n+1); this pass also
	// writes every coefficient of G_(n+1) once (so its storage need not be
	// cleared first).
	tasks = tasks[:0]
	for q := range e.single {
		dst := &out.blocks[q]
		terms := e.single[q]
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
			tasks = append(tasks, func() { pullTerms(dst, srcs, terms, ixs, lo, hi) })
		}
	}
	if err := runAll(ctx, tasks); err != nil {
		return nil, err
	}
	// Moves with several drops into a large state go through intermediate
	// arrays, one drop at a time, one move after another.
	limbs := out.Limbs
	for _, t := range chained {
		src := &sums[t.need]
		for k, o := range t.ops {
			var dst *block
			if k == len(t.ops)-1 {
				dst = &out.blocks[t.mv.To]
			} else {
				parts := len(t.ops[k+1].s0)
				deg := src.deg + 1
				c := scratchCount(parts, deg)
				dst = &block{l: parts - 1, deg: deg, limbs: limbs, count: c, words: e.take(c * limbs)}
				clear(dst.words)
			}
			if k > 0 {
				if err := runAll(ctx, runningSumTasks(src, src, ixs[src.l], o.u, o.v)); err != nil {
					return nil, err
				}
			}
			if err := runAll(ctx, pullTasks(dst, src, o, ixs)); err != nil {
				return nil, err
			}
			if k > 0 {
				e.give(src.words)
			}
			src = dst
		}
	}
	e.release() // the chained moves' arrays are not the size a push needs
	// Moves with several drops into a small state are pushed.
	for _, grp := range pushed {
		if err := e.push(ctx, g, &out.blocks[grp.to], grp.terms, ixs, grp.low); err != nil {
			return nil, err
		}
	}
	// Nothing is kept for the next step: between steps the engine holds no
	// storage, so that what a caller holds is all the memory in use (the
	// budgets of package bounds count on it).
	e.release()
	return out, nil
}

// pushGroup is the moves with several drops into one small state whose
// split gap lands at the same place: they share one array of differences.
type pushGroup struct {
	to, low int
	terms   []term
}

// pushFactor decides between pushing and chaining a move with several
// drops: it is pushed when its target's array, once per goroutine, is at
// most 1/pushFactor of its source's. (A variable so that tests can force
// either way.)
var pushFactor int64 = 4

// plan sorts the moves with several drops from blocks in to blocks out
// into pushed groups (in a fixed order) and chained moves, and marks the
// running sums of the input that single moves and chained moves read.
func (e *Engine) plan(in, out []block) ([]pushGroup, []term, []bool) {
	procs := runtime.GOMAXPROCS(0)
	var groups []pushGroup
	var chained []term
	used := make([]bool, len(e.needs))
	for q, terms := range e.single {
		for _, t := range terms {
			if t.need >= 0 && out[q].count > 0 && in[t.mv.From].count > 0 {
				used[t.need] = true
			}
		}
	}
	for _, t := range e.multi {
		src, dst := in[t.mv.From].count, out[t.mv.To].count
		if src == 0 || dst == 0 {
			continue
		}
		if satMul(satMul(dst, procs), int(pushFactor)) > src {
			chained = append(chained, t)
			used[t.need] = true
			continue
		}
		k := slices.IndexFunc(groups, func(p pushGroup) bool { return p.to == t.mv.To && p.low == t.mv.groups.low })
		if k < 0 {
			groups = append(groups, pushGroup{to: t.mv.To, low: t.mv.groups.low})
			k = len(groups) - 1
		}
		groups[k].terms = append(groups[k].terms, t)
	}
	return groups, chained, used
}

// push adds the moves of one group into dst. Each goroutine adds every
// source coefficient G_n[p][a] at the first output of its segment (the
// split b = 0) and subtracts it just past the last (b = a_i), modulo the
// word size, into its own array of differences; the sum of those arrays,
// summed along the segments' direction (low, low+1), is the moves'
// contribution. Modular sums are exact because the result fits.
func (e *Engine) push(ctx context.Context, g *Iterate, dst *block, terms []term, ixs []*Indexer, low int) error {
	// One pass over each source state serves all its moves in the group.
	type span struct {
		from, lo, hi int
		terms        []term
	}
	bySource := map[int][]term{}
	var froms []int
	for _, t := range terms {
		if _, ok := bySource[t.mv.From]; !ok {
			froms = append(froms, t.mv.From)
		}
		bySource[t.mv.From] = append(bySource[t.mv.From], t)
	}
	var spans []span
	for _, p := range froms {
		count := g.blocks[p].count
		for lo := 0; lo < count; lo += chunk {
			spans = append(spans, span{p, lo, min(lo+chunk, count), bySource[p]})
		}
	}
	var mu sync.Mutex
	var diffs []*block
	err := par.Run(ctx, len(spans), func() func(int) {
		d := &block{l: dst.l, deg: dst.deg, limbs: dst.limbs, count: dst.count, words: e.take(len(dst.words))}
		clear(d.words)
		mu.Lock()
		diffs = append(diffs, d)
		mu.Unlock()
		a := make([]int, e.st.MaxLength()+1)
		x := make([]int, dst.l+1)
		ox := ixs[dst.l]
		return func(task int) {
			sp := spans[task]
			src := &g.blocks[sp.from]
			a := a[:src.l+1]
			ix := ixs[src.l]
			ix.Unrank(src.deg, sp.lo, a)
			var adds, subs []int
			for r := sp.lo; r < sp.hi; r++ {
				adds, subs = adds[:0], subs[:0]
				for _, t := range sp.terms {
					gm := &t.mv.groups
					copy(x, gm.extra)
					for s, j := range gm.of {
						if j >= 0 {
							x[j] += a[s]
						}
					}
					ai := a[t.mv.Gap]
					x[low+1] += ai
					adds = append(adds, ox.Rank(x))
					if x[low+1] > ai { // the point past b = a_i exists
						x[low] += ai + 1
						x[low+1] -= ai + 1
						subs = append(subs, ox.Rank(x))
					}
				}
				// Segments of neighbouring gaps meet end to start (the
				// lower piece of gap i+1 begins just past the upper piece
				// of gap i): an addition and a subtraction at one place
				// cancel and are skipped.
				w := src.at(r)
				for _, p := range adds {
					if k := slices.Index(subs, p); k >= 0 {
						subs[k] = -1
						continue
					}
					words.Add(d.at(p), w)
				}
				for _, p := range subs {
					if p >= 0 {
						words.Sub(d.at(p), w)
					}
				}
				ix.Next(a)
			}
		}
	})
	if err != nil || len(diffs) == 0 {
		return err
	}
	acc := diffs[0]
	for _, d := range diffs[1:] {
		for r := range d.count {
			words.Add(acc.at(r), d.at(r)) // modulo the width of one coefficient
		}
	}
	if err := runAll(ctx, runningSumTasks(acc, acc, ixs[dst.l], low, low+1)); err != nil {
		return err
	}
	for r := range dst.count {
		words.Add(dst.at(r), acc.at(r))
	}
	for _, d := range diffs {
		e.give(d.words)
	}
	return nil
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

// pullTerms writes dst's coefficients lo..hi-1: the sum over the terms of
// the source coefficients each maps them to (0 when none does).
func pullTerms(dst *block, srcs []*block, terms []term, ixs []*Indexer, lo, hi int) {
	c := make([]int, dst.l+2) // the last slot stays 0
	ixs[dst.l].Unrank(dst.deg, lo, c[:dst.l+1])
	for r := lo; r < hi; r++ {
		out := dst.at(r)
		empty := true
		for k, t := range terms {
			src := srcs[k]
			if src.count == 0 {
				continue
			}
			rank, ok := lookup(c, t.ops[0], ixs[src.l].binom, src.l)
			if !ok {
				continue
			}
			if empty {
				copy(out, src.at(rank))
				clear(out[src.limbs:])
				empty = false
			} else {
				words.Add(out, src.at(rank))
			}
		}
		if empty {
			clear(out)
		}
		ixs[dst.l].Next(c[:dst.l+1])
	}
}

// lookup returns the source rank the op maps composition c to, or false
// when a part would be negative.
func lookup(c []int, o resolved, binom [][]int, sl int) (int, bool) {
	rank, s := 0, 0
	for t := 0; t < sl; t++ {
		x := c[o.s0[t]] + c[o.s1[t]] + o.off[t]
		if x < 0 {
			return 0, false
		}
		s += x
		rank += binom[s+t][t+1]
	}
	return rank, c[o.s0[sl]]+c[o.s1[sl]]+o.off[sl] >= 0
}

// pull adds into dst's coefficients lo..hi-1 the source coefficients the
// op maps them to.
func pull(dst, src *block, o resolved, ixs []*Indexer, lo, hi int) {
	if src.count == 0 {
		return
	}
	c := make([]int, dst.l+2) // the last slot stays 0
	ixs[dst.l].Unrank(dst.deg, lo, c[:dst.l+1])
	for r := lo; r < hi; r++ {
		if rank, ok := lookup(c, o, ixs[src.l].binom, src.l); ok {
			words.Add(dst.at(r), src.at(rank))
		}
		ixs[dst.l].Next(c[:dst.l+1])
	}
}

// runningSumTasks returns tasks that write into dst the running sums of
// src along (u, v): P[a] = sum over t = 0..a_u of S[a - t e_u + t e_v]
// (dst may be src). Every line {a_u + a_v fixed, other parts fixed} is
// summed by the task whose rank range holds its start (a_u = 0), so tasks
// write disjoint coefficients.
func runningSumTasks(dst, src *block, ix *Indexer, u, v int) []func() {
	var tasks []func()
	for lo := 0; lo < src.count; lo += chunk {
		hi := min(lo+chunk, src.count)
		tasks = append(tasks, func() {
			a := make([]int, src.l+1)
			ix.Unrank(src.deg, lo, a)
			w := make([]int, src.l+1)
			for r := lo; r < hi; r++ {
				if a[u] == 0 {
					if dst != src {
						copy(dst.at(r), src.at(r))
					}
					copy(w, a)
					prev := r
					for w[v] > 0 {
						w[u]++
						w[v]--
						cur := ix.Rank(w)
						words.AddInto(dst.at(cur), dst.at(prev), src.at(cur))
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
