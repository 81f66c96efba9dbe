package structure

import (
	"slices"

	"gonum.org/v1/gonum/graph/simple"
	"gonum.org/v1/gonum/graph/topo"

	"avoidcert/transfer"
)

// target is where a move goes: the new state and how many of the oldest
// retained values it forgets. to is -1 when the move is forbidden.
type target struct{ to, drops int }

// stateDigraph is the state digraph of a set's prefix states: an edge
// p -> q for every allowed move from p whose target is q.
type stateDigraph struct {
	st *transfer.States
	// next[p][i] is the move of state p with the new value in gap i
	// (above exactly i of p's retained values).
	next [][]target
	succ [][]int // distinct targets of each state, increasing
	// reachable: some walk (zero or more edges) from the empty state.
	reachable []bool
	// recurrent: reachable and on a walk of one or more edges back to
	// itself.
	recurrent []bool
	blocks    [][]int // the recurrent strongly connected components, canonical order
}

func newStateDigraph(st *transfer.States) *stateDigraph {
	n := st.Len()
	d := &stateDigraph{st: st, next: make([][]target, n), succ: make([][]int, n)}
	g := simple.NewDirectedGraph()
	loop := make([]bool, n)
	for p := range n {
		g.AddNode(simple.Node(p))
		d.next[p] = make([]target, st.Length(p)+1)
		for i := range d.next[p] {
			d.next[p][i].to = -1
		}
	}
	for p := range n {
		for _, mv := range st.Moves(p) {
			d.next[p][mv.Gap] = target{mv.To, mv.Drops}
			d.succ[p] = append(d.succ[p], mv.To)
			if mv.To == p {
				loop[p] = true // gonum's simple graphs refuse self-loops
			} else {
				g.SetEdge(simple.Edge{F: simple.Node(p), T: simple.Node(mv.To)})
			}
		}
		slices.Sort(d.succ[p])
		d.succ[p] = slices.Compact(d.succ[p])
	}
	d.reachable = make([]bool, n)
	d.reachable[0] = true
	queue := []int{0}
	for len(queue) > 0 {
		p := queue[0]
		queue = queue[1:]
		for _, q := range d.succ[p] {
			if !d.reachable[q] {
				d.reachable[q] = true
				queue = append(queue, q)
			}
		}
	}
	d.recurrent = make([]bool, n)
	for _, nodes := range topo.TarjanSCC(g) {
		comp := make([]int, len(nodes))
		for i, v := range nodes {
			comp[i] = int(v.ID())
		}
		// A component holds a cycle when it has two states or a loop;
		// one state of it is reachable exactly when all are.
		if !d.reachable[comp[0]] || (len(comp) == 1 && !loop[comp[0]]) {
			continue
		}
		slices.Sort(comp)
		for _, p := range comp {
			d.recurrent[p] = true
		}
		d.blocks = append(d.blocks, comp)
	}
	// TarjanSCC returns components in no fixed order.
	slices.SortFunc(d.blocks, func(a, b []int) int { return a[0] - b[0] })
	return d
}

// marked returns the states with the given mark, increasing.
func marked(mark []bool) []int {
	var out []int
	for p, ok := range mark {
		if ok {
			out = append(out, p)
		}
	}
	return out
}

// longestWalk returns the largest number of edges of a walk from the
// empty state. It must only be called when no state is recurrent: then
// the reachable part of the digraph has no cycle.
func (d *stateDigraph) longestWalk() int {
	longest := make([]int, len(d.succ))
	done := make([]bool, len(d.succ))
	var walk func(p int) int
	walk = func(p int) int {
		if !done[p] {
			done[p] = true // no cycle is reachable, so p is not revisited below itself
			for _, q := range d.succ[p] {
				longest[p] = max(longest[p], 1+walk(q))
			}
		}
		return longest[p]
	}
	return walk(0)
}
