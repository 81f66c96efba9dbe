package structure

import (
	"slices"

	"gonum.org/v1/gonum/graph"
	"gonum.org/v1/gonum/graph/multi"
	"gonum.org/v1/gonum/graph/simple"
	"gonum.org/v1/gonum/graph/topo"
)

// Digraph is the window digraph W_S of a system: one vertex per order
// cell (pattern.Rank over S_m) and one edge per allowed window of length
// m+1, from the cell of its first m entries to the cell of its last m.
// Several windows may join the same two cells and a window may be a loop,
// so the graph is a gonum multigraph. A Digraph is immutable.
type Digraph struct {
	M       int // cell length
	Cells   int // m!
	Windows int // allowed windows (edges, loops included)
	// Components are the strongly connected components, each with its
	// cells sorted, ordered by least cell.
	Components []Component
	// Order lists component indices in a topological order of the
	// condensation: every window goes from a component to itself or to a
	// later one in this order. Ties are broken by component index.
	Order []int

	start     []bool
	component []int   // cell -> component index
	succ      [][]int // cell -> cells one window away, sorted, from the gonum graph
	g         *multi.DirectedGraph
}

// Component is one strongly connected component of the window digraph.
type Component struct {
	Cells   []int // cell ranks, increasing
	Windows int   // windows with both ends in the component
	// Cyclic reports whether the component holds a cycle: more than one
	// cell, or one cell with a loop.
	Cyclic bool
	// Period is the gcd of the lengths of the cycles inside the
	// component; 0 when it holds none.
	Period int
}

// WindowDigraph builds the window digraph of a system and its strongly
// connected components (gonum topo.TarjanSCC), their periods and a
// topological order of the blocks.
func WindowDigraph(sys Windows) *Digraph {
	d := &Digraph{M: sys.M, Cells: sys.Cells(), start: sys.Start, g: multi.NewDirectedGraph()}
	for c := range d.Cells {
		d.g.AddNode(multi.Node(c))
	}
	for w, ok := range sys.Allowed {
		if ok {
			from, to := sys.Ends(w)
			d.g.SetLine(multi.Line{F: multi.Node(from), T: multi.Node(to), UID: int64(w)})
			d.Windows++
		}
	}
	d.succ = make([][]int, d.Cells)
	for u := range d.succ {
		for _, n := range graph.NodesOf(d.g.From(int64(u))) {
			d.succ[u] = append(d.succ[u], int(n.ID()))
		}
		slices.Sort(d.succ[u])
	}
	for _, nodes := range topo.TarjanSCC(d.g) {
		cells := make([]int, len(nodes))
		for i, n := range nodes {
			cells[i] = int(n.ID())
		}
		slices.Sort(cells)
		d.Components = append(d.Components, Component{Cells: cells})
	}
	slices.SortFunc(d.Components, func(a, b Component) int { return a.Cells[0] - b.Cells[0] })
	d.component = make([]int, d.Cells)
	for i, c := range d.Components {
		for _, cell := range c.Cells {
			d.component[cell] = i
		}
	}
	condensation := simple.NewDirectedGraph()
	for i := range d.Components {
		condensation.AddNode(simple.Node(i))
	}
	for w, ok := range sys.Allowed {
		if !ok {
			continue
		}
		from, to := sys.Ends(w)
		cf, ct := d.component[from], d.component[to]
		if cf == ct {
			d.Components[cf].Windows++
			continue
		}
		if !condensation.HasEdgeFromTo(int64(cf), int64(ct)) {
			condensation.SetEdge(simple.Edge{F: simple.Node(cf), T: simple.Node(ct)})
		}
	}
	order, err := topo.SortStabilized(condensation, nil)
	if err != nil {
		panic("structure: the condensation of a digraph has a cycle: " + err.Error())
	}
	for _, n := range order {
		d.Order = append(d.Order, int(n.ID()))
	}
	for i := range d.Components {
		d.Components[i].Period = d.period(i)
		d.Components[i].Cyclic = d.Components[i].Period > 0
	}
	return d
}

// period returns the gcd of the cycle lengths of component i by BFS
// levels: with level(v) the distance from the least cell inside the
// component, every edge u -> v inside it has level(u)+1-level(v) a
// multiple of the period, and the gcd of these differences is the period
// (0 when the component has no edge, so no cycle).
func (d *Digraph) period(i int) int {
	cells := d.Components[i].Cells
	level := map[int]int{cells[0]: 0}
	queue := []int{cells[0]}
	gcd := 0
	for len(queue) > 0 {
		u := queue[0]
		queue = queue[1:]
		for _, v := range d.successors(u) {
			if d.component[v] != i {
				continue
			}
			if lv, seen := level[v]; seen {
				gcd = gcdInt(gcd, abs(level[u]+1-lv))
				continue
			}
			level[v] = level[u] + 1
			queue = append(queue, v)
		}
	}
	return gcd
}

func gcdInt(a, b int) int {
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

func abs(a int) int {
	if a < 0 {
		return -a
	}
	return a
}

// successors returns the cells reached from cell u by one window, sorted
// and distinct. The slice is shared: callers must not modify it.
func (d *Digraph) successors(u int) []int { return d.succ[u] }

// Graph returns the window digraph as a gonum multigraph: node IDs are
// cell ranks, line IDs are window ranks. Callers must not modify it.
func (d *Digraph) Graph() graph.Directed { return d.g }

// ComponentOf returns the index of the component holding a cell.
func (d *Digraph) ComponentOf(cell int) int { return d.component[cell] }

// Acyclic reports whether no component holds a cycle.
func (d *Digraph) Acyclic() bool {
	for _, c := range d.Components {
		if c.Cyclic {
			return false
		}
	}
	return true
}

// LongestPath returns the largest number of windows on a walk of the
// digraph, or -1 when the digraph has a cycle (walks are then unbounded).
func (d *Digraph) LongestPath() int {
	if !d.Acyclic() {
		return -1
	}
	// Every component is a single cell; walk the order backwards.
	longest := make([]int, d.Cells)
	best := 0
	for i := len(d.Order) - 1; i >= 0; i-- {
		u := d.Components[d.Order[i]].Cells[0]
		for _, v := range d.successors(u) {
			longest[u] = max(longest[u], longest[v]+1)
		}
		best = max(best, longest[u])
	}
	return best
}

// SimpleCycles reports whether every cyclic component is a single cell.
// A loop at a cell is a window whose first m and last m entries have the
// same pattern; comparing adjacent entries shows that such a window is
// monotone, so then every cycle is a monotone loop.
func (d *Digraph) SimpleCycles() bool {
	for _, c := range d.Components {
		if c.Cyclic && len(c.Cells) > 1 {
			return false
		}
	}
	return true
}

// Unreachable returns the least pair of start cells (from, to), in rank
// order, such that no walk of one or more windows leads from from to to;
// ok is false when every such pair is joined (the start cells form one
// strongly connected component with a cycle).
func (d *Digraph) Unreachable() (from, to int, ok bool) {
	for u := range d.Cells {
		if !d.start[u] {
			continue
		}
		reached := make([]bool, d.Cells)
		queue := append([]int(nil), d.successors(u)...)
		for _, v := range queue {
			reached[v] = true
		}
		for len(queue) > 0 {
			x := queue[0]
			queue = queue[1:]
			for _, v := range d.successors(x) {
				if !reached[v] {
					reached[v] = true
					queue = append(queue, v)
				}
			}
		}
		for v := range d.Cells {
			if d.start[v] && !reached[v] {
				return u, v, true
			}
		}
	}
	return 0, 0, false
}
