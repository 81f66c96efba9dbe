package certify

import (
	"context"
	"fmt"
	"math/big"
	"runtime"
	"runtime/debug"
	"sync"
	"sync/atomic"
)

// This file re-runs every bracket's system and checks each bracket's
// digest and inequalities against it, after estimating the work and
// memory that takes.

// stepWork is the estimated work of one step G_n -> G_(n+1) of sys: per
// move into a state, the entries it reads and writes, once more for every
// dropped value (each drop is one pass over a table).
func stepWork(sys *system, n int) float64 {
	w := 0.0
	for q, moves := range sys.inbound {
		Lq := len(sys.sp.states[q])
		if Lq > n+1 {
			continue
		}
		out := float64(sys.bin.count(Lq+1, n+1-Lq))
		for _, mv := range moves {
			Lp := len(sys.sp.states[mv.from])
			if Lp > n {
				continue
			}
			w += (float64(sys.bin.count(Lp+1, n-Lp)) + out) * float64(1+len(mv.drops))
		}
	}
	return w
}

// coefficients returns the number of coefficients of an iterate of sys at n.
func coefficients(sys *system, n int) float64 {
	c := 0.0
	for p, ok := range sys.in {
		if L := len(sys.sp.states[p]); ok && L <= n {
			c += float64(sys.bin.count(L+1, n-L))
		}
	}
	return c
}

// bracketWork is the estimated work of checking bracket b on sys once its
// iterates exist: the digest of G_N, d elevations (one multiply-add per
// part of each entry), and two comparisons per entry of degree N+d,
// weighted by the length of the bounds.
func (ck *checker) bracketWork(sys *system, b Bracket) float64 {
	w := coefficients(sys, b.N)
	for j := 1; j <= b.Step; j++ {
		w += float64(ck.sp.maxLen+1) * coefficients(sys, b.N+j)
	}
	digits := len(formatRational(b.Lo))
	if b.Hi != nil {
		digits += len(formatRational(b.Hi))
	}
	return w + 2*coefficients(sys, b.N+b.Step)*(1+float64(digits)/64)
}

// limits estimates the recomputation's work and memory and refuses it
// above the options' limits; it sets ck.total for the progress reports.
func (ck *checker) limits() error {
	work, memory := ck.cost()
	ck.total = work
	if work > float64(ck.opts.MaxWork) {
		return &LimitError{Resource: "work", Need: work, Limit: float64(ck.opts.MaxWork)}
	}
	if memory > float64(ck.opts.MaxMemory) {
		return &LimitError{Resource: "memory", Need: memory, Limit: float64(ck.opts.MaxMemory)}
	}
	return nil
}

// cost estimates the recomputation's work and memory (see limits).
func (ck *checker) cost() (work, memory float64) {
	for _, gr := range ck.groups() {
		sys := newSystem(ck.sp, gr.states, gr.top)
		from := ck.startN(ck.c.Evidence.Brackets[gr.brackets[0]])
		if gr.start == StartWhole {
			whole := newSystem(ck.sp, nil, from)
			for n := 0; n < from; n++ {
				work += stepWork(whole, n)
			}
		}
		peak := 0.0
		for n := from; n < gr.top; n++ {
			work += stepWork(sys, n)
			peak = max(peak, coefficients(sys, n)+coefficients(sys, n+1))
		}
		widest := 0.0 // the largest temporary table (system.dropMove: a first merge of the source); a goroutine holds about two
		for q, moves := range sys.inbound {
			for _, mv := range moves {
				Lp := len(ck.sp.states[mv.from])
				adjacent := len(mv.drops) == 1 && (mv.drops[0] == mv.gap || mv.drops[0] == mv.gap+2)
				if Lp <= gr.top && len(mv.drops) > 0 && !adjacent && len(ck.sp.states[q]) > 1 {
					widest = max(widest, float64(sys.bin.count(Lp, gr.top+1-Lp)))
				}
			}
		}
		pending := 0.0 // the elevations waiting for their G_(N+d)
		for _, i := range gr.brackets {
			b := ck.c.Evidence.Brackets[i]
			work += ck.bracketWork(sys, b)
			pending += coefficients(sys, b.N+b.Step)
		}
		bytes := 8 * float64(wordsFor(gr.top)) // one coefficient
		live := (peak + pending + 2*widest*float64(runtime.GOMAXPROCS(0))) * bytes
		// the garbage collector lets the heap grow to twice the live data
		// (GOGC = 100) before it collects the iterates of past steps
		memory = max(memory, 2*live)
	}
	// the structure section is verified first, on its own memory
	sw, sm := ck.structureCost()
	return work + sw, max(memory, sm)
}

// progress adds work units to the progress and reports it.
func (ck *checker) progress(units float64) {
	ck.done = min(ck.done+units, ck.total)
	if ck.opts.Progress != nil {
		ck.opts.Progress(int64(ck.done), int64(ck.total))
	}
}

// run iterates sys from g up to n = to, reporting progress per step.
func (ck *checker) run(ctx context.Context, sys *system, g *iterate, to int, visit func(g *iterate) error) error {
	for {
		if err := visit(g); err != nil {
			return err
		}
		if g.n == to {
			return nil
		}
		next, err := sys.next(ctx, g)
		if err != nil {
			return err
		}
		ck.progress(stepWork(sys, g.n))
		g = next
	}
}

// recompute runs every system's iteration and checks each bracket against
// it.
func (ck *checker) recompute(ctx context.Context) error {
	brackets := ck.c.Evidence.Brackets
	for _, gr := range ck.groups() {
		sys := newSystem(ck.sp, gr.states, gr.top)
		from := ck.startN(brackets[gr.brackets[0]])
		var g *iterate
		switch gr.start {
		case StartEmpty:
			g = sys.emptyStart()
		case StartOnes:
			g = sys.onesStart(from)
		case StartWhole:
			whole := newSystem(ck.sp, nil, from)
			err := ck.run(ctx, whole, whole.emptyStart(), from, func(w *iterate) error {
				g = w
				return nil
			})
			if err != nil {
				return err
			}
			g = sys.restrict(g)
		}
		pending := map[int]*iterate{} // bracket -> elevated G_N, waiting for G_(N+d)
		err := ck.run(ctx, sys, g, gr.top, func(g *iterate) error {
			for _, i := range gr.brackets {
				b := brackets[i]
				if b.N+b.Step == g.n {
					if err := ck.compare(ctx, i, pending[i], g); err != nil {
						return err
					}
					delete(pending, i)
					ck.progress(ck.bracketWork(sys, b))
				}
				if b.N != g.n {
					continue
				}
				if sys.digest(g) != b.IterateDigest {
					return fmt.Errorf("%s: iterate_sha256 does not match the recomputed G_%d", ck.describe(i), b.N)
				}
				if b.Lo.Sign() > 0 && g.isZero() {
					return fmt.Errorf("%s: lo > 0 but G_%d is zero, so it bounds nothing", ck.describe(i), b.N)
				}
				if i == ck.allN {
					if s := g.sum(); s.Cmp(ck.c.Statement.AllN.AN0) != 0 {
						return fmt.Errorf("statement.all_n.a_n0: %s is not a_%d = %s, the sum of G_%d", abbreviate(ck.c.Statement.AllN.AN0.String()), b.N, abbreviate(s.String()), b.N)
					}
				}
				h, err := sys.elevated(ctx, g, b.Step)
				if err != nil {
					return err
				}
				pending[i] = h
			}
			return nil
		})
		if err != nil {
			return err
		}
	}
	return nil
}

// elevated returns the d-fold integer elevation of every table of g.
func (sys *system) elevated(ctx context.Context, g *iterate, d int) (*iterate, error) {
	out := &iterate{n: g.n + d, tables: make([]*table, len(g.tables))}
	err := eachState(ctx, runtime.GOMAXPROCS(0), len(g.tables), func(_, p int) error {
		if t := g.tables[p]; t != nil {
			for range d {
				t = sys.bin.elevate(t, wordsFor(g.n+d))
			}
			out.tables[p] = t
		}
		return nil
	})
	return out, err
}

// compare checks lo*H[a] <= N[a] <= hi*H[a] at every state of the system
// and every composition a of degree N+d-|p|, H the elevated G_N and N the
// iterate G_(N+d).
func (ck *checker) compare(ctx context.Context, i int, h, n *iterate) error {
	b := ck.c.Evidence.Brackets[i]
	return eachState(ctx, runtime.GOMAXPROCS(0), len(n.tables), func(_, p int) error {
		num, den := n.tables[p], h.tables[p]
		if num == nil {
			return nil
		}
		if den == nil { // unreachable: statement requires N >= the longest state
			return fmt.Errorf("%s: state %d has no coefficients at n = %d", ck.describe(i), p, b.N)
		}
		var left, right big.Int
		for r := range num.size() {
			N, H := toBig(num.at(r)), toBig(den.at(r))
			// lo <= N/H:  lo.num * H <= lo.den * N
			left.Mul(b.Lo.Num(), H)
			right.Mul(b.Lo.Denom(), N)
			if left.Cmp(&right) > 0 {
				return fmt.Errorf("%s: lo is above the ratio G_%d/elevated G_%d = %s/%s at state %d, index %v", ck.describe(i), n.n, b.N, abbreviate(N.String()), abbreviate(H.String()), p, ck.composition(num, r))
			}
			if b.Hi == nil {
				continue
			}
			// N/H <= hi:  N * hi.den <= hi.num * H
			left.Mul(N, b.Hi.Denom())
			right.Mul(b.Hi.Num(), H)
			switch {
			case left.Cmp(&right) <= 0:
			case H.Sign() == 0:
				// Not reached from a certificate that passed statement
				// (N at least every state's length): a sequence counted at
				// (p, a) in G_(N+1), less its oldest value (an old value of
				// some gap j, or for start ones one of the start's values),
				// is counted at (p, a - e_j) in G_N, so H[a] > 0. Kept for
				// its message; compare_internal_test.go reaches it directly.
				return fmt.Errorf("%s: G_%d is positive where the elevated G_%d is 0 (state %d, index %v), so hi must be infinite", ck.describe(i), n.n, b.N, p, ck.composition(num, r))
			default:
				return fmt.Errorf("%s: hi is below the ratio G_%d/elevated G_%d = %s/%s at state %d, index %v", ck.describe(i), n.n, b.N, abbreviate(N.String()), abbreviate(H.String()), p, ck.composition(num, r))
			}
		}
		return nil
	})
}

// composition returns the composition of rank r of a table, for messages.
func (ck *checker) composition(t *table, r int) []int {
	a := make([]int, t.parts)
	firstComposition(a, t.degree)
	for range r {
		nextComposition(a)
	}
	return a
}

// eachState calls f(worker, i) for i = 0..count-1 on the given number of
// goroutines (worker numbers them from 0) and returns the error of the
// lowest index that failed, so that the message does not depend on the
// scheduling; ctx stops it between calls. A panic in f stops the others
// and is raised again on the caller's goroutine (with the worker's stack
// in its value), where the caller's recovery sees it: a bug in the checker
// must end a command as an internal error, never as Go's crash.
func eachState(ctx context.Context, workers, count int, f func(worker, i int) error) error {
	errs := make([]error, count)
	var next atomic.Int64
	var wg sync.WaitGroup
	var mu sync.Mutex
	var caught any
	for worker := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			defer func() {
				if r := recover(); r != nil {
					next.Store(int64(count))
					mu.Lock()
					if caught == nil {
						caught = fmt.Sprintf("%v (in a worker of the checker)\n%s", r, debug.Stack())
					}
					mu.Unlock()
				}
			}()
			for {
				i := int(next.Add(1)) - 1
				if i >= count || ctx.Err() != nil {
					return
				}
				errs[i] = f(worker, i)
			}
		}()
	}
	wg.Wait()
	if caught != nil {
		panic(caught)
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
