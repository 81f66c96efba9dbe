package prove

import (
	"context"
	"errors"
	"fmt"
	"math"
	"time"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/internal/bytesize"
	"avoidcert/pattern"
	"avoidcert/structure"
	"avoidcert/transfer"
)

// Budget names one budget of Options.
type Budget string

// The budgets a refusal or a stop can name.
const (
	BudgetMemory    Budget = "memory"     // Options.MaxMemory: the engine's memory, and the checker's
	BudgetMaxK      Budget = "max-k"      // Options.MaxK
	BudgetTime      Budget = "time"       // Options.Deadline, or the deadline of the context
	BudgetCheckWork Budget = "check-work" // Options.CheckWork: the checker's estimated work
)

// BudgetError is a refusal that a larger budget would lift, in terms a
// command can put to its user: the budget, what needed more of it, the
// amount needed (0 when not known) and the budget's value, in bytes
// (memory), coefficient operations (check work), seconds (time) or steps
// k (max-k). errors.Is(err, ErrBudget) holds for it, and the refusal of
// the package that found it (a *bounds.BudgetError, *structure.BudgetError
// or *certify.LimitError) stays in the chain.
type BudgetError struct {
	Budget      Budget
	What        string
	Need, Limit float64
	err         error
}

func (e *BudgetError) Error() string {
	switch {
	case e.Budget == BudgetMemory && e.Need > 0:
		return fmt.Sprintf("%s needs %s, over the memory budget of %s", e.What, bytesize.About(int64(e.Need)), bytesize.Format(int64(e.Limit)))
	case e.Budget == BudgetMemory:
		return fmt.Sprintf("%s: over the memory budget of %s", e.What, bytesize.Format(int64(e.Limit)))
	case e.Budget == BudgetCheckWork:
		return fmt.Sprintf("%s needs about %.2g coefficient operations, over the checker's work limit of %.2g", e.What, e.Need, e.Limit)
	case e.Budget == BudgetTime && e.Need > 0:
		return fmt.Sprintf("%s would take about %s, more than the time budget of %s", e.What, seconds(e.Need), seconds(e.Limit))
	case e.Budget == BudgetTime:
		return fmt.Sprintf("%s: the time budget ran out first", e.What)
	}
	return fmt.Sprintf("%s: no bracket within the budget of k <= %d", e.What, int(e.Limit))
}

// Unwrap gives ErrBudget and the refusal it was made from, if any.
func (e *BudgetError) Unwrap() []error {
	if e.err == nil {
		return []error{ErrBudget}
	}
	return []error{ErrBudget, e.err}
}

func seconds(s float64) string {
	return time.Duration(s * float64(time.Second)).Round(time.Second / 10).String()
}

// budgetError turns the refusals that a larger budget would lift (the
// structure test's memory estimate, the bracket run's first bracket over
// the memory budget, a budget that stopped the run before its first
// bracket, a certificate over the checker's limits) into a *BudgetError,
// keeping the original in the chain. An interrupt (cancellation) stays a
// context error.
func budgetError(ctx context.Context, err error, opts Options) error {
	var be *bounds.BudgetError
	var se *structure.BudgetError
	var le *certify.LimitError
	switch {
	case err == nil:
		return nil
	case errors.Is(ctx.Err(), context.Canceled):
		return fmt.Errorf("%w (%w)", ctx.Err(), err)
	case errors.As(err, &se):
		need, what := se.Cost.Memory, fmt.Sprintf("the structure test (%d joint configurations)", se.Cost.Space)
		if se.Steps > 0 {
			need = se.Cost.Fixed + int64(se.Steps+1)*se.Cost.PerStep
			what = fmt.Sprintf("the structure test, after %d sets R_k of %d joint configurations that neither reached D nor repeated,", se.Steps, se.Cost.Space)
		}
		return &BudgetError{Budget: BudgetMemory, What: what, Need: float64(need), Limit: float64(se.Limit), err: err}
	case errors.As(err, &le) && le.Resource == "memory":
		return &BudgetError{Budget: BudgetMemory, What: "the checker's re-check of the certificate", Need: le.Need, Limit: le.Limit, err: err}
	case errors.As(err, &le):
		return &BudgetError{Budget: BudgetCheckWork, What: "the checker's re-check of the certificate", Need: le.Need, Limit: le.Limit, err: err}
	case errors.As(err, &be):
		out := &BudgetError{What: "a first bracket", err: err}
		switch be.Stop {
		case bounds.StopMemory:
			out.Budget, out.Need, out.Limit = BudgetMemory, float64(be.Need), float64(opts.maxMemory())
		case bounds.StopMaxN, bounds.StopCertifiable:
			out.Budget, out.Limit = BudgetMaxK, float64(opts.MaxK)
		default:
			out.Budget = BudgetTime
		}
		return out
	case errors.Is(err, context.DeadlineExceeded):
		return &BudgetError{Budget: BudgetTime, What: "a first result", err: err}
	}
	return err
}

// checkNanos is the checker's estimated wall time per coefficient
// operation of its work estimate, for planning only: 15 ns of CPU time
// per operation was measured ('avoidcert check' of a certificate of 1342
// at n = 130: 1.6e8 operations, 2.5 s of user time, on the 2-core
// machine), with little gain from a second core; 20 leaves room.
const checkNanos = 20

// limits are what the plan found before the run: the largest bracket n
// whose certificate the checker could re-check within the budgets
// (certN, 0 for no limit below the run's own), and why no bracket past it
// could be certified.
type limits struct {
	certN  int
	beyond *BudgetError
}

// limit finds, before the run, the largest n at which a bracket can still
// be certified: the checker's re-check of the certificate (certify.Estimate:
// the figures the checker itself compares with its limits) within
// opts.MaxMemory and opts.CheckWork and, when the certificate needs a
// whole-system bracket of its own (periodic and reducible sets), that
// bracket within opts.MaxMemory (bounds.AtNeed). It refuses at once, with
// the amount needed, when not even a first bracket at n = M (the longest
// prefix state) can be.
func (p *plan) limit(opts Options, last int, endBits int) (limits, error) {
	first := p.states.MaxLength()
	cost := func(n int) *BudgetError {
		return p.certifyCost(opts, n, endBits, fmt.Sprintf("the checker's re-check of a bracket at n = %d", n))
	}
	if over := p.certifyCost(opts, first, endBits, fmt.Sprintf("the checker's re-check of a first bracket (n = %d)", first)); over != nil {
		return limits{}, over
	}
	// Galloping, then bisection: the estimates grow with n, and the
	// larger n cost more to estimate.
	good, bad := first, 0
	var why *BudgetError
	for step := 4; bad == 0; step *= 2 {
		n := min(good+step, last)
		if over := cost(n); over != nil {
			bad, why = n, over
		} else if good = n; n == last {
			return limits{}, nil
		}
	}
	for bad-good > 1 {
		mid := (good + bad) / 2
		if over := cost(mid); over != nil {
			bad, why = mid, over
		} else {
			good = mid
		}
	}
	why = cost(good + 1)
	return limits{certN: good, beyond: why}, nil
}

// certifyCost returns why a certificate with brackets at n could not be
// certified within the budgets of opts, or nil when it could.
func (p *plan) certifyCost(opts Options, n, endBits int, what string) *BudgetError {
	work, memory, err := certify.Estimate(opts.expect(p.rep.Set), Structure(p.rep), p.planned(n), endBits)
	if err != nil {
		// the checker cannot read the set: its check will say so
		return nil
	}
	switch {
	case memory > float64(opts.maxMemory()):
		return &BudgetError{Budget: BudgetMemory, What: what, Need: memory, Limit: float64(opts.maxMemory())}
	case work > float64(opts.checkWork()):
		return &BudgetError{Budget: BudgetCheckWork, What: what, Need: work, Limit: float64(opts.checkWork())}
	}
	if p.extraWhole() {
		if need := bounds.AtNeed(transfer.Whole(p.states), n, 1); need > opts.maxMemory() {
			return &BudgetError{Budget: BudgetMemory, What: fmt.Sprintf("the whole-system bracket at n = %d that the certificate needs", n), Need: float64(need), Limit: float64(opts.maxMemory())}
		}
	}
	return nil
}

// extraWhole reports whether the certificate needs a whole-system step-1
// bracket that the run does not take (BuildCertificate): for periodic sets
// (step d > 1) and for sets bracketed by blocks.
func (p *plan) extraWhole() bool { return p.step > 1 || len(p.blocks) > 1 }

// planned is where the brackets of a certificate whose brackets are all
// at n would sit: every system of the run (bounds.RunBlocks: a ones and a
// whole start for each block, which bounds the blocks without inner moves
// from above) and the whole-system bracket BuildCertificate adds.
func (p *plan) planned(n int) []certify.Planned {
	var out []certify.Planned
	if len(p.blocks) <= 1 {
		out = append(out, certify.Planned{Start: certify.StartEmpty, Step: p.step, N: n})
	} else {
		for _, b := range p.blocks {
			out = append(out, certify.Planned{States: b, Start: certify.StartOnes, Step: p.step, N: n},
				certify.Planned{States: b, Start: certify.StartWhole, Step: p.step, N: n})
		}
	}
	if p.extraWhole() {
		out = append(out, certify.Planned{Start: certify.StartEmpty, Step: 1, N: n})
	}
	return out
}

// reserve returns the time to leave, after a bracket run stopped by a
// deadline, for certifying a bracket at n: the checker's estimated time
// (its work estimate at checkNanos an operation) and, for the plans whose
// certificate adds a whole-system bracket, as long again for taking it.
func (p *plan) reserve(opts Options, endBits int) func(n int) time.Duration {
	known := map[int]time.Duration{} // the run asks at every step
	return func(n int) time.Duration {
		if t, ok := known[n]; ok {
			return t
		}
		work, _, err := certify.Estimate(opts.expect(p.rep.Set), Structure(p.rep), p.planned(n), endBits)
		if err != nil {
			return 0
		}
		t := time.Duration(math.Min(work*checkNanos, math.MaxInt64/2))
		if p.extraWhole() {
			t *= 2
		}
		known[n] = t
		return t
	}
}

// endBits estimates the significant bits of a certificate's bracket ends
// (the shortener rounds them to the run's precision plus 64 bits) for a
// target of the given digits.
func endBits(digits int) int { return int(3.33*float64(digits+10)) + 64 }

// Explain states the refusal in a user's terms: each budget under the
// name that sets it (name returns a command's flag, "--max-memory", or a
// manifest's field), and when the amount needed is known, what to set it
// to. For a budget name returns "" for, it says what the limit is.
func (e *BudgetError) Explain(name func(Budget) string) string {
	flag := name(e.Budget)
	switch e.Budget {
	case BudgetMemory:
		if e.Need <= 0 {
			return fmt.Sprintf("%s: over %s %s; raise %s", e.What, flag, bytesize.Format(int64(e.Limit)), flag)
		}
		return fmt.Sprintf("%s needs %s, over %s %s; raise %s to at least %s", e.What, bytesize.About(int64(e.Need)), flag, bytesize.Format(int64(e.Limit)), flag, bytesize.Flag(int64(e.Need)))
	case BudgetCheckWork:
		if flag == "" {
			return fmt.Sprintf("%s needs about %.2g coefficient operations, over the checker's work limit of %.2g; ask for fewer digits", e.What, e.Need, e.Limit)
		}
		return fmt.Sprintf("%s needs about %.2g coefficient operations, over %s %.2g; raise %s to at least %.2g", e.What, e.Need, flag, e.Limit, flag, e.Need)
	case BudgetTime:
		if e.Need > 0 {
			return fmt.Sprintf("%s would take about %s, more than %s leaves (%s); raise %s", e.What, seconds(e.Need), flag, seconds(e.Limit), flag)
		}
		return fmt.Sprintf("%s: %s ran out first; raise %s", e.What, flag, flag)
	}
	return fmt.Sprintf("%s is the last that %s %d allows; raise %s", e.What, flag, int(e.Limit), flag)
}

// LeastMemory is, in time independent of n, a lower estimate of the memory
// any certificate of set takes to make and check, together with its
// counts a_0..a_n (Counts): every certificate holds a whole-system bracket
// with step 1 at n0 >= M, M the longest prefix state, which the engine
// takes (bounds.AtNeed) and the checker re-checks (certify.Estimate), one
// after the other. A budget below it is refused before any work.
func LeastMemory(set pattern.Set, n int, opts Options) int64 {
	st := transfer.NewStates(set)
	m := st.MaxLength()
	need := max(bounds.AtNeed(transfer.Whole(st), m, 1), CountsMemory(set, n, opts))
	if _, checker, err := certify.Estimate(opts.given(set), nil, []certify.Planned{{Start: certify.StartEmpty, Step: 1, N: m}}, endBits(1)); err == nil {
		need = max(need, int64(min(checker, math.MaxInt64/2)))
	}
	return need
}
