package structure

import (
	"context"
	"fmt"
	"math"
	"strings"

	"avoidcert/pattern"
	"avoidcert/transfer"
)

// Class names what the structure test proved about a set.
type Class string

const (
	// Primitive: R_e = D, so T^e has an a.e.-positive kernel on the
	// recurrent states and a_n/n! = c lambda^n (1 + O(theta^n)), c > 0,
	// theta < 1.
	Primitive Class = "primitive"
	// Periodic: one block, and the p >= 2 sets of the joint cycle are
	// disjoint, cover D and hold whole pairs of states:
	// a_n/n! = lambda^n (c_(n mod p) + O(theta^n)).
	Periodic Class = "periodic"
	// Reducible: two or more blocks, or one whose joint cycle misses a
	// configuration of D: lambda is the largest over the blocks.
	Reducible Class = "reducible"
	// Finite: no recurrent state; a_n = 0 for every n >= N1.
	Finite Class = "finite"
	// Subexponential: recurrent states exist (a_n > 0 for every n) and
	// lambda = 0.
	Subexponential Class = "subexponential"
	// Undecided: none of the above was proved (one block whose joint
	// cycle covers D without splitting it into classes, or the step
	// limit).
	Undecided Class = "undecided"
)

// Lambda says what is proved about lambda > 0.
type Lambda string

const (
	LambdaPositive  Lambda = "positive"  // a cyclic avoider is the evidence
	LambdaZero      Lambda = "zero"      // no closable configuration: no cyclic avoider
	LambdaUndecided Lambda = "undecided" // neither proved (step limit)
)

// Options bound the structure test. The zero value is usable.
type Options struct {
	// Witnesses keeps, for a primitive set, one realisation per
	// configuration of D (Report.Witnesses); it stores one link per
	// configuration and step.
	Witnesses bool
	// MaxSteps caps the sets R_1, R_2, ... computed (0: MaxSteps; at
	// most MaxSteps).
	MaxSteps int
	// MaxMemory caps the estimated memory in bytes (0: no cap; package
	// prove always sets one); a test over it is refused before it starts
	// with a *BudgetError.
	MaxMemory int64
}

func (o Options) maxSteps() int {
	if o.MaxSteps <= 0 || o.MaxSteps > MaxSteps {
		return MaxSteps
	}
	return o.MaxSteps
}

func (o Options) maxMemory() int64 {
	if o.MaxMemory <= 0 {
		return math.MaxInt64
	}
	return o.MaxMemory
}

// Report is the result of the structure test of one set. It is not
// modified after Analyze returns; its slices belong to it and callers
// must not modify them.
type Report struct {
	Set    pattern.Set
	States *transfer.States // the prefix states the test ran on (shared, read-only)
	Cost   Cost             // the estimate the budget was checked against

	// Recurrent and Transient partition the states (increasing state
	// numbers); Blocks are the strongly connected components among the
	// recurrent states, each increasing, ordered by least state.
	Recurrent, Transient []int
	Blocks               [][]int

	Class Class
	// Exponent is the primitivity exponent: the least k with R_k = D, the
	// least k with T^k positive (primitive only).
	Exponent int
	// Period is p >= 2, the joint cycle's length (periodic only).
	Period int
	// N1 is the least n with a_n = 0 (finite only): a_n > 0 exactly for
	// n < N1.
	N1 int
	// Configurations is |D| (0 for a finite set).
	Configurations int
	// CycleStart and CycleLength are the joint cycle, the first
	// repetition R_CycleStart = R_(CycleStart+CycleLength) (0 when the
	// sequence reached D, or the step limit first).
	CycleStart, CycleLength int
	// Sizes[k] is |R_k| for every R_k computed.
	Sizes []int

	Lambda Lambda
	// CyclicAvoider is the evidence of lambda > 0: a permutation of
	// length L >= w whose cyclic windows of each member's length avoid
	// that member, checked window by window (the explanation names the
	// closable configuration it was built from).
	CyclicAvoider pattern.Perm

	// Witnesses holds one realisation per configuration of D (primitive,
	// with Options.Witnesses), or nil.
	Witnesses *Witnesses
	// Explanation says in words what was proved and what was not.
	Explanation []string
}

func (r *Report) say(format string, args ...any) {
	r.Explanation = append(r.Explanation, fmt.Sprintf(format, args...))
}

// Analyze runs the structure test on the prefix states of a set
// (docs/prefix-states.md, "The structure test"): the state digraph,
// recurrent states and blocks, the sequence R_0, R_1, ... to R_e = D or
// its joint cycle, the class, and lambda > 0 or lambda = 0 with its
// evidence. A test whose estimated memory is over Options.MaxMemory is
// refused first with a *BudgetError; a cancelled ctx returns its error.
func Analyze(ctx context.Context, s pattern.Set, opts Options) (*Report, error) {
	st := transfer.NewStates(s)
	d := newStateDigraph(st)
	rep := &Report{Set: s, States: st, Cost: estimate(d, opts), Lambda: LambdaUndecided,
		Recurrent: marked(d.recurrent), Blocks: d.blocks}
	for p := range st.Len() {
		if !d.recurrent[p] {
			rep.Transient = append(rep.Transient, p)
		}
	}
	if rep.Cost.Memory > opts.maxMemory() {
		return nil, &BudgetError{Cost: rep.Cost, Limit: opts.maxMemory()}
	}
	if rep.Cost.Space > maxSpace {
		return nil, fmt.Errorf("structure: the test of %s has %d joint configurations, more than it can number (%d)", s, rep.Cost.Space, maxSpace)
	}
	rep.sayStates()
	if len(rep.Recurrent) == 0 {
		P := d.longestWalk()
		rep.Class, rep.N1, rep.Lambda = Finite, P+1, LambdaZero
		rep.say("finite: no state is recurrent, so every walk of the state digraph from () is a path; the longest has %s, so a_n > 0 for n <= %d and a_n = 0 for every n >= N1 = %d (proved)",
			plural(P, "move"), P, P+1)
		return rep, nil
	}
	sp := newSpace(d)
	rep.Configurations = sp.domain.count()
	ru, err := runJoint(ctx, sp, opts.maxSteps(), opts.Witnesses, rep.Cost, opts.maxMemory())
	if err != nil {
		return nil, err
	}
	for _, r := range ru.history {
		rep.Sizes = append(rep.Sizes, r.count())
	}
	rep.say("joint configurations: D has %d (every ordered pair of recurrent states, every interleaving of their values); |R_k| for k = 0..%d: %s",
		rep.Configurations, ru.last(), sizes(rep.Sizes))
	lambda, err := rep.decideLambda(ru)
	if err != nil {
		return nil, err
	}
	rep.classify(ru, lambda)
	if rep.Class == Primitive && opts.Witnesses {
		rep.Witnesses = &Witnesses{run: ru}
	}
	return rep, nil
}

// sayStates names the recurrent and transient states and the blocks.
func (r *Report) sayStates() {
	st := r.States
	r.say("prefix states: %d; recurrent: %s; transient: %s", st.Len(), r.stateList(r.Recurrent), r.stateList(r.Transient))
	if len(r.Blocks) > 1 {
		var parts []string
		for _, b := range r.Blocks {
			parts = append(parts, "{"+r.stateList(b)+"}")
		}
		r.say("the recurrent states form %d blocks (strongly connected components of the state digraph): %s", len(r.Blocks), listAtMost(parts, 12))
	}
}

// stateList names states, "none" for none, at most 12 of them.
func (r *Report) stateList(states []int) string {
	if len(states) == 0 {
		return "none"
	}
	var names []string
	for _, p := range states {
		names = append(names, StateName(r.States, p))
	}
	return listAtMost(names, 12)
}

// StateName writes state p in parentheses: "()", "(1)", "(132)".
func StateName(st *transfer.States, p int) string {
	if st.Length(p) == 0 {
		return "()"
	}
	return "(" + st.String(p) + ")"
}

func listAtMost(names []string, most int) string {
	if len(names) <= most {
		return strings.Join(names, ", ")
	}
	return fmt.Sprintf("%s, ... (%d more)", strings.Join(names[:most], ", "), len(names)-most)
}

func sizes(ns []int) string {
	var parts []string
	for _, n := range ns {
		parts = append(parts, fmt.Sprint(n))
	}
	return listAtMost(parts, 20)
}

// decideLambda settles lambda > 0 (a cyclic avoider from a closable
// configuration) or lambda = 0 (none, the sequence followed to its end),
// and returns the sentence that says so.
func (r *Report) decideLambda(ru *jointRun) (string, error) {
	w := r.Set.Window()
	if c, ok := ru.findClosing(w); ok {
		p := ru.realise(c.k, c.r)
		if at, member := cyclicFault(r.Set, p); member != nil {
			return "", fmt.Errorf("structure: internal error: %v, built from configuration %s of R_%d, is not a cyclic avoider: its cyclic window at %d has the pattern %v",
				p, ru.sp.describe(c.r), c.k, at+1, member)
		}
		r.Lambda, r.CyclicAvoider = LambdaPositive, p
		return fmt.Sprintf("lambda > 0 proved: %v is a cyclic avoider of length %d (every cyclic window of each member's length avoids that member, checked window by window), built from the closable configuration %s of R_%d",
			p, len(p), ru.sp.describe(c.r), c.k), nil
	}
	if !ru.recurs() {
		return fmt.Sprintf("lambda > 0 undecided: no closable configuration in R_k with k + |s| >= w = %d for k <= %d, and the sequence did not repeat within the step limit, so later ones are not excluded", w, ru.last()), nil
	}
	if ru.exponent >= 0 {
		return "", fmt.Errorf("structure: internal error: %s is primitive but no configuration of D is closable", r.Set)
	}
	r.Lambda = LambdaZero
	return fmt.Sprintf("lambda = 0 proved: no configuration of R_0 .. R_%d is closable with k + |s| >= w = %d, nor any of the joint cycle, so no cyclic avoider of any length exists",
		ru.cycleStart+ru.cycleLength-1, w), nil
}

// cyclicFault returns the first cyclic window of p (its start, 0-based)
// of some member's length that has that member's pattern, or nil when p
// is a cyclic avoider. A p shorter than the longest member is refused at
// position 0 with that member.
func cyclicFault(s pattern.Set, p pattern.Perm) (int, pattern.Perm) {
	ms := s.Patterns()
	for _, m := range ms {
		if len(p) < len(m) {
			return 0, m
		}
	}
	win := make([]int, 0, len(p))
	for i := range p {
		for _, m := range ms {
			win = win[:0]
			for t := range m {
				win = append(win, p[(i+t)%len(p)])
			}
			if pattern.OrderIsomorphic(win, m) {
				return i, m
			}
		}
	}
	return 0, nil
}

// classify sets the class from the run and lambda, and explains it with
// the sentence about lambda in its place.
func (r *Report) classify(ru *jointRun, lambda string) {
	sp := ru.sp
	switch {
	case ru.exponent >= 0:
		r.Class, r.Exponent = Primitive, ru.exponent
		least := ""
		if e := ru.exponent; e > 0 {
			prev := ru.history[e-1]
			missing := prev.firstMissing(sp.domain)
			least = fmt.Sprintf(" (least: R_%d lacks %s of D, e.g. %s)", e-1, plural(r.Configurations-countIn(prev, sp.domain), "configuration"), sp.describe(missing))
		}
		r.say("primitive: R_%d = D, so T^%d has an a.e.-positive kernel on the recurrent states: primitivity exponent k = %d%s; by Jentzsch's theorem lambda is simple and strictly dominant, and a_n/n! = c lambda^n (1 + O(theta^n)) with c > 0, theta < 1 (proved; lambda, c and theta are not given here)",
			ru.exponent, ru.exponent, ru.exponent, least)
		r.say("%s", lambda)
		return
	case !ru.recurs():
		r.Class = Undecided
		r.say("undecided: R_k was not D for k = 0..%d and did not repeat within the step limit of %d", ru.last(), ru.last())
		r.say("%s", lambda)
		return
	}
	r.CycleStart, r.CycleLength = ru.cycleStart, ru.cycleLength
	r.say("not primitive (proved): R_k is never D, and R_%d = R_%d: from k = %d on the sets repeat with period %d (the joint cycle), so no power of T has an a.e.-positive kernel",
		ru.cycleStart, ru.cycleStart+ru.cycleLength, ru.cycleStart, ru.cycleLength)
	r.say("%s", lambda)
	if r.Lambda == LambdaZero {
		r.Class = Subexponential
		r.say("subexponential: a_n > 0 for every n (recurrent states exist) and lambda = 0, so a_n/n! decays faster than every exponential (proved)")
		return
	}
	union, disjoint := newBitset(sp.size), true
	for k := ru.cycleStart; k < ru.cycleStart+ru.cycleLength; k++ {
		if union.intersects(ru.history[k]) {
			disjoint = false
		}
		union.or(ru.history[k])
	}
	switch {
	case len(r.Blocks) > 1:
		r.Class = Reducible
		r.say("reducible: %d blocks of recurrent states; the functions on the states reached from one block form a proper invariant ideal. lambda is the largest over the blocks (each bracketed on its own); whether a_n/n! ~ c lambda^n holds is not proved", len(r.Blocks))
	case !sp.domain.subsetOf(union):
		r.Class = Reducible
		missing := union.firstMissing(sp.domain)
		r.say("reducible: one block, but the sets of the joint cycle miss %s of D (e.g. %s): the functions reached from a small set of start values form a proper invariant ideal. lambda is bracketed on the block; whether a_n/n! ~ c lambda^n holds is not proved",
			plural(r.Configurations-countIn(union, sp.domain), "configuration"), sp.describe(missing))
	case ru.cycleLength >= 2 && disjoint && ru.wholePairs():
		r.Class, r.Period = Periodic, ru.cycleLength
		p := ru.cycleLength
		r.say("periodic, period %d: one block; the %d sets of the joint cycle are disjoint, cover D and each holds whole pairs of states, so the recurrent states split into %d classes that T permutes cyclically and T^%d is primitive on each: a_n/n! = lambda^n (c_(n mod %d) + O(theta^n)) with c_r >= 0, theta < 1 (proved); one constant for every n is not",
			p, p, p, p, p)
	default:
		r.Class = Undecided
		r.say("undecided: one block whose joint cycle covers D, but its sets overlap or split a pair of states: irreducible and not primitive, with the period not settled")
	}
}

// wholePairs reports whether every set of the joint cycle holds, for each
// pair of recurrent states, all of its configurations with no shared
// value or none.
func (ru *jointRun) wholePairs() bool {
	sp := ru.sp
	for k := ru.cycleStart; k < ru.cycleStart+ru.cycleLength; k++ {
		set := ru.history[k]
		for _, b := range sp.blocks {
			if b.o != 0 {
				continue
			}
			n := 0
			for i := range b.size {
				if set.has(b.base + i) {
					n++
				}
			}
			if n != 0 && n != b.size {
				return false
			}
		}
	}
	return true
}

// countIn returns |b ∩ within|.
func countIn(b, within bitset) int {
	n := 0
	each(b, func(r int) {
		if within.has(r) {
			n++
		}
	})
	return n
}

// plural writes "1 move", "2 moves".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}
