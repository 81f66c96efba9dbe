package structure

import (
	"context"
	"fmt"

	"avoidcert/pattern"
)

// Class names what the structure pass proved about a set.
type Class string

const (
	// Primitive: some R_e is every joint pattern (T^e has an a.e.-positive
	// kernel), so a_n/n! = c lambda^n (1 + O(theta^n)), c > 0, theta < 1.
	Primitive Class = "primitive"
	// Periodic: the R_k repeat with period p > 1, every joint pattern lies
	// in exactly one R_k of the cycle: T is irreducible, not primitive.
	Periodic Class = "periodic"
	// Reducible: two start cells are not joined by any walk of the window
	// digraph, so no joint pattern with those halves is ever reached and
	// T leaves a proper set of cells invariant.
	Reducible Class = "reducible"
	// Finite: a_n = 0 for every n >= N1.
	Finite Class = "finite"
	// Subexponential: lambda = 0 proved (no cyclic avoider of any length),
	// while a_n > 0 for every n.
	Subexponential Class = "subexponential"
	// Undecided: none of the above was proved within the limits.
	Undecided Class = "undecided"
)

// Lambda says what is proved about lambda > 0.
type Lambda string

const (
	LambdaPositive  Lambda = "positive"  // a cyclic avoider is the witness
	LambdaZero      Lambda = "zero"      // no cyclic avoider of any length
	LambdaUndecided Lambda = "undecided" // neither proved
)

// Options bound the structure pass. The zero value is usable.
type Options struct {
	// Witnesses keeps one predecessor per joint pattern and step, so
	// that a primitive report can give one witness per joint pattern
	// (Report.Witnesses). Memory: 4 (2m)! bytes per step past R_m.
	Witnesses bool
	// MaxSteps caps the joint-pattern steps past R_m (default 200). Each
	// R_k is kept for cycle detection: (2m)!/8 bytes each.
	MaxSteps int
	// CyclicMaxLength is the longest length tried by the bounded search
	// for a cyclic avoider where the exact decision does not apply
	// (m > 5); default 2m+2.
	CyclicMaxLength int
	// CyclicBudget caps the nodes of that bounded search, over all its
	// lengths (default 4e6).
	CyclicBudget int64
}

func (o Options) withDefaults(m int) Options {
	if o.MaxSteps <= 0 {
		o.MaxSteps = 200
	}
	if o.CyclicMaxLength <= 0 {
		o.CyclicMaxLength = 2*m + 2
	}
	if o.CyclicBudget <= 0 {
		o.CyclicBudget = 4_000_000
	}
	return o
}

// Report is the result of the structure pass for one set. It is not
// modified after Analyze returns.
type Report struct {
	Set        pattern.Set
	M          int // cell length m = w-1
	Cells      int // m!
	StartCells int // cells whose pattern avoids the shorter members
	Windows    int // allowed windows of length m+1
	Digraph    *Digraph

	Class Class
	// Exact reports whether the joint-pattern test ran (m <= 5).
	Exact bool
	// Exponent is the least k with R_k every joint pattern (primitive).
	Exponent int
	// Period is the period p of the R_k cycle (periodic).
	Period int
	// CycleStart and CycleLength describe where the R_k sequence was
	// seen to repeat: R_{CycleStart} = R_{CycleStart+CycleLength}
	// (0 when the test stopped first).
	CycleStart, CycleLength int
	// Sizes[i] is |R_{m+i}| for every R_k computed.
	Sizes []int
	// Domain is the number of joint patterns whose halves are start cells
	// (the "every joint pattern" of the test).
	Domain int
	// Unreached, for a reducible set, is a pair of start cells with no
	// walk from the first to the second.
	Unreached *CellPair

	Lambda Lambda
	// CyclicAvoider is a cyclic avoider of least length (witness of
	// lambda > 0), or nil.
	CyclicAvoider pattern.Perm
	// N1 is, for a finite set, the least n with a_n = 0 (then a_n = 0 for
	// every n >= N1).
	N1 int
	// Witnesses holds one witness per joint pattern at the exponent
	// (primitive, Options.Witnesses), or nil.
	Witnesses *Witnesses
	// Explanation says in words what was proved and what was not.
	Explanation []string
}

// CellPair is a pair of order cells.
type CellPair struct{ From, To pattern.Perm }

func (r *Report) say(format string, args ...any) {
	r.Explanation = append(r.Explanation, fmt.Sprintf(format, args...))
}

// Analyze runs the structure pass on a set: the window digraph, the exact
// joint-pattern test (m <= 5), the decision of lambda > 0, and the
// classification with its evidence. It returns ctx's error if cancelled.
func Analyze(ctx context.Context, s pattern.Set, opts Options) (*Report, error) {
	sys := WindowsOf(s)
	m := sys.M
	opts = opts.withDefaults(m)
	d := WindowDigraph(sys)
	rep := &Report{Set: s, M: m, Cells: d.Cells, Windows: d.Windows, Digraph: d, Lambda: LambdaUndecided}
	for _, ok := range sys.Start {
		if ok {
			rep.StartCells++
		}
	}
	rep.say("window digraph: %d cells, %d windows, %s, %d of them cyclic",
		d.Cells, d.Windows, plural(len(d.Components), "strongly connected component"), countCyclic(d))

	if d.Acyclic() {
		finite(rep)
		return rep, nil
	}
	var run *jointRun
	if m <= maxExactM {
		var err error
		run, err = runJoint(ctx, sys, opts)
		if err != nil {
			return nil, err
		}
		rep.Exact = true
		rep.Domain = run.js.domain.count()
		for _, r := range run.history {
			rep.Sizes = append(rep.Sizes, r.count())
		}
		rep.CycleStart, rep.CycleLength = run.cycleStart, run.cycleLength
		switch {
		case run.exponent > 0:
		case run.cycleLength > 0:
			rep.say("R_k is never every joint pattern: R_%d = R_%d, so the sequence repeats with period %d from k = %d on (proved: no power of T has an a.e.-positive kernel, T is not primitive)",
				run.cycleStart, run.cycleStart+run.cycleLength, run.cycleLength, run.cycleStart)
		default:
			rep.say("R_k was not every joint pattern for k = %d..%d and did not repeat within the step limit: primitivity undecided", m, m+len(run.history)-1)
		}
	} else {
		rep.say("the exact joint-pattern test is out of range for m = %d ((2m)! = %d joint patterns); only the window digraph and bounded searches were used", m, pattern.Factorial(2*m))
	}
	if err := decideLambda(ctx, rep, sys, run, opts); err != nil {
		return nil, err
	}
	classify(rep, run)
	return rep, nil
}

func countCyclic(d *Digraph) int {
	n := 0
	for _, c := range d.Components {
		if c.Cyclic {
			n++
		}
	}
	return n
}

// finite fills in the report of a set whose window digraph has no cycle.
// Every avoiding permutation of length n >= m traces a walk of n-m
// windows, and every walk from a start cell is traced by some avoiding
// permutation (each window fixes the new entry only against the m entries
// before it, so it can always be placed). Every window joins start cells,
// and start cells exist (the longest member's first m entries form one),
// so a_n > 0 exactly for n <= m + P, P the longest path.
func finite(rep *Report) {
	P := rep.Digraph.LongestPath()
	rep.Class = Finite
	rep.N1 = rep.M + P + 1
	rep.Lambda = LambdaZero
	rep.say("finite: the window digraph has no cycle; its longest path has %d windows, so a_n > 0 for n <= %d and a_n = 0 for every n >= N1 = %d (proved)", P, rep.M+P, rep.N1)
}

// jointRun is the R_k sequence of one system.
type jointRun struct {
	js        *jointSpace
	history   []bitset   // R_m, R_{m+1}, ...
	pred      [][]uint32 // pred[i] reaches R_{m+i+1} (when witnesses)
	witnesses bool
	// exponent is the least k with R_k the domain, or 0.
	exponent int
	// cycleStart, cycleLength: R_cycleStart = R_{cycleStart+cycleLength}.
	cycleStart, cycleLength int
	// closeK, closeR: the least k with a closable r in R_k, and that r.
	closeK, closeR int
}

// runJoint computes R_m, R_{m+1}, ... until one is the domain, one
// repeats, or MaxSteps is reached. Along the way it finds the least k
// whose R_k holds a closable joint pattern.
func runJoint(ctx context.Context, sys Windows, opts Options) (*jointRun, error) {
	js := newJointSpace(sys)
	m := sys.M
	run := &jointRun{js: js, closeK: -1, witnesses: opts.Witnesses}
	cur, err := js.initial(ctx)
	if err != nil {
		return nil, err
	}
	seen := map[uint64][]int{}
	for k := m; ; k++ {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		run.history = append(run.history, cur)
		if run.closeK < 0 {
			if r := js.firstClosable(cur); r >= 0 {
				run.closeK, run.closeR = k, r
			}
		}
		if cur.count() > 0 && cur.equal(js.domain) {
			run.exponent = k
			return run, nil
		}
		h := cur.hash()
		for _, i := range seen[h] {
			if run.history[i].equal(cur) {
				run.cycleStart, run.cycleLength = m+i, k-m-i
				return run, nil
			}
		}
		seen[h] = append(seen[h], k-m)
		if k-m >= opts.MaxSteps {
			return run, nil
		}
		var pred []uint32
		if opts.Witnesses {
			pred = make([]uint32, js.size)
		}
		cur, err = js.step(ctx, cur, pred)
		if err != nil {
			return nil, err
		}
		if pred != nil {
			run.pred = append(run.pred, pred)
		}
	}
}

// decideLambda settles lambda > 0 where it can.
//
// lambda > 0 exactly when a cyclic avoider exists (method.md 5b: one gives
// sequences near its periodic repetition that all avoid, so
// a_n/n! >= eps^n; conversely L! tr(T^L) counts the cyclic avoiders of
// length L, and power sums of the eigenvalues that vanish for every large
// L force every eigenvalue to be 0).
//
// Exact decision for m <= 5. A permutation p of length L >= 2m is a cyclic
// avoider iff p avoids and its m wrap-around windows
// (p_{L-m+i}..p_L, p_1..p_i), i = 1..m, are allowed. Those windows consist
// of the first m entries x and the last m entries u only, and x and u are
// disjoint, so whether they are allowed depends on the joint pattern
// (x, u) alone ("closable"). Hence a cyclic avoider of length L >= 2m
// exists iff R_{L-m} holds a closable joint pattern, and since R_k is
// periodic from the detected cycle on, scanning R_m up to the cycle
// covers every L >= 2m. The lengths m+1..2m-1 are searched exhaustively.
// This automaton has (2m)! states, the R_k themselves; the (3m)! one of
// method.md 5b also tracks a copy c of x, which the wrap windows make
// unnecessary.
//
// Simple case for any m: if every cyclic component of the window digraph
// is one cell, its only loops are monotone windows, so the closed walk of
// a cyclic avoider would be one monotone window repeated L times, and
// p_1 < p_2 < ... < p_L < p_1 is impossible: there is none.
func decideLambda(ctx context.Context, rep *Report, sys Windows, run *jointRun, opts Options) error {
	m := sys.M
	if run != nil {
		short, err := findCyclic(ctx, sys, m+1, 2*m-1, 0)
		if err != nil {
			return err
		}
		switch {
		case short != nil:
			rep.CyclicAvoider = short
		case run.closeK >= 0:
			p, err := run.cyclicWitness()
			if err != nil {
				return err
			}
			rep.CyclicAvoider = p
		case run.cycleLength > 0:
			rep.Lambda = LambdaZero
			short := ""
			if m >= 2 {
				short = fmt.Sprintf("no cyclic avoider of length %d..%d (exhaustive search), and ", m+1, 2*m-1)
			}
			rep.say("lambda = 0 proved: %sno R_k for k >= m holds a closable joint pattern (checked up to the repetition at k = %d), so no cyclic avoider of any length >= %d exists",
				short, run.cycleStart+run.cycleLength, 2*m)
			return nil
		}
	}
	if rep.CyclicAvoider == nil && rep.Digraph.SimpleCycles() {
		rep.Lambda = LambdaZero
		rep.say("lambda = 0 proved: every cyclic component of the window digraph is one cell, whose only loop is a monotone window, so no cyclic avoider exists")
		return nil
	}
	if rep.CyclicAvoider == nil && run == nil {
		p, err := findCyclic(ctx, sys, m+1, opts.CyclicMaxLength, opts.CyclicBudget)
		if err != nil && err != errBudget {
			return err
		}
		rep.CyclicAvoider = p
	}
	if rep.CyclicAvoider != nil {
		if !closesCyclically(sys, rep.CyclicAvoider) {
			return fmt.Errorf("structure: internal error: cyclic witness %v does not close", rep.CyclicAvoider)
		}
		rep.Lambda = LambdaPositive
		rep.say("lambda > 0 proved: %v is a cyclic avoider of length %d (least length)", rep.CyclicAvoider, len(rep.CyclicAvoider))
		return nil
	}
	if run != nil {
		rep.say("lambda > 0 undecided: no cyclic avoider of length %d..%d, and R_k did not repeat within the step limit, so longer ones are not excluded",
			m+1, m+run.js.m+len(run.history)-1)
	} else {
		rep.say("lambda > 0 undecided: no cyclic avoider found (lengths %d..%d, at most %d search nodes in all) and no proof of lambda = 0 applies",
			m+1, opts.CyclicMaxLength, opts.CyclicBudget)
	}
	return nil
}

func factorials(n int) []int {
	f := make([]int, n+1)
	f[0] = 1
	for i := 1; i <= n; i++ {
		f[i] = f[i-1] * i
	}
	return f
}

// cyclicWitness builds a cyclic avoider of length m+closeK from the
// closable joint pattern found in R_closeK, walking back through the
// stored R_k to R_m.
func (run *jointRun) cyclicWitness() (pattern.Perm, error) {
	js, m := run.js, run.js.m
	r := run.closeR
	gaps := make([]int, run.closeK-m)
	for k := run.closeK; k > m; k-- {
		src, gap, ok := js.predecessor(r, run.history[k-1-m])
		if !ok {
			return nil, fmt.Errorf("structure: internal error: joint pattern %d of R_%d has no predecessor", r, k)
		}
		gaps[k-1-m] = gap
		r = src
	}
	first, digits := make([]int, js.n), make([]int, js.n)
	js.unrank(r, first, digits)
	return realise(m, first, gaps), nil
}

// classify sets the class from the digraph, the R_k run and lambda.
func classify(rep *Report, run *jointRun) {
	d := rep.Digraph
	if run != nil && run.exponent > 0 {
		rep.Class = Primitive
		rep.Exponent = run.exponent
		rep.say("primitive: R_%d holds all %d joint patterns, so T^%d has an a.e.-positive kernel; by Jentzsch's theorem lambda is simple and strictly dominant and a_n/n! = c lambda^n (1 + O(theta^n)) with c > 0, theta < 1 (proved; the values of lambda, c, theta are not given here)",
			run.exponent, rep.Domain, run.exponent)
		if rep.Exponent > rep.M {
			rep.say("exponent %d is least: R_%d lacks %s", rep.Exponent, rep.Exponent-1, plural(rep.Domain-rep.Sizes[len(rep.Sizes)-2], "joint pattern"))
		}
		if run.witnesses {
			rep.Witnesses = &Witnesses{run: run}
		}
		return
	}
	if rep.Lambda == LambdaZero {
		rep.Class = Subexponential
		rep.say("subexponential: a_n > 0 for every n (the window digraph has a cycle) and a_n/n! decays faster than every exponential; the form a_n/n! ~ c lambda^n with lambda > 0 does not hold (proved)")
		return
	}
	if from, to, ok := d.Unreachable(); ok {
		rep.Class = Reducible
		rep.Unreached = &CellPair{From: cellPerm(rep.M, from), To: cellPerm(rep.M, to)}
		rep.say("reducible: no walk of the window digraph leads from cell %v to cell %v, so no avoiding permutation of length > %d starts with pattern %v and ends with %v; T maps the functions on the cells reached from %v (on %v itself if none is) into themselves, a proper invariant subspace (proved)",
			rep.Unreached.From, rep.Unreached.To, rep.M, rep.Unreached.From, rep.Unreached.To, rep.Unreached.From, rep.Unreached.From)
		rep.say("lambda is the largest over the blocks (each strongly connected block of the prefix-state digraph is bracketed on its own); whether a_n/n! ~ c lambda^n holds depends on the dominant blocks and is not proved here")
		return
	}
	if run != nil && run.cycleLength > 0 {
		if union, disjoint := run.cycleUnion(); union.equal(run.js.domain) && disjoint {
			rep.Class = Periodic
			rep.Period = run.cycleLength
			rep.say("periodic: from k = %d on each joint pattern lies in exactly one of the %d sets R_k of the cycle, and every one lies in some: T is irreducible, the positivity of the kernel of T^k repeats with period %d, and no power of T is primitive (proved)",
				run.cycleStart, run.cycleLength, run.cycleLength)
			if run.cellBlocks() {
				rep.say("each R_k of the cycle is a union of whole cell pairs, so the cells split into %d classes cyclically permuted by T and T^%d has an a.e.-positive kernel on each class: by Jentzsch's theorem there, a_n/n! = lambda^n (c_(n mod %d) + O(theta^n)) with c_r >= 0, theta < 1 (proved); one constant c for all n is not (bracket with T^%d)",
					run.cycleLength, run.cycleLength, run.cycleLength, run.cycleLength)
			} else {
				rep.say("some R_k of the cycle splits a pair of cells: the asymptotic form is not proved")
			}
			return
		}
		rep.say("the R_k cycle does not split the joint patterns into %d disjoint classes covering them all, although the window digraph is strongly connected: irreducibility undecided", run.cycleLength)
	}
	if run == nil {
		if p := startPeriod(d); p == 1 {
			rep.say("the window digraph is strongly connected on the start cells and aperiodic: necessary for primitivity, not sufficient; primitivity undecided")
		} else {
			rep.say("the window digraph is strongly connected on the start cells with period %d: T is not primitive (no power joins every pair of cells); irreducibility undecided", p)
		}
	}
	rep.Class = Undecided
}

// startPeriod returns the period of the component holding the start
// cells (when they form one component).
func startPeriod(d *Digraph) int {
	for u, ok := range d.start {
		if ok {
			return d.Components[d.component[u]].Period
		}
	}
	return 0
}

// cellBlocks reports whether every R_k of the cycle is a union of whole
// cell pairs: with the halves (sigma, tau) of one of its joint patterns it
// holds all C(2m, m) joint patterns with those halves (one per choice of
// the values that go to the first half).
//
// Why that gives p classes. Let c(sigma, tau) be the residue mod p of the
// k >= cycleStart whose R_k holds the pair. Two avoiding permutations, one
// ending and one starting with the pattern tau, glue along those m entries
// (linear orders amalgamate), and every window of the result lies in one
// of them; so c is additive, c(sigma, tau) = f(tau) - f(sigma), and a
// window sigma -> tau has f(tau) = f(sigma) + 1. The classes f = i are
// then nonempty (the digraph is strongly connected), T maps class i to
// i+1, and R_k for k = 0 mod p holds every pair inside a class: T^p has an
// a.e.-positive kernel on each class. Every cycle of the digraph has a
// length divisible by p, and a larger digraph period d would keep R_k and
// R_{k+p} apart, so p is the digraph's period.
func (run *jointRun) cellBlocks() bool {
	js, m := run.js, run.js.m
	cells := pattern.Factorial(m)
	whole := 1 // C(2m, m)
	for i := 1; i <= m; i++ {
		whole = whole * (m + i) / i
	}
	c := js.newCursor()
	for k := run.cycleStart; k < run.cycleStart+run.cycleLength; k++ {
		tally := make([]int, cells*cells)
		set := run.history[k-m]
		for r := range js.size {
			if set.has(r) {
				c.seek(r)
				tally[pattern.Rank(c.q[:m])*cells+pattern.Rank(c.q[m:])]++
			}
		}
		for _, n := range tally {
			if n != 0 && n != whole {
				return false
			}
		}
	}
	return true
}

// cycleUnion returns the union of the R_k of the detected cycle and
// whether they are pairwise disjoint.
func (run *jointRun) cycleUnion() (bitset, bool) {
	m := run.js.m
	union := newBitset(run.js.size)
	disjoint := true
	for k := run.cycleStart; k < run.cycleStart+run.cycleLength; k++ {
		r := run.history[k-m]
		if union.intersects(r) {
			disjoint = false
		}
		union.or(r)
	}
	return union, disjoint
}

func cellPerm(m, cell int) pattern.Perm { return pattern.Unrank(m, cell) }

// plural writes "1 joint pattern", "2 joint patterns".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}
