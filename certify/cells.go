package certify

// cellGraph is the window digraph as the checker sees it, built from the
// allowed windows alone: one vertex per order cell (a permutation of 1..m,
// by rank) and an edge from the cell of a window's first m entries to the
// cell of its last m for every allowed window of length m+1. Parallel
// windows are merged; a window whose two cells agree is a loop.
type cellGraph struct {
	cells int
	succ  [][]int // distinct successors of each cell, increasing
	loop  []bool
	start []bool // the cells whose pattern avoids the shorter members
}

func newCellGraph(win windows) *cellGraph {
	m := win.m
	n := factorial(m)
	g := &cellGraph{cells: n, succ: make([][]int, n), loop: make([]bool, n), start: win.good}
	edge := make([]bool, n*n)
	for w, ok := range win.allowed {
		if !ok {
			continue
		}
		seq := unrank(m+1, w)
		from, to := rankOf(seq[:m]), rankOf(seq[1:])
		edge[from*n+to] = true
	}
	for u := range n {
		for v := range n {
			if edge[u*n+v] {
				g.succ[u] = append(g.succ[u], v)
				g.loop[u] = g.loop[u] || u == v
			}
		}
	}
	return g
}

// reach returns the cells reached from u by a walk of one or more windows.
func (g *cellGraph) reach(u int) []bool {
	seen := make([]bool, g.cells)
	queue := []int{u}
	for len(queue) > 0 {
		x := queue[0]
		queue = queue[1:]
		for _, v := range g.succ[x] {
			if !seen[v] {
				seen[v] = true
				queue = append(queue, v)
			}
		}
	}
	return seen
}

// longestPath returns the largest number of windows on a walk, or -1 when
// some walk returns to its start (a cycle, loops included), so that walks
// are unbounded. Kahn's order: a cell is placed once all its predecessors
// are; cells on or after a cycle never are.
func (g *cellGraph) longestPath() int {
	indegree := make([]int, g.cells)
	for u := range g.cells {
		for _, v := range g.succ[u] {
			indegree[v]++
		}
	}
	var ready []int
	for u, d := range indegree {
		if d == 0 {
			ready = append(ready, u)
		}
	}
	longest := make([]int, g.cells) // windows on the longest walk ending at a cell
	placed, best := 0, 0
	for len(ready) > 0 {
		u := ready[len(ready)-1]
		ready = ready[:len(ready)-1]
		placed++
		best = max(best, longest[u])
		for _, v := range g.succ[u] {
			longest[v] = max(longest[v], longest[u]+1)
			if indegree[v]--; indegree[v] == 0 {
				ready = append(ready, v)
			}
		}
	}
	if placed < g.cells {
		return -1
	}
	return best
}

// crossCycle returns a window u -> v between two different cells that lies
// on a cycle (v reaches u back), and ok false when there is none: then every
// cycle is a loop.
func (g *cellGraph) crossCycle() (u, v int, ok bool) {
	from := make([][]bool, g.cells) // from[v]: reach(v), computed once
	for u := range g.cells {
		for _, v := range g.succ[u] {
			if v == u {
				continue
			}
			if from[v] == nil {
				from[v] = g.reach(v)
			}
			if from[v][u] {
				return u, v, true
			}
		}
	}
	return 0, 0, false
}

// unreached returns the least pair (u, v) of start cells, in rank order of
// u then v, such that no walk of one or more windows leads from u to v.
func (g *cellGraph) unreached() (u, v int, ok bool) {
	for u := range g.cells {
		if !g.start[u] {
			continue
		}
		r := g.reach(u)
		for v := range g.cells {
			if g.start[v] && !r[v] {
				return u, v, true
			}
		}
	}
	return 0, 0, false
}

// windows holds what a pattern set allows: the allowed windows (the
// permutations of 1..m+1 that avoid the set) and the good cells (the
// permutations of 1..m that avoid it, the start cells), both by rank.
type windows struct {
	m             int
	allowed, good []bool
}

func windowsOf(s patternSet) windows {
	m := s.longest() - 1
	return windows{m: m, allowed: avoidingTable(s, m+1), good: avoidingTable(s, m)}
}

// avoidingTable marks, by rank, the permutations of 1..n that avoid s.
func avoidingTable(s patternSet, n int) []bool {
	out := make([]bool, factorial(n))
	q := identity(n)
	for r := range out { // q runs through S_n in rank order
		out[r] = s.avoids(q)
		nextPerm(q)
	}
	return out
}

func factorial(n int) int {
	f := 1
	for i := 2; i <= n; i++ {
		f *= i
	}
	return f
}

// unrank returns the permutation of 1..n of lexicographic rank r: its
// i-th entry is the d-th smallest value not used yet, d the i-th digit of
// r in the factorial base.
func unrank(n, r int) []int {
	q := make([]int, 0, n)
	used := make([]bool, n+1)
	for i := range n {
		f := factorial(n - 1 - i)
		d := r / f
		r %= f
		for v := 1; v <= n; v++ {
			if used[v] {
				continue
			}
			if d == 0 {
				q = append(q, v)
				used[v] = true
				break
			}
			d--
		}
	}
	return q
}
