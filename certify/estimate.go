package certify

import (
	"fmt"
	"math/big"
	"slices"
)

// Planned is where one bracket of a certificate not yet built will sit:
// its system (States, increasing, as the certificate will list them; nil
// for the whole system) and start, its step and its n.
type Planned struct {
	States  []int
	Start   Start
	Step, N int
}

// Estimate returns the work, in coefficient operations, and the memory,
// in bytes, that Check estimates before any of its work for a certificate
// of the patterns given (as for Counts) with the structure section st
// (nil for none) and brackets where planned says, each end of about
// endBits significant bits: the figures Check compares with
// CheckOptions.MaxWork and MaxMemory (see LimitError). Both grow with
// every bracket's n, so a producer can find, before it iterates, the
// largest n whose certificate its checker's budget would still accept.
// Nothing is checked: st and planned are only measured.
func Estimate(given []string, st *Structure, planned []Planned, endBits int) (work, memory float64, err error) {
	set, err := parseSet(PatternTokens(given))
	if err != nil {
		return 0, 0, fmt.Errorf("estimate: %v", err)
	}
	sp := newStateSpace(set)
	all := make([]int, len(sp.states))
	for p := range all {
		all[p] = p
	}
	// an end of endBits bits: (2^b - 1)/2^b has about as many digits
	denom := new(big.Int).Lsh(big.NewInt(1), uint(max(endBits, 1)))
	end := new(big.Rat).SetFrac(new(big.Int).Sub(denom, big.NewInt(1)), denom)
	c := &Certificate{Structure: st}
	for _, p := range planned {
		states := p.States
		if states == nil {
			states = all
		}
		for i, q := range states {
			if q < 0 || q >= len(sp.states) || (i > 0 && q <= states[i-1]) {
				return 0, 0, fmt.Errorf("estimate: the states of a planned bracket must be increasing, in 0..%d", len(sp.states)-1)
			}
		}
		if p.Step < 1 || p.N < 0 {
			return 0, 0, fmt.Errorf("estimate: a planned bracket needs a step of at least 1 and n >= 0")
		}
		c.Evidence.Brackets = append(c.Evidence.Brackets, Bracket{States: states, Start: p.Start, Step: p.Step, N: p.N, Lo: end, Hi: end})
	}
	// the brackets of one system are adjacent in canonical order, as cost
	// expects
	slices.SortFunc(c.Evidence.Brackets, compareBrackets)
	ck := &checker{c: c, set: set, sp: sp}
	if st != nil {
		ck.recurrent, ck.blocks = newStateGraph(sp).recurrence()
	}
	work, memory = ck.cost()
	return work, memory, nil
}
