package certify

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// StructureClass names a property of a pattern set that a version 2
// certificate states and the checker proves (docs/certificate.md, "What
// each class proves"). The strings are those of structure.Class.
type StructureClass string

const (
	// ClassPrimitive: R_e is the whole domain of joint patterns and no
	// earlier R_k is, so T^e has an a.e.-positive kernel.
	ClassPrimitive StructureClass = "primitive"
	// ClassPeriodic: the R_k repeat with period p >= 2, the p sets of the
	// cycle are disjoint and cover the domain: walks join every pair of
	// start cells, and no power of T has an a.e.-positive kernel.
	ClassPeriodic StructureClass = "periodic"
	// ClassReducible: some start cell has no walk to another (or to
	// itself), so T is reducible.
	ClassReducible StructureClass = "reducible"
	// ClassFinite: the window digraph has no cycle; a_n = 0 exactly from
	// n = N1 on.
	ClassFinite StructureClass = "finite"
	// ClassSubexponential: lambda = 0 proved while the window digraph has
	// a cycle, so a_n > 0 for every n.
	ClassSubexponential StructureClass = "subexponential"
	// ClassUndecided: no class is claimed.
	ClassUndecided StructureClass = "undecided"
)

// LambdaStatus is what a certificate claims about lambda > 0. The strings
// are those of structure.Lambda.
type LambdaStatus string

const (
	LambdaPositive  LambdaStatus = "positive"  // shown by a cyclic avoider
	LambdaZero      LambdaStatus = "zero"      // recomputed by the checker
	LambdaUndecided LambdaStatus = "undecided" // nothing claimed
)

// EvidenceMode says how a primitive certificate shows that R_e is the
// whole domain.
type EvidenceMode string

const (
	// ModeWitnesses lists one witness permutation per joint pattern; the
	// checker verifies each (linear in the list).
	ModeWitnesses EvidenceMode = "witnesses"
	// ModeRecompute lists nothing; the checker recomputes R_e itself. For
	// m = 5 the (2m)! = 3628800 witnesses would not fit a file.
	ModeRecompute EvidenceMode = "recompute"
)

// Fixed strings and limits of the structure section.
const (
	StructureMethod        = "window digraph and joint patterns"
	StructureMethodVersion = 1
	// MaxJointM is the largest m for which the checker recomputes joint
	// patterns: (2m)! = 3628800 of them at m = 5.
	MaxJointM = 5
	// MaxJointSteps bounds k - m for the exponent and the joint cycle.
	MaxJointSteps = 1000
	// MaxPermLength bounds the length of a witness or cyclic avoider.
	MaxPermLength = 2048
)

// Structure is the structure section of a format version 2 certificate:
// a claim about the transfer operator of the set and its evidence. The
// command line fills it from a structure.Report (see docs/certificate.md
// for the mapping); Check proves every claim with its own code.
//
// Free fields are Class and Lambda (each may be any claim the checker
// proves, or undecided), Mode, and CyclicAvoider (any cyclic avoider).
// Every other field is derived from the set and the free fields and must
// equal its derivation.
type Structure struct {
	Class StructureClass
	// Exponent is the least e with R_e the whole domain (ClassPrimitive
	// only, else 0).
	Exponent int
	// Period is the least period of the R_k sequence (ClassPeriodic only,
	// else 0); it equals CycleLength.
	Period int
	// N1 is the least n with a_n = 0 (ClassFinite only, else 0).
	N1 int
	// Unreached is the least pair of start cells, in rank order of From
	// then To, with no walk of one or more windows from From to To
	// (ClassReducible only, else nil).
	Unreached *CellPair
	Lambda    LambdaStatus

	// Mode is how R_e is shown full (ClassPrimitive only, else "").
	Mode EvidenceMode
	// Witnesses lists, for ModeWitnesses, one avoiding permutation of
	// length m+Exponent per joint pattern of the domain, in increasing
	// rank of the joint pattern (its first m and last m entries); nil
	// otherwise. structure.Witnesses.Each gives them in this order.
	Witnesses [][]int
	// CycleStart and CycleLength: the R_k sequence first repeats at
	// R_CycleStart = R_(CycleStart+CycleLength) (both least). Present
	// (non-zero) exactly when Class is periodic, or Lambda is zero and some
	// cycle of the window digraph passes through two or more cells (then
	// the checker decides lambda = 0 on the joint patterns).
	CycleStart, CycleLength int
	// CyclicAvoider is a permutation of length at least m+1 whose cyclic
	// windows all avoid the set (LambdaPositive only, else nil).
	CyclicAvoider []int
}

// CellPair is a pair of order cells (permutations of 1..m).
type CellPair struct{ From, To []int }

// parsePerm reads a permutation of 1..L (1 <= L <= MaxPermLength) in its
// one spelling, that of formatPerm.
func parsePerm(s string) ([]int, error) {
	switch {
	case s == "":
		return nil, fmt.Errorf("empty; write a permutation like 1342, or 1.10.2.3.4.5.6.7.8.9 with more than 9 entries")
	case len(s) > 5*MaxPermLength:
		return nil, fmt.Errorf("%d characters; a permutation of at most %d entries has at most %d", len(s), MaxPermLength, 5*MaxPermLength)
	}
	p := make([]int, 0, strings.Count(s, ".")+1)
	if strings.IndexByte(s, '.') < 0 {
		p = make([]int, 0, len(s))
		for i := 0; i < len(s); i++ {
			if s[i] < '0' || s[i] > '9' {
				return nil, fmt.Errorf("%q has a character other than a digit or a dot", abbreviate(s))
			}
			p = append(p, int(s[i]-'0'))
		}
	} else {
		v, digits := 0, 0
		for i := 0; i <= len(s); i++ {
			switch {
			case i == len(s) || s[i] == '.':
				if digits == 0 {
					return nil, fmt.Errorf("%q has an empty entry between dots", abbreviate(s))
				}
				p = append(p, v)
				v, digits = 0, 0
			case s[i] < '0' || s[i] > '9':
				return nil, fmt.Errorf("%q has a character other than a digit or a dot", abbreviate(s))
			case digits > 0 && v == 0:
				return nil, fmt.Errorf("%q has an entry with a leading zero", abbreviate(s))
			case digits == 4:
				return nil, fmt.Errorf("%q has an entry of more than 4 digits", abbreviate(s))
			default:
				v, digits = 10*v+int(s[i]-'0'), digits+1
			}
		}
		if len(p) <= 9 {
			return nil, fmt.Errorf("%q is written with dots, but a permutation of at most 9 entries is written as digits", abbreviate(s))
		}
	}
	if len(p) > MaxPermLength {
		return nil, fmt.Errorf("%d entries; at most %d", len(p), MaxPermLength)
	}
	seen := make([]bool, len(p)+1)
	for _, v := range p {
		switch {
		case v < 1 || v > len(p):
			return nil, fmt.Errorf("%q is not a permutation: entry %d is outside 1..%d", abbreviate(s), v, len(p))
		case seen[v]:
			return nil, fmt.Errorf("%q is not a permutation: value %d repeats", abbreviate(s), v)
		}
		seen[v] = true
	}
	return p, nil
}

// formatPerm writes a permutation in its one spelling: digits for
// at most 9 entries ("1342"), entries separated by dots for more
// ("1.10.2.3.4.5.6.7.8.9").
func formatPerm(p []int) string {
	buf := make([]byte, 0, 3*len(p))
	for i, v := range p {
		if i > 0 && len(p) > 9 {
			buf = append(buf, '.')
		}
		buf = strconv.AppendInt(buf, int64(v), 10)
	}
	return string(buf)
}

// describeJoint writes a joint pattern of rank r over S_2m.
func describeJoint(m, r int) string { return formatPerm(unrank(2*m, r)) }

// structureClaims checks the structure section's form against the set and
// everything that needs only the window digraph: which members are
// present, the finite and reducible classes, the cyclic avoider, and the
// cheap proof of lambda = 0. The joint patterns are left to
// verifyStructure.
func (ck *checker) structureClaims() error {
	st := ck.c.Structure
	if st == nil {
		return nil
	}
	m := ck.m
	g := newCellGraph(ck.win)
	longest := g.longestPath()
	_, _, crosses := g.crossCycle()
	ck.zeroByJoints = st.Lambda == LambdaZero && crosses

	// the class
	if err := presence([]optional{
		{"statement.structure.exponent", st.Exponent != 0, st.Class == ClassPrimitive, "class primitive"},
		{"statement.structure.period", st.Period != 0, st.Class == ClassPeriodic, "class periodic"},
		{"statement.structure.finite_from", st.N1 != 0, st.Class == ClassFinite, "class finite"},
		{"statement.structure.unreached", st.Unreached != nil, st.Class == ClassReducible, "class reducible"},
		{"evidence.structure.mode", st.Mode != "", st.Class == ClassPrimitive, "class primitive"},
		{"evidence.structure.witnesses", st.Witnesses != nil, st.Mode == ModeWitnesses, "mode witnesses"},
	}); err != nil {
		return err
	}
	switch c := st.Class; {
	case c == ClassUndecided:
	case c == ClassFinite:
		if longest < 0 {
			return fmt.Errorf("statement.structure.class: finite is false: the window digraph has a cycle, so a_n > 0 for every n")
		}
		if want := m + longest + 1; st.N1 != want {
			return fmt.Errorf("statement.structure.finite_from: %d, but the longest walk of the window digraph has %d windows, so a_n = 0 exactly from n = m+%d+1 = %d", st.N1, longest, longest, want)
		}
	case longest >= 0:
		return fmt.Errorf("statement.structure.class: %s is false: the window digraph has no cycle, so the set is finite (a_n = 0 from n = %d)", c, m+longest+1)
	case c == ClassReducible:
		u, v, ok := g.unreached()
		if !ok {
			return fmt.Errorf("statement.structure.class: reducible is false: every start cell reaches every start cell through the window digraph")
		}
		from, to := unrank(m, u), unrank(m, v)
		if !slices.Equal(st.Unreached.From, from) || !slices.Equal(st.Unreached.To, to) {
			return fmt.Errorf("statement.structure.unreached: (%s, %s) is not the least pair of start cells without a walk, which is (%s, %s)", abbreviate(formatPerm(st.Unreached.From)), abbreviate(formatPerm(st.Unreached.To)), formatPerm(from), formatPerm(to))
		}
	case m > MaxJointM && (c == ClassPrimitive || c == ClassPeriodic):
		return fmt.Errorf("statement.structure.class: %s needs the joint-pattern test, which this checker runs for m <= %d only (here m = %d); state undecided", c, MaxJointM, m)
	case c == ClassPrimitive && (st.Exponent < m || st.Exponent > m+MaxJointSteps):
		return fmt.Errorf("statement.structure.exponent: %d is outside m..m+%d = %d..%d (joint patterns start at k = m)", st.Exponent, MaxJointSteps, m, m+MaxJointSteps)
	case c == ClassPeriodic && st.Period != st.CycleLength:
		return fmt.Errorf("statement.structure.period: %d is not the length %d of evidence.structure.joint_cycle", st.Period, st.CycleLength)
	case c == ClassPeriodic && st.Period < 2:
		return fmt.Errorf("statement.structure.period: %d; a periodic class has period at least 2 (a cycle of length 1 is primitive or not covering)", st.Period)
	}
	if (st.Class == ClassFinite || st.Class == ClassSubexponential) && st.Lambda != LambdaZero {
		return fmt.Errorf("statement.structure.lambda_status: %s, but class %s states lambda = 0: write zero", st.Lambda, st.Class)
	}

	// lambda
	if err := presence([]optional{
		{"evidence.structure.cyclic_avoider", st.CyclicAvoider != nil, st.Lambda == LambdaPositive, "lambda_status positive"},
		{"evidence.structure.joint_cycle", st.CycleLength != 0, st.Class == ClassPeriodic || ck.zeroByJoints,
			"class periodic, or lambda_status zero when a cycle of the window digraph passes through two or more cells,"},
	}); err != nil {
		return err
	}
	switch st.Lambda {
	case LambdaPositive:
		p := st.CyclicAvoider
		if len(p) < m+1 {
			return fmt.Errorf("evidence.structure.cyclic_avoider: %s has length %d; a cyclic avoider has at least m+1 = %d entries", abbreviate(formatPerm(p)), len(p), m+1)
		}
		if i := ck.cyclicForbidden(p); i >= 0 {
			return fmt.Errorf("evidence.structure.cyclic_avoider: %s is not a cyclic avoider: its cyclic window at positions %d..%d (wrapping around) contains %s", abbreviate(formatPerm(p)), i+1, (i+m)%len(p)+1, ck.member(cyclicWindow(p, i, m+1)))
		}
	case LambdaZero:
		if ck.zeroByJoints && m > MaxJointM {
			return fmt.Errorf("statement.structure.lambda_status: zero needs the joint-pattern automaton here (a cycle of the window digraph passes through two or more cells), which this checker runs for m <= %d only (here m = %d); state undecided", MaxJointM, m)
		}
	}
	if st.CycleLength != 0 && (st.CycleStart < m || st.CycleStart+st.CycleLength > m+MaxJointSteps) {
		return fmt.Errorf("evidence.structure.joint_cycle: start %d and length %d are outside m..m+%d (joint patterns start at k = m)", st.CycleStart, st.CycleLength, MaxJointSteps)
	}
	return nil
}

// optional is an optional member of the structure section: whether it is
// present, whether it must be, and for what.
type optional struct {
	field     string
	has, want bool
	why       string
}

func presence(members []optional) error {
	for _, p := range members {
		switch {
		case p.has && !p.want:
			return fmt.Errorf("%s: present, but it belongs only to %s", p.field, p.why)
		case !p.has && p.want:
			return fmt.Errorf("%s: missing; %s states it", p.field, p.why)
		}
	}
	return nil
}

// cyclicWindow returns the entries p_i..p_{i+w-1}, indices modulo len(p).
func cyclicWindow(p []int, i, w int) []int {
	out := make([]int, w)
	for t := range out {
		out[t] = p[(i+t)%len(p)]
	}
	return out
}

// cyclicForbidden returns the start of the first cyclic window of length
// m+1 of p that is not allowed, or -1 when p is a cyclic avoider.
func (ck *checker) cyclicForbidden(p []int) int {
	w := make([]int, ck.m+1)
	for i := range p {
		for t := range w {
			w[t] = p[(i+t)%len(p)]
		}
		if !ck.win.allowed[rankOf(w)] {
			return i
		}
	}
	return -1
}

// member names a member of the set that the window (not allowed) contains.
func (ck *checker) member(window []int) string {
	for _, p := range ck.set {
		if occursIn(p, window) {
			return "the pattern " + p.String()
		}
	}
	return "a forbidden pattern" // unreachable: a window is allowed when it contains no member
}

// structureWork estimates, in the unit of the bracket work (about 52 ns),
// the work and the memory of verifyStructure.
func (ck *checker) structureWork() (work, memory float64) {
	st := ck.c.Structure
	if st == nil {
		return 0, 0
	}
	m := ck.m
	top := ck.jointTop()
	if top >= m || st.Mode == ModeWitnesses {
		size := float64(factorial(2 * m))
		steps := float64(max(top-m, 0))
		// R_m and the domain: about 3 units per joint pattern; a step about
		// 4 per member; the closable scan about 3 per member of the union
		work += size * (3 + 4*steps)
		held := 3.0 // domain, current and next
		if st.CycleLength != 0 {
			work += 3 * size
			held += 2 * (steps + 1) // the sets of the cycle and their keys
		}
		memory = held * size / 8
	}
	if ck.zeroByJoints {
		for L := m + 1; L < 2*m; L++ { // the short cyclic search
			work += float64(factorial(L)) * float64(L*L) / 8
		}
	}
	for _, w := range st.Witnesses { // reading and checking the windows
		work += float64(len(w)) * (float64(m*m)/16 + 0.25)
	}
	return work, memory
}

// jointTop returns the largest k whose R_k verifyStructure computes, or -1.
func (ck *checker) jointTop() int {
	st := ck.c.Structure
	top := -1
	if st.Class == ClassPrimitive {
		top = st.Exponent
		if st.Mode == ModeWitnesses {
			top-- // R_e is shown by the witnesses; R_m..R_{e-1} for minimality
		}
	}
	if st.CycleLength != 0 {
		top = max(top, st.CycleStart+st.CycleLength)
	}
	return top
}

// verifyStructure proves the claims that need the joint patterns: the
// witnesses, the exponent, the joint cycle, the periodic class, and
// lambda = 0 by the joint-pattern automaton.
func (ck *checker) verifyStructure() error {
	st := ck.c.Structure
	if st == nil {
		return nil
	}
	m := ck.m
	top := ck.jointTop()
	if top < m && st.Mode != ModeWitnesses {
		return nil
	}
	jp := newJointPatterns(ck.win)
	if st.Mode == ModeWitnesses {
		if err := ck.verifyWitnesses(jp); err != nil {
			return err
		}
	}
	end := st.CycleStart + st.CycleLength // 0 without a joint cycle
	var history []bitset                  // R_m..R_{end-1}
	seen := map[string]int{}
	cur := jp.first
	for k := m; k <= top; k++ {
		if k > m {
			cur = jp.step(cur)
		}
		if st.Class == ClassPrimitive {
			missing := jp.domain.firstNotIn(cur)
			switch {
			case k < st.Exponent && missing < 0:
				return fmt.Errorf("statement.structure.exponent: %d is not least: R_%d already holds all %d joint patterns of the domain (recomputed)", st.Exponent, k, jp.domain.count())
			case k == st.Exponent && missing >= 0:
				return fmt.Errorf("statement.structure.exponent: R_%d lacks the joint pattern %s of the domain (recomputed), so T^%d has no a.e.-positive kernel", k, jp.describe(missing), k)
			}
		}
		switch {
		case k < end:
			key := cur.key()
			if j, dup := seen[key]; dup {
				return fmt.Errorf("evidence.structure.joint_cycle: R_%d = R_%d already (recomputed), so the R_k first repeat from k = %d with period %d, not from %d with period %d", k, j, j, k-j, st.CycleStart, st.CycleLength)
			}
			seen[key] = k
			history = append(history, cur)
		case k == end:
			if !cur.equal(history[st.CycleStart-m]) {
				return fmt.Errorf("evidence.structure.joint_cycle: R_%d differs from R_%d (recomputed): the R_k do not repeat there", end, st.CycleStart)
			}
		}
	}
	if st.Class == ClassPeriodic {
		if err := ck.verifyPeriodic(jp, history[st.CycleStart-m:]); err != nil {
			return err
		}
	}
	if ck.zeroByJoints {
		return ck.verifyLambdaZero(jp, history)
	}
	return nil
}

// verifyWitnesses checks that the witnesses show R_e = D: each is a
// permutation of length m+e that avoids the set (so its joint pattern lies
// in R_e, and in D), their joint patterns strictly increase, and there are
// as many as D has members, so every member has one.
func (ck *checker) verifyWitnesses(jp *jointPatterns) error {
	st := ck.c.Structure
	m, L := ck.m, ck.m+st.Exponent
	last := -1
	joint := make([]int, 2*m)
	for i, w := range st.Witnesses {
		field := fmt.Sprintf("evidence.structure.witnesses[%d]", i)
		if len(w) != L {
			return fmt.Errorf("%s: %s has length %d; the exponent %d needs witnesses of length m+e = %d", field, abbreviate(formatPerm(w)), len(w), st.Exponent, L)
		}
		if at := jp.forbiddenWindow(w); at >= 0 {
			return fmt.Errorf("%s: %s contains %s at positions %d..%d", field, abbreviate(formatPerm(w)), ck.member(w[at:at+m+1]), at+1, at+m+1)
		}
		copy(joint, w[:m])
		copy(joint[m:], w[L-m:])
		r := rankOf(joint)
		if r <= last {
			return fmt.Errorf("%s: its joint pattern %s (first and last %d entries) does not come after %s of the witness before; list one witness per joint pattern, in increasing order", field, describeJoint(m, r), m, describeJoint(m, last))
		}
		last = r
	}
	if n, full := len(st.Witnesses), jp.domain.count(); n != full {
		covered := newBitset(jp.size)
		for _, w := range st.Witnesses {
			copy(joint, w[:m])
			copy(joint[m:], w[L-m:])
			covered.set(jp.numberOf(joint))
		}
		return fmt.Errorf("evidence.structure.witnesses: the joint pattern %s of the domain has no witness (%d witnesses for %d joint patterns)", jp.describe(jp.domain.firstNotIn(covered)), n, full)
	}
	return nil
}

// verifyPeriodic checks that the sets of the cycle are pairwise disjoint
// and cover the domain.
func (ck *checker) verifyPeriodic(jp *jointPatterns, sets []bitset) error {
	st := ck.c.Structure
	union := newBitset(jp.size)
	for i, set := range sets {
		if r := set.firstIn(union); r >= 0 {
			j := 0
			for !sets[j].has(r) {
				j++
			}
			return fmt.Errorf("statement.structure.class: periodic is false: R_%d and R_%d of the cycle share the joint pattern %s", st.CycleStart+j, st.CycleStart+i, jp.describe(r))
		}
		union.or(set)
	}
	if r := jp.domain.firstNotIn(union); r >= 0 {
		return fmt.Errorf("statement.structure.class: periodic is false: the joint pattern %s of the domain lies in no R_k of the cycle (k = %d..%d)", jp.describe(r), st.CycleStart, st.CycleStart+st.CycleLength-1)
	}
	return nil
}

// verifyLambdaZero proves that no cyclic avoider exists. A permutation of
// length L >= 2m is one exactly when it avoids the set and its m windows
// that wrap around are allowed; those consist of its first m and last m
// entries only, disjoint, so they are allowed or not by its joint pattern
// (closable). So a cyclic avoider of length L >= 2m exists iff R_{L-m}
// holds a closable joint pattern, and the sets of the cycle (with those
// before it) are all the R_k. Lengths m+1..2m-1 are searched exhaustively.
func (ck *checker) verifyLambdaZero(jp *jointPatterns, sets []bitset) error {
	m := ck.m
	for L := m + 1; L < 2*m; L++ {
		q := identity(L)
		for {
			if ck.cyclicForbidden(q) < 0 {
				return fmt.Errorf("statement.structure.lambda_status: zero is false: %s is a cyclic avoider of length %d", formatPerm(q), L)
			}
			if nextPerm(q) < 0 {
				break
			}
		}
	}
	union := newBitset(jp.size)
	for _, set := range sets {
		union.or(set)
	}
	found := -1
	union.each(func(r int) bool {
		if jp.closable(jp.perm(r)) {
			found = r
			return false
		}
		return true
	})
	if found >= 0 {
		k := m
		for i, set := range sets {
			if set.has(found) {
				k = m + i
				break
			}
		}
		return fmt.Errorf("statement.structure.lambda_status: zero is false: the joint pattern %s of R_%d closes (its %d wrap-around windows are allowed), so a cyclic avoider of length %d exists", jp.describe(found), k, m, m+k)
	}
	return nil
}
