package claims

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"strings"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/internal/brief"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// Verdict is the outcome of one claim.
type Verdict string

// The verdicts.
const (
	Proved    Verdict = "proved"    // rests on checked certificates, or on counts the engine and the checker agree on
	Refuted   Verdict = "refuted"   // likewise
	Undecided Verdict = "undecided" // a budget stopped the work first; Evidence says which
	Failed    Verdict = "error"     // the tool failed (a certificate the checker refused, engine and checker disagreeing): no verdict
)

// outcome is a verdict and its evidence in a few words.
type outcome struct {
	verdict  Verdict
	evidence string
}

func fromBounds(v bounds.Verdict) Verdict {
	switch v {
	case bounds.Proved:
		return Proved
	case bounds.Refuted:
		return Refuted
	}
	return Undecided
}

// judgeCounts decides count, equal-counts and probability claims from
// counts that the engine and the checker agree on (prove.Counts).
func judgeCounts(ctx context.Context, c Claim, opts prove.Options) (outcome, error) {
	top := c.N
	switch c.Kind {
	case KindCount:
		top = c.From + len(c.Counts) - 1
	case KindEqualCounts:
		top = c.To
	}
	if top > c.Budget.MaxN {
		return outcome{Undecided, fmt.Sprintf("n = %d is over the budget max_n = %d", top, c.Budget.MaxN)}, nil
	}
	counts, err := prove.Counts(ctx, c.Set, top, opts)
	if err != nil {
		return outcome{}, err
	}
	switch c.Kind {
	case KindCount:
		for i, claimed := range c.Counts {
			n := c.From + i
			if counts[n].Cmp(claimed) != 0 {
				return outcome{Refuted, fmt.Sprintf("a_%d = %s, not %s (engine and checker agree)", n, brief.Digits(counts[n].String()), brief.Digits(claimed.String()))}, nil
			}
		}
		if len(c.Counts) == 1 {
			return outcome{Proved, fmt.Sprintf("a_%d = %s (engine and checker agree)", c.From, brief.Digits(counts[c.From].String()))}, nil
		}
		return outcome{Proved, fmt.Sprintf("a_%d..a_%d all equal (engine and checker agree)", c.From, top)}, nil
	case KindEqualCounts:
		opts.Typed = c.OtherTyped
		other, err := prove.Counts(ctx, c.Other, top, opts)
		if err != nil {
			return outcome{}, err
		}
		for n := range counts {
			if counts[n].Cmp(other[n]) != 0 {
				return outcome{Refuted, fmt.Sprintf("a_%d differ: %s for %s, %s for %s", n, brief.Digits(counts[n].String()), c.Set, brief.Digits(other[n].String()), c.Other)}, nil
			}
		}
		return outcome{Proved, fmt.Sprintf("a_n equal for every n <= %d (engine and checker agree); evidence, not a proof, of c-Wilf equivalence", top)}, nil
	}
	p := new(big.Rat).SetFrac(counts[c.N], new(big.Int).MulRange(1, int64(c.N)))
	num, den, _ := strings.Cut(p.RatString(), "/")
	fraction := brief.Digits(num)
	if den != "" {
		fraction += "/" + brief.Digits(den)
	}
	shown := fmt.Sprintf("a_%d/%d! = %s ~ %s", c.N, c.N, fraction, approx(p))
	ok := false
	if c.Exact != nil {
		ok = p.Cmp(c.Exact) == 0
	} else {
		ok = c.Claimed.Contains(p)
	}
	if ok {
		return outcome{Proved, shown + " (engine and checker agree)"}, nil
	}
	return outcome{Refuted, shown + ", not " + brief.Digits(c.Stated)}, nil
}

// approx writes r to 10 significant digits, rounded to nearest (a display).
func approx(r *big.Rat) string {
	return new(big.Float).SetPrec(128).SetRat(r).Text('g', 10)
}

// certified is a claim decided by certificates: the sets they are for,
// how the verdict is read from checked certificates, and how fresh ones
// are made.
type certified struct {
	sets    []pattern.Set
	typed   [][]string // each set as the manifest writes it
	decide  func(certs []*certify.Certificate) outcome
	compute func(ctx context.Context, opts prove.Options) ([]*certify.Certificate, outcome, error)
}

func certifiedFor(c Claim) certified {
	switch c.Kind {
	case KindGrowth:
		return certified{
			sets:   []pattern.Set{c.Set},
			typed:  [][]string{c.Typed},
			decide: func(cs []*certify.Certificate) outcome { return growthOutcome(c, prove.Enclosure(cs[0], c.Of)) },
			compute: func(ctx context.Context, opts prove.Options) ([]*certify.Certificate, outcome, error) {
				j, err := prove.Judge(ctx, c.Set, c.Claimed, c.Of, opts)
				if err != nil {
					return nil, outcome{}, err
				}
				o := growthOutcome(c, j.Certified)
				if o.verdict == Undecided {
					o.evidence += "; " + stopWords(j.Result)
				}
				return []*certify.Certificate{j.Certificate}, o, nil
			},
		}
	case KindForm:
		return certified{
			sets:   []pattern.Set{c.Set},
			typed:  [][]string{c.Typed},
			decide: func(cs []*certify.Certificate) outcome { return formOutcome(c, prove.FormOf(cs[0])) },
			compute: func(ctx context.Context, opts prove.Options) ([]*certify.Certificate, outcome, error) {
				opts.Digits = 3 // the structure section is the point; any bracket will do
				r, err := prove.Certify(ctx, c.Set, opts)
				if err != nil {
					return nil, outcome{}, err
				}
				return []*certify.Certificate{r.Certificate}, formOutcome(c, prove.FormOf(r.Certificate)), nil
			},
		}
	}
	return certified{
		sets:   []pattern.Set{c.Set, c.Other},
		typed:  [][]string{c.Typed, c.OtherTyped},
		decide: func(cs []*certify.Certificate) outcome { return orderOutcome(c, cs[0], cs[1]) },
		compute: func(ctx context.Context, opts prove.Options) ([]*certify.Certificate, outcome, error) {
			opts.TypedOther = c.OtherTyped
			cmp, err := prove.Compare(ctx, c.Set, c.Other, opts)
			if err != nil {
				return nil, outcome{}, err
			}
			o := orderOutcome(c, cmp.First.Certificate, cmp.Second.Certificate)
			if o.verdict == Undecided && !cmp.First.Done() {
				o.evidence += "; " + stopWords(cmp.First)
			} else if o.verdict == Undecided && !cmp.Second.Done() {
				o.evidence += "; " + stopWords(cmp.Second)
			}
			return []*certify.Certificate{cmp.First.Certificate, cmp.Second.Certificate}, o, nil
		},
	}
}

func growthOutcome(c Claim, q bounds.Enclosure) outcome {
	digits := min(max(interval.CommonDigits(c.Claimed.Lo, c.Claimed.Hi)+3, 8), 60)
	v := fromBounds(prove.Decide(q, c.Claimed))
	shown := fmt.Sprintf("%s in %s", c.Of, q.String(digits))
	switch v {
	case Proved:
		return outcome{v, shown + ", inside the claim"}
	case Refuted:
		return outcome{v, shown + ", outside the claim " + brief.Digits(c.Stated)}
	}
	return outcome{v, shown + " overlaps the claim's ends"}
}

func formOutcome(c Claim, f prove.Form) outcome {
	got := string(f.Class)
	switch f.Class {
	case certify.ClassPrimitive:
		got += fmt.Sprintf(" (primitivity exponent k = %d)", f.Exponent)
	case certify.ClassPeriodic:
		got += fmt.Sprintf(" with period %d", f.Period)
	case certify.ClassUndecided:
		return outcome{Undecided, "the structure test decided no class (the joint sets did not repeat within the step limit, or the period is not settled)"}
	}
	if string(f.Class) == c.Form && (c.Period == 0 || c.Period == f.Period) {
		return outcome{Proved, got + ", by the checked structure section"}
	}
	return outcome{Refuted, "the checked structure section proves " + got}
}

func orderOutcome(c Claim, first, second *certify.Certificate) outcome {
	a, b := prove.Enclosure(first, bounds.QuantityLambda), prove.Enclosure(second, bounds.QuantityLambda)
	v := fromBounds(prove.DecideOrder(first, second))
	digits := 8
	for v != Undecided && digits < 60 && !disjointAt(a, b, digits) {
		digits += 4
	}
	relation := map[Verdict]string{Proved: "is below", Refuted: "is not below", Undecided: "overlaps"}[v]
	return outcome{v, fmt.Sprintf("lambda(%s) in %s %s lambda(%s) in %s", c.Set, a.String(digits), relation, c.Other, b.String(digits))}
}

// disjointAt reports whether the enclosures, printed outward to the given
// digits, show their order.
func disjointAt(a, b bounds.Enclosure, digits int) bool {
	printed := func(r *big.Rat, up bool) *big.Rat {
		s := interval.DecimalDown(r, digits)
		if up {
			s = interval.DecimalUp(r, digits)
		}
		x, err := interval.ParseDecimal(s)
		if err != nil {
			return r
		}
		return x
	}
	return printed(a.Hi, true).Cmp(printed(b.Lo, false)) < 0 || printed(b.Hi, true).Cmp(printed(a.Lo, false)) < 0
}

// stopWords says which budget of the claim stopped a run, and what more
// it would need.
func stopWords(r *prove.Result) string {
	if over := r.Stopped(); over != nil {
		return "budget stop: " + over.Explain(fieldOf)
	}
	return "decided"
}

// fieldOf names the manifest field (or gate flag) that sets a budget.
func fieldOf(b prove.Budget) string {
	return map[prove.Budget]string{prove.BudgetMemory: "max_memory", prove.BudgetTime: "timeout", prove.BudgetMaxK: "max_k"}[b]
}

// budgetOutcome turns a budget error into an undecided verdict, and
// reports false for any other error.
func budgetOutcome(err error, claimCtx, runCtx context.Context, c Claim) (outcome, bool) {
	var be *prove.BudgetError
	switch {
	case errors.As(err, &be) && (be.Budget != prove.BudgetTime || be.Need > 0):
		return outcome{Undecided, be.Explain(fieldOf)}, true
	case errors.Is(err, prove.ErrBudget) && !errors.Is(err, context.DeadlineExceeded):
		return outcome{Undecided, strings.TrimPrefix(err.Error(), "prove: ")}, true
	case errors.Is(err, context.DeadlineExceeded) && runCtx.Err() != nil:
		return outcome{Undecided, "the run's timeout was spent before this claim was decided"}, true
	case errors.Is(err, context.DeadlineExceeded) && claimCtx.Err() != nil:
		return outcome{Undecided, fmt.Sprintf("the claim's timeout (%s) was spent first", c.Budget.Timeout)}, true
	}
	return outcome{}, false
}
