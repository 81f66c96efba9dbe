package certify

import (
	"slices"
	"strings"
)

// The prefix states of a set and the moves between them
// (docs/prefix-states.md), built by the checker from the patterns alone.

// stateSpace holds the prefix states of a set, in state order, and for
// every state and gap the move a new value in that gap makes.
type stateSpace struct {
	set    patternSet
	member map[string]bool // the members of the set, by key
	states []perm          // shorter first, then lexicographically; states[0] is ()
	index  map[string]int  // state (by key) -> its number
	moves  [][]move        // moves[p][i]: the new value in gap i of state p
	maxLen int             // M, the largest state length
}

// move is what one step does to a state p of length L when the new value
// goes into gap i (above exactly i retained values).
type move struct {
	allowed bool // no suffix of p+ has the pattern of a member
	to      int  // the new state p'
	// drops lists, in order, the rank (1-based, among the values retained
	// at that moment) of each dropped value: dropping rank r merges gaps
	// r-1 and r into one of size left + right + 1.
	drops []int
}

func stateKey(p []int) string {
	var b strings.Builder
	for _, v := range p {
		b.WriteByte(byte(v))
	}
	return b.String()
}

// newStateSpace builds the prefix states of s and their moves.
func newStateSpace(s patternSet) *stateSpace {
	sp := &stateSpace{set: s, member: map[string]bool{}, index: map[string]int{}}
	for _, pat := range s {
		sp.member[stateKey(pat)] = true
	}
	var states []perm
	seen := map[string]bool{}
	for _, pat := range s {
		for l := 0; l < len(pat); l++ {
			p := std(pat[:l])
			if k := stateKey(p); !seen[k] {
				seen[k] = true
				states = append(states, p)
			}
		}
	}
	slices.SortFunc(states, permLess)
	sp.states = states
	for i, p := range states {
		sp.index[stateKey(p)] = i
		sp.maxLen = max(sp.maxLen, len(p))
	}
	sp.moves = make([][]move, len(states))
	for i, p := range states {
		for gap := 0; gap <= len(p); gap++ {
			sp.moves[i] = append(sp.moves[i], sp.moveOf(p, gap))
		}
	}
	return sp
}

// grow returns p+ : the entries of p above gap raised by one, and gap+1
// appended.
func grow(p perm, gap int) perm {
	q := make(perm, 0, len(p)+1)
	for _, v := range p {
		if v > gap {
			v++
		}
		q = append(q, v)
	}
	return append(q, gap+1)
}

// moveOf follows the contract's one step for state p and gap i.
func (sp *stateSpace) moveOf(p perm, gap int) move {
	q := grow(p, gap)
	for l := 1; l <= len(q); l++ {
		if sp.member[stateKey(std(q[len(q)-l:]))] {
			return move{}
		}
	}
	keep := 0
	for l := len(q); l >= 0; l-- {
		if _, ok := sp.index[stateKey(std(q[len(q)-l:]))]; ok {
			keep = l
			break
		}
	}
	mv := move{allowed: true}
	cur := q
	for len(cur) > keep {
		mv.drops = append(mv.drops, cur[0]) // cur is standardised: the value is its rank
		cur = std(cur[1:])
	}
	mv.to = sp.index[stateKey(cur)]
	return mv
}
