package certify

import (
	"crypto/sha256"
	"encoding/binary"
	"math/big"

	"avoidcert/pattern"
)

// This file recomputes the iterates G_k from their combinatorial meaning,
// with nothing taken from the fast engine.
//
// G_k[sigma][a] counts the avoiding permutations of length m+k whose last m
// entries have pattern sigma and whose other k values fall a_0, ..., a_m into
// the gaps of those entries (gap i lies between the i-th and (i+1)-th
// smallest of them). For k+1 >= 1 such a permutation pi of length m+k+1 has
// a value t just before its last m entries x_1..x_m that is not one of them;
// say t lies in gap j of x, above l and below r = a_j-1-l of the other values
// in that gap. Deleting the last entry x_m leaves an avoiding permutation of
// length m+k whose last m entries (t, x_1..x_{m-1}) have some pattern tau and
// whose gap sizes b follow from (a, j, l). The only window of pi that the
// shorter one lacks is (t, x_1..x_m), so
//
//	G_{k+1}[sigma][a] = sum over gaps j with a_j > 0 whose window is allowed,
//	                    sum over l = 0..a_j-1, of G_k[tau][b(a, j, l)].
//
// Indices a of one degree are stored in lexicographic order of
// (a_0, ..., a_m), which is also the order of the digest.

// system is one (possibly restricted) transfer system as the checker sees it.
type system struct {
	m     int
	cells int     // m!
	in    []bool  // per cell: part of the system
	start []bool  // per cell: G_0 = 1 there
	moves [][]gap // per cell sigma, per gap j of sigma
	comb  *compositions
}

// gap describes a new value t placed in one gap j of a cell sigma.
type gap struct {
	allowed bool // the window (t, x_1..x_m) is allowed and both its end cells are in the system
	tau     int  // the cell of (t, x_1..x_{m-1})
	drop    int  // the value of x_m within the window, in 1..m+1
}

// windows holds what a pattern set allows: allowed windows of length m+1
// and good cells (length-m patterns that avoid the shorter members), both
// by pattern.Rank.
type windows struct {
	m             int
	allowed, good []bool
}

func windowsOf(s pattern.Set) windows {
	m := s.Window() - 1
	return windows{m: m, allowed: s.AvoidingPerms(m + 1), good: s.AvoidingPerms(m)}
}

// newSystem builds the system on the given cells (nil: the whole system,
// all cells, with the unrestricted start vector). maxDegree bounds the
// degrees that will be indexed.
func newSystem(win windows, cells []int, maxDegree int) *system {
	m := win.m
	n := pattern.Factorial(m)
	sys := &system{m: m, cells: n, in: make([]bool, n), moves: make([][]gap, n), comb: newCompositions(m+1, maxDegree)}
	if cells == nil {
		for c := range sys.in {
			sys.in[c] = true
		}
		sys.start = win.good
	} else {
		for _, c := range cells {
			sys.in[c] = true
		}
		sys.start = sys.in
	}
	for sigma := range n {
		x := pattern.Unrank(m, sigma)
		sys.moves[sigma] = make([]gap, m+1)
		for j := 0; j <= m; j++ {
			w := make(pattern.Perm, m+1) // (t, x_1..x_m) with t above exactly j of the x's
			w[0] = j + 1
			for i, v := range x {
				w[i+1] = v
				if v > j {
					w[i+1] = v + 1
				}
			}
			tau := pattern.Rank(pattern.Standardize(w[:m]))
			sys.moves[sigma][j] = gap{
				allowed: win.allowed[pattern.Rank(w)] && sys.in[sigma] && sys.in[tau],
				tau:     tau,
				drop:    w[m],
			}
		}
	}
	return sys
}

// shorter writes into b the gap sizes of the shorter permutation: t splits
// gap j of a into l (below t) and a_j-1-l (above), which gives the m+2 gaps
// c of the window; deleting x_m, the window value drop, merges the two gaps
// beside it.
func (sys *system) shorter(a []int, j, l, drop int, c, b []int) {
	m := sys.m
	for i := 0; i < m+2; i++ {
		switch {
		case i < j:
			c[i] = a[i]
		case i == j:
			c[i] = l
		case i == j+1:
			c[i] = a[j] - 1 - l
		default:
			c[i] = a[i-1]
		}
	}
	for i := 0; i <= m; i++ {
		switch {
		case i < drop-1:
			b[i] = c[i]
		case i == drop-1:
			b[i] = c[i] + c[i+1]
		default:
			b[i] = c[i+1]
		}
	}
}

// iterate is G_k (or an elevation of it) of one system: coefficient r of
// cell c of degree D at index c*count(D)+r.
type iterate struct {
	degree int
	coef   []big.Int
}

func (sys *system) newIterate(degree int) *iterate {
	return &iterate{degree: degree, coef: make([]big.Int, sys.cells*sys.comb.count(degree))}
}

// at returns the coefficient of cell c at the composition of rank r.
func (sys *system) at(g *iterate, c, r int) *big.Int {
	return &g.coef[c*sys.comb.count(g.degree)+r]
}

// first returns G_0.
func (sys *system) first() *iterate {
	g := sys.newIterate(0)
	for c, ok := range sys.start {
		if ok {
			sys.at(g, c, 0).SetInt64(1)
		}
	}
	return g
}

// each calls fn for every index of degree D on the cells of the system (or
// on all cells), in storage order: cell, rank r, composition a. fn must not
// keep or modify a.
func (sys *system) each(D int, all bool, fn func(cell, r int, a []int)) {
	a := make([]int, sys.m+1)
	for cell := range sys.cells {
		if !all && !sys.in[cell] {
			continue
		}
		sys.comb.firstOf(D, a)
		for r := range sys.comb.count(D) {
			fn(cell, r, a)
			sys.comb.next(a)
		}
	}
}

// next returns G_{k+1} from g = G_k by the recurrence above.
func (sys *system) next(g *iterate) *iterate {
	out := sys.newIterate(g.degree + 1)
	b := make([]int, sys.m+1)
	c := make([]int, sys.m+2)
	sys.each(out.degree, false, func(sigma, r int, a []int) {
		acc := sys.at(out, sigma, r)
		for j, mv := range sys.moves[sigma] {
			if !mv.allowed {
				continue
			}
			for l := 0; l < a[j]; l++ {
				sys.shorter(a, j, l, mv.drop, c, b)
				acc.Add(acc, sys.at(g, mv.tau, sys.comb.rank(b)))
			}
		}
	})
	return out
}

// elevate returns the integer degree elevation of h (degree D) to degree
// D+1: out[a] = sum over t with a_t > 0 of a_t h[a - e_t]. Applied d times
// to G_k it gives (k+d)!/k! times the Bernstein coefficients of g_k = G_k/k!
// written in degree k+d.
func (sys *system) elevate(h *iterate) *iterate {
	out := sys.newIterate(h.degree + 1)
	e := make([]int, sys.m+1)
	var term big.Int
	sys.each(out.degree, false, func(cell, r int, a []int) {
		acc := sys.at(out, cell, r)
		for t := range a {
			if a[t] == 0 {
				continue
			}
			copy(e, a)
			e[t]--
			term.SetInt64(int64(a[t]))
			term.Mul(&term, sys.at(h, cell, sys.comb.rank(e)))
			acc.Add(acc, &term)
		}
	})
	return out
}

// sum returns the sum of all coefficients.
func (g *iterate) sum() *big.Int {
	s := new(big.Int)
	for i := range g.coef {
		s.Add(s, &g.coef[i])
	}
	return s
}

// isZero reports whether every coefficient is zero.
func (g *iterate) isZero() bool {
	for i := range g.coef {
		if g.coef[i].Sign() != 0 {
			return false
		}
	}
	return true
}

// IterateHeader starts the canonical byte stream of an iterate.
const IterateHeader = "avoidcert-iterate-v1\n"

// digest returns the SHA-256 of the canonical byte stream of G_k:
// IterateHeader, uvarint(m), uvarint(k), then for every cell in rank order
// and every composition in lexicographic order, uvarint(len(b)) and b, the
// big-endian magnitude without leading zero bytes.
func (sys *system) digest(g *iterate) [32]byte {
	h := sha256.New()
	buf := []byte(IterateHeader)
	buf = binary.AppendUvarint(buf, uint64(sys.m))
	buf = binary.AppendUvarint(buf, uint64(g.degree))
	h.Write(buf)
	for i := range g.coef { // cell-major, lexicographic within a cell
		b := g.coef[i].Bytes()
		h.Write(binary.AppendUvarint(buf[:0], uint64(len(b))))
		h.Write(b)
	}
	var out [32]byte
	h.Sum(out[:0])
	return out
}

// compositions indexes the compositions of a degree D into p parts in
// lexicographic order.
type compositions struct {
	p     int
	binom [][]int64 // binom[n][r] for r < p+1
}

func newCompositions(p, maxDegree int) *compositions {
	cp := &compositions{p: p, binom: make([][]int64, maxDegree+p+1)}
	for n := range cp.binom {
		cp.binom[n] = make([]int64, p+1)
		cp.binom[n][0] = 1
		for r := 1; r <= p && r <= n; r++ {
			cp.binom[n][r] = cp.binom[n-1][r-1]
			if r < n {
				cp.binom[n][r] += cp.binom[n-1][r]
			}
		}
	}
	return cp
}

// count returns the number of compositions of D into p parts, C(D+p-1, p-1).
func (cp *compositions) count(D int) int { return int(cp.binom[D+cp.p-1][cp.p-1]) }

// firstOf writes the lexicographically first composition of D: (0, ..., 0, D).
func (cp *compositions) firstOf(D int, a []int) {
	clear(a)
	a[cp.p-1] = D
}

// next advances a to its lexicographic successor and reports false after
// the last composition (D, 0, ..., 0). The successor raises the entry just
// before the last non-zero one and moves the rest of that entry to the end.
func (cp *compositions) next(a []int) bool {
	z := cp.p - 1
	for z > 0 && a[z] == 0 {
		z--
	}
	if z == 0 {
		return false
	}
	rest := a[z] - 1
	a[z] = 0
	a[z-1]++
	a[cp.p-1] = rest
	return true
}

// rank returns the lexicographic position of a among the compositions of
// its degree. Fixing a_0..a_{i-1}, the compositions with a smaller entry
// v < a_i at position i number sum_v C(rest-v+q-1, q-1) with q = p-1-i parts
// after it, which telescopes to C(rest+q, q) - C(rest-a_i+q, q).
func (cp *compositions) rank(a []int) int {
	rest := 0
	for _, v := range a {
		rest += v
	}
	var r int64
	for i := 0; i < cp.p-1; i++ {
		q := cp.p - 1 - i
		r += cp.binom[rest+q][q] - cp.binom[rest-a[i]+q][q]
		rest -= a[i]
	}
	return int(r)
}
