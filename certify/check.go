package certify

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"slices"
	"strings"
)

// Defaults of CheckOptions.
const (
	// DefaultMaxWork is the default cap on the estimated recomputation
	// work, in coefficient operations (one big-integer addition or
	// multiply-add each; see docs/certificate.md, "Limits", for the
	// measured time of one). Every command that writes certificates plans
	// its brackets within this limit and DefaultMaxMemory, so whatever it
	// writes at its defaults passes at these defaults; the memory estimate
	// binds first in practice, this one stops hostile certificates.
	DefaultMaxWork = 1_000_000_000_000
	// DefaultMaxMemory is the default cap on the estimated memory of the
	// recomputation, in bytes: 4 GiB, the one default memory budget of
	// every command (it leaves room on a CI runner with 7 GB of memory).
	DefaultMaxMemory = 4 << 30
)

// ErrLimit is wrapped by every refusal that a raised CheckOptions limit
// could lift; the error is a *LimitError.
var ErrLimit = errors.New("over the checker's limit")

// LimitError is a refusal before the work: the estimate Need of Resource
// ("work" in coefficient operations, "memory" in bytes) is over Limit.
// It unwraps to ErrLimit.
type LimitError struct {
	Resource    string // "work" or "memory"
	Need, Limit float64
}

func (e *LimitError) Error() string {
	if e.Resource == "memory" {
		return fmt.Sprintf("%v: recomputing the evidence needs about %.3g bytes of memory, above the limit of %.3g; raise the memory limit (CheckOptions.MaxMemory, --max-memory) if you expect a certificate this large", ErrLimit, e.Need, e.Limit)
	}
	return fmt.Sprintf("%v: recomputing the evidence needs about %.3g coefficient operations, above the limit of %.3g; raise the work limit (CheckOptions.MaxWork, --max-work) if you expect a certificate this large", ErrLimit, e.Need, e.Limit)
}

func (e *LimitError) Unwrap() error { return ErrLimit }

// CheckOptions tunes Check.
type CheckOptions struct {
	// Expect binds the check to a pattern set: the patterns as a user
	// writes them ("1342", "1.3.4.2", or comma lists "123,321"), parsed
	// by the checker's own parser. A certificate whose irredundant set
	// differs is refused. Empty binds nothing; callers that know which
	// set is claimed must set it.
	Expect []string
	// MaxWork caps the estimated work (0: DefaultMaxWork).
	MaxWork int64
	// MaxMemory caps the estimated memory in bytes (0: DefaultMaxMemory).
	MaxMemory int64
	// Progress, when not nil, is called from Check's goroutine after each
	// step of the recomputation with the work done so far and the
	// estimated total, in the units of MaxWork. done never exceeds total.
	Progress func(done, total int64)
}

// Check verifies a certificate: nil means every claim of its statement is
// proved by its evidence, recomputed here from the pattern set alone.
// Otherwise the error's message names the first failure, on one line,
// quoting at most a few dozen characters of any value.
//
// Check builds the prefix states of the set and recomputes the iterate of
// every bracket's system with its own code (it shares no code with the
// engine), and verifies its digest, a_(n0), and every bracket inequality
// exactly; then that the statement follows from the brackets, that every
// derived field equals its derivation, and that the set is opts.Expect
// when that is set. With a structure section it proves the stated class
// and lambda status with its own code: the state digraph and its recurrent
// states, a recomputation of the sets R_k of joint configurations, and
// the cyclic avoider (see Structure). It refuses, before doing the work, a
// certificate whose estimated work or memory is over the limits
// (errors.Is(err, ErrLimit)). Cancelling ctx stops it within one state's
// step; the error then wraps ctx.Err(). Check does not modify c.
func Check(ctx context.Context, c *Certificate, opts CheckOptions) error {
	// a private, validated copy: nothing the caller holds can change under us
	w, err := toWire(c)
	if err != nil {
		return fmt.Errorf("certificate rejected: %v", err)
	}
	own, err := fromWire(w)
	if err != nil {
		return fmt.Errorf("certificate rejected: %v", err)
	}
	if opts.MaxWork <= 0 {
		opts.MaxWork = DefaultMaxWork
	}
	if opts.MaxMemory <= 0 {
		opts.MaxMemory = DefaultMaxMemory
	}
	ck := &checker{c: own, opts: opts}
	if err := ck.statement(); err != nil {
		return fmt.Errorf("certificate rejected: %v", err)
	}
	if err := ck.limits(); err != nil {
		return fmt.Errorf("certificate refused: %w", err)
	}
	for _, verify := range []func(context.Context) error{ck.verifyStructure, ck.recompute} {
		if err := verify(ctx); err != nil {
			if ctx.Err() != nil {
				return fmt.Errorf("check interrupted: %w", ctx.Err())
			}
			return fmt.Errorf("certificate rejected: %v", err)
		}
	}
	return nil
}

type checker struct {
	c    *Certificate
	opts CheckOptions
	set  patternSet
	sp   *stateSpace
	allN int // index of the bracket the all-n bounds come from
	// the recurrent states and their blocks (structure sections only)
	recurrent []int
	blocks    [][]int
	// the progress of recompute, in work units
	done, total float64
}

// describe names a bracket in messages.
func (ck *checker) describe(i int) string {
	b := ck.c.Evidence.Brackets[i]
	what := "whole system"
	if !ck.whole(b) {
		what = fmt.Sprintf("%d of %d states, start %s", len(b.States), len(ck.sp.states), b.Start)
	}
	return fmt.Sprintf("evidence.brackets[%d] (%s, step %d, n %d)", i, what, b.Step, b.N)
}

func (ck *checker) whole(b Bracket) bool { return len(b.States) == len(ck.sp.states) }

// startN is the n at which a bracket's system starts: 0 for the whole
// system, the longest of its states for a restricted one.
func (ck *checker) startN(b Bracket) int {
	if ck.whole(b) {
		return 0
	}
	n := 0
	for _, p := range b.States {
		n = max(n, len(ck.sp.states[p]))
	}
	return n
}

// firstN is the least N of a bracket of b's system: the longest state (M)
// for the whole system, n_s for a restricted one.
func (ck *checker) firstN(b Bracket) int {
	if ck.whole(b) {
		return ck.sp.maxLen
	}
	return ck.startN(b)
}

// statement checks everything that needs no iterate: the set, the derived
// fields, the form of the brackets, and that the claims follow from the
// brackets' claims.
func (ck *checker) statement() error {
	st := &ck.c.Statement
	set, err := parseSet(st.Given)
	if err != nil {
		return fmt.Errorf("statement.patterns_given: %v", err)
	}
	if !slices.Equal(set.strings(), st.Patterns) {
		return fmt.Errorf("statement.patterns: %s is not the irredundant set %s of the patterns given", abbreviate(strings.Join(st.Patterns, ",")), abbreviate(strings.Join(set.strings(), ",")))
	}
	canon := set.canonical().strings()
	if !slices.Equal(canon, st.Canonical) {
		return fmt.Errorf("statement.canonical_patterns: %s is not the symmetry representative %s", abbreviate(strings.Join(st.Canonical, ",")), abbreviate(strings.Join(canon, ",")))
	}
	if len(ck.opts.Expect) > 0 {
		expect, err := parseSet(PatternTokens(ck.opts.Expect))
		if err != nil {
			return fmt.Errorf("the expected set: %v", err)
		}
		if !slices.Equal(expect.strings(), set.strings()) {
			return fmt.Errorf("the certificate is for the set %s, not for the expected set %s", abbreviate(strings.Join(set.strings(), ",")), abbreviate(strings.Join(expect.strings(), ",")))
		}
	}
	ck.set = set
	ck.sp = newStateSpace(set)
	if n := len(ck.sp.states); ck.c.Evidence.States != n {
		return fmt.Errorf("evidence.states: %d, but the set has %d prefix states", ck.c.Evidence.States, n)
	}

	for _, r := range []struct {
		name string
		r    Range
	}{{"statement.lambda", st.Lambda}, {"statement.radius", st.Radius}} {
		if want := decimalOutward(r.r.Lo, r.r.Digits, false); r.r.LoDecimal != want {
			return fmt.Errorf("%s.lo_decimal: %q is not lo rounded down to %d significant digits (%q)", r.name, abbreviate(r.r.LoDecimal), r.r.Digits, abbreviate(want))
		}
		want := ""
		if r.r.Hi != nil {
			want = decimalOutward(r.r.Hi, r.r.Digits, true)
		}
		if r.r.HiDecimal != want {
			return fmt.Errorf("%s.hi_decimal: %q is not hi rounded up to %d significant digits (%q)", r.name, abbreviate(r.r.HiDecimal), r.r.Digits, abbreviate(want))
		}
	}

	brackets := ck.c.Evidence.Brackets
	for i, b := range brackets {
		for j, p := range b.States {
			if p < 0 || p >= len(ck.sp.states) {
				return fmt.Errorf("evidence.brackets[%d].states: state %d out of range 0..%d", i, p, len(ck.sp.states)-1)
			}
			if j > 0 && p <= b.States[j-1] {
				return fmt.Errorf("evidence.brackets[%d].states: not strictly increasing at entry %d", i, j)
			}
		}
		switch {
		case ck.whole(b) && b.Start != StartEmpty:
			return fmt.Errorf("evidence.brackets[%d].start: %s, but all states make the whole system, which starts empty", i, b.Start)
		case !ck.whole(b) && b.Start == StartEmpty:
			return fmt.Errorf("evidence.brackets[%d].start: empty is the whole system's start; a restricted system starts ones or whole", i)
		case b.N < ck.firstN(b):
			return fmt.Errorf("%s: n is below %d, where this system's brackets begin (every state of it must have coefficients)", ck.describe(i), ck.firstN(b))
		}
		if i > 0 && compareBrackets(brackets[i-1], b) >= 0 {
			return fmt.Errorf("evidence.brackets[%d]: brackets must be distinct and in canonical order (more states first, then states, start, step, n)", i)
		}
	}
	if err := ck.claims(); err != nil {
		return err
	}
	return ck.structureForm()
}

// claims checks that the statement follows from the brackets' own claims
// (which recompute verifies).
func (ck *checker) claims() error {
	st := &ck.c.Statement
	lam, rad := st.Lambda, st.Radius
	brackets := ck.c.Evidence.Brackets
	one := big.NewRat(1, 1)
	if lam.Hi == nil {
		return errors.New("statement.lambda.hi is missing: a certificate states a finite upper bound")
	}
	if lam.Lo.Cmp(lam.Hi) > 0 {
		return errors.New("statement.lambda: lo is above hi")
	}
	if new(big.Rat).Mul(rad.Lo, lam.Hi).Cmp(one) > 0 {
		return errors.New("statement.radius.lo: radius.lo * lambda.hi exceeds 1, so radius.lo is not a lower bound of 1/lambda")
	}
	switch {
	case lam.Lo.Sign() == 0 && rad.Hi != nil:
		return errors.New("statement.radius.hi: must be absent (infinite) since lambda.lo is 0")
	case lam.Lo.Sign() > 0 && rad.Hi == nil:
		return errors.New("statement.radius.hi: missing, although lambda.lo > 0 gives a finite bound")
	case rad.Hi != nil && new(big.Rat).Mul(rad.Hi, lam.Lo).Cmp(one) < 0:
		return errors.New("statement.radius.hi: radius.hi * lambda.lo is below 1, so radius.hi is not an upper bound of 1/lambda")
	}

	// lower end: the whole system, or a restricted one started from it
	loPow, hiPow := newPowers(lam.Lo), newPowers(lam.Hi)
	if lam.Lo.Sign() > 0 {
		found := false
		for _, b := range brackets {
			if b.Start != StartOnes && loPow.cmp(b.Step, b.Lo) <= 0 {
				found = true
				break
			}
		}
		if !found {
			return errors.New("statement.lambda.lo: no bracket of the whole system or with start whole has lo >= lambda.lo^step")
		}
	}

	// upper end: the brackets marked upper partition the states, one
	// whole-system bracket or ones-start blocks in an acyclic order
	block := make([]int, len(ck.sp.states))
	for i := range block {
		block[i] = -1
	}
	var upper []int
	for i, b := range brackets {
		if !b.Upper {
			continue
		}
		switch {
		case b.Hi == nil:
			return fmt.Errorf("%s: carries the upper bound but its hi is infinite", ck.describe(i))
		case b.Start == StartWhole:
			return fmt.Errorf("%s: a bracket with start whole bounds lambda from below only; an upper block starts ones", ck.describe(i))
		case hiPow.cmp(b.Step, b.Hi) < 0:
			return fmt.Errorf("statement.lambda.hi: lambda.hi^%d is below the hi of %s", b.Step, ck.describe(i))
		}
		for _, p := range b.States {
			if block[p] >= 0 {
				return fmt.Errorf("%s: state %d is also in evidence.brackets[%d]; the brackets marked upper must partition the states", ck.describe(i), p, block[p])
			}
			block[p] = i
		}
		upper = append(upper, i)
	}
	if len(upper) == 0 {
		return errors.New("evidence: no bracket is marked upper, so nothing proves statement.lambda.hi")
	}
	for p, b := range block {
		if b < 0 {
			return fmt.Errorf("evidence: state %d is in no bracket marked upper; they must partition the states", p)
		}
	}
	if len(upper) > 1 {
		if err := ck.acyclic(block, upper); err != nil {
			return err
		}
	}

	// all-n bounds: the whole-system step-1 bracket with N = n0
	a := st.AllN
	ck.allN = -1
	for i, b := range brackets {
		if ck.whole(b) && b.Step == 1 && b.N == a.N0 {
			ck.allN = i
		}
	}
	if ck.allN < 0 {
		return fmt.Errorf("statement.all_n.n0: no whole-system bracket with step 1 and n = n0 = %d", a.N0)
	}
	b := brackets[ck.allN]
	if a.MuLo.Cmp(b.Lo) > 0 {
		return fmt.Errorf("statement.all_n.mu_lo: above the lo of %s", ck.describe(ck.allN))
	}
	switch {
	case a.MuHi != nil && b.Hi == nil:
		return fmt.Errorf("statement.all_n.mu_hi: must be absent, since the hi of %s is infinite", ck.describe(ck.allN))
	case a.MuHi != nil && a.MuHi.Cmp(b.Hi) < 0:
		return fmt.Errorf("statement.all_n.mu_hi: below the hi of %s", ck.describe(ck.allN))
	}
	return nil
}

// acyclic checks that the moves visit the blocks in a fixed order: the
// digraph of blocks (an edge for every move of the whole system between
// states of different blocks) has no cycle. Then T' is block-triangular
// and its spectral radius is the largest over the blocks.
func (ck *checker) acyclic(block, upper []int) error {
	out := map[int]map[int]bool{}
	indegree := map[int]int{}
	for p, moves := range ck.sp.moves {
		for _, mv := range moves {
			from, to := block[p], block[mv.to]
			if !mv.allowed || from == to || out[from][to] {
				continue
			}
			if out[from] == nil {
				out[from] = map[int]bool{}
			}
			out[from][to] = true
			indegree[to]++
		}
	}
	// Kahn: repeatedly remove a block with no incoming edge
	var ready []int
	for _, b := range upper {
		if indegree[b] == 0 {
			ready = append(ready, b)
		}
	}
	removed := 0
	for len(ready) > 0 {
		b := ready[len(ready)-1]
		ready = ready[:len(ready)-1]
		removed++
		for to := range out[b] {
			if indegree[to]--; indegree[to] == 0 {
				ready = append(ready, to)
			}
		}
	}
	if removed < len(upper) {
		return errors.New("evidence: the brackets marked upper are not in block-triangular order: moves lead around a cycle of their state sets, so their brackets do not bound lambda")
	}
	return nil
}

// group is the brackets that share one system (states and start).
type group struct {
	states   []int // nil: whole system
	start    Start
	brackets []int
	top      int // the largest N+d
}

func (ck *checker) groups() []group {
	var gs []group
	for i, b := range ck.c.Evidence.Brackets {
		var states []int
		if !ck.whole(b) {
			states = b.States
		}
		if n := len(gs); n > 0 && slices.Equal(gs[n-1].states, states) && gs[n-1].start == b.Start {
			gs[n-1].brackets = append(gs[n-1].brackets, i)
			gs[n-1].top = max(gs[n-1].top, b.N+b.Step)
			continue
		}
		// canonical order keeps the brackets of one system adjacent
		gs = append(gs, group{states: states, start: b.Start, brackets: []int{i}, top: b.N + b.Step})
	}
	return gs
}

// powers compares powers of one rational p/q with other rationals, in
// integers (no reduction of the large powers), caching p^d and q^d.
type powers struct {
	r    *big.Rat
	p, q map[int]*big.Int
}

func newPowers(r *big.Rat) *powers {
	return &powers{r: r, p: map[int]*big.Int{}, q: map[int]*big.Int{}}
}

// cmp compares r^d with x: -1, 0 or +1.
func (pw *powers) cmp(d int, x *big.Rat) int {
	if pw.p[d] == nil {
		e := big.NewInt(int64(d))
		pw.p[d] = new(big.Int).Exp(pw.r.Num(), e, nil)
		pw.q[d] = new(big.Int).Exp(pw.r.Denom(), e, nil)
	}
	// p^d/q^d <=> x.num/x.den:  p^d * x.den <=> x.num * q^d
	left := new(big.Int).Mul(pw.p[d], x.Denom())
	return left.Cmp(new(big.Int).Mul(x.Num(), pw.q[d]))
}
