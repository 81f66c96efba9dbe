package prob

import (
	"context"
	"math"
	"math/big"
	"sort"

	"avoidcert/pattern"
)

// Observation is a count of matching windows seen in data: the windows of
// N values (or of the subsequences of a delay) that match a member of Set.
type Observation struct {
	Set      pattern.Set
	Observed int
}

// Budget limits the exact laws of Assess: the estimated word additions of
// all layered iterations together, and the estimated memory of each.
type Budget struct {
	Work   float64
	Memory float64
}

// Assessment is an observed count against the law of the count under
// i.i.d. continuous draws.
type Assessment struct {
	Moments Moments
	// Exact reports whether the tails below are exact; otherwise they are
	// the normal approximation of NormalTails.
	Exact bool
	// AtMost and AtLeast are P(count <= observed) and P(count >= observed):
	// exact fractions when Exact, nil otherwise.
	AtMost, AtLeast *big.Rat
	// ApproxAtMost and ApproxAtLeast are the normal approximation, set
	// when Exact is false.
	ApproxAtMost, ApproxAtLeast float64
	// Central is the exact central 95% range [lo, hi] of the count (Law.
	// Central with tail 1/40), when CentralKnown.
	Central      [2]int
	CentralKnown bool
	// Need is the cost of the exact tails (the law to the observed count);
	// when Exact is false it was over the budget left (+Inf: over the
	// whole budget).
	Need Cost
}

// Assess compares each observation with the law of its count over
// sequences of the given lengths (Interleave for a delay): the exact mean
// and variance always, the exact tails when the layered iterations fit the
// budget, the normal approximation otherwise.
//
// Observations whose sets are images of one another under reversal and
// complement share one law (the count's distribution is the same), computed
// once, to the largest count any of them needs: the observed count for the
// tails, and mean + 3 sd for the central 95% range when that fits too.
// Groups are taken cheapest first while the budget lasts, so a few costly
// ones do not crowd out many cheap ones.
func Assess(ctx context.Context, obs []Observation, lengths []int, b Budget) ([]Assessment, error) {
	out := make([]Assessment, len(obs))
	type group struct {
		rep             pattern.Set
		members         []int
		tails, forRange int // J needed for the tails, and for the range too
		cost, costR     Cost
	}
	groups := map[string]*group{}
	var order []*group
	for i, o := range obs {
		out[i].Moments = InterleavedMoments(o.Set, lengths)
		key := o.Set.Canonical().String()
		g := groups[key]
		if g == nil {
			g = &group{rep: o.Set}
			groups[key] = g
			order = append(order, g)
		}
		g.members = append(g.members, i)
		mean, _ := out[i].Moments.Mean.Float64()
		variance, _ := out[i].Moments.Variance.Float64()
		g.tails = max(g.tails, o.Observed)
		g.forRange = max(g.forRange, o.Observed, int(math.Ceil(mean+3*math.Sqrt(variance))))
	}
	values := 0
	for _, n := range lengths {
		values += n
	}
	for _, g := range order {
		// no count exceeds a window per value and member: cap J there
		most := values * len(g.rep.Patterns())
		g.tails, g.forRange = min(g.tails, most), min(g.forRange, most)
		g.cost = InterleavedCost(g.rep, lengths, g.tails, b.Work)
		g.costR = InterleavedCost(g.rep, lengths, g.forRange, b.Work)
		for _, i := range g.members {
			out[i].Need = g.cost
		}
	}
	sort.SliceStable(order, func(i, j int) bool { return order[i].cost.Work < order[j].cost.Work })
	left := b.Work
	for _, g := range order {
		J := -1
		switch {
		case g.costR.Work <= left && g.costR.Memory <= b.Memory:
			J, left = g.forRange, left-g.costR.Work
		case g.cost.Work <= left && g.cost.Memory <= b.Memory:
			J, left = g.tails, left-g.cost.Work
		}
		if J < 0 {
			for _, i := range g.members {
				out[i].ApproxAtMost, out[i].ApproxAtLeast = NormalTails(out[i].Moments, obs[i].Observed)
			}
			continue
		}
		law, err := InterleavedLaw(ctx, g.rep, lengths, J)
		if err != nil {
			return nil, err
		}
		lo, hi, ok := law.Central(big.NewRat(1, 40))
		for _, i := range g.members {
			a := &out[i]
			x := obs[i].Observed
			a.Exact = true
			a.AtMost, a.AtLeast = law.AtMost(min(x, law.J())), law.AtLeast(x)
			a.Central, a.CentralKnown = [2]int{lo, hi}, ok
		}
	}
	return out, nil
}
