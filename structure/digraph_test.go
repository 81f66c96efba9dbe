package structure

import (
	"avoidcert/internal/settest"
	"math/rand/v2"
	"testing"
)

// reachability returns reach[u][v]: a walk of one or more windows leads
// from u to v (transitive closure of the window relation, Warshall).
func reachability(sys Windows) [][]bool {
	n := sys.Cells()
	reach := make([][]bool, n)
	for u := range reach {
		reach[u] = make([]bool, n)
	}
	for w, ok := range sys.Allowed {
		if ok {
			from, to := sys.Ends(w)
			reach[from][to] = true
		}
	}
	for k := range n {
		for u := range n {
			if reach[u][k] {
				for v := range n {
					reach[u][v] = reach[u][v] || reach[k][v]
				}
			}
		}
	}
	return reach
}

// closedWalkGCD returns the gcd of the lengths L <= 3|C| of closed walks
// at the component's least cell that stay inside it (0 if none); every
// simple cycle of length l gives closed walks of lengths a+b and a+l+b,
// so these lengths already have the period as gcd.
func closedWalkGCD(sys Windows, cells []int) int {
	in := map[int]bool{}
	for _, c := range cells {
		in[c] = true
	}
	v := cells[0]
	at := map[int]bool{v: true}
	g := 0
	for L := 1; L <= 3*len(cells); L++ {
		next := map[int]bool{}
		for w, ok := range sys.Allowed {
			if from, to := sys.Ends(w); ok && at[from] && in[to] {
				next[to] = true
			}
		}
		at = next
		if at[v] {
			g = gcdInt(g, L)
		}
	}
	return g
}

func TestWindowDigraphAgainstClosure(t *testing.T) {
	sets := []string{"123", "132", "123,321", "132,231", "123,231,312,321", "123,132,213,231",
		"1234", "1324", "123,2143", "12345", "1234,4321,2413,3142"}
	rng := rand.New(rand.NewPCG(3, 5))
	for range 30 {
		sets = append(sets, settest.Random(rng, 8, 5).String())
	}
	for _, arg := range sets {
		s := settest.Must(t, arg)
		sys := WindowsOf(s)
		d := WindowDigraph(sys)
		reach := reachability(sys)
		windows := 0
		for _, ok := range sys.Allowed {
			if ok {
				windows++
			}
		}
		if d.Windows != windows || d.Cells != sys.Cells() {
			t.Fatalf("%v: %d cells %d windows, want %d %d", s, d.Cells, d.Windows, sys.Cells(), windows)
		}
		if n := d.Graph().Nodes().Len(); n != d.Cells {
			t.Fatalf("%v: gonum graph has %d nodes, want %d", s, n, d.Cells)
		}
		seen := make([]bool, d.Cells)
		for i, c := range d.Components {
			if i > 0 && d.Components[i-1].Cells[0] >= c.Cells[0] {
				t.Fatalf("%v: components not ordered by least cell", s)
			}
			for j, u := range c.Cells {
				if j > 0 && c.Cells[j-1] >= u {
					t.Fatalf("%v: cells of component %d not sorted: %v", s, i, c.Cells)
				}
				seen[u] = true
				for _, v := range c.Cells {
					if u != v && !(reach[u][v] && reach[v][u]) {
						t.Fatalf("%v: cells %d and %d share a component but are not mutually reachable", s, u, v)
					}
				}
				for v := range d.Cells {
					if d.ComponentOf(v) != i && reach[u][v] && reach[v][u] {
						t.Fatalf("%v: cells %d and %d are mutually reachable but in different components", s, u, v)
					}
				}
			}
			if c.Cyclic != reach[c.Cells[0]][c.Cells[0]] {
				t.Fatalf("%v: component %v cyclic = %v, closure says %v", s, c.Cells, c.Cyclic, reach[c.Cells[0]][c.Cells[0]])
			}
			if want := closedWalkGCD(sys, c.Cells); c.Period != want {
				t.Fatalf("%v: component %v has period %d, closed walks give %d", s, c.Cells, c.Period, want)
			}
		}
		for u, ok := range seen {
			if !ok {
				t.Fatalf("%v: cell %d in no component", s, u)
			}
		}
		position := make([]int, len(d.Components))
		for p, i := range d.Order {
			position[i] = p
		}
		for w, ok := range sys.Allowed {
			if from, to := sys.Ends(w); ok && position[d.ComponentOf(from)] > position[d.ComponentOf(to)] {
				t.Fatalf("%v: window %d goes backwards in the block order", s, w)
			}
		}
	}
}

// A loop at a cell is kept: for 12 (m = 1) the one cell has the loop 21.
func TestWindowDigraphKeepsLoops(t *testing.T) {
	d := WindowDigraph(WindowsOf(settest.Must(t, "12")))
	if d.Windows != 1 || !d.Components[0].Cyclic || d.Components[0].Period != 1 {
		t.Fatalf("12: %+v", d.Components)
	}
	if !d.Graph().HasEdgeFromTo(0, 0) {
		t.Fatal("12: the gonum graph lost the loop")
	}
}
