package prove

import (
	"context"
	"errors"
	"math/big"
	"time"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// Defaults of Options.
const (
	// DefaultMaxMemory caps the engine's and the checker's estimated
	// memory when Options.MaxMemory is 0: the checker's own default, the
	// one default memory budget of every command.
	DefaultMaxMemory = certify.DefaultMaxMemory
	// DefaultCheckWork caps the checker's estimated work when
	// Options.CheckWork is 0: the checker's own default (also that of
	// 'avoidcert check'), so whatever Certify builds within its memory
	// budget is checked.
	DefaultCheckWork = certify.DefaultMaxWork
	// defaultDigits is Certify's target when neither Digits nor Width is set.
	defaultDigits = 10
)

// ErrBudget is wrapped by every refusal that a larger budget could lift:
// a count whose iterates would not fit in Options.MaxMemory, a structure
// test whose memory estimate is over it (structure.ErrBudget), a
// certificate over the checker's limits, and the bracket run's refusals
// (bounds.ErrBudget: a memory budget below the first bracket's need, a
// budget that stopped the run before its first bracket).
var ErrBudget = errors.New("over the budget")

// Options set the target and the budgets of a call. The zero value is
// usable.
type Options struct {
	// Digits and Width are Certify's target (see bounds.Options); with
	// neither, Certify aims for 10 significant digits. Judge and Compare
	// choose their own targets.
	Digits int
	Width  *big.Rat
	// MaxK caps a bracket's k = n - M, M the longest prefix state (0: as
	// far as certify.MaxN, the format's limit on n, allows).
	MaxK int
	// MaxMemory caps the estimated memory of the engine and of the
	// checker, in bytes (0: DefaultMaxMemory).
	MaxMemory int64
	// CheckWork caps the checker's estimated work in coefficient
	// operations (0: DefaultCheckWork).
	CheckWork int64
	// Tool is written into certificates (default "avoidcert").
	Tool string
	// Typed are the pattern arguments of the set as the user wrote them
	// ("1342", "1.3.4.2" or comma lists "123,321"). They are handed to
	// the checker unparsed (certify.CheckOptions.Expect) and become the
	// certificate's patterns_given, so a checked answer is about the set
	// the user asked for even should the engine's parser misread it: the
	// checker then refuses. Without them the check is bound to the set as
	// the engine read it (pattern.Set.Strings); commands set them.
	Typed []string
	// TypedOther is Typed for Compare's second set.
	TypedOther []string
	// Deadline, if not zero, stops the bracket run (and the structure
	// pass before it) in time to keep its best bracket; building and
	// checking that bracket's certificate follow it and stop only when ctx
	// is cancelled. A deadline of ctx itself stops everything, the
	// certificate's check included.
	Deadline time.Time
	// Witnesses keeps, in Result.Report, one realisation per
	// configuration of a primitive set (structure.Options.Witnesses).
	Witnesses bool
	// ResidueConstants asks Certify and Judge for Estimates.ByResidue on
	// periodic sets (it counts a_n once more, to the bracket's n).
	ResidueConstants bool
	// Progress, if set, receives the bracket runs' events, from the
	// goroutine doing the work; it must not block for long.
	Progress func(Event)
	// CheckProgress, if set, receives the checker's estimated work done
	// and total (certify.CheckOptions.Progress).
	CheckProgress func(done, total int64)
	// Planned, if set, receives the plan of a bracket run before the run
	// starts: how far the budgets let it go.
	Planned func(Plan)
}

// Plan is how far a bracket run may go, found before it starts: brackets
// up to n = LastN, the largest the budgets allow (Beyond, when not nil,
// is why none past it could be certified; nil when MaxK binds), and the
// checker's estimated work and time for re-checking a certificate of a
// bracket at LastN (an estimate, from its work estimate at a measured
// speed).
type Plan struct {
	LastN     int
	Beyond    *BudgetError
	CheckWork float64
	CheckTime time.Duration
}

// Event is a progress event of a bracket run, with the number of blocks
// the set is bracketed by (0: the whole system at once); Block in the
// embedded event counts from 0.
type Event struct {
	bounds.Event
	Blocks int
}

// withDeadline returns ctx with Deadline applied; cancel must be called.
func (o Options) withDeadline(ctx context.Context) (context.Context, context.CancelFunc) {
	if o.Deadline.IsZero() {
		return ctx, func() {}
	}
	return context.WithDeadline(ctx, o.Deadline)
}

// maxN is the largest bracket n the budget allows on states st.
func (o Options) maxN(st *transfer.States) int {
	if o.MaxK <= 0 {
		return certify.MaxN
	}
	return min(o.MaxK+st.MaxLength(), certify.MaxN)
}

func (o Options) maxMemory() int64 {
	if o.MaxMemory <= 0 {
		return DefaultMaxMemory
	}
	return o.MaxMemory
}

func (o Options) checkWork() int64 {
	if o.CheckWork <= 0 {
		return DefaultCheckWork
	}
	return o.CheckWork
}

// expect is the set the checker binds a certificate to: the typed
// arguments, or the engine's reading of set when there are none.
func (o Options) expect(set pattern.Set) []string {
	if len(o.Typed) > 0 {
		return o.Typed
	}
	return set.Strings()
}

// given are the patterns a certificate states as given: the typed tokens,
// or the engine's reading.
func (o Options) given(set pattern.Set) []string {
	if len(o.Typed) > 0 {
		return certify.PatternTokens(o.Typed)
	}
	return set.Given()
}

func (o Options) tool() string {
	if o.Tool == "" {
		return "avoidcert"
	}
	return o.Tool
}
