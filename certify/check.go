package certify

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"
	"strings"

	"avoidcert/pattern"
)

// Defaults of CheckOptions.
const (
	// DefaultMaxWork is the default cap on the estimated recomputation
	// work, in coefficient operations (one big-integer addition or
	// multiply-add each); about a minute on one core.
	DefaultMaxWork = 1_000_000_000
	// DefaultMaxMemory is the default cap on the estimated memory of the
	// recomputed iterates, in bytes.
	DefaultMaxMemory = 2 << 30
)

// ErrLimit is wrapped by every refusal that a raised CheckOptions limit
// could lift.
var ErrLimit = errors.New("over the checker's limit")

// CheckOptions tunes Check.
type CheckOptions struct {
	// Expect binds the check to a pattern set: a certificate whose
	// irredundant set differs is refused. The zero Set binds nothing;
	// callers that know which set is claimed must set it.
	Expect pattern.Set
	// MaxWork caps the estimated work (0: DefaultMaxWork).
	MaxWork int64
	// MaxMemory caps the estimated memory in bytes (0: DefaultMaxMemory).
	MaxMemory int64
	// Progress, when set, is called from Check's goroutine after each
	// recomputed iterate with the estimated coefficient operations of the
	// iteration steps done so far and of all of them (the bulk of the
	// work, in the units of MaxWork). It must not block for long.
	Progress func(done, total int64)
}

// Check verifies a certificate: nil means every claim of its statement is
// proved by its evidence, recomputed here from the pattern set alone.
// Otherwise the error's message names the first failure, on one line.
//
// Check recomputes the iterate G_k of every bracket's system from the
// combinatorial recurrence (it shares no code with the fast engine) and
// verifies its digest, a_{n0}, and every bracket inequality exactly; then
// that the statement follows from the brackets, that every derived field
// equals its derivation, and that the set is opts.Expect when that is set.
// With a structure section (format version 2) it proves the stated class
// and lambda status with its own code: the window digraph, the witnesses
// or a recomputation of the joint-pattern sets R_k, and the cyclic
// avoider (see Structure). It refuses, before doing the work, a certificate whose estimated work or
// memory is over the limits. Check does not modify c.
func Check(c *Certificate, opts CheckOptions) error {
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
	if err := ck.verifyStructure(); err != nil {
		return fmt.Errorf("certificate rejected: %v", err)
	}
	if err := ck.recompute(); err != nil {
		return fmt.Errorf("certificate rejected: %v", err)
	}
	return nil
}

type checker struct {
	c     *Certificate
	opts  CheckOptions
	set   pattern.Set
	win   windows
	m     int
	cells int // m!
	allN  int // index of the bracket the all-n bounds come from
	// zeroByJoints reports that the structure section claims lambda = 0
	// where it must be decided on the joint patterns
	zeroByJoints bool
}

// describe names a bracket in messages.
func (ck *checker) describe(i int) string {
	b := ck.c.Evidence.Brackets[i]
	what := "whole system"
	if len(b.Cells) < ck.cells {
		what = fmt.Sprintf("%d of %d cells", len(b.Cells), ck.cells)
	}
	return fmt.Sprintf("evidence.brackets[%d] (%s, step %d, k %d)", i, what, b.Step, b.K)
}

func (ck *checker) whole(b Bracket) bool { return len(b.Cells) == ck.cells }

// statement checks everything that needs no iterate: the set, the derived
// fields, the form of the brackets, and that the claims follow from the
// brackets' claims.
func (ck *checker) statement() error {
	st := &ck.c.Statement
	set, err := pattern.ParseSet(st.Given)
	if err != nil {
		return fmt.Errorf("statement.patterns_given: %v", err)
	}
	if !slices.Equal(set.Given(), st.Given) {
		return errors.New("statement.patterns_given: write one pattern per entry, without spaces or commas")
	}
	if !slices.Equal(set.Strings(), st.Patterns) {
		return fmt.Errorf("statement.patterns: %s is not the irredundant set %s of the patterns given", abbreviate(strings.Join(st.Patterns, ",")), abbreviate(set.String()))
	}
	if canon := set.Canonical(); !slices.Equal(canon.Strings(), st.Canonical) {
		return fmt.Errorf("statement.canonical_patterns: %s is not the symmetry representative %s", abbreviate(strings.Join(st.Canonical, ",")), abbreviate(canon.String()))
	}
	if len(ck.opts.Expect.Patterns()) > 0 && !ck.opts.Expect.Equal(set) {
		return fmt.Errorf("the certificate is for the set %s, not for the expected set %s", abbreviate(set.String()), abbreviate(ck.opts.Expect.String()))
	}
	ck.set = set
	ck.win = windowsOf(set)
	ck.m = ck.win.m
	ck.cells = pattern.Factorial(ck.m)
	if ck.c.Evidence.CellLength != ck.m {
		return fmt.Errorf("evidence.cell_length: %d, but the longest pattern has length %d, so m = %d", ck.c.Evidence.CellLength, ck.m+1, ck.m)
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
		for j, cell := range b.Cells {
			if cell < 0 || cell >= ck.cells {
				return fmt.Errorf("evidence.brackets[%d].cells: cell %d out of range 0..%d", i, cell, ck.cells-1)
			}
			if j > 0 && cell <= b.Cells[j-1] {
				return fmt.Errorf("evidence.brackets[%d].cells: not strictly increasing at entry %d", i, j)
			}
		}
		if i > 0 && compareBrackets(brackets[i-1], b) >= 0 {
			return fmt.Errorf("evidence.brackets[%d]: brackets must be distinct and in canonical order (more cells first, then cells, step, k)", i)
		}
	}
	if err := ck.claims(); err != nil {
		return err
	}
	return ck.structureClaims()
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

	// lower end: any bracket, on any cell set (monotonicity)
	loPow, hiPow := newPowers(lam.Lo), newPowers(lam.Hi)
	if lam.Lo.Sign() > 0 {
		found := false
		for _, b := range brackets {
			if loPow.cmp(b.Step, b.Lo) <= 0 {
				found = true
				break
			}
		}
		if !found {
			return errors.New("statement.lambda.lo: no bracket has lo >= lambda.lo^step")
		}
	}

	// upper end: the brackets marked upper partition the cells in an
	// acyclic block order
	block := make([]int, ck.cells)
	for i := range block {
		block[i] = -1
	}
	var upper []int
	for i, b := range brackets {
		if !b.Upper {
			continue
		}
		if b.Hi == nil {
			return fmt.Errorf("%s: carries the upper bound but its hi is infinite", ck.describe(i))
		}
		if hiPow.cmp(b.Step, b.Hi) < 0 {
			return fmt.Errorf("statement.lambda.hi: lambda.hi^%d is below the hi of %s", b.Step, ck.describe(i))
		}
		for _, cell := range b.Cells {
			if block[cell] >= 0 {
				return fmt.Errorf("%s: cell %d is also in evidence.brackets[%d]; the brackets marked upper must partition the cells", ck.describe(i), cell, block[cell])
			}
			block[cell] = i
		}
		upper = append(upper, i)
	}
	if len(upper) == 0 {
		return errors.New("evidence: no bracket is marked upper, so nothing proves statement.lambda.hi")
	}
	for cell, b := range block {
		if b < 0 {
			return fmt.Errorf("evidence: cell %d is in no bracket marked upper; they must partition the cells", cell)
		}
	}
	if len(upper) > 1 {
		if err := ck.acyclic(block, upper); err != nil {
			return err
		}
	}

	// all-n bounds: the whole-system step-1 bracket with k = n0 - m
	a := st.AllN
	ck.allN = -1
	for i, b := range brackets {
		if ck.whole(b) && b.Step == 1 && b.K+ck.m == a.N0 {
			ck.allN = i
		}
	}
	if ck.allN < 0 {
		return fmt.Errorf("statement.all_n.n0: no whole-system bracket with step 1 and k = n0 - m = %d", a.N0-ck.m)
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

// acyclic checks that the window digraph visits the blocks in a fixed
// order: the digraph of blocks (an edge for every allowed window whose end
// cells lie in different blocks) has no cycle. Then T is block-triangular
// and its spectral radius is the largest over the blocks.
func (ck *checker) acyclic(block, upper []int) error {
	out := map[int]map[int]bool{}
	indegree := map[int]int{}
	for w, ok := range ck.win.allowed {
		if !ok {
			continue
		}
		win := pattern.Unrank(ck.m+1, w)
		from := block[pattern.Rank(pattern.Standardize(win[:ck.m]))]
		to := block[pattern.Rank(pattern.Standardize(win[1:]))]
		if from == to || out[from][to] {
			continue
		}
		if out[from] == nil {
			out[from] = map[int]bool{}
		}
		out[from][to] = true
		indegree[to]++
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
		return errors.New("evidence: the brackets marked upper are not in block-triangular order: allowed windows lead around a cycle of their cell sets, so their brackets do not bound lambda")
	}
	return nil
}

// group is the brackets that share one cell set, hence one system.
type group struct {
	cells    []int // nil: whole system
	brackets []int
	degree   int // the largest k+d
}

func (ck *checker) groups() []group {
	var gs []group
	for i, b := range ck.c.Evidence.Brackets {
		var cells []int
		if !ck.whole(b) {
			cells = b.Cells
		}
		if n := len(gs); n > 0 && slices.Equal(gs[n-1].cells, cells) {
			gs[n-1].brackets = append(gs[n-1].brackets, i)
			gs[n-1].degree = max(gs[n-1].degree, b.K+b.Step)
			continue
		}
		// canonical order keeps brackets of one cell set adjacent
		gs = append(gs, group{cells: cells, brackets: []int{i}, degree: b.K + b.Step})
	}
	return gs
}

// limits estimates the recomputation's work and memory and refuses it
// above the options' limits.
func (ck *checker) limits() error {
	m := float64(ck.m)
	count := ck.coefficients
	work, memory := 0.0, 0.0
	for _, g := range ck.groups() {
		size := float64(len(g.cells))
		if g.cells == nil {
			size = float64(ck.cells)
		}
		for D := 1; D <= g.degree; D++ {
			work += ck.stepWork(g, D)
		}
		// bytes of one coefficient at the top degree: a big.Int header and
		// words for about log2((m+degree)!) bits
		lg, _ := math.Lgamma(float64(ck.m+g.degree) + 1)
		perCoef := 32 + 8*(lg/math.Ln2/64+1)
		held := 2.0 // the current and the next iterate
		for _, i := range g.brackets {
			b := ck.c.Evidence.Brackets[i]
			for j := 1; j <= b.Step; j++ {
				work += size * count(b.K+j) * (m + 1)
			}
			// the comparisons multiply by lo and hi: long numbers cost more
			digits := len(formatRational(b.Lo))
			if b.Hi != nil {
				digits += len(formatRational(b.Hi))
			}
			work += float64(ck.cells) * (count(b.K) + 2*count(b.K+b.Step)*(1+float64(digits)/64))
			held++ // its pending elevation
		}
		memory = max(memory, held*float64(ck.cells)*count(g.degree)*perCoef)
	}
	// the structure section is verified first, on its own memory
	sw, sm := ck.structureWork()
	work += sw
	memory = max(memory, sm)
	if work > float64(ck.opts.MaxWork) {
		return fmt.Errorf("%w: recomputing the evidence needs about %.3g coefficient operations, above the limit of %.3g; raise the work limit if you expect a certificate this large", ErrLimit, work, float64(ck.opts.MaxWork))
	}
	if memory > float64(ck.opts.MaxMemory) {
		return fmt.Errorf("%w: recomputing the evidence needs about %.3g bytes of memory, above the limit of %.3g; raise the memory limit if you expect a certificate this large", ErrLimit, memory, float64(ck.opts.MaxMemory))
	}
	return nil
}

// coefficients returns C(D+m, m), the number of Bernstein coefficients of
// degree D on one cell.
func (ck *checker) coefficients(D int) float64 {
	c := 1.0
	for i := 1; i <= ck.m; i++ {
		c = c * float64(D+i) / float64(i)
	}
	return c
}

// stepWork estimates the coefficient operations of computing the iterate
// of degree D of group g.
func (ck *checker) stepWork(g group, D int) float64 {
	size := float64(len(g.cells))
	if g.cells == nil {
		size = float64(ck.cells)
	}
	return size * ck.coefficients(D) * float64(D)
}

// recompute runs every system's iteration and checks each bracket against
// it.
func (ck *checker) recompute() error {
	brackets := ck.c.Evidence.Brackets
	groups := ck.groups()
	var done, total float64
	for _, gr := range groups {
		for D := 1; D <= gr.degree; D++ {
			total += ck.stepWork(gr, D)
		}
	}
	for _, gr := range groups {
		sys := newSystem(ck.win, gr.cells, gr.degree)
		pending := map[int]*iterate{} // bracket -> elevated G_k, waiting for G_{k+d}
		g := sys.first()
		for D := 0; D <= gr.degree; D++ {
			if D > 0 {
				g = sys.next(g)
				done += ck.stepWork(gr, D)
				if ck.opts.Progress != nil {
					ck.opts.Progress(int64(done), int64(total))
				}
			}
			for _, i := range gr.brackets {
				b := brackets[i]
				if b.K+b.Step == D {
					if err := ck.compare(i, sys, pending[i], g); err != nil {
						return err
					}
					delete(pending, i)
				}
				if b.K != D {
					continue
				}
				if sys.digest(g) != b.IterateDigest {
					return fmt.Errorf("%s: iterate_sha256 does not match the recomputed G_%d", ck.describe(i), b.K)
				}
				if b.Lo.Sign() > 0 && g.isZero() {
					return fmt.Errorf("%s: lo > 0 but G_%d is zero, so it bounds nothing", ck.describe(i), b.K)
				}
				if i == ck.allN {
					if s := g.sum(); s.Cmp(ck.c.Statement.AllN.AN0) != 0 {
						return fmt.Errorf("statement.all_n.a_n0: %s is not a_%d = %s, the sum of G_%d", abbreviate(ck.c.Statement.AllN.AN0.String()), ck.c.Statement.AllN.N0, abbreviate(s.String()), b.K)
					}
				}
				h := g
				for range b.Step {
					h = sys.elevate(h)
				}
				pending[i] = h
			}
		}
	}
	return nil
}

// compare checks lo*H[a] <= N[a] <= hi*H[a] at every index a of degree
// k+d, where H is the elevated G_k and N = G_{k+d}.
func (ck *checker) compare(i int, sys *system, h, n *iterate) error {
	b := ck.c.Evidence.Brackets[i]
	var left, right big.Int
	var err error
	sys.each(n.degree, true, func(cell, r int, a []int) {
		if err != nil {
			return
		}
		den, num := sys.at(h, cell, r), sys.at(n, cell, r)
		// lo <= num/den:  lo.num * den <= lo.den * num
		left.Mul(b.Lo.Num(), den)
		right.Mul(b.Lo.Denom(), num)
		if left.Cmp(&right) > 0 {
			err = fmt.Errorf("%s: lo is above the ratio G_%d/elevated G_%d = %s/%s at cell %d, index %v", ck.describe(i), n.degree, b.K, abbreviate(num.String()), abbreviate(den.String()), cell, a)
			return
		}
		// num/den <= hi:  num * hi.den <= hi.num * den
		if b.Hi == nil {
			return
		}
		left.Mul(num, b.Hi.Denom())
		right.Mul(b.Hi.Num(), den)
		switch {
		case left.Cmp(&right) <= 0:
		case den.Sign() == 0:
			err = fmt.Errorf("%s: G_%d is positive where the elevated G_%d is 0 (cell %d, index %v), so hi must be infinite", ck.describe(i), n.degree, b.K, cell, a)
		default:
			err = fmt.Errorf("%s: hi is below the ratio G_%d/elevated G_%d = %s/%s at cell %d, index %v", ck.describe(i), n.degree, b.K, abbreviate(num.String()), abbreviate(den.String()), cell, a)
		}
	})
	return err
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
