package cellbounds

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"runtime"
	"time"

	"avoidcert/internal/bytesize"
	transfer "avoidcert/internal/cellform/transfer"
	"avoidcert/interval"
)

// firstK is the k of the first bracket: cheap, and past the start-up
// transient of most sets.
const firstK = 4

// runner iterates one system (the whole set or one block) and takes its
// brackets on a schedule. Steps consume their input (transfer's Advance,
// recycling storage) except the step from the G_k of a planned bracket,
// which keeps G_k as the base until G_{k+d} is reached.
type runner struct {
	block int
	sys   transfer.System
	eng   *transfer.Engine
	cells []int // the cells scanned
	whole bool  // the system is the whole set: Sum is a count a_n
	d     int

	cur    *transfer.Iterate // the newest iterate
	base   *transfer.Iterate // G_k of the pending bracket, or nil
	spare  *transfer.Iterate // consumed storage for the next output, or nil
	pinned *transfer.Iterate // G_k of best, kept for its digest
	sizes  []int64           // bytes of G_K by K, as far as needed

	next      int // k of the next planned bracket
	evaluated int // k of the newest bracket, -1 before the first
	best      *Bracket
	widths    []widthPoint // finite brackets of positive width
	finished  bool         // exact, or dominated by another block

	stepDur, evalDur time.Duration
	stepFoot         int64 // Footprint of the timed step
	evalBytes        int64 // bytes of G_{k+d} at the timed bracket
}

type widthPoint struct {
	k    int
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
}

func newRunner(block int, sys transfer.System, cells []int, whole bool, d int) *runner {
	eng := transfer.New(sys)
	g0 := eng.Start()
	return &runner{block: block, sys: sys, eng: eng, cells: cells, whole: whole, d: d,
		cur: g0, sizes: []int64{g0.Bytes()}, evaluated: -1, next: firstK}
}

// size returns the bytes of G_K. transfer.Engine.Footprint(K) counts G_K
// twice (the input and its prefix sums) and G_{K+1} once, which gives the
// sizes one after another from G_0.
func (r *runner) size(K int) int64 {
	for len(r.sizes) <= K {
		j := len(r.sizes) - 1
		r.sizes = append(r.sizes, r.eng.Footprint(j)-2*r.sizes[j])
	}
	return r.sizes[K]
}

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

// evalNeed returns the workspace of a bracket at k beyond the iterates.
func (r *runner) evalNeed(k int) int64 {
	ix := transfer.NewIndexer(r.sys.M, k+r.d)
	limbs := r.size(k)/int64(8*r.sys.Cells()*ix.Count(k)) + int64(r.d) + 1
	tasks := int64(len(r.cells)) * int64((ix.Count(k+r.d)+chunk-1)/chunk)
	n := 8 * limbs * (4*tasks + 16*int64(runtime.GOMAXPROCS(0)))
	if r.d > 1 {
		n += 2 * 8 * limbs * int64(r.sys.Cells()) * int64(ix.Count(k+r.d-1))
	}
	return n
}

// baseNeed returns the peak bytes of a bracket with base G_j, reached from
// G_j with nothing else of this runner held but other bytes: the step that
// keeps G_j (G_j, its prefix sums, G_{j+1}), the consuming steps up to
// G_{j+d} with G_j held, and the bracket itself.
func (r *runner) baseNeed(j int, other int64) int64 {
	peak := other + 2*r.size(j) + r.size(j+1)
	for i := 1; i < r.d; i++ {
		peak = max(peak, other+r.size(j)+r.size(j+i)+r.size(j+i+1))
	}
	return max(peak, other+r.size(j)+r.size(j+r.d)+r.evalNeed(j))
}

// firstNeed returns the peak bytes up to the first bracket at k0.
func (r *runner) firstNeed(k0 int) int64 {
	var peak int64
	for K := 0; K < k0; K++ {
		peak = max(peak, r.size(K)+2*r.size(K+1))
	}
	return max(peak, r.baseNeed(k0, 0))
}

// advance steps until the next bracket is taken (and returns "") or a
// budget stops the run (and returns the reason). Near a budget it keeps the
// last iterate from which a bracket can still be finished in time and
// memory, so that a budget stop comes with the newest bracket possible.
func (r *runner) advance(ctx context.Context, e *env) (StopReason, string, error) {
	budget := e.opts.MaxMemory
	for {
		cur := r.cur
		if r.base != nil && cur.K == r.base.K+r.d {
			k := r.base.K
			if need := r.held() + r.evalNeed(k) + e.elsewhere(); budget > 0 && need > budget {
				return StopMemory, fmt.Sprintf("the bracket at k = %d would need about %s, over the memory budget of %s", k, bytesize.Format(need), bytesize.Format(budget)), nil
			}
			if err := r.evaluate(ctx, e); err != nil {
				return stopFor(err)
			}
			return "", "", nil
		}
		K := cur.K
		if r.base == nil {
			// The earliest bracket still possible has base G_K.
			if e.opts.MaxK > 0 && K > e.opts.MaxK {
				return StopMaxK, fmt.Sprintf("reached the largest k allowed (%d)", e.opts.MaxK), nil
			}
			other := e.elsewhere() + r.pinnedExtra()
			if need := r.baseNeed(K, other); budget > 0 && need > budget {
				return StopMemory, fmt.Sprintf("a bracket at k = %d would need about %s, over the memory budget of %s", K, bytesize.Format(need), bytesize.Format(budget)), nil
			}
			if left, ok := timeLeft(ctx); ok && left < r.bracketTime(K) {
				return StopTimeout, fmt.Sprintf("stopped at G_%d: a further bracket would not finish before the deadline", K), nil
			}
			keep := K == r.next
			if !keep && budget > 0 && r.baseNeed(K+1, other) > budget {
				keep = true // the last bracket the memory allows
			}
			if left, ok := timeLeft(ctx); ok && !keep && left < r.stepEstimate(K)+r.bracketTime(K+1) {
				keep = true // the last bracket the deadline allows
			}
			if keep {
				if err := r.step(ctx, e, true); err != nil {
					return stopFor(err)
				}
				continue
			}
		}
		if need := r.held() - bytesOf(r.spare) + max(bytesOf(r.spare), r.size(K+1)) + e.elsewhere(); budget > 0 && need > budget {
			return StopMemory, fmt.Sprintf("the step to G_%d would need about %s, over the memory budget of %s", K+1, bytesize.Format(need), bytesize.Format(budget)), nil
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
	if keep {
		r.spare = nil // let the collector have it: the kept step allocates
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
	r.stepDur, r.stepFoot = time.Since(t0), r.eng.Footprint(cur.K)
	if keep {
		r.base = cur
	} else {
		r.spare = cur
	}
	r.cur = next
	if e.progress != nil {
		e.progress(Event{Block: r.block, K: next.K, NextK: r.next, Lambda: e.combined()})
	}
	return nil
}

// timeLeft returns the time until the context's deadline.
func timeLeft(ctx context.Context) (time.Duration, bool) {
	d, ok := ctx.Deadline()
	return time.Until(d), ok
}

// bracketTime estimates the time to take a bracket with base G_K from G_K:
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

// stepEstimate scales the last step's time to the step from G_K.
func (r *runner) stepEstimate(K int) time.Duration {
	if r.stepFoot == 0 {
		return 0
	}
	return time.Duration(float64(r.stepDur) * float64(r.eng.Footprint(K)) / float64(r.stepFoot))
}

// evalEstimate scales the last bracket's time to one whose G_{k+d} is G_K.
func (r *runner) evalEstimate(K int) time.Duration {
	if r.evalBytes == 0 {
		return 2 * r.stepEstimate(K)
	}
	return time.Duration(float64(r.evalDur) * float64(r.size(K)) / float64(r.evalBytes))
}

// evaluate takes the bracket at k = cur.K - d.
func (r *runner) evaluate(ctx context.Context, e *env) error {
	cur, gk := r.cur, r.base
	t0 := time.Now()
	res, err := extremes(ctx, ratioProblem{m: r.sys.M, k: gk.K, d: r.d, cells: r.cells, num: cur, base: gk, numLimbs: cur.Limbs, baseLimbs: gk.Limbs})
	if err != nil {
		return err
	}
	r.evalDur, r.evalBytes = time.Since(t0), cur.Bytes()
	b := Bracket{Cells: r.cells, M: r.sys.M, K: gk.K, Step: r.d, Lo: res.lo, Hi: res.hi, Sum: gk.Sum()}
	b.Prec = e.goal.prec(res.hi)
	b.Lambda = lambdaOf(res.lo, res.hi, r.d, b.Prec)
	r.evaluated = gk.K
	if w := b.Lambda.Width(); w != nil && w.Sign() > 0 {
		r.widths = append(r.widths, widthPoint{k: gk.K, log2: log2Rat(w)})
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
		e.progress(Event{Block: r.block, K: cur.K, Bracket: &b, NextK: r.next, Lambda: e.combined()})
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
// width predicts the goal is reached, but no further than about twice the
// current k (predictions from small k are rough), and 1.5 times the
// current k while no decay has been seen.
func (r *runner) plan(e *env) int {
	k := r.evaluated
	next := max(k+1, int(math.Ceil(1.5*float64(k))))
	if n := len(r.widths); n >= 2 {
		p, q := r.widths[n-2], r.widths[n-1]
		if q.k == k && q.k > p.k {
			rate := (q.log2 - p.log2) / float64(q.k-p.k)
			if rate < -1e-3 {
				steps := math.Ceil((e.goal.targetLog2(e.combined()) - q.log2) / rate)
				next = k + int(min(max(steps, 1), float64(k+4)))
			}
		}
	}
	if e.opts.MaxK > 0 {
		next = min(next, e.opts.MaxK)
	}
	return max(next, k+r.d) // the base of a bracket is at or after G_{k+d}
}

// rate returns the observed width decay per unit of k (estimate).
func (r *runner) rate() float64 {
	n := len(r.widths)
	if n < 2 {
		return 0
	}
	p, q := r.widths[n-2], r.widths[n-1]
	return math.Exp2((q.log2 - p.log2) / float64(q.k-p.k))
}

// digest fills in the digest of the best bracket's G_k, if wanted, and
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
