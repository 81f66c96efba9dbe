package cellbounds

import (
	"context"
	"math/big"
	"math/rand"
	"sort"
	"testing"

	transfer "avoidcert/internal/cellform/transfer"
	"avoidcert/pattern"
)

// These tests derive the bracket's ratio from first principles (method
// note, sections 2-4): they evaluate the polynomials at exact rational
// points instead of trusting the coefficient identities.

// poly is a polynomial in t with rational coefficients, lowest first.
type poly []*big.Rat

func constPoly(c *big.Rat) poly { return poly{new(big.Rat).Set(c)} }

func (p poly) mul(q poly) poly {
	out := make(poly, len(p)+len(q)-1)
	for i := range out {
		out[i] = new(big.Rat)
	}
	for i, a := range p {
		for j, b := range q {
			out[i+j].Add(out[i+j], new(big.Rat).Mul(a, b))
		}
	}
	return out
}

func (p poly) add(q poly) poly {
	out := make(poly, max(len(p), len(q)))
	for i := range out {
		out[i] = new(big.Rat)
		if i < len(p) {
			out[i].Add(out[i], p[i])
		}
		if i < len(q) {
			out[i].Add(out[i], q[i])
		}
	}
	return out
}

func (p poly) scale(c *big.Rat) poly {
	out := make(poly, len(p))
	for i, a := range p {
		out[i] = new(big.Rat).Mul(a, c)
	}
	return out
}

// integrate returns the integral of p over [lo, hi].
func (p poly) integrate(lo, hi *big.Rat) *big.Rat {
	sum := new(big.Rat)
	for i, a := range p {
		n := big.NewRat(1, int64(i+1))
		up := new(big.Rat).Set(hi)
		down := new(big.Rat).Set(lo)
		for range i {
			up.Mul(up, hi)
			down.Mul(down, lo)
		}
		sum.Add(sum, new(big.Rat).Mul(a, n.Mul(n, new(big.Rat).Sub(up, down))))
	}
	return sum
}

// bernsteinValue returns sum_a c[a] prod_i L_i^{a_i}/a_i!, which is the
// polynomial with Bernstein coefficients c[a]/D! at barycentric point L
// (B_a = D!/prod a_i! L^a). L entries are polynomials in t.
func bernsteinValue(ix *transfer.Indexer, D int, coef func(r int) *big.Int, L []poly) poly {
	m := len(L) - 1
	a := make([]int, m+1)
	sum := poly{new(big.Rat)}
	for r := range ix.Count(D) {
		ix.Unrank(D, r, a)
		c := coef(r)
		if c.Sign() == 0 {
			continue
		}
		term := constPoly(new(big.Rat).SetInt(c))
		for i, ai := range a {
			for range ai {
				term = term.mul(L[i])
			}
			term = term.scale(new(big.Rat).SetFrac(big.NewInt(1), factorial(ai)))
		}
		sum = sum.add(term)
	}
	return sum
}

// barycentric returns the gap lengths of the sorted values of a point
// whose entries are polynomials in t (constants or t itself), ordered by
// the given representative values.
func barycentric(vals []poly, order []*big.Rat) []poly {
	idx := make([]int, len(vals))
	for i := range idx {
		idx[i] = i
	}
	sort.Slice(idx, func(i, j int) bool { return order[idx[i]].Cmp(order[idx[j]]) < 0 })
	one := big.NewRat(1, 1)
	minusOne := big.NewRat(-1, 1)
	L := make([]poly, len(vals)+1)
	prev := constPoly(new(big.Rat))
	for i, j := range idx {
		L[i] = vals[j].add(prev.scale(minusOne))
		prev = vals[j]
	}
	L[len(vals)] = constPoly(one).add(prev.scale(minusOne))
	return L
}

func ranks(vals []*big.Rat) []int {
	out := make([]int, len(vals))
	for i, v := range vals {
		for _, w := range vals {
			if w.Cmp(v) <= 0 {
				out[i]++
			}
		}
	}
	return out
}

func iterates(t *testing.T, s pattern.Set, upto int) (transfer.System, []*transfer.Iterate) {
	t.Helper()
	sys := transfer.FromSet(s)
	e := transfer.New(sys)
	gs := []*transfer.Iterate{e.Start()}
	for len(gs) <= upto {
		g, err := e.Next(context.Background(), gs[len(gs)-1])
		if err != nil {
			t.Fatal(err)
		}
		gs = append(gs, g)
	}
	return sys, gs
}

// TestTransferInBernsteinForm checks that G_{k+1}/(k+1)! are the Bernstein
// coefficients of T g_k, g_k = G_k/k!, by computing (T g_k)(x) =
// integral_0^1 chi(t, x) g_k(t, x_1..x_{m-1}) dt exactly at random rational
// x (method note, section 2: Ehrenborg, Kitaev, Perry 2011).
func TestTransferInBernsteinForm(t *testing.T) {
	rng := rand.New(rand.NewSource(7))
	for _, set := range []string{"123", "132", "123,321", "1342", "1324"} {
		s, err := pattern.ParseSet([]string{set})
		if err != nil {
			t.Fatal(err)
		}
		const k = 3
		sys, gs := iterates(t, s, k+1)
		m := sys.M
		ix := transfer.NewIndexer(m, k+1)
		for trial := range 6 {
			// distinct random rationals in (0,1)
			x := make([]*big.Rat, m)
			seen := map[int64]bool{}
			for i := range x {
				n := 1 + rng.Int63n(996)
				for seen[n] {
					n = 1 + rng.Int63n(996)
				}
				seen[n] = true
				x[i] = big.NewRat(n, 997)
			}
			sigma := pattern.Rank(pattern.Perm(ranks(x)))
			xs := make([]poly, m)
			for i := range x {
				xs[i] = constPoly(x[i])
			}
			want := bernsteinValue(ix, k+1, func(r int) *big.Int { return gs[k+1].Int(sigma, r) }, barycentric(xs, x))[0]

			// gaps of t between the sorted coordinates of x
			cuts := append([]*big.Rat{new(big.Rat)}, x...)
			cuts = append(cuts, big.NewRat(1, 1))
			sort.Slice(cuts, func(i, j int) bool { return cuts[i].Cmp(cuts[j]) < 0 })
			got := new(big.Rat)
			for j := 0; j+1 < len(cuts); j++ {
				lo, hi := cuts[j], cuts[j+1]
				mid := new(big.Rat).Add(lo, hi)
				mid.Quo(mid, big.NewRat(2, 1))
				window := append([]*big.Rat{mid}, x...)
				if !sys.Allowed[pattern.Rank(pattern.Perm(ranks(window)))] {
					continue
				}
				y := window[:m] // (t, x_1..x_{m-1})
				tau := pattern.Rank(pattern.Perm(ranks(y)))
				ys := append([]poly{{new(big.Rat), big.NewRat(1, 1)}}, xs[:m-1]...)
				f := bernsteinValue(ix, k, func(r int) *big.Int { return gs[k].Int(tau, r) }, barycentric(ys, y))
				got.Add(got, f.integrate(lo, hi))
			}
			if got.Cmp(want) != 0 {
				t.Fatalf("%s trial %d: (T g_k)(x) = %s by integration, %s from G_{k+1}", set, trial, got.RatString(), want.RatString())
			}
		}
	}
}

// TestRaisedDegree checks that the raised coefficients H_d (H_0 = G_k,
// H_{i+1}[a] = sum_t a_t H_i[a-e_t]) divided by (k+d)! are the Bernstein
// coefficients of g_k itself, at random rational barycentric points (degree
// elevation: B_b = sum_t (b_t+1)/(D+1) B_{b+e_t}, since L_0+...+L_m = 1).
func TestRaisedDegree(t *testing.T) {
	rng := rand.New(rand.NewSource(11))
	for _, set := range []string{"123", "1342", "12345"} {
		s, _ := pattern.ParseSet([]string{set})
		const k = 3
		sys, gs := iterates(t, s, k)
		m := sys.M
		cells := make([]int, sys.Cells())
		for c := range cells {
			cells[c] = c
		}
		p := ratioProblem{m: m, k: k, d: 3, cells: cells}
		ix := transfer.NewIndexer(m, k+3)
		var src source = gs[k]
		limbs := gs[k].Limbs
		for d := 1; d <= 3; d++ {
			h, err := elevate(context.Background(), ix, p, k+d, src, limbs)
			if err != nil {
				t.Fatal(err)
			}
			src, limbs = h, limbs+1
			for trial := range 4 {
				// random point of the simplex: sorted cuts of (0,1)
				cut := make([]*big.Rat, m)
				for i := range cut {
					cut[i] = big.NewRat(1+rng.Int63n(9999), 10000+rng.Int63n(7))
				}
				sort.Slice(cut, func(i, j int) bool { return cut[i].Cmp(cut[j]) < 0 })
				vals := make([]poly, m)
				for i := range cut {
					vals[i] = constPoly(cut[i])
				}
				L := barycentric(vals, cut)
				cell := trial % sys.Cells()
				want := bernsteinValue(ix, k, func(r int) *big.Int { return gs[k].Int(cell, r) }, L)[0]
				got := bernsteinValue(ix, k+d, func(r int) *big.Int {
					return new(big.Int).SetBits(append([]big.Word(nil), h.Words(cell, r)...))
				}, L)[0]
				if got.Cmp(want) != 0 {
					t.Fatalf("%s d=%d: raised value %s, original %s", set, d, got.RatString(), want.RatString())
				}
			}
		}
	}
}
