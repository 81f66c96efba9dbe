package celltransfer

import "avoidcert/pattern"

// System is what the iteration needs to know of a pattern set: the cell
// length m, which windows of length m+1 are allowed, and the start vector.
// A window (t, x_1..x_m) leads from the cell of (t, x_1..x_{m-1}) to the
// cell of (x_1..x_m).
type System struct {
	M       int    // cell length m = w-1
	Allowed []bool // over permutations of 1..m+1, by pattern.Rank
	Start   []bool // over permutations of 1..m, by pattern.Rank: g0 = 1 there
}

// FromSet returns the system of a pattern set: windows of length w that
// avoid it are allowed, and g0 = 1 on cells whose pattern avoids the
// shorter members.
func FromSet(s pattern.Set) System {
	w := s.Window()
	return System{M: w - 1, Allowed: s.AvoidingPerms(w), Start: s.AvoidingPerms(w - 1)}
}

// Cells returns m!, the number of order cells.
func (s System) Cells() int { return pattern.Factorial(s.M) }

// Ends returns the source and target cells of the window with the given
// rank.
func (s System) Ends(window int) (from, to int) {
	p := pattern.Unrank(s.M+1, window)
	return pattern.Rank(pattern.Standardize(p[:s.M])), pattern.Rank(pattern.Standardize(p[1:]))
}

// Restrict returns the system restricted to a set of cells: only windows
// with both ends in the set stay allowed, and g0 = 1 on exactly those
// cells. The spectral radius of the whole system is the largest over its
// strongly connected blocks, each bracketed on its own.
func (s System) Restrict(cells []bool) System {
	r := System{M: s.M, Allowed: make([]bool, len(s.Allowed)), Start: append([]bool(nil), cells...)}
	for w, ok := range s.Allowed {
		if ok {
			from, to := s.Ends(w)
			r.Allowed[w] = cells[from] && cells[to]
		}
	}
	return r
}
