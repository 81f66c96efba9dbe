package cellbounds

import (
	"fmt"
	"math"
	"math/big"
	"time"

	"avoidcert/interval"
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

// Bracket is one certified coefficientwise Collatz-Wielandt bracket: for
// the iterates G_k and G_{k+d} of one system (the whole set, or one block
// of cells), Lo = min R_a and Hi = max R_a over the indices a of degree k+d
// with D_a > 0, where R_a = G_{k+d}[a] / D_a and D_a is G_k raised d
// degrees. Then lambda^d lies in [Lo, Hi] (lambda of the system iterated).
type Bracket struct {
	Cells []int // the cells iterated (all cells for the whole set)
	M     int   // cell length m
	K     int   // k
	Step  int   // d
	// Lo and Hi are the exact extremes of R_a. Hi is nil when some index has
	// D_a = 0 < G_{k+d}[a]: no upper bound at this k.
	Lo, Hi *big.Rat
	// Lambda is the enclosure of lambda drawn from [Lo, Hi]: d-th roots,
	// rounded outward to dyadic rationals of Prec significant bits.
	Lambda Enclosure
	Prec   uint
	// Sum is the sum of the coefficients of G_k: a_{m+k} for the whole set.
	Sum *big.Int
	// Digest is transfer's digest of G_k (zero unless Options.Digests, or
	// from BracketAt).
	Digest [32]byte
}

// N0 returns m+k, the length whose count Sum is.
func (b Bracket) N0() int { return b.M + b.K }

// StopReason says why a run ended.
type StopReason string

// The reasons a run ends. Only StopTarget, StopExact and StopDecided mean
// the goal was reached; the others are budget stops, after which the result
// still holds the best certified bracket found.
const (
	StopTarget    StopReason = "target"    // the digits or width target is met
	StopExact     StopReason = "exact"     // a bracket of zero width: lambda is known exactly
	StopDecided   StopReason = "decided"   // Judge: the claim is proved or refuted
	StopMaxK      StopReason = "max-k"     // Options.MaxK reached
	StopMemory    StopReason = "memory"    // the next step would exceed Options.MaxMemory
	StopTimeout   StopReason = "timeout"   // the context deadline (stopped in time to keep a bracket)
	StopCancelled StopReason = "cancelled" // the context was cancelled
)

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
	Detail    string
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
// [MuLo, MuHi] of the whole set at k = N0-m:
//
//	A MuLo^(n-N0) <= a_n/n! <= A MuHi^(n-N0),  A = AN0/N0!.
//
// Proof. T is a positive operator (its kernel chi is 0 or 1), so f <= g
// pointwise gives T f <= T g. The bracket says, coefficient by coefficient
// in the Bernstein basis of degree k+1 on every cell, MuLo D_a <=
// G_{k+1}[a] <= MuHi D_a, where D_a/(k+1)! are the coefficients of g_k =
// G_k/k! = T^k g0 raised one degree and G_{k+1}[a]/(k+1)! are those of
// T g_k. The basis polynomials are nonnegative on their cell, so
// MuLo g_k <= T g_k <= MuHi g_k pointwise. By induction, using positivity,
// T^(j+1) g_k = T^j (T g_k) <= T^j (MuHi g_k) = MuHi T^j g_k <=
// MuHi^(j+1) g_k, and likewise MuLo^j g_k <= T^j g_k. Pairing with the
// constant 1 and using a_n/n! = <T^(n-m) g0, 1> (method note, section 2),
// with n = N0 + j: a_n/n! = <T^j g_k, 1> lies between MuLo^j <g_k, 1> and
// MuHi^j <g_k, 1>, and <g_k, 1> = a_{N0}/N0!.
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
