package bounds

import (
	"context"
	"math"
	"math/big"
	"math/bits"

	"avoidcert/internal/par"
	"avoidcert/internal/words"
	"avoidcert/transfer"
)

// The bracket at one n compares two polynomials on the cell of every
// state p (docs/prefix-states.md, "The bracket"), both written in the
// Bernstein basis of degree n+d-|p| over the |p|+1 gaps:
//
//   - T'^d g_n, where g_n has the coefficients G_n[p]/(n-|p|)!. Each step of
//     T' maps a basis polynomial of degree D to basis polynomials of degree
//     D+1 with weight 1/(D+1) (method note, sections 3 and 8), so the
//     coefficients of T'^d g_n are G_(n+d)[p]/(n+d-|p|)!.
//   - E^d g_n, the same polynomial raised to degree n+d-|p|. Multiplying
//     B_b (degree D) by 1 = L_0 + ... + L_|p| gives
//     B_b = sum_t (b_t+1)/(D+1) B_(b+e_t), so the coefficient at a of the
//     raised polynomial is sum_t a_t/(D+1) c_(a-e_t). Starting from
//     H_0 = G_n[p], H_(i+1)[a] = sum_t a_t H_i[a-e_t] gives the
//     coefficients of E^i g_n times (n-|p|+i)!.
//
// The factorials cancel: R = G_(n+d)[p][a] / H_d[a] is the ratio of the
// Bernstein coefficients of T'^d g_n and g_n at a.

// source is a read-only view of integer coefficients by state and storage
// rank; *transfer.Iterate is one.
type source interface {
	Words(p, r int) []big.Word
}

// table holds coefficients this package computes (the raised H_i), per
// state.
type table struct {
	limbs int
	offs  []int
	words []big.Word
}

// Words returns the words of coefficient r of state p (aliasing the table).
func (t *table) Words(p, r int) []big.Word {
	off := t.offs[p] + r*t.limbs
	return t.words[off : off+t.limbs : off+t.limbs]
}

// ratioProblem is one bracket evaluation: num = G_(n+d) and base = G_n of
// one system, whose coefficients fit in numLimbs and baseLimbs words.
type ratioProblem struct {
	st        *transfer.States
	n, d      int
	states    []int // the states to scan; the others are zero in base
	num, base source
	numLimbs  int
	baseLimbs int
}

// deg returns the degree of state p's coefficients at length n.
func (p ratioProblem) deg(state, n int) int { return n - p.st.Length(state) }

// indexers returns one Indexer per state length, up to degree n+d.
func (p ratioProblem) indexers() []*transfer.Indexer {
	ixs := make([]*transfer.Indexer, p.st.MaxLength()+1)
	for l := range ixs {
		ixs[l] = transfer.NewIndexer(l, p.n+p.d)
	}
	return ixs
}

// ratioExtremes is the outcome of one evaluation.
type ratioExtremes struct {
	lo, hi   *big.Rat // min and max of R over H_d > 0; hi is nil when unbounded
	positive int      // indices with H_d > 0
	exact    int      // comparisons the floating-point screen left to exact arithmetic
}

// chunk is the number of indices one task scans.
const chunk = 4096

// extremes computes the exact min and max of R.
//
// Every comparison of two ratios N/D and N'/D' is first screened in
// floating point and decided exactly (N*D' against N'*D) only when the
// screen cannot call it. Near convergence all ratios agree to far more than
// float64 precision, so the screen works on the offsets from a centre
// mu = c/2^s close to all of them: it compares x = (N*2^s - c*D)/D =
// 2^s (R - mu), whose float64 approximation has a relative error below
// 2^-49 however close R is to mu. The centre is the weighted mean of all
// ratios (the ratio of the coefficient sums), with s chosen from the spread
// seen on a sample; a poor centre only sends more comparisons to exact
// arithmetic.
func extremes(ctx context.Context, p ratioProblem) (ratioExtremes, error) {
	ixs := p.indexers()
	den, denLimbs := p.base, p.baseLimbs
	for i := 1; i < p.d; i++ {
		t, err := elevate(ctx, ixs, p, p.n+i, den, denLimbs)
		if err != nil {
			return ratioExtremes{}, err
		}
		den, denLimbs = t, denLimbs+1
	}
	top := p.n + p.d
	centre := screenCentre(ixs, p, den, denLimbs)
	type span struct{ state, lo, hi int }
	var spans []span
	for _, s := range p.states {
		count := ixs[p.st.Length(s)].Count(p.deg(s, top))
		for lo := 0; lo < count; lo += chunk {
			spans = append(spans, span{s, lo, min(lo+chunk, count)})
		}
	}
	tallies := make([]tally, len(spans))
	err := par.Run(ctx, len(spans), func() func(int) {
		s := newScratch(p.st.MaxLength(), denLimbs, p.numLimbs, centre)
		return func(task int) {
			sp := spans[task]
			ix := ixs[p.st.Length(sp.state)]
			a := s.a[:p.st.Length(sp.state)+1]
			ix.Unrank(p.deg(sp.state, top), sp.lo, a)
			t := &tallies[task]
			for r := sp.lo; r < sp.hi; r++ {
				s.raise(ix, a, sp.state, den, s.d)
				s.visit(t, p.num.Words(sp.state, r), s.d)
				ix.Next(a)
			}
		}
	})
	if err != nil {
		return ratioExtremes{}, err
	}
	s := newScratch(p.st.MaxLength(), denLimbs, p.numLimbs, centre)
	var all tally
	for i := range tallies {
		s.merge(&all, &tallies[i])
	}
	out := ratioExtremes{positive: all.positive, exact: all.exact}
	switch {
	case all.positive == 0:
		// No positive denominator: G_n vanishes on the scanned states.
		out.lo = new(big.Rat)
		if !all.unbounded {
			out.hi = new(big.Rat)
		}
	default:
		out.lo = all.min.ratio()
		if !all.unbounded {
			out.hi = all.max.ratio()
		}
	}
	return out, nil
}

// centre is the screening centre mu = c/2^s with s = words*W (W the word
// size); p nil means no centre (the screen then uses R itself).
type centre struct {
	p     []big.Word
	words int
}

// screenCentre returns a centre close to the ratios: the sum ratio (a
// weighted mean of the R) rounded down to s bits after the point, s about
// 20 bits beyond the spread of the ratios on a sample of indices.
func screenCentre(ixs []*transfer.Indexer, p ratioProblem, den source, denLimbs int) centre {
	top := p.n + p.d
	var sumN, sumD big.Int
	var x big.Int
	s := newScratch(p.st.MaxLength(), denLimbs, p.numLimbs, centre{})
	for _, st := range p.states {
		ix := ixs[p.st.Length(st)]
		for r := range ix.Count(p.deg(st, top)) {
			sumN.Add(&sumN, x.SetBits(p.num.Words(st, r)))
		}
		for r := range ix.Count(p.deg(st, top-1)) {
			sumD.Add(&sumD, x.SetBits(den.Words(st, r)))
		}
	}
	if sumD.Sign() == 0 || sumN.Sign() == 0 {
		return centre{}
	}
	// Raising multiplies a state's coefficient sum by D+|p| = n+d (D the
	// raised degree): every b of degree D-1 feeds its neighbours b+e_t with
	// weights b_t+1, which add up to D+|p|.
	sumD.Mul(&sumD, big.NewInt(int64(top)))
	mean := new(big.Rat).SetFrac(&sumN, &sumD)

	const samplesPerState = 8
	spread := new(big.Rat)
	for _, st := range p.states {
		ix := ixs[p.st.Length(st)]
		a := s.a[:p.st.Length(st)+1]
		count := ix.Count(p.deg(st, top))
		for j := range samplesPerState {
			r := j * count / samplesPerState
			ix.Unrank(p.deg(st, top), r, a)
			s.raise(ix, a, st, den, s.d)
			if isZero(s.d) {
				continue
			}
			q := new(big.Rat).SetFrac(new(big.Int).SetBits(append([]big.Word(nil), p.num.Words(st, r)...)),
				new(big.Int).SetBits(append([]big.Word(nil), s.d...)))
			q.Sub(q, mean).Abs(q)
			if q.Cmp(spread) > 0 {
				spread = q
			}
		}
	}
	bitsWanted := 64
	if spread.Sign() > 0 {
		bitsWanted = int(math.Ceil(-log2Rat(spread))) + 20
	}
	words := (min(max(bitsWanted, 64), 1<<16) + bits.UintSize - 1) / bits.UintSize
	num := new(big.Int).Lsh(mean.Num(), uint(words*bits.UintSize))
	return centre{p: num.Quo(num, mean.Denom()).Bits(), words: words}
}

// elevate returns the coefficients at length n (one degree above src's)
// raised from src on the scanned states.
func elevate(ctx context.Context, ixs []*transfer.Indexer, p ratioProblem, n int, src source, srcLimbs int) (*table, error) {
	dst := &table{limbs: srcLimbs + 1, offs: make([]int, p.st.Len())}
	type span struct{ state, lo, hi int }
	var spans []span
	total := 0
	for _, s := range p.states {
		dst.offs[s] = total
		count := ixs[p.st.Length(s)].Count(p.deg(s, n))
		total += count * dst.limbs
		for lo := 0; lo < count; lo += chunk {
			spans = append(spans, span{s, lo, min(lo+chunk, count)})
		}
	}
	dst.words = make([]big.Word, total)
	err := par.Run(ctx, len(spans), func() func(int) {
		s := newScratch(p.st.MaxLength(), srcLimbs, 0, centre{})
		return func(task int) {
			sp := spans[task]
			ix := ixs[p.st.Length(sp.state)]
			a := s.a[:p.st.Length(sp.state)+1]
			ix.Unrank(p.deg(sp.state, n), sp.lo, a)
			for r := sp.lo; r < sp.hi; r++ {
				s.raise(ix, a, sp.state, src, dst.Words(sp.state, r))
				ix.Next(a)
			}
		}
	})
	return dst, err
}

// extreme is the current minimum or maximum: its numerator (aliasing a
// read-only source), a copy of its denominator, and its screen value.
type extreme struct {
	n, d []big.Word
	x    approx
}

func (e *extreme) set(n, d []big.Word, x approx) {
	e.n, e.d, e.x = n, append(e.d[:0], d...), x
}

func (e *extreme) ratio() *big.Rat {
	return new(big.Rat).SetFrac(new(big.Int).SetBits(append([]big.Word(nil), e.n...)),
		new(big.Int).SetBits(append([]big.Word(nil), e.d...)))
}

// tally is the state of the tournament over some indices.
type tally struct {
	min, max  extreme
	positive  int  // indices with D_a > 0 seen
	unbounded bool // some index has D_a = 0 < N_a
	exact     int
}

// scratch is one worker's reusable state.
type scratch struct {
	a      []int
	d      []big.Word // the raised denominator of the current index
	centre centre
	// shifted, product and offset hold N*2^s, p*D and their difference.
	shifted, product, offset []big.Word
	x1, y1, x2, y2, p1, p2   big.Int
}

func newScratch(maxL, denLimbs, numLimbs int, c centre) *scratch {
	n := max(numLimbs+c.words, len(c.p)+denLimbs+1) + 1
	return &scratch{a: make([]int, maxL+1), d: make([]big.Word, denLimbs+1), centre: c,
		shifted: make([]big.Word, n), product: make([]big.Word, n), offset: make([]big.Word, n)}
}

// raise writes into dst the coefficient at a (state p's composition) of
// src raised by one degree: sum_t a_t src[a - e_t].
func (s *scratch) raise(ix *transfer.Indexer, a []int, p int, src source, dst []big.Word) {
	clear(dst)
	for t, at := range a {
		if at == 0 {
			continue
		}
		a[t]--
		mulAddWords(dst, src.Words(p, ix.Rank(a)), uint(at))
		a[t]++
	}
}

// screen returns the approx of 2^s (N/D - mu) = (N*2^s - p*D)/D.
func (s *scratch) screen(n, d []big.Word) approx {
	c := s.centre
	if c.p == nil {
		return approxQuo(n, false, d)
	}
	clear(s.shifted)
	copy(s.shifted[c.words:], n)
	clear(s.product)
	for j, w := range c.p {
		mulAddWords(s.product[j:], d, uint(w))
	}
	negative := compareWords(s.shifted, s.product) < 0
	if negative {
		words.SubInto(s.offset, s.product, s.shifted)
	} else {
		words.SubInto(s.offset, s.shifted, s.product)
	}
	return approxQuo(s.offset, negative, d)
}

// compareExact returns the sign of n1/d1 - n2/d2 (d1, d2 > 0) by
// cross-multiplication. The operands are only read.
func (s *scratch) compareExact(n1, d1, n2, d2 []big.Word) int {
	s.x1.SetBits(n1)
	s.y1.SetBits(d1)
	s.x2.SetBits(n2)
	s.y2.SetBits(d2)
	s.p1.Mul(&s.x1, &s.y2)
	s.p2.Mul(&s.x2, &s.y1)
	return s.p1.Cmp(&s.p2)
}

// compare returns the sign of n/d - e's ratio.
func (s *scratch) compare(t *tally, x approx, n, d []big.Word, e *extreme) int {
	if c, ok := compareApprox(x, e.x); ok {
		return c
	}
	// Equal ratios are common (iterates are often constant along some
	// directions); equal words settle them without multiplying.
	if equalWords(n, e.n) && equalWords(d, e.d) {
		return 0
	}
	t.exact++
	return s.compareExact(n, d, e.n, e.d)
}

// visit enters one index into the tournament. An index that is below the
// minimum cannot be above the maximum, so most indices cost one comparison.
func (s *scratch) visit(t *tally, n, d []big.Word) {
	if isZero(d) {
		if !isZero(n) {
			t.unbounded = true
		}
		return
	}
	x := s.screen(n, d)
	t.positive++
	if t.positive == 1 {
		t.min.set(n, d, x)
		t.max.set(n, d, x)
		return
	}
	if s.compare(t, x, n, d, &t.min) < 0 {
		t.min.set(n, d, x)
		return
	}
	if s.compare(t, x, n, d, &t.max) > 0 {
		t.max.set(n, d, x)
	}
}

// merge folds tally u into t.
func (s *scratch) merge(t, u *tally) {
	t.unbounded = t.unbounded || u.unbounded
	t.exact += u.exact
	if u.positive == 0 {
		return
	}
	if t.positive == 0 {
		t.min.set(u.min.n, u.min.d, u.min.x)
		t.max.set(u.max.n, u.max.d, u.max.x)
	} else {
		if s.compare(t, u.min.x, u.min.n, u.min.d, &t.min) < 0 {
			t.min.set(u.min.n, u.min.d, u.min.x)
		}
		if s.compare(t, u.max.x, u.max.n, u.max.d, &t.max) > 0 {
			t.max.set(u.max.n, u.max.d, u.max.x)
		}
	}
	t.positive += u.positive
}

// log2Rat returns an approximation of log2(r) for r > 0.
func log2Rat(r *big.Rat) float64 {
	tn, en := topFloat(r.Num().Bits())
	td, ed := topFloat(r.Denom().Bits())
	return math.Log2(tn) - math.Log2(td) + float64(en-ed)
}
