package bounds

import (
	"slices"

	"context"
	"errors"
	"fmt"
	"gonum.org/v1/gonum/graph"
	"gonum.org/v1/gonum/graph/simple"
	"gonum.org/v1/gonum/graph/topo"
	"math/big"
	"time"

	"avoidcert/internal/bytesize"
	"avoidcert/interval"
	"avoidcert/transfer"
)

// Event reports progress: after every step and after every bracket.
type Event struct {
	Block   int      // the block stepped (0 for Run)
	N       int      // the length n of that block's newest iterate
	Bracket *Bracket // the bracket just taken, or nil after a plain step
	NextN   int      // the n planned for that block's next bracket
	// Lambda is the certified enclosure so far (Lo 0 and Hi nil before
	// every block has a bracket).
	Lambda Enclosure
}

// Progress receives events; it is called from the goroutine running the
// bracket search and must not block for long.
type Progress func(Event)

// Run brackets the growth rate of the whole system (transfer.Whole of a
// set's states) until the target in opts is met or a budget stops it. A
// budget stop is not an error: the result then holds the best certified
// bracket found and says why it stopped. Errors are bad options, a memory
// budget too small for even the first bracket, and a stop before any
// bracket was taken (both *BudgetError, wrapping ErrBudget, unless the
// context was cancelled).
func Run(ctx context.Context, st *transfer.States, opts Options, progress Progress) (*Result, error) {
	if err := opts.validate(true); err != nil {
		return nil, err
	}
	r, err := newRunner(ctx, 0, transfer.Whole(st), opts.step())
	if err != nil {
		return nil, err
	}
	return drive(ctx, []*runner{r}, opts, targetGoal{opts.Digits, opts.Width}, progress)
}

// RunBlocks brackets lambda block by block over a partition of the states
// (nil: Blocks(st), the strongly connected components of the state
// digraph) and reports [max lo, max hi] (method note, section 5b;
// docs/prefix-states.md, "The bracket"):
//   - upper end: every block C is iterated with start ones;
//     lambda(T'_C)^d <= hi_C. The blocks partition the states and no move
//     leads back from a later block to an earlier one (RunBlocks checks
//     both), so T' is block-triangular and lambda <= max hi_C^(1/d).
//   - lower end: every block with a move inside it is also iterated with
//     start whole; lo_C <= lambda^d, because that start is at most the
//     whole iterate and T' >= T'_C on non-negative functions.
//
// Blocks whose ends cannot change the enclosure stop early; the others are
// advanced widest first.
func RunBlocks(ctx context.Context, st *transfer.States, blocks [][]int, opts Options, progress Progress) (*Result, error) {
	if err := opts.validate(true); err != nil {
		return nil, err
	}
	runners, err := blockRunners(ctx, st, blocks, opts)
	if err != nil {
		return nil, err
	}
	return drive(ctx, runners, opts, targetGoal{opts.Digits, opts.Width}, progress)
}

// blockRunners returns the runners of a bracket: the whole system for nil
// blocks, else a ones runner for every block and a whole-start runner for
// every block with a move inside it.
func blockRunners(ctx context.Context, st *transfer.States, blocks [][]int, opts Options) ([]*runner, error) {
	if blocks == nil {
		r, err := newRunner(ctx, 0, transfer.Whole(st), opts.step())
		if err != nil {
			return nil, err
		}
		return []*runner{r}, nil
	}
	if err := checkBlocks(st, blocks); err != nil {
		return nil, err
	}
	if len(blocks) == 1 {
		return blockRunners(ctx, st, nil, opts) // one block is the whole system
	}
	inside := map[int]bool{}
	blockOf := make([]int, st.Len())
	for i, b := range blocks {
		for _, p := range b {
			blockOf[p] = i
		}
	}
	for _, e := range st.Edges() {
		if blockOf[e.From] == blockOf[e.To] {
			inside[blockOf[e.From]] = true
		}
	}
	var runners []*runner
	for i, b := range blocks {
		starts := []transfer.Start{transfer.StartOnes}
		if inside[i] {
			starts = append(starts, transfer.StartWhole)
		}
		for _, start := range starts {
			sys, err := st.Restrict(b, start)
			if err != nil {
				return nil, err
			}
			r, err := newRunner(ctx, i, sys, opts.step())
			if err != nil {
				return nil, err
			}
			runners = append(runners, r)
		}
	}
	return runners, nil
}

// Blocks returns the strongly connected components of the state digraph
// (gonum topo.TarjanSCC), each sorted, in a topological order of the
// component digraph (moves only lead from a block to itself or a later
// block), ties broken by the least state.
func Blocks(st *transfer.States) [][]int {
	g := simple.NewDirectedGraph()
	for p := range st.Len() {
		g.AddNode(simple.Node(p))
	}
	for _, e := range st.Edges() {
		if e.From != e.To { // simple graphs refuse self-loops; they do not change components
			g.SetEdge(simple.Edge{F: simple.Node(e.From), T: simple.Node(e.To)})
		}
	}
	var comps [][]int
	for _, nodes := range topo.TarjanSCC(g) {
		c := make([]int, len(nodes))
		for i, n := range nodes {
			c[i] = int(n.ID())
		}
		slices.Sort(c)
		comps = append(comps, c)
	}
	slices.SortFunc(comps, func(a, b []int) int { return a[0] - b[0] })
	of := make([]int, st.Len())
	for i, c := range comps {
		for _, p := range c {
			of[p] = i
		}
	}
	cond := simple.NewDirectedGraph()
	for i := range comps {
		cond.AddNode(simple.Node(i))
	}
	for _, e := range st.Edges() {
		if a, b := of[e.From], of[e.To]; a != b && !cond.HasEdgeFromTo(int64(a), int64(b)) {
			cond.SetEdge(simple.Edge{F: simple.Node(a), T: simple.Node(b)})
		}
	}
	order, err := topo.SortStabilized(cond, func(ns []graph.Node) {
		slices.SortFunc(ns, func(a, b graph.Node) int { return int(a.ID() - b.ID()) })
	})
	if err != nil {
		panic("bounds: the component digraph has a cycle: " + err.Error())
	}
	out := make([][]int, len(order))
	for i, n := range order {
		out[i] = comps[n.ID()]
	}
	return out
}

// checkBlocks verifies what RunBlocks's upper end rests on: the blocks
// partition the states and the moves between blocks form no cycle.
func checkBlocks(st *transfer.States, blocks [][]int) error {
	if len(blocks) == 0 {
		return fmt.Errorf("bounds: no blocks given; pass Blocks(states), or use Run")
	}
	blockOf := make([]int, st.Len())
	for p := range blockOf {
		blockOf[p] = -1
	}
	for i, b := range blocks {
		if len(b) == 0 {
			return fmt.Errorf("bounds: block %d is empty", i)
		}
		for _, p := range b {
			if p < 0 || p >= st.Len() {
				return fmt.Errorf("bounds: block %d names state %d, outside 0..%d", i, p, st.Len()-1)
			}
			if blockOf[p] >= 0 {
				return fmt.Errorf("bounds: state %d is in blocks %d and %d; blocks must partition the states", p, blockOf[p], i)
			}
			blockOf[p] = i
		}
	}
	for p, b := range blockOf {
		if b < 0 {
			return fmt.Errorf("bounds: state %d is in no block; blocks must partition the states", p)
		}
	}
	succ := make([]map[int]bool, len(blocks))
	for i := range succ {
		succ[i] = map[int]bool{}
	}
	for _, e := range st.Edges() {
		if blockOf[e.From] != blockOf[e.To] {
			succ[blockOf[e.From]][blockOf[e.To]] = true
		}
	}
	state := make([]int, len(blocks)) // 0 new, 1 on the path, 2 done
	var visit func(int) error
	visit = func(b int) error {
		state[b] = 1
		for c := range succ[b] {
			switch state[c] {
			case 1:
				return fmt.Errorf("bounds: moves form a cycle through blocks %d and %d; blocks must be unions of strongly connected components in which no cycle crosses blocks", b, c)
			case 0:
				if err := visit(c); err != nil {
					return err
				}
			}
		}
		state[b] = 2
		return nil
	}
	for b := range blocks {
		if state[b] == 0 {
			if err := visit(b); err != nil {
				return err
			}
		}
	}
	return nil
}

// upper and lower report which ends of a runner's brackets bound lambda.
func (r *runner) upper() bool { return r.sys.Start != transfer.StartWhole }
func (r *runner) lower() bool { return r.sys.Start != transfer.StartOnes }

// combined returns [max lo, max hi] over the runners' best brackets: lower
// ends from the whole system and start whole, upper ends from the whole
// system and start ones.
func combined(runners []*runner) Enclosure {
	var l Enclosure
	bounded := true
	for _, r := range runners {
		if r.upper() && (r.best == nil || r.best.Lambda.Hi == nil) {
			bounded = false
		}
		if r.best == nil {
			continue
		}
		if r.lower() && (l.Lo == nil || r.best.Lambda.Lo.Cmp(l.Lo) > 0) {
			l.Lo = r.best.Lambda.Lo
		}
		if r.upper() && bounded && (l.Hi == nil || r.best.Lambda.Hi.Cmp(l.Hi) > 0) {
			l.Hi = r.best.Lambda.Hi
		}
	}
	if l.Lo == nil {
		l.Lo = new(big.Rat)
	}
	if !bounded {
		l.Hi = nil
	}
	return l
}

// drive advances the runners until the goal is met or a budget stops.
func drive(ctx context.Context, runners []*runner, opts Options, g goal, progress Progress) (*Result, error) {
	start := time.Now()
	if err := checkFirstMemory(runners, opts); err != nil {
		return nil, err
	}
	e := &env{opts: opts, goal: g, progress: progress, combined: func() Enclosure { return combined(runners) }}
	var active *runner
	e.elsewhere = func() int64 {
		var n int64
		for _, r := range runners {
			if r != active {
				n += r.held()
			}
		}
		return n
	}
	stop, detail := StopReason(""), ""
	for stop == "" {
		l := combined(runners)
		if bracketed(runners) && g.met(l) {
			stop = StopTarget
			if _, ok := g.(judgeGoal); ok {
				stop = StopDecided
			}
			break
		}
		active = pick(runners)
		if active == nil {
			stop = StopExact // every block is exact or dominated
			break
		}
		var err error
		if stop, detail, err = active.advance(ctx, e); err != nil {
			return nil, err
		}
		dropDominated(runners, opts.Digests)
	}
	return finish(runners, e, stop, detail, start)
}

// bracketed reports whether every runner has a bracket: before that the
// enclosure is only what holds for every set, [0, inf], and a goal is not
// met by it (a claim below 0 is refuted by the first bracket).
func bracketed(runners []*runner) bool {
	for _, r := range runners {
		if r.best == nil {
			return false
		}
	}
	return true
}

// checkFirstMemory plans the first bracket of every runner and refuses a
// memory budget that cannot hold them, lowering the first n when that
// helps.
func checkFirstMemory(runners []*runner, opts Options) error {
	for above := firstAbove; above >= 0; above-- {
		var need int64
		for _, r := range runners {
			r.next = r.first() + above
			if last, _ := opts.lastN(); last > 0 {
				r.next = max(min(r.next, last), r.first())
			}
			need += r.firstNeed(r.next)
		}
		if opts.MaxMemory == 0 || need <= opts.MaxMemory {
			return nil
		}
		if above == 0 {
			return &BudgetError{Stop: StopMemory, Need: need, msg: fmt.Sprintf("bounds: a first bracket needs %s, over the memory budget of %s; raise it", bytesize.About(need), bytesize.Format(opts.MaxMemory))}
		}
	}
	return nil
}

// pick returns the runner to advance: an unfinished one without a
// bracket, else the unfinished one whose bracket is widest (unbounded
// first).
func pick(runners []*runner) *runner {
	var best *runner
	for _, r := range runners {
		if r.finished {
			continue
		}
		if best == nil || wider(r, best) {
			best = r
		}
	}
	return best
}

// wider orders runners by their brackets' widths, widest first.
func wider(r, s *runner) bool {
	return before(r, s, func(b *Bracket) *big.Rat { return b.Lambda.Width() })
}

// higher orders runners by their upper ends, highest first.
func higher(r, s *runner) bool {
	return before(r, s, func(b *Bracket) *big.Rat { return b.Lambda.Hi })
}

// before reports whether r comes before s: a runner with no bracket yet
// first, then one whose bracket is unbounded above, then by key, largest
// first.
func before(r, s *runner, key func(*Bracket) *big.Rat) bool {
	switch {
	case r.best == nil:
		return s.best != nil
	case s.best == nil:
		return false
	case r.best.Lambda.Hi == nil:
		return s.best.Lambda.Hi != nil
	case s.best.Lambda.Hi == nil:
		return false
	}
	return key(r.best).Cmp(key(s.best)) > 0
}

// dropDominated finishes the runners that cannot change the enclosure any
// more and frees their iterates: a block whose upper end (an estimate of
// its own growth rate from above) is at most the enclosure's lower end
// cannot raise the lower end or set the upper end above it.
func dropDominated(runners []*runner, digests bool) {
	if len(runners) < 2 {
		return
	}
	l := combined(runners)
	for _, r := range runners {
		if r.finished || r.cur == nil || r.best == nil || r.best.Lambda.Hi == nil {
			continue
		}
		if r.best.Lambda.Hi.Cmp(l.Lo) < 0 || (r.upper() && r.best.Lambda.Hi.Cmp(l.Lo) == 0) {
			r.finished = true
			r.release(digests)
		}
	}
}

// finish assembles the result.
func finish(runners []*runner, e *env, stop StopReason, detail string, start time.Time) (*Result, error) {
	res := &Result{Stop: stop, Detail: detail, Need: e.need}
	for _, r := range runners {
		r.digest(e.opts.Digests)
		if r.best != nil {
			res.Brackets = append(res.Brackets, *r.best)
		}
	}
	if len(res.Brackets) == 0 {
		msg := fmt.Sprintf("bounds: stopped (%s) before the first bracket: %s", stop, detail)
		if stop == StopCancelled {
			return nil, errors.New(msg) // an interrupt, not a budget
		}
		return nil, &BudgetError{Stop: stop, msg: msg}
	}
	res.Lambda = combined(runners)
	for _, b := range res.Brackets {
		res.Prec = max(res.Prec, b.Prec)
	}
	res.Radius = res.Lambda.reciprocal(res.Prec)
	if res.Lambda.Finite() {
		res.Digits = interval.CommonDigits(res.Lambda.Lo, res.Lambda.Hi)
	}
	top := runners[0]
	for _, r := range runners {
		if higher(r, top) {
			top = r
		}
	}
	res.Estimates.Rate = top.rate()
	if r := runners[0]; len(runners) == 1 && r.whole {
		b := r.best
		res.Estimates.C = estimateC(b.Sum, b.N, res.Lambda)
		if b.Step == 1 && b.Hi != nil {
			res.Explicit = &AllN{N0: b.N, AN0: b.Sum, MuLo: b.Lambda.Lo, MuHi: b.Lambda.Hi}
		}
	}
	res.Elapsed = time.Since(start)
	return res, nil
}
