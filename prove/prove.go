package prove

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"time"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/structure"
	"avoidcert/transfer"
)

// Result is a checked certificate for a set and the runs it was built
// from.
type Result struct {
	Set    pattern.Set
	Report *structure.Report // the structure pass
	States *transfer.States  // the prefix states of Set
	Step   int               // the bracket's step d (the period of a periodic set, else 1)
	Blocks [][]int           // the blocks bracketed one by one (reducible sets), or nil
	// Bracket is the engine's run; Bracket.Stop says whether the target
	// was met or a budget stopped it first.
	Bracket *bounds.Result
	// Certificate is the certificate built from the run, accepted by
	// certify.Check for Set.
	Certificate *certify.Certificate
	// Estimates are floating-point figures for orientation, not proved.
	Estimates Estimates

	opts   Options
	beyond *BudgetError
}

// Estimates are figures for orientation: estimate, not certified, and to
// be labelled so wherever they are shown. Zero or nil means unknown or not
// meaningful for the set's class.
type Estimates struct {
	// Rate is the observed decay of the bracket width per unit of k, an
	// estimate of |lambda_2|/lambda (not for subexponential sets).
	Rate float64
	// C estimates c in a_n ~ c lambda^n n! (primitive sets only).
	C float64
	// ByResidue estimates, for a periodic set of period d, the constants
	// c_r in a_n/n! = lambda^n (c_(n mod d) + o(1)), r = 0..d-1, from the
	// exact counts (only with Options.ResidueConstants).
	ByResidue []float64
}

// K is the bracket's k = n - M, M the longest prefix state: the steps
// above the longest state of the (first) bracket the result rests on.
func (r *Result) K() int { return r.Bracket.Brackets[0].N - r.States.MaxLength() }

// Done reports whether the bracket run reached its goal (a target met,
// lambda exact, a claim decided, or lambda = 0 proved by the structure
// pass) rather than stopping on a budget.
func (r *Result) Done() bool {
	switch r.Bracket.Stop {
	case bounds.StopTarget, bounds.StopExact, bounds.StopDecided:
		return true
	}
	return r.Report.Class == structure.Subexponential
}

// Stopped returns, when a budget stopped the bracket run before its goal,
// that budget, what it stopped and what more was needed when known (the
// figures of a memory stop, or of the checker's re-check of a bracket
// further on); nil when the run reached its goal.
func (r *Result) Stopped() *BudgetError {
	if r.Done() {
		return nil
	}
	res := r.Bracket
	switch res.Stop {
	case bounds.StopCertifiable:
		if r.beyond != nil {
			return r.beyond
		}
	case bounds.StopMemory:
		return &BudgetError{Budget: BudgetMemory, What: fmt.Sprintf("a bracket past n = %d", r.lastN()), Need: float64(res.Need), Limit: float64(r.opts.maxMemory())}
	case bounds.StopMaxN:
		return &BudgetError{Budget: BudgetMaxK, What: fmt.Sprintf("the bracket at n = %d (k = %d)", r.lastN(), r.lastN()-r.States.MaxLength()), Limit: float64(r.opts.MaxK)}
	}
	return &BudgetError{Budget: BudgetTime, What: fmt.Sprintf("a bracket past n = %d", r.lastN())}
}

// lastN is the largest n of the brackets the result rests on.
func (r *Result) lastN() int {
	n := 0
	for _, b := range r.Bracket.Brackets {
		n = max(n, b.N)
	}
	return n
}

// Certify brackets the growth rate of set to the target of opts (or until
// a budget stops it), builds the certificate and returns it once the
// checker has accepted it.
func Certify(ctx context.Context, set pattern.Set, opts Options) (*Result, error) {
	runCtx, cancel := opts.withDeadline(ctx)
	defer cancel()
	p, err := planFor(runCtx, set, opts)
	if err != nil {
		return nil, err
	}
	target := opts.Digits
	if target == 0 && opts.Width == nil {
		target = defaultDigits
	}
	if opts.Width != nil {
		w, _ := opts.Width.Float64()
		target = max(target, int(math.Ceil(-math.Log10(w))))
	}
	bo, err := p.options(runCtx, opts, endBits(target))
	if err != nil {
		return nil, err
	}
	bo.Digits, bo.Width = opts.Digits, opts.Width
	if bo.Digits == 0 && bo.Width == nil {
		bo.Digits = defaultDigits
	}
	res, err := p.bracket(runCtx, bo, p.progress(opts))
	if err != nil {
		return nil, err
	}
	digits := 20
	if bo.Digits > 0 {
		digits = bo.Digits + 3 // a few more than certified, so the printed ends show the bracket
	}
	return p.finish(ctx, res, digits, opts)
}

// Classify runs the structure test of set and returns it once the checker
// has accepted a certificate with its structure section, so that the class
// and the lambda status can be stated as proved. The certificate carries
// the cheapest bracket the class allows (k = n - M at most 1, one digit
// aimed for): its lambda range is wide and not meant to be read.
func Classify(ctx context.Context, set pattern.Set, opts Options) (*Result, error) {
	opts.Digits, opts.Width, opts.MaxK = 1, nil, 1
	return Certify(ctx, set, opts)
}

// Judgement is the verdict on a claim that lambda (or 1/lambda) lies in an
// interval, read from a checked certificate, or for a claim no set can
// satisfy, from the bounds every set satisfies.
type Judgement struct {
	Verdict bounds.Verdict
	// Certified is the enclosure of the claimed quantity that the
	// certificate proves (Enclosure of the certificate).
	Certified bounds.Enclosure
	// Impossible, when not "", is why no set has the claimed value
	// (Impossible): the verdict is Refuted, and there is no certificate
	// (Result is nil).
	Impossible string
	*Result
}

// Judge decides the claim that the quantity of set lies in the closed
// interval claim: it tightens the bracket until it lies inside the claim
// or misses it, or a budget stops it, then certifies and checks the final
// bracket and reads the verdict from the checked certificate (Decide). A
// claim that no set satisfies (Impossible) is refuted at once, without a
// certificate.
func Judge(ctx context.Context, set pattern.Set, claim interval.Interval, of bounds.Quantity, opts Options) (*Judgement, error) {
	if claim.Lo == nil || claim.Hi == nil || claim.Lo.Cmp(claim.Hi) > 0 {
		return nil, errors.New("prove: a claimed interval needs finite ends with lo <= hi")
	}
	if why := Impossible(claim, of); why != "" {
		return &Judgement{Verdict: bounds.Refuted, Impossible: why}, nil
	}
	runCtx, cancel := opts.withDeadline(ctx)
	defer cancel()
	p, err := planFor(runCtx, set, opts)
	if err != nil {
		return nil, err
	}
	bo, err := p.options(runCtx, opts, endBits(interval.CommonDigits(claim.Lo, claim.Hi)+4))
	if err != nil {
		return nil, err
	}
	var res *bounds.Result
	if p.rep.Class == structure.Subexponential {
		// lambda = 0 is proved by the structure pass; a short run gives
		// the certificate its upper bound
		bo.Digits = 1
		res, err = p.bracket(runCtx, bo, p.progress(opts))
	} else {
		_, res, err = bounds.JudgeBlocks(runCtx, p.states, p.blocks, claim, of, bo, p.progress(opts))
		err = budgetError(runCtx, err, opts)
	}
	if err != nil {
		return nil, err
	}
	digits := min(max(interval.CommonDigits(claim.Lo, claim.Hi)+4, 8), 60)
	r, err := p.finish(ctx, res, digits, opts)
	if err != nil {
		return nil, err
	}
	q := Enclosure(r.Certificate, of)
	return &Judgement{Verdict: Decide(q, claim), Certified: q, Result: r}, nil
}

// Comparison is the verdict on lambda(First.Set) < lambda(Second.Set),
// read from two checked certificates.
type Comparison struct {
	Verdict       bounds.Verdict
	First, Second *Result
}

// compareDigits are the targets Compare tries in turn.
var compareDigits = []int{6, 12, 24, 48, 96}

// Compare decides lambda(first) < lambda(second): it certifies both sets
// to 6 digits, then 12, 24, ... until the checked enclosures are disjoint
// (proved or refuted, DecideOrder), a budget stops a run, or 96 digits do
// not separate them (then the verdict is undecided; equal growth rates
// are never separated).
func Compare(ctx context.Context, first, second pattern.Set, opts Options) (*Comparison, error) {
	var cmp Comparison
	for _, d := range compareDigits {
		o := opts
		o.Digits, o.Width = d, nil
		var err error
		if cmp.First, err = Certify(ctx, first, o); err != nil {
			return nil, err
		}
		o.Typed = opts.TypedOther
		if cmp.Second, err = Certify(ctx, second, o); err != nil {
			return nil, err
		}
		cmp.Verdict = DecideOrder(cmp.First.Certificate, cmp.Second.Certificate)
		if cmp.Verdict != bounds.Undecided || !cmp.First.Done() || !cmp.Second.Done() {
			break
		}
	}
	return &cmp, nil
}

// Recheck runs the checker on a certificate (one read from a cache, say)
// bound to set (to opts.Typed when set): nil means it is accepted.
func Recheck(ctx context.Context, c *certify.Certificate, set pattern.Set, opts Options) error {
	return check(ctx, c, set, opts)
}

// CheckBytes reads a certificate file's bytes and returns the certificate
// once the checker has accepted it for the set typed (pattern arguments as
// written, unparsed: see Options.Typed). Its verdicts may then be read.
// An error is a file that does not read as a certificate or a refusal;
// both wrap the checker's reason.
func CheckBytes(ctx context.Context, data []byte, typed []string, opts Options) (*certify.Certificate, error) {
	if len(typed) == 0 {
		return nil, errors.New("prove: CheckBytes needs the set the certificate must be about")
	}
	c, err := certify.Read(bytes.NewReader(data))
	if err != nil {
		return nil, err
	}
	opts.Typed = typed
	if err := check(ctx, c, pattern.Set{}, opts); err != nil {
		return nil, err
	}
	return c, nil
}

// check is the one place that calls the checker. It refuses to start
// after an interrupt (cancellation), not after a deadline: a budget stop
// keeps the best bracket, and its certificate is still checked.
func check(ctx context.Context, c *certify.Certificate, set pattern.Set, opts Options) error {
	if errors.Is(ctx.Err(), context.Canceled) {
		return ctx.Err()
	}
	err := certify.Check(ctx, c, certify.CheckOptions{Expect: opts.expect(set), MaxWork: opts.checkWork(), MaxMemory: opts.maxMemory(), Progress: opts.CheckProgress})
	if errors.Is(err, certify.ErrLimit) {
		return budgetError(ctx, err, opts)
	}
	return err
}

// plan is how a set is bracketed, decided from its structure.
type plan struct {
	rep    *structure.Report
	states *transfer.States
	step   int
	blocks [][]int // nil: the whole system
	opts   Options
	// beyond is why no bracket past the run's CertN could be certified
	beyond *BudgetError
}

// planFor runs the structure test within the memory budget of opts and
// plans the bracket from its report: step d = the period of a periodic
// set, the blocks of the state digraph (bounds.Blocks, every state in
// one) for a reducible one, a short run for a subexponential one.
func planFor(ctx context.Context, set pattern.Set, opts Options) (*plan, error) {
	rep, err := structure.Analyze(ctx, set, structure.Options{MaxMemory: opts.maxMemory(), Witnesses: opts.Witnesses})
	if err != nil {
		return nil, budgetError(ctx, err, opts)
	}
	p := &plan{rep: rep, states: rep.States, step: 1, opts: opts}
	switch rep.Class {
	case structure.Periodic:
		p.step = rep.Period
	case structure.Reducible:
		p.blocks = bounds.Blocks(p.states) // the components of the state digraph, in block order
	}
	return p, nil
}

// options are the bracket options of the plan within the budgets of opts,
// with the digests a certificate needs: no bracket past the largest n
// whose certificate the checker could re-check within the same budgets,
// and with a deadline, time left to certify the last bracket. What cannot
// fit even a first bracket is refused here, before the work (a
// *BudgetError); endBits estimates the length of the bracket ends.
func (p *plan) options(ctx context.Context, opts Options, endBits int) (bounds.Options, error) {
	bo := bounds.Options{Step: p.step, MaxN: p.lastN(opts), MaxMemory: opts.maxMemory(), Digests: true}
	lim, err := p.limit(opts, bo.MaxN, endBits)
	if err != nil {
		return bo, err
	}
	p.beyond = lim.beyond
	bo.CertN = lim.certN
	if opts.Planned != nil {
		last := bo.MaxN
		if lim.certN > 0 {
			last = min(last, lim.certN)
		}
		work, _, _ := certify.Estimate(opts.expect(p.rep.Set), Structure(p.rep), p.planned(last), endBits)
		opts.Planned(Plan{LastN: last, Beyond: lim.beyond, CheckWork: work, CheckTime: p.reserve(opts, endBits)(last)})
	}
	if deadline, ok := ctx.Deadline(); ok {
		bo.Reserve = p.reserve(opts, endBits)
		first := p.states.MaxLength()
		if need, left := bo.Reserve(first), time.Until(deadline); need > left {
			return bo, &BudgetError{Budget: BudgetTime, What: fmt.Sprintf("the checker's re-check of a first bracket (n = %d)", first),
				Need: need.Seconds(), Limit: max(left, 0).Seconds(), err: context.DeadlineExceeded}
		}
	}
	return bo, nil
}

// lastN is the largest bracket n of the plan: that of opts, and a short
// run for a subexponential set, whose lambda = 0 is proved by the
// structure pass (the bracket only bounds the decay).
func (p *plan) lastN(opts Options) int {
	n := opts.maxN(p.states)
	if p.rep.Class == structure.Subexponential {
		n = min(n, 40+p.states.MaxLength())
	}
	return n
}

// bracket runs the bracket search the plan asks for. A subexponential set
// has lambda = 0 proved: only a short run for the explicit upper bound.
func (p *plan) bracket(ctx context.Context, opts bounds.Options, progress bounds.Progress) (*bounds.Result, error) {
	var res *bounds.Result
	var err error
	if p.blocks != nil {
		res, err = bounds.RunBlocks(ctx, p.states, p.blocks, opts, progress)
	} else {
		res, err = bounds.Run(ctx, p.states, opts, progress)
	}
	return res, budgetError(ctx, err, p.opts)
}

// finish builds the certificate of a run and returns it once the checker
// accepts it.
func (p *plan) finish(ctx context.Context, res *bounds.Result, digits int, opts Options) (*Result, error) {
	buildCtx := ctx
	if errors.Is(ctx.Err(), context.DeadlineExceeded) {
		// The deadline stopped the bracket run in time to keep its best
		// bracket: certify that one. Building the certificate may take
		// one more bracket at the same k (periodic and reducible sets).
		buildCtx = context.WithoutCancel(ctx)
	}
	c, err := BuildCertificate(buildCtx, opts.tool(), p.rep, res, digits)
	if err != nil {
		return nil, budgetError(ctx, err, opts)
	}
	// The patterns as the user typed them, not as the engine read them:
	// should the two differ, the checker refuses the certificate.
	c.Statement.Given = opts.given(p.rep.Set)
	if err := check(ctx, c, p.rep.Set, opts); err != nil {
		if errors.Is(err, ErrBudget) || ctx.Err() != nil {
			return nil, err
		}
		return nil, fmt.Errorf("prove: the certificate built for %s did not pass the checker: %w", p.rep.Set, err)
	}
	if res.Stop == bounds.StopCertifiable && p.beyond != nil {
		res.Detail = p.beyond.Error()
	}
	r := &Result{Set: p.rep.Set, Report: p.rep, States: p.states, Step: p.step, Blocks: p.blocks, Bracket: res, Certificate: c, opts: opts, beyond: p.beyond}
	r.Estimates = p.estimates(buildCtx, c, res, opts)
	return r, nil
}

// estimates are the run's figures for orientation, kept only for the
// classes where they mean something.
func (p *plan) estimates(ctx context.Context, c *certify.Certificate, res *bounds.Result, opts Options) Estimates {
	var est Estimates
	if p.rep.Class != structure.Subexponential {
		est.Rate = res.Estimates.Rate
	}
	if p.rep.Class == structure.Primitive {
		est.C = res.Estimates.C
	}
	if p.rep.Class == structure.Periodic && opts.ResidueConstants {
		est.ByResidue = residueConstants(ctx, p.rep.Set, p.rep.Period, res.Brackets[0].N, Enclosure(c, bounds.QuantityLambda))
	}
	return est
}

// residueConstants estimates, for a periodic set of period d, the
// constants c_r in a_n/n! = lambda^n (c_(n mod d) + o(1)) as
// a_n/(n! mid^n) at the d lengths n from n0 on, mid the middle of the
// certified lambda: estimates, not certified. nil when lambda is not
// known to be positive, or when the counting is interrupted.
func residueConstants(ctx context.Context, set pattern.Set, d, n0 int, lambda bounds.Enclosure) []float64 {
	if !lambda.Finite() || lambda.Lo.Sign() <= 0 {
		return nil
	}
	counts, err := transfer.Counts(ctx, set, n0+d-1, nil)
	if err != nil {
		return nil
	}
	mid := new(big.Rat).Add(lambda.Lo, lambda.Hi)
	mid.Quo(mid, big.NewRat(2, 1))
	c := make([]float64, d)
	for n := n0; n < n0+d; n++ {
		den := new(big.Rat).SetInt(new(big.Int).MulRange(1, int64(n)))
		den.Mul(den, pow(mid, n))
		c[n%d], _ = new(big.Rat).Quo(new(big.Rat).SetInt(counts[n]), den).Float64()
	}
	return c
}

// progress passes the bracket runs' events on with the plan's number of
// blocks.
func (p *plan) progress(opts Options) bounds.Progress {
	if opts.Progress == nil {
		return nil
	}
	blocks := len(p.blocks)
	return func(ev bounds.Event) { opts.Progress(Event{Event: ev, Blocks: blocks}) }
}
