package prob

import (
	"context"
	"math/big"

	"avoidcert/pattern"
	"avoidcert/prove"
)

// Avoidance is the probability that independent sequences of i.i.d.
// continuous draws (the subsequences of a delay, or one sequence) all avoid
// a set: the product of a_n/n! over their lengths n.
type Avoidance struct {
	// Exact is the probability as a fraction when every length is in the
	// exact range, nil otherwise.
	Exact *big.Rat
	// Interval is proved to contain the probability: the exact value as a
	// point, or the product of enclosures read from the checked
	// certificate in Certified (rounded outward).
	Interval Enclosure
	// Certified is the certificate, accepted by the checker in this run,
	// whose bound for every n encloses the lengths past the exact range;
	// nil for an exact answer.
	Certified *Certified
	// Need is the estimated memory of the largest exact count.
	Need int64
}

// avoidPrec is the precision (bits) of the enclosure's products.
const avoidPrec = 128

// AvoidAll returns the probability that sequences of the given lengths all
// avoid set. Within the exact range (InExactRange for memory bytes, every
// length) it is exact, from counts the engine and the checker agree on
// (Exact). Otherwise the bracket of lambda is certified by prove.Certify
// (the checker must accept its certificate), tightened as in Certify so
// that the product's relative width is about relWidth, and each a_n/n! is
// enclosed from the certificate's bound for every n >= n0 (below n0, where
// the bound does not hold, exactly). A budget that stops the bracket leaves
// Certified.Narrow false; the interval is proved all the same.
func AvoidAll(ctx context.Context, set pattern.Set, lengths []int, memory int64, relWidth float64, opts prove.Options) (*Avoidance, error) {
	out := &Avoidance{}
	exact := true
	for _, n := range distinct(lengths) {
		ok, need := InExactRange(set, n, memory)
		exact = exact && ok
		out.Need = max(out.Need, need)
	}
	pointOf := map[int]*big.Rat{}
	point := func(n int) (*big.Rat, error) {
		if p, ok := pointOf[n]; ok {
			return p, nil
		}
		exactOpts := opts
		exactOpts.MaxMemory = memory
		_, p, err := Exact(ctx, set, n, exactOpts)
		pointOf[n] = p
		return p, err
	}
	if exact {
		p := big.NewRat(1, 1)
		for _, n := range lengths {
			pn, err := point(n)
			if err != nil {
				return nil, err
			}
			p.Mul(p, pn)
		}
		out.Exact = p
		out.Interval = Enclosure{Lo: dyadicOf(p, avoidPrec, false), Hi: dyadicOf(p, avoidPrec, true)}
		return out, nil
	}
	longest := 0
	for _, n := range lengths {
		longest = max(longest, n)
	}
	c, err := Certify(ctx, set, longest, relWidth/float64(len(lengths)), opts)
	if err != nil {
		return nil, err
	}
	out.Certified = c
	n0 := c.Result.Certificate.Statement.AllN.N0
	lo, hi := Dyadic{M: big.NewInt(1)}, Dyadic{M: big.NewInt(1)}
	for _, n := range lengths {
		var e Enclosure
		if n >= n0 {
			if e, err = Enclose(c.Result.Certificate, n); err != nil {
				return nil, err
			}
		} else {
			pn, err := point(n)
			if err != nil {
				return nil, err
			}
			e = Enclosure{Lo: dyadicOf(pn, avoidPrec, false), Hi: dyadicOf(pn, avoidPrec, true)}
		}
		lo, hi = lo.mul(e.Lo, avoidPrec, false), hi.mul(e.Hi, avoidPrec, true)
	}
	out.Interval = Enclosure{Lo: lo, Hi: hi}
	c.Narrow = below(out.Interval.RelativeWidth(), relWidth)
	return out, nil
}
