package cellbounds

import (
	"context"
	"fmt"
	"math/big"
	"time"

	"avoidcert/internal/bytesize"
	transfer "avoidcert/internal/cellform/transfer"
	"avoidcert/interval"
)

// Event reports progress: after every step and after every bracket.
type Event struct {
	Block   int      // the block stepped (0 for Run)
	K       int      // the degree of that block's newest iterate
	Bracket *Bracket // the bracket just taken, or nil after a plain step
	NextK   int      // the k planned for that block's next bracket
	// Lambda is the certified enclosure so far (Lo 0 and Hi nil before
	// every block has a bracket).
	Lambda Enclosure
}

// Progress receives events; it is called from the goroutine running the
// bracket search and must not block for long.
type Progress func(Event)

// Run brackets the growth rate of the system (usually transfer.FromSet of a
// pattern set) until the target in opts is met or a budget stops it. A
// budget stop is not an error: the result then holds the best certified
// bracket found and says why it stopped. Errors are bad options, a memory
// budget too small for even the first bracket, and a stop before any
// bracket was taken.
func Run(ctx context.Context, sys transfer.System, opts Options, progress Progress) (*Result, error) {
	if err := opts.validate(true); err != nil {
		return nil, err
	}
	return drive(ctx, []*runner{wholeRunner(sys, opts)}, opts, targetGoal{opts.Digits, opts.Width}, progress)
}

// RunBlocks brackets each block's restricted system (System.Restrict,
// start vector 1 on the block's cells) and reports lambda in
// [max lo_C, max hi_C] (method note, section 5b).
//
// The blocks must partition the cells, and no cycle of allowed windows may
// pass through two blocks (so T is block-triangular; the strongly
// connected components of the window digraph qualify). RunBlocks checks
// both, and that the start vector is 1 on every cell with an allowed window
// (true for every system from transfer.FromSet). Then:
//   - lower end: T >= T_C (dropping windows drops nonnegative terms) and
//     g0 >= 1 on the cells of C that have windows, so a_n/n! grows at least
//     like T_C^n 1_C, hence lambda >= lo_C for every C;
//   - upper end: a bracket of C bounds T_C^(dj) g_{C,k} <= hi_C^j g_{C,k}
//     pointwise, so T_C^n f grows at most like hi_C^(n/d) for every bounded
//     f >= 0 on C; T^n g0 is a finite sum over the block paths of such
//     terms, hence lambda <= max hi_C.
//
// Blocks whose upper end falls below another block's lower end stop
// early; the others are advanced largest upper end first.
func RunBlocks(ctx context.Context, sys transfer.System, blocks [][]int, opts Options, progress Progress) (*Result, error) {
	if err := opts.validate(true); err != nil {
		return nil, err
	}
	runners, err := blockRunners(sys, blocks, opts)
	if err != nil {
		return nil, err
	}
	return drive(ctx, runners, opts, targetGoal{opts.Digits, opts.Width}, progress)
}

func wholeRunner(sys transfer.System, opts Options) *runner {
	cells := make([]int, sys.Cells())
	for c := range cells {
		cells[c] = c
	}
	return newRunner(0, sys, cells, true, opts.step())
}

func blockRunners(sys transfer.System, blocks [][]int, opts Options) ([]*runner, error) {
	if blocks == nil {
		return []*runner{wholeRunner(sys, opts)}, nil
	}
	if err := checkBlocks(sys, blocks); err != nil {
		return nil, err
	}
	runners := make([]*runner, len(blocks))
	for i, b := range blocks {
		mask := make([]bool, sys.Cells())
		for _, c := range b {
			mask[c] = true
		}
		runners[i] = newRunner(i, sys.Restrict(mask), append([]int(nil), b...), false, opts.step())
	}
	return runners, nil
}

// checkBlocks verifies what RunBlocks's bound rests on.
func checkBlocks(sys transfer.System, blocks [][]int) error {
	cells := sys.Cells()
	if len(blocks) == 0 {
		return fmt.Errorf("bounds: no blocks given; pass the strongly connected components of the window digraph, or use Run")
	}
	blockOf := make([]int, cells)
	for c := range blockOf {
		blockOf[c] = -1
	}
	for i, b := range blocks {
		if len(b) == 0 {
			return fmt.Errorf("bounds: block %d is empty", i)
		}
		for _, c := range b {
			if c < 0 || c >= cells {
				return fmt.Errorf("bounds: block %d names cell %d, outside 0..%d", i, c, cells-1)
			}
			if blockOf[c] >= 0 {
				return fmt.Errorf("bounds: cell %d is in blocks %d and %d; blocks must partition the cells", c, blockOf[c], i)
			}
			blockOf[c] = i
		}
	}
	for c, b := range blockOf {
		if b < 0 {
			return fmt.Errorf("bounds: cell %d is in no block; blocks must partition the cells", c)
		}
	}
	// Edges between blocks must form an acyclic graph.
	succ := make([]map[int]bool, len(blocks))
	for i := range succ {
		succ[i] = map[int]bool{}
	}
	for w, ok := range sys.Allowed {
		if !ok {
			continue
		}
		from, to := sys.Ends(w)
		if !sys.Start[from] {
			return fmt.Errorf("bounds: the start vector is 0 on cell %d although a window leaves it; RunBlocks needs a system from transfer.FromSet", from)
		}
		if blockOf[from] != blockOf[to] {
			succ[blockOf[from]][blockOf[to]] = true
		}
	}
	state := make([]int, len(blocks)) // 0 new, 1 on the path, 2 done
	var visit func(int) error
	visit = func(b int) error {
		state[b] = 1
		for c := range succ[b] {
			switch state[c] {
			case 1:
				return fmt.Errorf("bounds: windows form a cycle through blocks %d and %d; blocks must be unions of strongly connected components in which no cycle crosses blocks", b, c)
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

// combined returns [max lo_C, max hi_C] over the runners' best brackets.
func combined(runners []*runner) Enclosure {
	var l Enclosure
	bounded := true
	for _, r := range runners {
		if r.best == nil || r.best.Lambda.Hi == nil {
			bounded = false
		}
		if r.best == nil {
			continue
		}
		if l.Lo == nil || r.best.Lambda.Lo.Cmp(l.Lo) > 0 {
			l.Lo = r.best.Lambda.Lo
		}
		if bounded && (l.Hi == nil || r.best.Lambda.Hi.Cmp(l.Hi) > 0) {
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
		if g.met(l) {
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

// checkFirstMemory refuses a memory budget that cannot hold the first
// bracket of every block, and lowers the first k when that helps.
func checkFirstMemory(runners []*runner, opts Options) error {
	k0 := firstK
	if opts.MaxK > 0 {
		k0 = min(k0, opts.MaxK)
	}
	for _, r := range runners {
		r.next = k0
	}
	if opts.MaxMemory == 0 {
		return nil
	}
	for ; k0 >= 0; k0-- {
		var need int64
		for _, r := range runners {
			need += r.firstNeed(k0)
		}
		if need <= opts.MaxMemory {
			for _, r := range runners {
				r.next = k0
			}
			return nil
		}
		if k0 == 0 {
			return fmt.Errorf("bounds: the memory budget of %s is below the %s needed for a first bracket (k = 0); raise it", bytesize.Format(opts.MaxMemory), bytesize.Format(need))
		}
	}
	return nil
}

// pick returns the runner to advance: the unfinished one with the largest
// upper end (unbounded first, then no bracket yet).
func pick(runners []*runner) *runner {
	var best *runner
	for _, r := range runners {
		if r.finished {
			continue
		}
		if best == nil || higher(r, best) {
			best = r
		}
	}
	return best
}

func higher(r, s *runner) bool {
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
	return r.best.Lambda.Hi.Cmp(s.best.Lambda.Hi) > 0
}

// dropDominated finishes the blocks whose upper end is at most another
// block's lower end (they cannot change the enclosure) and frees the
// iterates of every finished block. Two blocks can only dominate each other
// when both brackets are the same single point.
func dropDominated(runners []*runner, digests bool) {
	for _, r := range runners {
		if r.cur == nil || r.best == nil || r.best.Lambda.Hi == nil {
			continue
		}
		for _, s := range runners {
			if s != r && s.best != nil && r.best.Lambda.Hi.Cmp(s.best.Lambda.Lo) <= 0 {
				r.finished = true
			}
		}
		if r.finished {
			r.release(digests)
		}
	}
}

// finish assembles the result.
func finish(runners []*runner, e *env, stop StopReason, detail string, start time.Time) (*Result, error) {
	res := &Result{Stop: stop, Detail: detail}
	for _, r := range runners {
		r.digest(e.opts.Digests)
		if r.best != nil {
			res.Brackets = append(res.Brackets, *r.best)
		}
	}
	if len(res.Brackets) == 0 {
		return nil, fmt.Errorf("bounds: stopped (%s) before the first bracket: %s", stop, detail)
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
		res.Estimates.C = estimateC(b.Sum, b.N0(), res.Lambda)
		if b.Step == 1 && b.Hi != nil {
			res.Explicit = &AllN{N0: b.N0(), AN0: b.Sum, MuLo: b.Lambda.Lo, MuHi: b.Lambda.Hi}
		}
	}
	res.Elapsed = time.Since(start)
	return res, nil
}
