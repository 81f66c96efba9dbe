package bounds

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"time"

	"avoidcert/interval"
	"avoidcert/transfer"
)

// Enclosure is a certified closed interval [Lo, Hi] with exact rational
// (dyadic, once rounded) endpoints. Hi == nil stands for +infinity: no finite
// upper bound was proved. Lo == nil (only together with Hi == nil) stands
// for the value +infinity itself: the radius when lambda = 0.
type Enclosure struct {
	Lo, Hi *big.Rat
}

// Finite reports whether both ends are finite.
func (x Enclosure) Finite() bool { return x.Lo != nil && x.Hi != nil }

// Interval returns the enclosure as an interval.Interval; ok is false when
// an end is infinite.
func (x Enclosure) Interval() (iv interval.Interval, ok bool) {
	if !x.Finite() {
		return interval.Interval{}, false
	}
	return interval.Interval{Lo: x.Lo, Hi: x.Hi}, true
}

// Width returns Hi - Lo, or nil when an end is infinite.
func (x Enclosure) Width() *big.Rat {
	if !x.Finite() {
		return nil
	}
	return new(big.Rat).Sub(x.Hi, x.Lo)
}

// String prints the enclosure outward with the given significant digits
// ("inf" for an infinite end).
func (x Enclosure) String(digits int) string {
	end := func(r *big.Rat, up bool) string {
		switch {
		case r == nil:
			return "inf"
		case up:
			return interval.DecimalUp(r, digits)
		}
		return interval.DecimalDown(r, digits)
	}
	return "[" + end(x.Lo, false) + ", " + end(x.Hi, true) + "]"
}

// reciprocal returns the enclosure of 1/x rounded outward to prec bits, for
// x >= 0: 1/0 is +infinity.
func (x Enclosure) reciprocal(prec uint) Enclosure {
	var r Enclosure
	if x.Hi != nil && x.Hi.Sign() > 0 {
		r.Lo = interval.RoundDown(new(big.Rat).Inv(x.Hi), prec)
	} else if x.Hi == nil {
		r.Lo = new(big.Rat)
	}
	if x.Lo != nil && x.Lo.Sign() > 0 {
		r.Hi = interval.RoundUp(new(big.Rat).Inv(x.Lo), prec)
	}
	return r
}

// Bracket is one certified coefficientwise Collatz-Wielandt bracket
// (docs/prefix-states.md, "The bracket"): for the iterates G_N and
// G_(N+d) of one system (the whole set, or the moves among some states
// with start ones or whole), Lo = min R and Hi = max R over the states p of
// the system and the compositions a of N+d-|p| with H > 0, where
// R = G_(N+d)[p][a] / H and H is G_N[p] raised d degrees (d-fold integer
// elevation). What [Lo, Hi] proves depends on the start: for the whole
// system lambda^d lies in [Lo, Hi]; start ones gives lambda(T'_C)^d <= Hi
// (the upper end of a block); start whole gives Lo <= lambda^d.
type Bracket struct {
	States []int          // the system's states, increasing (all states for the whole system)
	Start  transfer.Start // transfer.StartEmpty for the whole system
	Step   int            // d
	N      int            // the bracket compares G_N and G_(N+d)
	// Lo and Hi are the exact extremes of R. Hi is nil when some index has
	// H = 0 < G_(N+d)[p][a]: no upper bound at this N.
	Lo, Hi *big.Rat
	// Upper reports whether Hi is used as an upper end (the whole system,
	// or start ones); the lower end is used for the whole system and start
	// whole.
	Upper bool
	// Lambda is the enclosure drawn from [Lo, Hi]: d-th roots, rounded
	// outward to dyadic rationals of Prec significant bits. For a block
	// bracket only the end its start proves is about lambda itself.
	Lambda Enclosure
	Prec   uint
	// Sum is the sum of the coefficients of G_N: a_N for the whole system.
	Sum *big.Int
	// Digest is transfer's digest of G_N (zero unless Options.Digests, or
	// from BracketAt).
	Digest [32]byte
}

// Lower reports whether the bracket's Lo is a lower bound of lambda^d
// (the whole system, or start whole).
func (b Bracket) Lower() bool { return b.Start != transfer.StartOnes }

// StopReason says why a run ended.
type StopReason string

// The reasons a run ends. Only StopTarget, StopExact and StopDecided mean
// the goal was reached; the others are budget stops, after which the result
// still holds the best certified bracket found.
const (
	StopTarget  StopReason = "target"  // the digits or width target is met
	StopExact   StopReason = "exact"   // a bracket of zero width: lambda is known exactly
	StopDecided StopReason = "decided" // Judge: the claim is proved or refuted
	StopMaxN    StopReason = "max-n"   // Options.MaxN reached
	// StopCertifiable: Options.CertN reached; a bracket further on could
	// not be certified within the caller's budgets.
	StopCertifiable StopReason = "certifiable"
	StopMemory      StopReason = "memory"    // the next step would exceed Options.MaxMemory
	StopTimeout     StopReason = "timeout"   // the context deadline (stopped in time to keep a bracket)
	StopCancelled   StopReason = "cancelled" // the context was cancelled
)

// ErrBudget is wrapped by every refusal that a larger budget would lift:
// a memory budget below the need of the first bracket, and a budget
// (MaxN, MaxMemory, the context's deadline) that stopped a run before its
// first bracket. Such errors are *BudgetError values; errors.Is(err,
// ErrBudget) recognises them, errors.As gives the budget that ran out.
var ErrBudget = errors.New("bounds: over the budget")

// BudgetError is a run refused or left without a bracket by a budget.
type BudgetError struct {
	// Stop names the budget: StopMemory (Options.MaxMemory), StopMaxN
	// (Options.MaxN), StopCertifiable (Options.CertN) or StopTimeout (the
	// context's deadline).
	Stop StopReason
	// Need is, for StopMemory, the bytes the first bracket needs.
	Need int64
	msg  string
}

func (e *BudgetError) Error() string { return e.msg }

// Is makes errors.Is(err, ErrBudget) hold for a *BudgetError.
func (e *BudgetError) Is(target error) bool { return target == ErrBudget }

// Result is the outcome of Run, RunBlocks or Judge.
type Result struct {
	// Lambda is the certified enclosure of the growth rate
	// lambda = lim (a_n/n!)^(1/n), with the ends of the brackets' Lambda
	// (dyadic rationals). Prec is the largest of their precisions, also
	// used to round Radius outward.
	Lambda Enclosure
	// Radius is the certified enclosure of 1/lambda, the radius of
	// convergence of sum a_n z^n/n! (Hi nil when Lambda.Lo = 0).
	Radius Enclosure
	// Digits is interval.CommonDigits of Lambda (0 unless finite and positive).
	Digits int
	Prec   uint
	// Brackets are the brackets the enclosure rests on: for Run the
	// narrowest one found; for RunBlocks the narrowest of each block, in
	// block order. Lambda is [max of their lower ends, max of their upper
	// ends].
	Brackets []Bracket
	// Explicit holds the bounds valid for every n >= n0; nil unless the run
	// iterated the whole set with Step 1 and found a finite bracket.
	Explicit *AllN
	Stop     StopReason
	// Detail explains a budget stop in words.
	Detail string
	// Need is, for StopMemory, the bytes the step or bracket refused would
	// have needed.
	Need      int64
	Elapsed   time.Duration
	Estimates Estimates
}

// Estimates are floating-point figures for orientation: estimate, not
// certified. Zero means unknown.
type Estimates struct {
	// Rate is the observed factor by which the bracket width shrinks per
	// unit of k, an estimate of |lambda_2|/lambda (estimate, not
	// certified).
	Rate float64
	// C is a_{n0}/(n0! mid^n0) for the midpoint mid of Lambda, an estimate
	// of c in a_n ~ c lambda^n n! (estimate, not certified; whole set only).
	C float64
}

// AllN holds bounds valid for every n >= N0, from a Step 1 bracket
// [MuLo, MuHi] of the whole system at N0:
//
//	A MuLo^(n-N0) <= a_n/n! <= A MuHi^(n-N0),  A = AN0/N0!.
//
// Proof. T' (the transfer operator on prefix states, method note section
// 8) is positive, so f <= g pointwise gives T' f <= T' g. The bracket
// says, coefficient by coefficient in the Bernstein basis of degree
// N0+1-|p| on the cell of every state p, MuLo H <= G_(N0+1)[p][a] <= MuHi H,
// where H/(N0+1-|p|)! are the coefficients of g (the density of G_N0,
// coefficients G_N0[p]/(N0-|p|)!) raised one degree and
// G_(N0+1)[p][a]/(N0+1-|p|)! are those of T' g. The basis polynomials are
// nonnegative on their cell, so MuLo g <= T' g <= MuHi g pointwise. By
// induction, using positivity, MuLo^j g <= T'^j g <= MuHi^j g. The mass of
// T'^j g is a_(N0+j)/(N0+j)! (every permutation of length n is counted
// once in G_n, and a coefficient G_n[p][a] carries mass G_n[p][a]/n!), so
// with n = N0 + j, a_n/n! lies between MuLo^j and MuHi^j times
// a_N0/N0!.
type AllN struct {
	N0         int
	AN0        *big.Int // a_{N0}
	MuLo, MuHi *big.Rat // the bracket, rounded outward (still valid: looser)
}

// At returns lo <= A MuLo^(n-N0) and hi >= A MuHi^(n-N0), so that
// lo <= a_n/n! <= hi, each rounded outward to prec bits (via
// interval.PowDown and PowUp). It refuses n < N0.
func (b AllN) At(n int, prec uint) (lo, hi *big.Rat, err error) {
	if n < b.N0 {
		return nil, nil, fmt.Errorf("bounds: the explicit bounds hold for n >= %d, not n = %d", b.N0, n)
	}
	a := new(big.Rat).SetFrac(b.AN0, factorial(b.N0))
	lo = new(big.Rat).Mul(a, interval.PowDown(b.MuLo, n-b.N0, prec))
	hi = new(big.Rat).Mul(a, interval.PowUp(b.MuHi, n-b.N0, prec))
	return interval.RoundDown(lo, prec), interval.RoundUp(hi, prec), nil
}

func factorial(n int) *big.Int {
	return new(big.Int).MulRange(1, int64(n))
}

// estimateC returns a_{n0}/(n0! mid^n0) in floating point.
func estimateC(sum *big.Int, n0 int, lambda Enclosure) float64 {
	if !lambda.Finite() || lambda.Lo.Sign() <= 0 || sum.Sign() == 0 {
		return 0
	}
	const prec = 128
	mid := new(big.Rat).Add(lambda.Lo, lambda.Hi)
	mid.Quo(mid, big.NewRat(2, 1))
	m := new(big.Float).SetPrec(prec).SetRat(mid)
	p := new(big.Float).SetPrec(prec).SetInt64(1)
	for range n0 {
		p.Mul(p, m)
	}
	p.Mul(p, new(big.Float).SetPrec(prec).SetInt(factorial(n0)))
	c, _ := new(big.Float).SetPrec(prec).Quo(new(big.Float).SetPrec(prec).SetInt(sum), p).Float64()
	if math.IsInf(c, 0) {
		return 0
	}
	return c
}
