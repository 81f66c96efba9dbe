package prove

import (
	"errors"
	"math/big"

	"avoidcert/bounds"
	"avoidcert/certify"
)

// Defaults of Options.
const (
	// DefaultMaxMemory caps the engine's and the checker's estimated
	// memory when Options.MaxMemory is 0.
	DefaultMaxMemory = 8 << 30
	// DefaultCheckWork caps the checker's estimated work when
	// Options.CheckWork is 0: the default of 'avoidcert check', which
	// admits the 50-digit certificates of the length-4 patterns.
	DefaultCheckWork = 10_000_000_000
	// defaultDigits is Certify's target when neither Digits nor Width is set.
	defaultDigits = 10
)

// ErrBudget is wrapped by every refusal that a larger budget could lift:
// a count whose iterates would not fit in Options.MaxMemory, a certificate
// over the checker's limits.
var ErrBudget = errors.New("over the budget")

// Options set the target and the budgets of a call. The zero value is
// usable.
type Options struct {
	// Digits and Width are Certify's target (see bounds.Options); with
	// neither, Certify aims for 10 significant digits. Judge and Compare
	// choose their own targets.
	Digits int
	Width  *big.Rat
	// MaxK caps the degree of a bracket (0: certify.MaxK, the checker's
	// limit).
	MaxK int
	// MaxMemory caps the estimated memory of the engine and of the
	// checker, in bytes (0: DefaultMaxMemory).
	MaxMemory int64
	// CheckWork caps the checker's estimated work in coefficient
	// operations (0: DefaultCheckWork).
	CheckWork int64
	// Tool is written into certificates (default "avoidcert").
	Tool string
	// Progress, if set, receives the bracket runs' events.
	Progress bounds.Progress
}

func (o Options) maxK() int {
	if o.MaxK <= 0 || o.MaxK > certify.MaxK {
		return certify.MaxK
	}
	return o.MaxK
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

func (o Options) tool() string {
	if o.Tool == "" {
		return "avoidcert"
	}
	return o.Tool
}
