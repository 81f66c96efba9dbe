package certify

import (
	"context"
	"fmt"
	"math/big"
	"slices"
)

// Exports for the tests of package certify_test. The tests build their
// certificates with MakeBracket, from the checker's own iteration: the
// producer of real certificates is the engine's (prove/produce.go), and
// the engine's agreement with the checker is tested in
// internal/conformance.

// Iterate returns G_n of the system on states (nil: whole) with the given
// start, as one slice of coefficients per state (nil outside the system or
// for states longer than n), its digest and its sum.
func Iterate(given []string, states []int, start Start, n int) (coef [][]*big.Int, digest [32]byte, sum *big.Int) {
	sys, g := iterateTo(given, states, start, n)
	for _, t := range g.tables {
		var c []*big.Int
		if t != nil {
			for r := range t.size() {
				c = append(c, toBig(t.at(r)))
			}
		}
		coef = append(coef, c)
	}
	return coef, sys.digest(g), g.sum()
}

func iterateTo(given []string, states []int, start Start, n int) (*system, *iterate) {
	s, err := parseSet(given)
	if err != nil {
		panic(err)
	}
	sp := newStateSpace(s)
	sys := newSystem(sp, states, n+MaxStep)
	var g *iterate
	from := 0
	for _, p := range states {
		from = max(from, len(sp.states[p]))
	}
	switch start {
	case StartEmpty:
		g = sys.emptyStart()
	case StartOnes:
		g = sys.onesStart(from)
	case StartWhole:
		whole := newSystem(sp, nil, from)
		g = whole.emptyStart()
		for g.n < from {
			g, _ = whole.next(context.Background(), g)
		}
		g = sys.restrict(g)
	}
	for g.n < n {
		g, _ = sys.next(context.Background(), g)
	}
	return sys, g
}

// MakeBracket returns the bracket of the system on states (nil: whole)
// with the given start, step d and N, with Lo and Hi the exact least and
// largest ratios G_(N+d)/H (Hi nil where some H is 0 under a positive
// G_(N+d)), and the sum of G_N.
func MakeBracket(given []string, states []int, start Start, d, N int, upper bool) (Bracket, *big.Int) {
	sys, g := iterateTo(given, states, start, N)
	h, _ := sys.elevated(context.Background(), g, d)
	next := g
	for next.n < N+d {
		next, _ = sys.next(context.Background(), next)
	}
	var lo, hi *big.Rat
	infinite := false
	for p, t := range next.tables {
		if t == nil {
			continue
		}
		for r := range t.size() {
			N, H := toBig(t.at(r)), new(big.Int)
			if h.tables[p] != nil {
				H = toBig(h.tables[p].at(r))
			}
			if H.Sign() == 0 {
				infinite = infinite || N.Sign() > 0
				continue
			}
			ratio := new(big.Rat).SetFrac(N, H)
			if lo == nil || ratio.Cmp(lo) < 0 {
				lo = ratio
			}
			if hi == nil || ratio.Cmp(hi) > 0 {
				hi = ratio
			}
		}
	}
	if lo == nil {
		lo, hi = new(big.Rat), new(big.Rat)
	}
	if infinite {
		hi = nil
	}
	all := states
	if all == nil {
		for p := range sys.in {
			all = append(all, p)
		}
	}
	return Bracket{States: all, Start: start, Step: d, N: N, Lo: lo, Hi: hi, Upper: upper, IterateDigest: sys.digest(g)}, g.sum()
}

// JointSets returns the recurrent states as patterns ("()" for the empty
// state) and R_0 .. R_k as the checker computes them, each sorted, a
// configuration written "s c o w": start and current state as patterns,
// the overlap, and the order of the start values followed by the current
// values that are not start values.
func JointSets(given []string, k int) (recurrent []string, sets [][]string) {
	sp, j := jointOf(given)
	for _, p := range j.recurrent {
		recurrent = append(recurrent, stateName(sp.states[p]))
	}
	ck := &checker{sp: sp, recurrent: j.recurrent}
	r := j.first()
	for i := 0; i <= k; i++ {
		var members []string
		for cf := range r.members {
			members = append(members, fmt.Sprintf("%s %s %d %s", stateName(sp.states[cf.s]), stateName(sp.states[cf.c]), cf.o, formatPerm(cf.values(1))))
		}
		slices.Sort(members)
		sets = append(sets, members)
		r, _ = ck.step(context.Background(), j, r)
	}
	return recurrent, sets
}

func jointOf(given []string) (*stateSpace, *jointSystem) {
	s, err := parseSet(given)
	if err != nil {
		panic(err)
	}
	sp := newStateSpace(s)
	recurrent, _ := newStateGraph(sp).recurrence()
	return sp, newJointSystem(sp, recurrent)
}

// OwnStructure returns the structure section that the checker's own
// functions derive for the set with the decision procedure of
// docs/prefix-states.md ("The sequence R_0, R_1, ... and the classes"):
// finite, primitive, subexponential (lambda = 0), reducible, periodic or
// undecided, the first that holds in this order, lambda_status positive or
// zero, and for positive no cyclic avoider (the caller supplies one, found
// by brute force). For tests whose reference is elsewhere (brute force,
// published values) and for the benchmarks.
func OwnStructure(given []string) *Structure {
	sp, j := jointOf(given)
	g := newStateGraph(sp)
	_, blocks := g.recurrence()
	if len(j.recurrent) == 0 {
		return &Structure{Class: ClassFinite, N1: g.longestWalk() + 1, Lambda: LambdaZero}
	}
	ck := &checker{sp: sp, recurrent: j.recurrent}
	st := &Structure{Recurrent: j.recurrent, Configurations: ck.domainSize(), Lambda: LambdaPositive}
	d := j.domain()
	var history []*configSet
	r := j.first()
	for k := 0; k <= MaxJointSteps; k++ {
		if r.equal(d) {
			st.Class, st.Exponent = ClassPrimitive, k
			return st
		}
		for i, h := range history {
			if r.equal(h) {
				st.CycleStart, st.CycleLength = i, k-i
			}
		}
		if st.CycleLength > 0 {
			break
		}
		history = append(history, r)
		r, _ = ck.step(context.Background(), j, r)
	}
	ck.c = &Certificate{Structure: st}
	cycle := history[st.CycleStart:]
	_, missed := d.least(func(cf config) bool { return !inAny(cycle, cf) })
	switch {
	case ck.verifyNoClosable(j, history) == nil:
		st.Class, st.Lambda = ClassSubexponential, LambdaZero
	case len(blocks) > 1 || missed:
		st.Class, st.Blocks = ClassReducible, blocks
	case st.CycleLength >= 2 && verifyPeriodic(j, d, cycle, st.CycleStart) == nil:
		st.Class, st.Period = ClassPeriodic, st.CycleLength
	default:
		*st = Structure{Class: ClassUndecided, Lambda: LambdaPositive}
	}
	return st
}
