package certify

import "slices"

// The state digraph of docs/prefix-states.md ("The structure test"), from
// the checker's own states and moves: an edge p -> q for every allowed move
// from p whose target is q.

// stateGraph holds, for every state, its distinct successors in increasing
// order; a loop p -> p is kept.
type stateGraph struct {
	succ [][]int
}

func newStateGraph(sp *stateSpace) stateGraph {
	g := stateGraph{succ: make([][]int, len(sp.states))}
	for p, moves := range sp.moves {
		for _, mv := range moves {
			if mv.allowed && !slices.Contains(g.succ[p], mv.to) {
				g.succ[p] = append(g.succ[p], mv.to)
			}
		}
		slices.Sort(g.succ[p])
	}
	return g
}

// reachable marks the states reached from the empty state by zero or
// more edges (breadth first).
func (g stateGraph) reachable() []bool {
	seen := make([]bool, len(g.succ))
	seen[0] = true
	queue := []int{0}
	for len(queue) > 0 {
		p := queue[0]
		queue = queue[1:]
		for _, q := range g.succ[p] {
			if !seen[q] {
				seen[q] = true
				queue = append(queue, q)
			}
		}
	}
	return seen
}

// components returns the strongly connected components of the digraph
// among the states marked in, each in increasing order, the components
// ordered by their least state. Kosaraju's method: a depth-first search
// lists the states in the order it finishes them; then, in the reverse of
// that order, each state not yet placed collects, along reversed edges,
// the states not yet placed that reach it, which are its component.
func (g stateGraph) components(in []bool) [][]int {
	n := len(g.succ)
	pred := make([][]int, n)
	for p, qs := range g.succ {
		for _, q := range qs {
			if in[p] && in[q] {
				pred[q] = append(pred[q], p)
			}
		}
	}
	visited := make([]bool, n)
	var finished []int
	var visit func(p int)
	visit = func(p int) {
		visited[p] = true
		for _, q := range g.succ[p] {
			if in[q] && !visited[q] {
				visit(q)
			}
		}
		finished = append(finished, p)
	}
	for p := range n {
		if in[p] && !visited[p] {
			visit(p)
		}
	}
	placed := make([]bool, n)
	var collect func(p int, into *[]int)
	collect = func(p int, into *[]int) {
		placed[p] = true
		*into = append(*into, p)
		for _, r := range pred[p] {
			if !placed[r] {
				collect(r, into)
			}
		}
	}
	var out [][]int
	for i := len(finished) - 1; i >= 0; i-- {
		if p := finished[i]; !placed[p] {
			var comp []int
			collect(p, &comp)
			slices.Sort(comp)
			out = append(out, comp)
		}
	}
	slices.SortFunc(out, func(a, b []int) int { return a[0] - b[0] })
	return out
}

// recurrence returns the recurrent states (reachable from the empty state,
// and on a walk of one or more edges back to themselves), increasing, and
// the blocks: the strongly connected components among them. A reachable
// state lies on such a walk exactly when its component has two or more
// states or a loop, and then every state of its component is recurrent.
func (g stateGraph) recurrence() (recurrent []int, blocks [][]int) {
	for _, comp := range g.components(g.reachable()) {
		if len(comp) > 1 || slices.Contains(g.succ[comp[0]], comp[0]) {
			blocks = append(blocks, comp)
			recurrent = append(recurrent, comp...)
		}
	}
	slices.Sort(recurrent)
	return recurrent, blocks
}

// longestWalk returns the largest number of edges on a walk from the
// empty state; the states reached must not lie on a cycle (no recurrent
// state), so that walks are bounded.
func (g stateGraph) longestWalk() int {
	memo := make([]int, len(g.succ))
	for i := range memo {
		memo[i] = -1
	}
	var longest func(p int) int
	longest = func(p int) int {
		if memo[p] < 0 {
			memo[p] = 0
			for _, q := range g.succ[p] {
				memo[p] = max(memo[p], 1+longest(q))
			}
		}
		return memo[p]
	}
	return longest(0)
}
