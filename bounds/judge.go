package bounds

import (
	"context"
	"fmt"
	"math"
	"math/big"

	"avoidcert/interval"
	"avoidcert/transfer"
)

// Quantity names what a claim is about.
type Quantity string

// The quantities a claim may state.
const (
	QuantityLambda Quantity = "lambda" // the growth rate lambda
	QuantityRadius Quantity = "radius" // 1/lambda, the radius of convergence of the e.g.f.
)

// ParseQuantity reads "lambda" or "radius".
func ParseQuantity(s string) (Quantity, error) {
	switch q := Quantity(s); q {
	case QuantityLambda, QuantityRadius:
		return q, nil
	}
	return "", fmt.Errorf("bounds: unknown quantity %q; a claim is about \"lambda\" (the growth rate) or \"radius\" (1/lambda)", s)
}

// Verdict is the outcome of judging a claim.
type Verdict string

// The verdicts.
const (
	Proved    Verdict = "proved"    // the certified enclosure lies inside the claimed interval
	Refuted   Verdict = "refuted"   // the certified enclosure is disjoint from the claimed interval
	Undecided Verdict = "undecided" // a budget stopped the run first
)

// Judge decides a claim that lambda (or 1/lambda) lies in the closed
// interval claim (as interval.ClaimRange returns for a printed decimal),
// tightening the bracket until it lies inside the claim or misses it, or a
// budget in opts stops the run (its Digits and Width are ignored).
func Judge(ctx context.Context, st *transfer.States, claim interval.Interval, of Quantity, opts Options) (Verdict, *Result, error) {
	return JudgeBlocks(ctx, st, nil, claim, of, opts, nil)
}

// JudgeBlocks is Judge over the blocks of a reducible set (see RunBlocks);
// nil blocks mean the whole set, as in Judge.
func JudgeBlocks(ctx context.Context, st *transfer.States, blocks [][]int, claim interval.Interval, of Quantity, opts Options, progress Progress) (Verdict, *Result, error) {
	if _, err := ParseQuantity(string(of)); err != nil {
		return Undecided, nil, err
	}
	if claim.Lo == nil || claim.Hi == nil || claim.Lo.Cmp(claim.Hi) > 0 {
		return Undecided, nil, fmt.Errorf("bounds: the claimed interval must have finite ends with lo <= hi")
	}
	opts.Digits, opts.Width = 0, nil
	if err := opts.validate(false); err != nil {
		return Undecided, nil, err
	}
	runners, err := blockRunners(ctx, st, blocks, opts)
	if err != nil {
		return Undecided, nil, err
	}
	g := judgeGoal{claim: claim, of: of}
	res, err := drive(ctx, runners, opts, g, progress)
	if err != nil {
		return Undecided, nil, err
	}
	return g.verdict(g.quantity(res.Lambda)), res, nil
}

// judgeGoal is reached when the claim is proved or refuted.
type judgeGoal struct {
	claim interval.Interval
	of    Quantity
}

// quantity returns the enclosure of the claimed quantity.
func (g judgeGoal) quantity(l Enclosure) Enclosure {
	if g.of == QuantityRadius {
		return l.reciprocal(g.prec(l.Hi))
	}
	return l
}

func (g judgeGoal) verdict(q Enclosure) Verdict { return Decide(q, g.claim) }

// Decide judges the claim "the value lies in the closed interval claim"
// against a certified enclosure q: proved when q lies inside the claim,
// refuted when it misses it (an infinite value, Lo nil, misses every
// claim), undecided when they overlap.
func Decide(q Enclosure, claim interval.Interval) Verdict {
	switch {
	case q.Finite() && claim.Lo.Cmp(q.Lo) <= 0 && q.Hi.Cmp(claim.Hi) <= 0:
		return Proved
	case q.Lo == nil || q.Lo.Cmp(claim.Hi) > 0 || (q.Hi != nil && q.Hi.Cmp(claim.Lo) < 0):
		return Refuted
	}
	return Undecided
}

func (g judgeGoal) met(l Enclosure) bool { return g.verdict(g.quantity(l)) != Undecided }

// targetLog2 aims for a width below the distance from the midpoint to the
// nearest end of the claim (inside or out).
func (g judgeGoal) targetLog2(l Enclosure) float64 {
	if !l.Finite() || l.Lo.Sign() <= 0 {
		return -10
	}
	mid := new(big.Rat).Add(l.Lo, l.Hi)
	mid.Quo(mid, big.NewRat(2, 1))
	q := mid
	if g.of == QuantityRadius {
		q = new(big.Rat).Inv(mid)
	}
	dist := new(big.Rat)
	switch {
	case q.Cmp(g.claim.Lo) < 0:
		dist.Sub(g.claim.Lo, q)
	case q.Cmp(g.claim.Hi) > 0:
		dist.Sub(q, g.claim.Hi)
	default:
		dist.Sub(q, g.claim.Lo)
		if up := new(big.Rat).Sub(g.claim.Hi, q); up.Cmp(dist) < 0 {
			dist = up
		}
	}
	if dist.Sign() == 0 {
		return log2Rat(l.Width()) - 3
	}
	t := log2Rat(dist) - 1
	if g.of == QuantityRadius {
		// d(1/lambda) = d lambda / lambda^2
		t += 2 * log2Rat(mid)
	}
	return t
}

// prec keeps the outward rounding far below the claim's width.
func (g judgeGoal) prec(*big.Rat) uint {
	w := g.claim.Width()
	scale := new(big.Rat).Abs(g.claim.Lo)
	if h := new(big.Rat).Abs(g.claim.Hi); h.Cmp(scale) > 0 {
		scale = h
	}
	if w.Sign() == 0 || scale.Sign() == 0 {
		return 512
	}
	return max(64, uint(math.Ceil(log2Rat(scale)-log2Rat(w)))+24)
}
