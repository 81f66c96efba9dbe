package certify

import (
	"cmp"
	"context"
	"fmt"
	"slices"
	"strings"
)

// The checks of a structure section, in the order of the numbered list in
// docs/certificate.md ("What the checker verifies", items S1 to S9).
// structureForm (S1 to S4) needs only the state digraph and runs with the
// statement; structureCost estimates S6 to S9 for the limits (S5);
// verifyStructure (S6 to S9) recomputes the sets R_k.

// structureForm checks items S1 to S4: which members are present, the
// lambda status against the class, the state digraph's facts (recurrent
// states, blocks, finite_from, |D|), and the cyclic avoider.
func (ck *checker) structureForm() error {
	st := ck.c.Structure
	if st == nil {
		return nil
	}
	if err := structureMembers(st); err != nil {
		return err
	}
	g := newStateGraph(ck.sp)
	ck.recurrent, ck.blocks = g.recurrence()
	if err := ck.structureDigraph(st, g); err != nil {
		return err
	}
	if st.Lambda == LambdaPositive {
		return ck.cyclicAvoider(st.CyclicAvoider)
	}
	return nil
}

// structureMembers is item S1: each member present exactly for its class
// or status, the lambda status allowed with the class, the step counts
// within MaxJointSteps, and the period equal to the joint cycle's length.
func structureMembers(st *Structure) error {
	class := st.Class
	cycle := class == ClassPeriodic || class == ClassReducible || class == ClassSubexponential
	derived := class != ClassFinite && class != ClassUndecided
	for _, m := range []struct {
		field     string
		has, want bool
		why       string
	}{
		{"statement.structure.primitivity_exponent", st.Exponent != 0, class == ClassPrimitive, "class primitive"},
		{"statement.structure.period", st.Period != 0, class == ClassPeriodic, "class periodic"},
		{"statement.structure.finite_from", st.N1 != 0, class == ClassFinite, "class finite"},
		{"statement.structure.blocks", st.Blocks != nil, class == ClassReducible, "class reducible"},
		{"evidence.structure.recurrent_states", st.Recurrent != nil, derived, "classes primitive, periodic, reducible and subexponential"},
		{"evidence.structure.configurations", st.Configurations != 0, derived, "classes primitive, periodic, reducible and subexponential"},
		{"evidence.structure.joint_cycle", st.CycleLength != 0 || st.CycleStart != 0, cycle, "classes periodic, reducible and subexponential"},
		{"evidence.structure.cyclic_avoider", st.CyclicAvoider != nil, st.Lambda == LambdaPositive, "lambda_status positive"},
	} {
		switch {
		case m.has && !m.want:
			return fmt.Errorf("%s: present, but it belongs only to %s", m.field, m.why)
		case !m.has && m.want:
			return fmt.Errorf("%s: missing; %s states it", m.field, m.why)
		}
	}
	switch {
	case (class == ClassFinite || class == ClassSubexponential) && st.Lambda != LambdaZero:
		return fmt.Errorf("statement.structure.lambda_status: %s, but class %s states lambda = 0: write zero", st.Lambda, class)
	case st.Lambda == LambdaZero && class != ClassFinite && class != ClassSubexponential && class != ClassReducible:
		return fmt.Errorf("statement.structure.lambda_status: zero goes only with class finite, subexponential or reducible, not %s", class)
	case cycle && (st.CycleLength < 1 || st.CycleStart+st.CycleLength > MaxJointSteps):
		return fmt.Errorf("evidence.structure.joint_cycle: start %d and length %d: the length is at least 1 and start + length at most %d (MaxJointSteps)", st.CycleStart, st.CycleLength, MaxJointSteps)
	case class == ClassPrimitive && st.Exponent > MaxJointSteps:
		return fmt.Errorf("statement.structure.primitivity_exponent: %d is over the limit of %d (MaxJointSteps)", st.Exponent, MaxJointSteps)
	case class == ClassPeriodic && st.Period != st.CycleLength:
		return fmt.Errorf("statement.structure.period: %d is not the length %d of evidence.structure.joint_cycle", st.Period, st.CycleLength)
	case class == ClassPeriodic && st.Period < 2:
		return fmt.Errorf("statement.structure.period: %d; a periodic class has period at least 2", st.Period)
	}
	return nil
}

// structureDigraph is items S2 and S3: on the checker's own state
// digraph, the recurrent states, finite_from, |D| and the blocks.
func (ck *checker) structureDigraph(st *Structure, g stateGraph) error {
	switch st.Class {
	case ClassUndecided:
		return nil
	case ClassFinite:
		if len(ck.recurrent) > 0 {
			return fmt.Errorf("statement.structure.class: finite is false: the state %s is recurrent (on a cycle reachable from the empty state), so a_n > 0 for every n", stateName(ck.sp.states[ck.recurrent[0]]))
		}
		if longest := g.longestWalk(); st.N1 != longest+1 {
			return fmt.Errorf("statement.structure.finite_from: %d, but the longest walk from the empty state has %d moves, so a_n = 0 exactly from n = %d", st.N1, longest, longest+1)
		}
		return nil
	}
	if len(ck.recurrent) == 0 {
		return fmt.Errorf("statement.structure.class: %s is false: no state is recurrent, so the set is finite (a_n = 0 from n = %d)", st.Class, g.longestWalk()+1)
	}
	if !slices.Equal(st.Recurrent, ck.recurrent) {
		return fmt.Errorf("evidence.structure.recurrent_states: %s, but the recurrent states are %s", abbreviate(stateList(st.Recurrent)), abbreviate(stateList(ck.recurrent)))
	}
	if d := ck.domainSize(); st.Configurations != d {
		return fmt.Errorf("evidence.structure.configurations: %d, but D has %d configurations", st.Configurations, d)
	}
	switch {
	case st.Class == ClassReducible && !slices.EqualFunc(st.Blocks, ck.blocks, slices.Equal):
		return fmt.Errorf("statement.structure.blocks: %s, but the blocks of the recurrent states are %s", abbreviate(blockList(st.Blocks)), abbreviate(blockList(ck.blocks)))
	case st.Class == ClassPeriodic && len(ck.blocks) > 1:
		return fmt.Errorf("statement.structure.class: periodic is false: the recurrent states form %d blocks %s, so the set is reducible", len(ck.blocks), abbreviate(blockList(ck.blocks)))
	}
	return nil
}

// domainSize is |D| in closed form: the sum over ordered pairs (s, c) of
// recurrent states of C(|s| + |c|, |s|).
func (ck *checker) domainSize() int {
	var byLength [MaxPatternLength]int // recurrent states of each length
	for _, p := range ck.recurrent {
		byLength[len(ck.sp.states[p])]++
	}
	bin := newBinomials(2 * MaxPatternLength)
	total := 0
	for a, na := range byLength {
		for b, nb := range byLength {
			total += na * nb * int(bin.c[a+b][min(a, b)])
		}
	}
	return total
}

// cyclicAvoider is item S4: a permutation of length L >= w whose every
// cyclic window of every member's length avoids that member.
func (ck *checker) cyclicAvoider(p []int) error {
	w := ck.set.longest()
	if len(p) < w {
		return fmt.Errorf("evidence.structure.cyclic_avoider: %s has length %d; a cyclic avoider has at least w = %d entries (the longest member)", abbreviate(formatPerm(p)), len(p), w)
	}
	var lengths []int
	for _, m := range ck.set {
		if !slices.Contains(lengths, len(m)) {
			lengths = append(lengths, len(m))
		}
	}
	window := make([]int, w)
	for i := range p {
		for _, l := range lengths {
			for t := range l {
				window[t] = p[(i+t)%len(p)]
			}
			if pat := std(window[:l]); ck.sp.member[stateKey(pat)] {
				return fmt.Errorf("evidence.structure.cyclic_avoider: %s is not a cyclic avoider: its cyclic window at positions %d..%d (wrapping around) has the pattern %s of the set", abbreviate(formatPerm(p)), i+1, (i+l-1)%len(p)+1, pat)
			}
		}
	}
	return nil
}

// Estimated costs of the structure section, in the units of the bracket
// work (coefficient operations of about 10 ns; docs/certificate.md,
// "Limits"). Set from BenchmarkStructure on the 2-core machine under load:
// about 3 ns per unit of an earlier estimate of 12 units per configuration
// move, for 123456789 and for four length-7 patterns; the estimate counts
// every R_k as large as D, so it is pessimistic for the first steps.
const (
	unitsPerConfigMove = 4   // one gap of one configuration in a step of R_k, and inserting the result
	unitsPerDomain     = 4   // one configuration of D
	unitsPerClosable   = 4   // one move of the closable test
	bytesPerConfig     = 100 // one member of a set R_k or D: 53 bytes measured in a map of 48602, with room for the map's growth
)

// structureCost estimates the work and memory of verifyStructure (items
// S6 to S9), in closed form from the recurrent states and the claimed
// number of steps: every R_k has at most as many members as D (after k
// moves the overlap of a pair is max(0, |c| - k), and the values not
// shared interleave in at most C(|s| + |c|, |s|) ways), each with
// |s| + |c| + 1 gaps.
func (ck *checker) structureCost() (work, memory float64) {
	steps := ck.jointSteps()
	if steps == 0 {
		return 0, 0
	}
	held := 3 // D, R_k and R_(k+1)
	if st := ck.c.Structure; st.CycleLength > 0 {
		held = st.CycleStart + st.CycleLength + 2 // D and R_0 .. R_(s0+p)
	}
	work = ck.domainCost() + float64(steps)*ck.stepCost() + ck.closableCost()
	// doubled for the garbage collector's headroom, as for the iterates
	return work, 2 * float64(held) * float64(ck.domainSize()) * bytesPerConfig
}

// jointSteps is the number of steps of R_k that verifyStructure takes: the
// primitivity exponent, or the end of the joint cycle, or none.
func (ck *checker) jointSteps() int {
	switch st := ck.c.Structure; {
	case st == nil:
		return 0
	case st.Class == ClassPrimitive:
		return st.Exponent
	default:
		return st.CycleStart + st.CycleLength
	}
}

// domainCost is the estimated work of building D.
func (ck *checker) domainCost() float64 { return float64(ck.domainSize()) * unitsPerDomain }

// closableCost is the estimated work of item S9: at most |D|
// configurations in each of the s0 + p sets, each tested by at most
// MaxPatternLength - 1 moves.
func (ck *checker) closableCost() float64 {
	if ck.c.Structure.Lambda != LambdaZero {
		return 0
	}
	return float64(ck.jointSteps()) * float64(ck.domainSize()) * (MaxPatternLength - 1) * unitsPerClosable
}

// stepCost is the estimated work of one step R_k -> R_(k+1): per pair of
// recurrent states, C(|s| + |c|, |s|) configurations with |s| + |c| + 1
// gaps each.
func (ck *checker) stepCost() float64 {
	var byLength [MaxPatternLength]float64
	for _, p := range ck.recurrent {
		byLength[len(ck.sp.states[p])]++
	}
	bin := newBinomials(2 * MaxPatternLength)
	moves := 0.0
	for a, na := range byLength {
		for b, nb := range byLength {
			moves += na * nb * float64(bin.c[a+b][min(a, b)]) * float64(a+b+1)
		}
	}
	return moves * unitsPerConfigMove
}

// verifyStructure is items S6 to S9: it recomputes R_0, R_1, ... with its
// own code, to the exponent (primitive) or to the end of the joint cycle,
// and proves the class and lambda = 0 from them.
func (ck *checker) verifyStructure(ctx context.Context) error {
	st := ck.c.Structure
	if ck.jointSteps() == 0 {
		return nil
	}
	j := newJointSystem(ck.sp, ck.recurrent)
	d := j.domain()
	ck.progress(ck.domainCost())
	if st.Class == ClassPrimitive {
		return ck.verifyExponent(ctx, j, d)
	}
	history, err := ck.verifyJointCycle(ctx, j, d)
	if err != nil {
		return err
	}
	cycle := history[st.CycleStart:]
	switch st.Class {
	case ClassPeriodic:
		if err := verifyPeriodic(j, d, cycle, st.CycleStart); err != nil {
			return err
		}
	case ClassReducible:
		if len(ck.blocks) == 1 {
			if _, missed := d.least(func(cf config) bool { return !inAny(cycle, cf) }); !missed {
				return fmt.Errorf("statement.structure.class: reducible is false: the recurrent states form one block and the sets R_%d .. R_%d of the joint cycle cover D (recomputed)", st.CycleStart, st.CycleStart+st.CycleLength-1)
			}
		}
	}
	if st.Lambda == LambdaZero {
		if err := ck.verifyNoClosable(j, history); err != nil {
			return err
		}
		ck.progress(ck.closableCost())
	}
	return nil
}

// step returns R_(k+1) from r = R_k; ctx stops it.
func (ck *checker) step(ctx context.Context, j *jointSystem, r *configSet) (*configSet, error) {
	out := newConfigSet()
	done := 0
	for cf := range r.members {
		if done%4096 == 0 && ctx.Err() != nil {
			return nil, ctx.Err()
		}
		j.next(cf, out)
		done++
	}
	ck.progress(ck.stepCost())
	return out, nil
}

// verifyExponent is item S6: R_k != D for every k < e, and R_e = D.
func (ck *checker) verifyExponent(ctx context.Context, j *jointSystem, d *configSet) error {
	e := ck.c.Structure.Exponent
	r := j.first()
	for k := 0; ; k++ {
		full := r.equal(d)
		switch {
		case k < e && full:
			return fmt.Errorf("statement.structure.primitivity_exponent: %d is not least: R_%d already equals D (all %d configurations, recomputed)", e, k, len(d.members))
		case k == e && !full:
			if cf, ok := d.least(func(cf config) bool { return !r.has(cf) }); ok {
				return fmt.Errorf("statement.structure.primitivity_exponent: R_%d lacks the configuration %s of D (recomputed), so T'^%d has no a.e.-positive kernel", e, j.describe(cf), e)
			}
			cf, _ := r.least(func(cf config) bool { return !d.has(cf) })
			return fmt.Errorf("statement.structure.primitivity_exponent: R_%d holds the configuration %s, which is not in D (recomputed)", e, j.describe(cf))
		case k == e:
			return nil
		}
		var err error
		if r, err = ck.step(ctx, j, r); err != nil {
			return err
		}
	}
}

// verifyJointCycle is item S7: R_0 .. R_(s0+p-1) pairwise distinct, none
// equal to D, and R_(s0+p) = R_s0. It returns R_0 .. R_(s0+p-1).
func (ck *checker) verifyJointCycle(ctx context.Context, j *jointSystem, d *configSet) ([]*configSet, error) {
	st := ck.c.Structure
	s0, p := st.CycleStart, st.CycleLength
	var history []*configSet
	r := j.first()
	for k := 0; k < s0+p; k++ {
		if r.equal(d) {
			return nil, fmt.Errorf("statement.structure.class: %s is false: R_%d equals D (recomputed), so the set is primitive with exponent %d", st.Class, k, k)
		}
		for i, h := range history {
			if r.equal(h) {
				return nil, fmt.Errorf("evidence.structure.joint_cycle: R_%d = R_%d already (recomputed), so the sequence first repeats from %d with length %d, not from %d with length %d", k, i, i, k-i, s0, p)
			}
		}
		history = append(history, r)
		var err error
		if r, err = ck.step(ctx, j, r); err != nil {
			return nil, err
		}
	}
	if !r.equal(history[s0]) {
		return nil, fmt.Errorf("evidence.structure.joint_cycle: R_%d differs from R_%d (recomputed): the sequence does not repeat there", s0+p, s0)
	}
	return history, nil
}

// verifyPeriodic is item S8 for class periodic: the sets of the cycle
// (R_s0 first) are pairwise disjoint, lie in D and cover it, and each
// holds all configurations of a pair of states or none.
func verifyPeriodic(j *jointSystem, d *configSet, cycle []*configSet, s0 int) error {
	owner := map[config]int{}
	for i, set := range cycle {
		shared, ok := set.least(func(cf config) bool {
			_, seen := owner[cf]
			return seen
		})
		if ok {
			return fmt.Errorf("statement.structure.class: periodic is false: R_%d and R_%d of the cycle share the configuration %s (recomputed)", s0+owner[shared], s0+i, j.describe(shared))
		}
		if outside, ok := set.least(func(cf config) bool { return !d.has(cf) }); ok {
			return fmt.Errorf("statement.structure.class: periodic is false: R_%d of the cycle holds the configuration %s, which is not in D (recomputed)", s0+i, j.describe(outside))
		}
		for cf := range set.members {
			owner[cf] = i
		}
		if err := wholePairs(j, set, s0+i); err != nil {
			return err
		}
	}
	if missed, ok := d.least(func(cf config) bool { _, in := owner[cf]; return !in }); ok {
		return fmt.Errorf("statement.structure.class: periodic is false: the configuration %s of D lies in no R_k of the cycle (k = %d .. %d, recomputed)", j.describe(missed), s0, s0+len(cycle)-1)
	}
	return nil
}

// wholePairs checks that a set of the cycle (a subset of D) holds, for
// every pair of states (s, c), all C(|s| + |c|, |s|) of its
// configurations or none.
func wholePairs(j *jointSystem, set *configSet, k int) error {
	count := map[[2]int32]int{}
	for cf := range set.members {
		count[[2]int32{cf.s, cf.c}]++
	}
	bin := newBinomials(2 * MaxPatternLength)
	var partial [][2]int32 // the pairs held only in part
	for pair, n := range count {
		if a, b := j.size(pair[0]), j.size(pair[1]); n != int(bin.c[a+b][a]) {
			partial = append(partial, pair)
		}
	}
	if len(partial) == 0 {
		return nil
	}
	least := slices.MinFunc(partial, func(x, y [2]int32) int { return cmp.Or(cmp.Compare(x[0], y[0]), cmp.Compare(x[1], y[1])) })
	a, b := j.size(least[0]), j.size(least[1])
	return fmt.Errorf("statement.structure.class: periodic is false: R_%d holds %d of the %d configurations of the pair (start %s, current %s), not all or none (recomputed)", k, count[least], bin.c[a+b][a], stateName(j.sp.states[least[0]]), stateName(j.sp.states[least[1]]))
}

// inAny reports whether some set holds cf.
func inAny(sets []*configSet, cf config) bool {
	for _, s := range sets {
		if s.has(cf) {
			return true
		}
	}
	return false
}

// verifyNoClosable is item S9: no configuration of R_k, k = 0 .. s0+p-1,
// is closable with k + |s| >= w (a cyclic avoider of that length) or
// k >= s0 (it recurs with the cycle, at lengths as large as we like).
func (ck *checker) verifyNoClosable(j *jointSystem, history []*configSet) error {
	s0 := ck.c.Structure.CycleStart
	for k, set := range history {
		counts := func(cf config) bool { return k+j.size(cf.s) >= j.longest || k >= s0 }
		if cf, ok := set.least(func(cf config) bool { return counts(cf) && j.closable(cf) }); ok {
			why := fmt.Sprintf("its period k + |s| = %d is at least w = %d", k+j.size(cf.s), j.longest)
			if k+j.size(cf.s) < j.longest {
				why = fmt.Sprintf("R_%d recurs with the joint cycle, at periods as long as needed", k)
			}
			return fmt.Errorf("statement.structure.lambda_status: zero is false: the configuration %s of R_%d is closable and %s, so a cyclic avoider exists and lambda > 0 (recomputed)", j.describe(cf), k, why)
		}
	}
	return nil
}

// stateList writes state numbers for messages, such as [1 2 5].
func stateList(states []int) string { return fmt.Sprint(states) }

// blockList writes blocks for messages, such as [[1 2] [5]].
func blockList(blocks [][]int) string {
	parts := make([]string, len(blocks))
	for i, b := range blocks {
		parts[i] = stateList(b)
	}
	return "[" + strings.Join(parts, " ") + "]"
}
