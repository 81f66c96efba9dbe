package prob

import (
	"context"
	"fmt"
	"math"
	"math/big"
	"math/bits"

	"avoidcert/internal/par"
	"avoidcert/internal/words"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// The layered iteration counts permutations by the number of windows that
// match the set. It is the prefix-state iteration (method note, section 8;
// docs/prefix-states.md) with one layer per occurrence count: after n
// values a permutation is in state p, the pattern of its longest suffix
// whose pattern is a proper prefix of a member. A new value goes into a gap
// between retained values; every suffix of the suffix-plus-new-value whose
// pattern is a member is a matching window that ends here, and the move goes
// up by that many layers instead of being refused.
//
// Kept values. Of the values of a state only some are ever compared with a
// later value in a way that matters: for 12...k only the last one (a new
// value continues the increasing run exactly when it lies above it). The
// iteration keeps only those, and counts each permutation by the gaps
// a_0..a_K between its K kept values (how many other values, retained or
// not, lie below, between and above them). A value can be forgotten when
// (1) the two gaps beside it lead to the same move (same next state, same
// number of matches) and (2) no next state keeps it. Both conditions only
// ever ask for more values to be kept, so the least set of kept values that
// satisfies them is reached by adding values until nothing changes
// (newAutomaton). Then the count of a lumped coefficient is the sum of the
// full prefix-state counts it stands for, and a move on kept gaps is the
// image of the moves on full gaps: within one kept gap every landing place
// has the same outcome, and the place of the new value among the kept values
// is the number of values below it in that gap. For one pattern of length k
// this keeps 1 value for 12...k (the exact range grows like N^2 instead of
// N^k) and all k-1 for patterns such as 132 or 1342.
//
// One step. A coefficient with gaps b, landing in kept gap g at split s
// (s = 0..b_g), gives the expanded gaps (b_0..b_(g-1), s, b_g - s,
// b_(g+1)..b_K) around the kept values and the new one; the values the next
// state does not keep are then dropped, each merging the two gaps beside it
// plus one for itself. As s runs from 0 to b_g the target moves along a line
// (one gap grows by one, the next shrinks by one), the same line for every
// move into the same state, because the new value has a fixed rank among
// that state's kept values. So each source adds its value at the line's
// first target and subtracts it one past the last, and one running sum
// along the lines of each target state completes the step: two additions
// per source and move, one per target. When the next state does not keep
// the new value the split does not matter: the target gets b_g + 1 times the
// source. Arithmetic is on fixed-width words modulo 2^(64w), w words holding
// (n+1)!, so the subtractions may wrap and the running sums still come out
// exact.

// occState is one prefix state with its kept values.
type occState struct {
	full pattern.Perm // the pattern of the retained suffix
	kept int          // the number of kept values, K
	// last is the rank (1-based, among the kept values) of the most recent
	// value, 0 when it is not kept.
	last int
}

// occMove is a landing in kept gap g of a state.
type occMove struct {
	from, g int
	to      int
	hits    int
	// cuts are the ranks (1-based) among the kept values and the new one of
	// those the next state keeps, ascending: target gap h gathers the
	// expanded gaps cuts[h-1] .. cuts[h]-1 (cuts[-1] = 0, cuts[K'] = K+2).
	cuts []int
}

// automaton holds the states and their moves, grouped by target.
type automaton struct {
	states []occState
	into   [][]occMove // into[q]: every move that ends in q
}

// newAutomaton builds the lumped prefix states of set and their moves.
func newAutomaton(set pattern.Set) *automaton {
	members := map[string]bool{}
	index := map[string]int{"": 0}
	full := []pattern.Perm{{}}
	for _, m := range set.Patterns() {
		members[m.String()] = true
		for k := 1; k < len(m); k++ {
			p := pattern.Standardize(m[:k])
			if _, ok := index[p.String()]; !ok {
				index[p.String()] = len(full)
				full = append(full, p)
			}
		}
	}
	// outcome of a new value in full gap r (between values r and r+1) of
	// state p: the next state, the matches ending at the new value, and
	// where the next state's suffix starts in the suffix-plus-new-value.
	type outcome struct{ to, hits, start int }
	out := make([][]outcome, len(full))
	for p, s := range full {
		out[p] = make([]outcome, len(s)+1)
		for r := range out[p] {
			seq := withNewValue(s, r)
			o := outcome{to: -1}
			for start := 0; start <= len(seq); start++ { // start = len(seq): the empty suffix, always a state
				w := pattern.Standardize(seq[start:]).String()
				if members[w] {
					o.hits++
				}
				if i, ok := index[w]; ok && o.to < 0 {
					o.to, o.start = i, start
				}
			}
			out[p][r] = o
		}
	}
	// kept[p][i]: position i of state p is kept. Least fixpoint of the two
	// conditions in the comment above.
	kept := make([][]bool, len(full))
	for p, s := range full {
		kept[p] = make([]bool, len(s))
	}
	for changed := true; changed; {
		changed = false
		for p, s := range full {
			pos := positions(s)
			for v := 1; v <= len(s); v++ { // value v separates full gaps v-1 and v
				a, b := out[p][v-1], out[p][v]
				if !kept[p][pos[v]] && (a.to != b.to || a.hits != b.hits) {
					kept[p][pos[v]], changed = true, true
				}
			}
			for _, o := range out[p] {
				for i, k := range kept[o.to] {
					if at := o.start + i; k && at < len(s) && !kept[p][at] {
						kept[p][at], changed = true, true
					}
				}
			}
		}
	}
	a := &automaton{states: make([]occState, len(full)), into: make([][]occMove, len(full))}
	for p, s := range full {
		st := occState{full: s}
		for i, k := range kept[p] {
			if k {
				st.kept++
				if i == len(s)-1 {
					st.last = keptRank(s, kept[p], s[i])
				}
			}
		}
		a.states[p] = st
	}
	for p, s := range full {
		// kept values in value order: gap g lies between the g-th and
		// (g+1)-th of them; its full gaps all have the outcome of the
		// lowest one, full gap v_g.
		var vals []int
		for v := 1; v <= len(s); v++ {
			if kept[p][positions(s)[v]] {
				vals = append(vals, v)
			}
		}
		for g := 0; g <= len(vals); g++ {
			r := 0
			if g > 0 {
				r = vals[g-1]
			}
			o := out[p][r]
			m := occMove{from: p, g: g, to: o.to, hits: o.hits}
			for i, k := range kept[o.to] {
				if !k {
					continue
				}
				at := o.start + i
				if at == len(s) {
					m.cuts = append(m.cuts, g+1) // the new value
					continue
				}
				kr := keptRank(s, kept[p], s[at])
				if kr > g {
					kr++
				}
				m.cuts = append(m.cuts, kr)
			}
			sortInts(m.cuts)
			if a.states[o.to].last != newRank(m.cuts, g+1) {
				panic("prob: the new value's kept rank differs between moves into one state")
			}
			a.into[o.to] = append(a.into[o.to], m)
		}
	}
	return a
}

// withNewValue returns the suffix s with a new value in full gap r: values
// above r move up by one, and the new value r+1 is appended.
func withNewValue(s pattern.Perm, r int) []int {
	seq := make([]int, 0, len(s)+1)
	for _, v := range s {
		if v > r {
			v++
		}
		seq = append(seq, v)
	}
	return append(seq, r+1)
}

// positions returns pos with pos[v] the position of value v in s (1-based
// values; pos[0] unused).
func positions(s pattern.Perm) []int {
	pos := make([]int, len(s)+1)
	for i, v := range s {
		pos[v] = i
	}
	return pos
}

// keptRank is the rank (1-based) of value v among the kept values of s.
func keptRank(s pattern.Perm, kept []bool, v int) int {
	r := 0
	for i, u := range s {
		if kept[i] && u <= v {
			r++
		}
	}
	return r
}

// newRank is the position (1-based) of the new value's rank in cuts, 0
// when the next state does not keep it.
func newRank(cuts []int, rank int) int {
	for h, c := range cuts {
		if c == rank {
			return h + 1
		}
	}
	return 0
}

func sortInts(a []int) {
	for i := 1; i < len(a); i++ {
		for j := i; j > 0 && a[j] < a[j-1]; j-- {
			a[j], a[j-1] = a[j-1], a[j]
		}
	}
}

// coefficients is the number of gap vectors of state st after n values:
// the C(n, K) compositions of the n - K other values into K+1 gaps, 0
// before the state's L values exist.
func (st occState) coefficients(n int) float64 {
	if n < len(st.full) {
		return 0
	}
	return binomial(n, st.kept)
}

// wordsFor is the number of words that hold n!.
func wordsFor(n int) int {
	return factorial(n).BitLen()/64 + 1
}

// wordsEstimate is wordsFor without computing n!, for estimates.
func wordsEstimate(n int) float64 {
	lg, _ := math.Lgamma(float64(n) + 1)
	return math.Floor(lg/math.Ln2/64) + 1
}

// DefaultWork is the default budget of the layered iterations, in word
// additions (Cost.Work): about a minute on the shared two-core machine
// (docs/benchmarks.md).
const DefaultWork = 5e10

// residentPerLive scales the bytes of the two iterates to the peak
// resident memory of a run: storage is allocated with a quarter to spare
// (stepper.reuse), and the collector lets the heap grow past the live data.
// The peak resident memory measured once, on a loaded machine, was 1.45 to
// 1.54 times the iterates with their quarter (132 at N = 261, 2413 at
// N = 127, 1234567 at N = 2062: BenchmarkExactRange); 1.25 times 1.5 is an
// estimate, not a bound.
const residentPerLive = 1.25 * 1.5

// Cost is the estimated cost of Occurrences before it starts.
type Cost struct {
	// Work is the number of word additions: two per source coefficient,
	// move and layer, one per target coefficient and layer, each times the
	// words of the step's numbers.
	Work float64
	// Memory is the estimated peak resident memory: the two iterates at
	// the largest step, times residentPerLive.
	Memory float64
}

// OccurrenceCost estimates Occurrences(set, N, J) without running it. A
// cost far past any budget (10^20 word additions) is +Inf.
func OccurrenceCost(set pattern.Set, N, J int) Cost {
	_, c := cheapestImage(set, N, J+1, noLimit)
	return c
}

// noLimit is the work past which estimates stop: far beyond any budget.
const noLimit = 1e20

// cheapestImage returns the automaton of the image of set under reversal,
// complement or both that costs least at N: the four have the same
// distribution of matching windows (a window of the reversed or
// complemented draws matches the reversed or complemented member), but not
// always the same kept values (1342 keeps 3, its reverse-complement 3124
// fewer).
// Costs over limit come out +Inf.
func cheapestImage(set pattern.Set, N, layers int, limit float64) (*automaton, Cost) {
	var best *automaton
	var bestCost Cost
	for _, img := range set.Symmetric() {
		a := newAutomaton(img)
		if c := a.cost(N, layers, limit); best == nil || c.Work < bestCost.Work {
			best, bestCost = a, c
		}
	}
	return best, bestCost
}

// cost estimates the iteration to N with the given layers; past limit it
// stops and returns +Inf (N may be 10^9: the last step alone is weighed
// first, and it is the largest).
func (a *automaton) cost(N, layers int, limit float64) Cost {
	over := Cost{Work: math.Inf(1), Memory: math.Inf(1)}
	step := func(n int) (work, memory float64) {
		w := wordsEstimate(n + 1)
		ops, held := 0.0, 0.0
		for q, st := range a.states {
			t := st.coefficients(n + 1)
			ops += t
			held += t + st.coefficients(n)
			for _, m := range a.into[q] {
				ops += 2 * a.states[m.from].coefficients(n)
			}
		}
		return ops * float64(layers) * w, held * float64(layers) * w * 8 * residentPerLive
	}
	if last, _ := step(N - 1); N > 0 && last > limit {
		return over
	}
	var c Cost
	for n := 0; n < N; n++ {
		work, memory := step(n)
		c.Work += work
		c.Memory = max(c.Memory, memory)
		if c.Work > limit {
			return over
		}
	}
	return c
}

// Occurrences returns, for j = 0..J, the number of permutations of 1..N in
// which exactly j windows match a member of set (each window of each
// member's length counted once). Counts[0] is a_N. The set is the
// irredundant one of pattern.Set: a member that contains another was
// dropped, and its windows are not counted. It runs on GOMAXPROCS
// goroutines; the result does not depend on their number.
func Occurrences(ctx context.Context, set pattern.Set, N, J int) ([]*big.Int, error) {
	if N < 0 || J < 0 {
		return nil, fmt.Errorf("prob: occurrences need N >= 0 and J >= 0, not N = %d, J = %d", N, J)
	}
	a, _ := cheapestImage(set, N, J+1, noLimit)
	return a.run(ctx, N, J)
}

// run is Occurrences on the automaton a.
func (a *automaton) run(ctx context.Context, N, J int) ([]*big.Int, error) {
	layers := J + 1
	s := &stepper{a: a, layers: layers, ix: make([]*transfer.Indexer, len(a.states))}
	for p, st := range a.states {
		s.ix[p] = transfer.NewIndexer(st.kept, N+1)
	}
	// cur[p][j]: the coefficients of state p in layer j, w words each, in
	// the indexer's storage order (nil when the state has none yet).
	s.w = 1
	s.cur = make([][][]big.Word, len(a.states))
	for p := range s.cur {
		s.cur[p] = make([][]big.Word, layers)
	}
	s.cur[0][0] = []big.Word{1} // no values yet: the empty state, one permutation
	for n := 0; n < N; n++ {
		if err := s.step(ctx, n); err != nil {
			return nil, err
		}
	}
	out := make([]*big.Int, layers)
	for j := range out {
		out[j] = new(big.Int)
	}
	for _, st := range s.cur {
		for j, c := range st {
			for i := 0; i+s.w <= len(c); i += s.w {
				out[j].Add(out[j], new(big.Int).SetBits(append([]big.Word(nil), c[i:i+s.w]...)))
			}
		}
	}
	return out, nil
}

// stepper carries the iteration from n to n+1.
type stepper struct {
	a      *automaton
	layers int
	ix     []*transfer.Indexer
	w, nw  int // words per coefficient at n and at n+1
	cur    [][][]big.Word
	next   [][][]big.Word
	spare  [][][]big.Word // the storage of the step before cur, free for next
	// per step: for every move into q (into[q][i]) and source coefficient
	// c, where its line starts and one past where it ends (-1: past the
	// last target), or how many times it lands on one target.
	first, past [][][]int32
	times       [][][]big.Word
	pred        [][]int32 // pred[q][r]: the previous target on r's line, -1 at its start
}

func (s *stepper) step(ctx context.Context, n int) error {
	s.nw = wordsFor(n + 1)
	states := s.a.states
	s.next = make([][][]big.Word, len(states))
	s.first = make([][][]int32, len(states))
	s.past = make([][][]int32, len(states))
	s.times = make([][][]big.Word, len(states))
	s.pred = make([][]int32, len(states))
	var live []int // the target states with coefficients at n+1
	for q, st := range states {
		s.next[q] = make([][]big.Word, s.layers)
		if size := int(st.coefficients(n+1)) * s.nw; size > 0 {
			for t := range s.next[q] {
				s.next[q][t] = s.reuse(q, t, size)
			}
			live = append(live, q)
		}
	}
	// the targets of every source and the lines, one task per target state
	err := par.Run(ctx, len(live), func() func(int) {
		return func(i int) { s.index(live[i], n) }
	})
	if err != nil {
		return err
	}
	// one task per target state and layer: a layer of one state is the
	// working set, small enough to stay in cache longer than all layers
	type task struct{ q, t int }
	var tasks []task
	for _, q := range live {
		for t := range s.layers {
			tasks = append(tasks, task{q, t})
		}
	}
	err = par.Run(ctx, len(tasks), func() func(int) {
		return func(i int) { s.add(tasks[i].q, tasks[i].t) }
	})
	if err != nil {
		return err
	}
	s.spare, s.cur, s.w = s.cur, s.next, s.nw
	return nil
}

// reuse returns a zeroed slice of size words for layer t of state q: the
// storage of two steps back when it is large enough (fresh memory costs a
// page fault per page, a cleared slice only the clearing), new storage with
// room to grow otherwise.
func (s *stepper) reuse(q, t, size int) []big.Word {
	if s.spare != nil {
		old := s.spare[q][t]
		s.spare[q][t] = nil // too small or taken: either way no longer held
		if cap(old) >= size {
			b := old[:size]
			clear(b)
			return b
		}
	}
	return make([]big.Word, size, size+size/4)
}

// index fills first, past, times and pred for target state q.
func (s *stepper) index(q, n int) {
	to := s.a.states[q]
	h := to.last
	b := make([]int, to.kept+1)
	moves := s.a.into[q]
	s.first[q] = make([][]int32, len(moves))
	s.past[q] = make([][]int32, len(moves))
	s.times[q] = make([][]big.Word, len(moves))
	for i, m := range moves {
		from := s.a.states[m.from]
		if n < len(from.full) {
			continue // the state has no permutations yet
		}
		count := int(from.coefficients(n))
		first := make([]int32, count)
		var past []int32
		var times []big.Word
		if h == 0 {
			times = make([]big.Word, count)
		} else {
			past = make([]int32, count)
		}
		a := make([]int, from.kept+1)
		s.ix[m.from].Unrank(n-from.kept, 0, a)
		for c := range count {
			target(m, a, b)
			first[c] = int32(s.ix[q].Rank(b))
			switch step := a[m.g] + 1; {
			case h == 0:
				times[c] = big.Word(step) // every split lands on the same target
			case b[h] >= step:
				b[h-1] += step
				b[h] -= step
				past[c] = int32(s.ix[q].Rank(b))
			default:
				past[c] = -1
			}
			s.ix[m.from].Next(a)
		}
		s.first[q][i], s.past[q][i], s.times[q][i] = first, past, times
	}
	if h == 0 {
		return
	}
	// each target's predecessor on its line: gap h-1 one smaller, gap h
	// one larger, which comes earlier in storage order
	pred := make([]int32, int(to.coefficients(n+1)))
	s.ix[q].Unrank(n+1-to.kept, 0, b)
	for r := range pred {
		pred[r] = -1
		if b[h-1] > 0 {
			b[h-1]--
			b[h]++
			pred[r] = int32(s.ix[q].Rank(b))
			b[h-1]++
			b[h]--
		}
		s.ix[q].Next(b)
	}
	s.pred[q] = pred
}

// add computes layer t of target state q at n+1: the pushes of every
// source, then the running sums along the lines.
func (s *stepper) add(q, t int) {
	w, nw := s.w, s.nw
	dst := s.next[q][t]
	for i, m := range s.a.into[q] {
		first := s.first[q][i]
		j := t - m.hits
		if first == nil || j < 0 || s.cur[m.from][j] == nil {
			continue
		}
		past, times := s.past[q][i], s.times[q][i]
		src := s.cur[m.from][j]
		for c, f := range first {
			x := src[c*w : (c+1)*w]
			at := int(f) * nw
			if times != nil {
				addMul(dst[at:at+nw], x, times[c])
				continue
			}
			words.Add(dst[at:at+nw], x)
			if p := past[c]; p >= 0 {
				at := int(p) * nw
				words.Sub(dst[at:at+nw], x)
			}
		}
	}
	for r, p := range s.pred[q] {
		if p >= 0 {
			words.Add(dst[r*nw:(r+1)*nw], dst[int(p)*nw:(int(p)+1)*nw])
		}
	}
}

// target writes into b the gaps of move m's target for source gaps a and
// split s = 0.
func target(m occMove, a, b []int) {
	// expanded gap i (0..K+1) lies between expanded ranks i and i+1
	expanded := func(i int) int {
		switch {
		case i < m.g:
			return a[i]
		case i == m.g:
			return 0
		default:
			return a[i-1]
		}
	}
	lo := 0
	for h := range b {
		hi := len(a) + 1 // K+2
		if h < len(m.cuts) {
			hi = m.cuts[h]
		}
		sum := hi - lo - 1 // the dropped values between the kept ones
		for i := lo; i < hi; i++ {
			sum += expanded(i)
		}
		b[h] = sum
		lo = hi
	}
}

// addMul adds x times m into dst modulo 2^(64 len(dst)) (len(x) <= len(dst)).
func addMul(dst, x []big.Word, m big.Word) {
	var carry uint
	for i, v := range x {
		hi, lo := bits.Mul(uint(v), uint(m))
		lo, c := bits.Add(lo, carry, 0)
		hi += c
		r, c2 := bits.Add(uint(dst[i]), lo, 0)
		dst[i] = big.Word(r)
		carry = hi + c2
	}
	for i := len(x); carry != 0 && i < len(dst); i++ {
		r, c := bits.Add(uint(dst[i]), carry, 0)
		dst[i] = big.Word(r)
		carry = c
	}
}

// binomial is C(n, k) as a float, for estimates.
func binomial(n, k int) float64 {
	b := 1.0
	for i := 1; i <= k; i++ {
		b = b * float64(n-k+i) / float64(i)
	}
	return b
}
