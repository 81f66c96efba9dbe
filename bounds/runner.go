package bounds

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"runtime"
	"time"

	"avoidcert/internal/bytesize"
	"avoidcert/internal/memory"
	"avoidcert/interval"
	"avoidcert/transfer"
)

// firstAbove is how far above the system's start (and its longest state)
// the first bracket is taken: cheap, and past the start-up transient of
// most sets.
const firstAbove = 4

// runner iterates one system (the whole set or one block) and takes its
// brackets on a schedule. Steps consume their input (transfer's Advance,
// recycling storage) except the step from the G_n of a planned bracket,
// which keeps G_n as the base until G_(n+d) is reached.
type runner struct {
	block int
	sys   transfer.System
	eng   *transfer.Engine
	whole bool // the system is the whole set: Sum is a count a_n
	d     int

	cur    *transfer.Iterate // the newest iterate
	base   *transfer.Iterate // G_n of the pending bracket, or nil
	spare  *transfer.Iterate // storage to recycle for the next output, or nil
	pinned *transfer.Iterate // G_n of best, kept for its digest

	next      int // n of the next planned bracket
	evaluated int // n of the newest bracket, -1 before the first
	best      *Bracket
	widths    []widthPoint // finite brackets of positive width
	finished  bool         // exact, or dominated by another block

	stepDur, evalDur time.Duration
	stepFoot         int64 // Footprint of the timed step
	evalBytes        int64 // bytes of G_(n+d) at the timed bracket
}

type widthPoint struct {
	n    int
	log2 float64 // log2 of the width of the lambda enclosure
}

// env is what a runner needs from the run around it.
type env struct {
	opts     Options
	goal     goal
	progress Progress
	// combined returns the current enclosure of lambda over all blocks.
	combined func() Enclosure
	// elsewhere returns the bytes held by the other blocks.
	elsewhere func() int64
	// need is what a step or bracket refused for memory would have needed.
	need int64
}

func newRunner(ctx context.Context, block int, sys transfer.System, d int) (*runner, error) {
	eng := transfer.New(sys)
	g0, err := eng.Start(ctx)
	if err != nil {
		return nil, err
	}
	r := &runner{block: block, sys: sys, eng: eng, whole: sys.IsWhole(), d: d, cur: g0, evaluated: -1}
	r.next = r.first()
	return r, nil
}

// first returns the earliest n a bracket may be taken at: the system's
// start, and no state longer than n.
func (r *runner) first() int {
	n := r.sys.StartN()
	for _, p := range r.sys.Members {
		n = max(n, r.sys.States.Length(p))
	}
	return n
}

// size returns the bytes of G_n.
func (r *runner) size(n int) int64 { return r.eng.IterateBytes(n) }

func bytesOf(g *transfer.Iterate) int64 {
	if g == nil {
		return 0
	}
	return g.Bytes()
}

// held returns the bytes this runner keeps alive.
func (r *runner) held() int64 {
	n := bytesOf(r.cur) + bytesOf(r.base) + bytesOf(r.spare)
	if r.pinned != r.base {
		n += bytesOf(r.pinned)
	}
	return n
}

// pinnedExtra returns the bytes of the pinned iterate when it is not the
// base.
func (r *runner) pinnedExtra() int64 {
	if r.pinned == r.base {
		return 0
	}
	return bytesOf(r.pinned)
}

// evalNeed returns the workspace of a bracket at n beyond the iterates:
// the tallies and scratch of the tasks, and for d > 1 two raised tables.
func (r *runner) evalNeed(n int) int64 {
	limbs := int64(r.eng.Limbs(n+r.d)) + int64(r.d) + 1
	tasks := r.size(n+r.d)/(8*int64(r.eng.Limbs(n+r.d))*chunk) + int64(len(r.sys.Members))
	need := 8 * limbs * (4*tasks + 16*int64(runtime.GOMAXPROCS(0)))
	if r.d > 1 {
		need += 2 * r.size(n+r.d-1) * limbs / int64(r.eng.Limbs(n+r.d-1))
	}
	return need
}

// baseNeed returns the peak bytes of a bracket with base G_j, reached from
// G_j with nothing else of this runner held but other bytes: the step that
// keeps G_j, the steps up to G_(j+d) with G_j held, and the bracket itself.
func (r *runner) baseNeed(j int, other int64) int64 {
	peak := other + r.eng.Footprint(j)
	for i := 1; i < r.d; i++ {
		peak = max(peak, other+r.size(j)+r.eng.Footprint(j+i))
	}
	return max(peak, other+r.size(j)+r.size(j+r.d)+r.evalNeed(j))
}

// firstNeed returns the peak bytes up to the first bracket at n0.
func (r *runner) firstNeed(n0 int) int64 { return r.needFrom(r.cur.N, n0) }

// needFrom returns the peak bytes of stepping from G_from to a bracket at
// n0.
func (r *runner) needFrom(from, n0 int) int64 {
	var peak int64
	for n := from; n < n0; n++ {
		peak = max(peak, r.eng.Footprint(n))
	}
	return max(peak, r.baseNeed(n0, 0))
}

// stepNeed returns the peak bytes of a plain step from the current
// iterate, with other bytes held elsewhere: the step's Footprint (the
// current iterate, the next one in the recycled storage or new, the
// step's scratch) and what this runner holds besides.
func (r *runner) stepNeed(other int64) int64 {
	return other + r.held() - bytesOf(r.cur) - bytesOf(r.spare) + r.eng.Footprint(r.cur.N)
}

// advance steps until the next bracket is taken (and returns "") or a
// budget stops the run (and returns the reason). Near a budget it keeps the
// last iterate from which a bracket can still be finished in time and
// memory, so that a budget stop comes with the newest bracket possible.
func (r *runner) advance(ctx context.Context, e *env) (StopReason, string, error) {
	budget := e.opts.MaxMemory
	for {
		cur := r.cur
		if r.base != nil && cur.N == r.base.N+r.d {
			k := r.base.N
			need := r.held() + r.evalNeed(k) + e.elsewhere()
			if budget > 0 && need > budget {
				e.need = need
				return StopMemory, fmt.Sprintf("the bracket at n = %d would need %s, over the memory budget of %s", k, bytesize.About(need), bytesize.Format(budget)), nil
			}
			memory.Collect(need)
			if err := r.evaluate(ctx, e); err != nil {
				return stopFor(err)
			}
			return "", "", nil
		}
		K := cur.N
		if r.base == nil {
			// The earliest bracket still possible has base G_n.
			if last, why := e.opts.lastN(); last > 0 && K > last {
				return why, fmt.Sprintf("no bracket past n = %d", last), nil
			}
			other := e.elsewhere() + r.pinnedExtra()
			if need := r.baseNeed(K, other); budget > 0 && need > budget {
				e.need = need
				return StopMemory, fmt.Sprintf("a bracket at n = %d would need %s, over the memory budget of %s", K, bytesize.About(need), bytesize.Format(budget)), nil
			}
			if left, ok := timeLeft(ctx); ok && left < r.bracketTime(K)+e.opts.reserve(K) {
				return StopTimeout, fmt.Sprintf("stopped at G_%d: a further bracket would not finish before the deadline", K), nil
			}
			keep := K == r.next
			early := K < r.first() // no bracket has its base below the system's longest state
			if !keep && !early && budget > 0 && r.baseNeed(K+1, other) > budget {
				keep = true // the last bracket the memory allows
			}
			if left, ok := timeLeft(ctx); ok && !keep && !early && left < r.stepEstimate(K)+r.bracketTime(K+1)+e.opts.reserve(K+1) {
				keep = true // the last bracket the deadline allows
			}
			if keep {
				if err := r.step(ctx, e, true); err != nil {
					return stopFor(err)
				}
				continue
			}
		}
		if need := r.stepNeed(e.elsewhere()); budget > 0 && need > budget {
			e.need = need
			return StopMemory, fmt.Sprintf("the step to G_%d would need %s, over the memory budget of %s", K+1, bytesize.About(need), bytesize.Format(budget)), nil
		}
		if err := r.step(ctx, e, false); err != nil {
			return stopFor(err)
		}
	}
}

// step computes the next iterate; keep makes the current one the base.
func (r *runner) step(ctx context.Context, e *env, keep bool) error {
	cur := r.cur
	t0 := time.Now()
	var next *transfer.Iterate
	var err error
	if keep || !r.eng.Recycles(r.spare, cur.N+1) {
		r.spare = nil // let the collector have it: the step allocates
	}
	memory.Collect(r.stepNeed(e.elsewhere()))
	if keep {
		next, err = r.eng.Next(ctx, cur)
	} else {
		next, err = r.eng.Advance(ctx, cur, r.spare)
	}
	if err != nil {
		if !keep {
			r.cur = nil // consumed
		}
		return err
	}
	r.stepDur, r.stepFoot = time.Since(t0), r.eng.Footprint(cur.N)
	if keep {
		r.base = cur
	} else {
		r.spare = cur
	}
	r.cur = next
	if e.progress != nil {
		e.progress(Event{Block: r.block, N: next.N, NextN: r.next, Lambda: e.combined()})
	}
	return nil
}

// timeLeft returns the time until the context's deadline.
func timeLeft(ctx context.Context) (time.Duration, bool) {
	d, ok := ctx.Deadline()
	return time.Until(d), ok
}

// bracketTime estimates the time to take a bracket with base G_n from G_n:
// d steps and the bracket.
func (r *runner) bracketTime(K int) time.Duration {
	var t time.Duration
	for i := range r.d {
		t += r.stepEstimate(K + i)
	}
	return t + r.evalEstimate(K+r.d)
}

// stopFor turns a context error into a stop reason.
func stopFor(err error) (StopReason, string, error) {
	switch {
	case errors.Is(err, context.DeadlineExceeded):
		return StopTimeout, "the deadline passed during a step", nil
	case errors.Is(err, context.Canceled):
		return StopCancelled, "the run was cancelled", nil
	}
	return "", "", err
}

// stepEstimate scales the last step's time to the step from G_n.
func (r *runner) stepEstimate(K int) time.Duration {
	if r.stepFoot == 0 {
		return 0
	}
	return time.Duration(float64(r.stepDur) * float64(r.eng.Footprint(K)) / float64(r.stepFoot))
}

// evalEstimate scales the last bracket's time to one whose G_(n+d) is G_n.
func (r *runner) evalEstimate(K int) time.Duration {
	if r.evalBytes == 0 {
		return 2 * r.stepEstimate(K)
	}
	return time.Duration(float64(r.evalDur) * float64(r.size(K)) / float64(r.evalBytes))
}

// evaluate takes the bracket at k = cur.N - d.
func (r *runner) evaluate(ctx context.Context, e *env) error {
	cur, gk := r.cur, r.base
	t0 := time.Now()
	res, err := extremes(ctx, ratioProblem{st: r.sys.States, n: gk.N, d: r.d, states: r.sys.Members, num: cur, base: gk, numLimbs: cur.Limbs, baseLimbs: gk.Limbs})
	if err != nil {
		return err
	}
	r.evalDur, r.evalBytes = time.Since(t0), cur.Bytes()
	b := Bracket{States: r.sys.Members, Start: r.sys.Start, Step: r.d, N: gk.N, Lo: res.lo, Hi: res.hi,
		Upper: r.sys.Start != transfer.StartWhole, Sum: gk.Sum()}
	b.Prec = e.goal.prec(res.hi)
	b.Lambda = lambdaOf(res.lo, res.hi, r.d, b.Prec)
	r.evaluated = gk.N
	if w := b.Lambda.Width(); w != nil && w.Sign() > 0 {
		r.widths = append(r.widths, widthPoint{n: gk.N, log2: log2Rat(w)})
	}
	if better(&b, r.best) {
		r.best = &b
		if e.opts.Digests {
			r.pinned = gk
		}
	}
	r.base = nil
	if r.pinned != gk && bytesOf(gk) > bytesOf(r.spare) {
		r.spare = gk
	}
	if res.hi != nil && res.lo.Cmp(res.hi) == 0 {
		r.finished = true
	}
	r.next = r.plan(e)
	if e.progress != nil {
		e.progress(Event{Block: r.block, N: cur.N, Bracket: &b, NextN: r.next, Lambda: e.combined()})
	}
	return nil
}

// lambdaOf returns the enclosure of lambda from a bracket [lo, hi] of
// lambda^d, rounded outward to prec bits.
func lambdaOf(lo, hi *big.Rat, d int, prec uint) Enclosure {
	var l Enclosure
	if d == 1 {
		l.Lo = interval.RoundDown(lo, prec)
		if hi != nil {
			l.Hi = interval.RoundUp(hi, prec)
		}
		return l
	}
	l.Lo = interval.RootDown(lo, d, prec)
	if hi != nil {
		l.Hi = interval.RootUp(hi, d, prec)
	}
	return l
}

// better reports whether bracket b improves on best: finite beats
// unbounded, then the narrower wins (the newer on a tie); among unbounded
// ones the higher lower end wins.
func better(b, best *Bracket) bool {
	switch {
	case best == nil:
		return true
	case b.Hi == nil:
		return best.Hi == nil && b.Lambda.Lo.Cmp(best.Lambda.Lo) >= 0
	case best.Hi == nil:
		return true
	}
	return b.Lambda.Width().Cmp(best.Lambda.Width()) <= 0
}

// plan returns the k of the next bracket: where the observed decay of the
// width predicts the goal is reached, but no further than 1.5 times the
// current k, which is also the step while no decay has been seen.
// Predictions from small k are rough: single patterns of length 8 often
// show almost no decay between their first brackets (a transient), and a
// prediction from it overshoots by far (36582714 at 10 digits went from
// n = 25 to n = 46, 8 GB and 20 digits, where n = 26 gives 11), while a
// bracket costs about two steps.
func (r *runner) plan(e *env) int {
	// k counts the steps above the first possible bracket, as n - m did
	// in the cell form.
	origin := r.first()
	k := r.evaluated - origin
	next := max(k+1, int(math.Ceil(1.5*float64(k))))
	if w := len(r.widths); w >= 2 {
		p, q := r.widths[w-2], r.widths[w-1]
		if q.n == r.evaluated && q.n > p.n {
			rate := (q.log2 - p.log2) / float64(q.n-p.n)
			if rate < -1e-3 {
				steps := math.Ceil((e.goal.targetLog2(e.combined()) - q.log2) / rate)
				next = k + int(min(max(steps, 1), float64(max(k/2, 2))))
			}
		}
	}
	next += origin
	if last, _ := e.opts.lastN(); last > 0 {
		next = min(next, last)
	}
	return max(next, r.evaluated+r.d) // the base of a bracket is at or after G_(n+d)
}

// rate returns the observed width decay per unit of k (estimate).
func (r *runner) rate() float64 {
	n := len(r.widths)
	if n < 2 {
		return 0
	}
	p, q := r.widths[n-2], r.widths[n-1]
	return math.Exp2((q.log2 - p.log2) / float64(q.n-p.n))
}

// digest fills in the digest of the best bracket's G_n, if wanted, and
// releases it.
func (r *runner) digest(wanted bool) {
	if wanted && r.best != nil && r.pinned != nil {
		r.best.Digest = r.pinned.Digest()
	}
	r.pinned = nil
}

// release drops all iterates of a runner that will not step again.
func (r *runner) release(digests bool) {
	r.digest(digests)
	r.cur, r.base, r.spare = nil, nil, nil
}
