package structure

import (
	"fmt"
	"slices"

	"avoidcert/pattern"
)

// closable reports whether configuration r is closable
// (docs/prefix-states.md, "lambda > 0: closable configurations"): from
// its current state with values y, appending x'_1 .. x'_|s|, each just
// above the start value x_i, every move is allowed and ends in the start
// state s (whose |s| retained values are then exactly the x').
func (sp *space) closable(r int) bool {
	cf := sp.decode(r)
	// Doubled coordinates: value v at 2v+1, x'_i at 2x_i+2, just above x_i
	// and below every other value above it.
	kept := make([]int, 0, len(cf.y)+len(cf.x)+1)
	for _, v := range cf.y {
		kept = append(kept, 2*v+1)
	}
	state := cf.c
	for _, v := range cf.x {
		z := 2*v + 2
		below := 0
		for _, u := range kept {
			if u < z {
				below++
			}
		}
		mv := sp.d.next[state][below]
		if mv.to < 0 {
			return false
		}
		kept = append(kept, z)[mv.drops:]
		state = mv.to
	}
	return state == cf.s
}

// closing is a closable configuration found in R_k with k + |s| >= w.
type closing struct {
	k, r int
}

// findClosing returns the closable configuration that gives the shortest
// cyclic avoider: the least k (then the least configuration) with a
// closable configuration in R_k and k + |s| >= w, where w is the longest
// member's length. It looks at R_0 .. R_last, and, when the sequence
// recurs, at the sets that recur for ever (R_e, or the joint cycle), each
// at its first repetition with k + |s| >= w. ok is false when there is
// none among those.
func (ru *jointRun) findClosing(w int) (closing, bool) {
	sp := ru.sp
	known := map[int]bool{}
	isClosable := func(r int) bool {
		c, seen := known[r]
		if !seen {
			c = sp.closable(r)
			known[r] = c
		}
		return c
	}
	best, found := closing{}, false
	consider := func(k, r int) {
		if !found || k < best.k || (k == best.k && r < best.r) {
			best, found = closing{k, r}, true
		}
	}
	for k := 0; k <= ru.last(); k++ {
		each(ru.history[k], func(r int) {
			if k+len(sp.perm[sp.block(r).s]) >= w && isClosable(r) {
				consider(k, r)
			}
		})
		if found {
			return best, true
		}
	}
	if !ru.recurs() {
		return best, false
	}
	start, length := ru.loop()
	for j := start; j < start+length; j++ {
		each(ru.history[j], func(r int) {
			ls := len(sp.perm[sp.block(r).s])
			if !isClosable(r) {
				return
			}
			k := j
			for k+ls < w {
				k += length
			}
			consider(k, r)
		})
	}
	return best, found
}

// realise returns a sequence x t_1 .. t_k whose configuration after k
// moves is r of R_k: the start values of a configuration of R_0 followed
// by k new values, each placed in the gap of the configuration's values
// that the walk from R_0 to r takes (just above the value below that gap,
// any value of the gap would do). It is a permutation of 1..|s|+k. The
// joint order of its start and current values is compared with r before
// it is returned.
func (ru *jointRun) realise(k, r int) pattern.Perm {
	sp := ru.sp
	first, gaps := ru.path(k, r)
	s := sp.block(first).s
	ls := len(sp.perm[s])
	// Values are named by their positions in the sequence; order lists
	// them from the smallest up.
	order := make([]int, ls)
	for i, rank := range sp.perm[s] {
		order[rank-1] = i
	}
	x := make([]int, ls)
	for i := range x {
		x[i] = i
	}
	y := slices.Clone(x) // the current values, in position order
	state := s
	for step, g := range gaps {
		tracked := trackedOrder(order, x, y)
		at := 0
		if g > 0 {
			at = slices.Index(order, tracked[g-1]) + 1
		}
		below := 0
		for _, v := range tracked[:g] {
			if slices.Contains(y, v) {
				below++
			}
		}
		order = slices.Insert(order, at, ls+step)
		mv := sp.d.next[state][below]
		y = append(y, ls+step)[mv.drops:]
		state = mv.to
	}
	tracked := trackedOrder(order, x, y)
	rankOf := func(ids []int) []int {
		out := make([]int, len(ids))
		for i, id := range ids {
			out[i] = slices.Index(tracked, id)
		}
		return out
	}
	cf := sp.decode(r)
	if state != cf.c || !slices.Equal(rankOf(x), cf.x) || !slices.Equal(rankOf(y), cf.y) {
		panic(fmt.Sprintf("structure: the walk to configuration %s of R_%d realises another", sp.describe(r), k))
	}
	p := make(pattern.Perm, len(order))
	for rank, id := range order {
		p[id] = rank + 1
	}
	return p
}

// trackedOrder returns the values of a configuration under construction
// (the start values x and the current values y) from the smallest up.
func trackedOrder(order, x, y []int) []int {
	var out []int
	for _, id := range order {
		if slices.Contains(x, id) || slices.Contains(y, id) {
			out = append(out, id)
		}
	}
	return out
}
