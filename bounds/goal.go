package bounds

import (
	"fmt"
	"math"
	"math/big"
	"time"

	"avoidcert/interval"
)

// Options sets a run's target and budgets. At least one target (Digits or
// Width) is needed by Run and RunBlocks; when both are given both must be
// met. Judge ignores the targets. Zero budgets mean no limit.
type Options struct {
	// Digits asks for interval.CommonDigits(Lambda.Lo, Lambda.Hi) >= Digits.
	Digits int
	// Width asks for Lambda.Hi - Lambda.Lo <= Width (absolute, exact).
	Width *big.Rat
	// Step is the period d: brackets are taken for lambda^d from T^d and
	// their d-th roots are taken outward. 0 means 1. Use the period the
	// structure test finds for periodic sets ({123, 321} has period 2).
	Step int
	// MaxN is the largest n at which a bracket is taken (iterates go to
	// MaxN + Step).
	MaxN int
	// CertN, when positive, is the largest n whose bracket the caller can
	// still certify (its certificate's check would be over budget beyond
	// it): the run takes no bracket past it and stops there with
	// StopCertifiable, like MaxN.
	CertN int
	// Reserve, when set, is the time the caller needs after the run to
	// certify a bracket at n (build and check its certificate): a deadline
	// stops the run early enough to leave it.
	Reserve func(n int) time.Duration
	// MaxMemory bounds the bytes held: iterates (transfer.Engine.Footprint
	// for the next step) plus this package's workspace.
	MaxMemory int64
	// Digests asks for Bracket.Digest (transfer's digest of G_n, for
	// certificates) on the brackets of the result. Digesting a large
	// iterate costs about as much as a counting step, so it is off unless
	// asked for.
	Digests bool
}

func (o Options) step() int { return max(o.Step, 1) }

// lastN returns the largest n a bracket may be taken at (0: no limit) and
// the stop that names it.
func (o Options) lastN() (int, StopReason) {
	if o.CertN > 0 && (o.MaxN == 0 || o.CertN < o.MaxN) {
		return o.CertN, StopCertifiable
	}
	return o.MaxN, StopMaxN
}

// reserve returns the time to leave after a bracket at n.
func (o Options) reserve(n int) time.Duration {
	if o.Reserve == nil {
		return 0
	}
	return o.Reserve(n)
}

func (o Options) validate(needTarget bool) error {
	switch {
	case o.Step < 0:
		return fmt.Errorf("bounds: Step must be a positive period, got %d", o.Step)
	case o.Digits < 0:
		return fmt.Errorf("bounds: Digits must be positive, got %d", o.Digits)
	case o.Width != nil && o.Width.Sign() <= 0:
		return fmt.Errorf("bounds: Width must be positive, got %s", o.Width.RatString())
	case o.MaxN < 0 || o.CertN < 0 || o.MaxMemory < 0:
		return fmt.Errorf("bounds: budgets must not be negative (MaxN %d, CertN %d, MaxMemory %d)", o.MaxN, o.CertN, o.MaxMemory)
	case needTarget && o.Digits == 0 && o.Width == nil:
		return fmt.Errorf("bounds: no target: set Digits (e.g. 30) or Width (e.g. 1e-30)")
	}
	return nil
}

// goal decides when a run is done and steers its schedule.
type goal interface {
	// met reports whether the enclosure of lambda reaches the goal.
	met(lambda Enclosure) bool
	// targetLog2 returns log2 of a lambda width likely to reach the goal,
	// given the current enclosure (used only to plan; never trusted).
	targetLog2(lambda Enclosure) float64
	// prec returns the bits to round lambda's ends to, given an upper end
	// (nil if infinite).
	prec(hi *big.Rat) uint
}

// targetGoal is the Digits/Width target of Run.
type targetGoal struct {
	digits int
	width  *big.Rat
}

func (g targetGoal) met(l Enclosure) bool {
	if !l.Finite() {
		return false
	}
	if g.width != nil && l.Width().Cmp(g.width) > 0 {
		return false
	}
	return g.digits == 0 || interval.CommonDigits(l.Lo, l.Hi) >= g.digits
}

func (g targetGoal) targetLog2(l Enclosure) float64 {
	t := math.Inf(1)
	if g.width != nil {
		t = log2Rat(g.width) - 1
	}
	if g.digits > 0 {
		// One unit in the last wanted digit, at lambda's magnitude; aim for
		// a twentieth of it so that a digit boundary is rarely straddled.
		scale := 0.0
		if l.Lo != nil && l.Lo.Sign() > 0 {
			scale = log2Rat(l.Lo)
		}
		e := math.Floor(scale / math.Log2(10))
		unit := (e + 1 - float64(g.digits)) * math.Log2(10)
		td := unit - math.Log2(20)
		if w := l.Width(); w != nil && w.Sign() > 0 && log2Rat(w) <= td {
			// Narrow enough but straddling a boundary: shrink further.
			td = log2Rat(w) - 3
		}
		t = math.Min(t, td)
	}
	return t
}

func (g targetGoal) prec(hi *big.Rat) uint {
	p := uint(64)
	if g.digits > 0 {
		p = max(p, uint(math.Ceil(3.33*float64(g.digits+10))))
	}
	if g.width != nil && hi != nil && hi.Sign() > 0 {
		// Rounding moves an end by at most 2^(1-prec) of its size. A width
		// above hi needs no extra bits (and a negative float must not
		// reach the uint conversion).
		p = max(p, uint(max(0, math.Ceil(log2Rat(hi)-log2Rat(g.width))))+12)
	}
	return p
}
