package transfer

import (
	"fmt"
	"slices"

	"avoidcert/pattern"
)

// States are the prefix states of a pattern set (docs/prefix-states.md):
// the distinct patterns of the proper prefixes of its members, the empty
// one included, shorter first and then lexicographically. State 0 is the
// empty state. States is read-only after NewStates and safe for concurrent
// use.
type States struct {
	set   pattern.Set
	perms []pattern.Perm
	index map[string]int
	maxL  int
	moves [][]Move // per state, by gap: the allowed moves
}

// Move is one allowed way to append a value to a sequence in state From:
// the new value lands in gap Gap of From's retained values, the Drops
// oldest values are forgotten, and the sequence is then in state To.
type Move struct {
	From, Gap, To, Drops int
	// ops turn From's coefficients into To's: ops[0] reads From's array,
	// each later op reads the previous op's output, the last writes To's.
	ops []op
	// groups is the same map in one piece: To's gap j collects the gaps
	// of p+ in one group (used to push moves that drop several values).
	groups groupMap
}

// groupMap says where the gaps of From end up in To: gap t of From (t not
// the split gap) lies in To's gap of[t]; the split gap's lower piece lies
// in To's gap low and its upper piece in gap low+1; To's gap j also holds
// extra[j] forgotten values. So a'_j = extra[j] + sum of a_t over
// of[t] = j, plus b in gap low and a_i - b in gap low+1.
type groupMap struct {
	of    []int // per From gap; -1 for the split gap
	low   int
	extra []int
}

// op is one pull: every destination coefficient at c' is the source's
// coefficient (or the source's running sums along (u, v), when prefix is
// set) at a*, where a*_t = sum of c'_j over j in src[t] plus off[t]. The
// destination is 0 where some a*_t is negative.
type op struct {
	prefix bool
	u, v   int
	src    [][2]int // per source coordinate: up to two destination coordinates, -1 for none
	off    []int    // per source coordinate: 0 or -1
}

// NewStates builds the prefix states of a set and their moves.
func NewStates(s pattern.Set) *States {
	st := &States{set: s, index: map[string]int{}}
	add := func(p pattern.Perm) {
		if _, ok := st.index[p.String()]; !ok {
			st.index[p.String()] = -1
			st.perms = append(st.perms, p)
		}
	}
	add(pattern.Perm{})
	for _, m := range s.Patterns() {
		for l := 1; l < len(m); l++ {
			add(pattern.Standardize(m[:l]))
		}
	}
	slices.SortFunc(st.perms, func(p, q pattern.Perm) int {
		if len(p) != len(q) {
			return len(p) - len(q)
		}
		return slices.Compare(p, q)
	})
	for i, p := range st.perms {
		st.index[p.String()] = i
		st.maxL = max(st.maxL, len(p))
	}
	st.moves = make([][]Move, len(st.perms))
	for from, p := range st.perms {
		for gap := 0; gap <= len(p); gap++ {
			if mv, ok := st.move(from, p, gap); ok {
				st.moves[from] = append(st.moves[from], mv)
			}
		}
	}
	return st
}

// Len returns the number of states.
func (st *States) Len() int { return len(st.perms) }

// Perm returns state i's pattern (a fresh copy).
func (st *States) Perm(i int) pattern.Perm { return append(pattern.Perm(nil), st.perms[i]...) }

// Length returns the number of values state i retains.
func (st *States) Length(i int) int { return len(st.perms[i]) }

// MaxLength returns the longest state's length M (the longest pattern's
// length minus one).
func (st *States) MaxLength() int { return st.maxL }

// Set returns the pattern set.
func (st *States) Set() pattern.Set { return st.set }

// Moves returns the allowed moves out of state i, by increasing gap. The
// slice is shared: callers must not modify it.
func (st *States) Moves(i int) []Move { return st.moves[i] }

// Index returns the state whose pattern is p, or -1.
func (st *States) Index(p pattern.Perm) int {
	if i, ok := st.index[p.String()]; ok {
		return i
	}
	return -1
}

// String describes a state, "()" for the empty one.
func (st *States) String(i int) string {
	if len(st.perms[i]) == 0 {
		return "()"
	}
	return st.perms[i].String()
}

// move derives the move from state p (index from) with the new value in
// gap i, or reports false when the move is forbidden.
func (st *States) move(from int, p pattern.Perm, i int) (Move, bool) {
	L := len(p)
	plus := make(pattern.Perm, L+1) // p+: entries above i raised, i+1 appended
	for t, x := range p {
		plus[t] = x
		if x > i {
			plus[t] = x + 1
		}
	}
	plus[L] = i + 1
	for _, m := range st.set.Patterns() {
		if len(m) <= L+1 && pattern.OrderIsomorphic(plus[L+1-len(m):], m) {
			return Move{}, false
		}
	}
	keep := 0
	for l := L + 1; l >= 0; l-- {
		if _, ok := st.index[pattern.Standardize(plus[L+1-l:]).String()]; ok {
			keep = l
			break
		}
	}
	to := st.index[pattern.Standardize(plus[L+1-keep:]).String()]
	mv := Move{From: from, Gap: i, To: to, Drops: L + 1 - keep}
	mv.ops = chain(plus, i, mv.Drops)
	mv.groups = groups(plus, i, mv.Drops)
	return mv, true
}

// groups follows the gaps of p+ through the drops (see groupMap).
func groups(plus pattern.Perm, i, drops int) groupMap {
	L := len(plus) - 1
	type gap struct {
		from      []int // From gaps wholly inside
		low, high bool  // holds the lower or upper piece of the split gap
		forgotten int
	}
	gaps := make([]gap, L+2)
	for t := range gaps {
		switch {
		case t < i:
			gaps[t].from = []int{t}
		case t == i:
			gaps[t].low = true
		case t == i+1:
			gaps[t].high = true
		default:
			gaps[t].from = []int{t - 1}
		}
	}
	cur := plus
	for range drops {
		r := cur[0]
		cur = pattern.Standardize(cur[1:])
		a, b := gaps[r-1], gaps[r]
		merged := gap{from: append(append([]int(nil), a.from...), b.from...), low: a.low || b.low,
			high: a.high || b.high, forgotten: a.forgotten + b.forgotten + 1}
		gaps = append(append(gaps[:r-1:r-1], merged), gaps[r+1:]...)
	}
	g := groupMap{of: make([]int, L+1), extra: make([]int, len(gaps))}
	for j, x := range gaps {
		for _, t := range x.from {
			g.of[t] = j
		}
		if x.low {
			g.low = j
		}
		g.extra[j] = x.forgotten
	}
	g.of[i] = -1
	return g
}

// Gap labels of p+ before any drop: a source coordinate t >= 0, or one of
// the two pieces of the split gap.
const (
	pieceLow  = -1 // the b other values of gap i below the new value
	pieceHigh = -2 // the a_i - b above it
)

// chain derives the ops of a move: p+ with the new value in gap i, then
// the first drops entries dropped, oldest first.
func chain(plus pattern.Perm, i, drops int) []op {
	L := len(plus) - 1
	labels := make([]int, L+2)
	for t := range labels {
		switch {
		case t < i:
			labels[t] = t
		case t == i:
			labels[t] = pieceLow
		case t == i+1:
			labels[t] = pieceHigh
		default:
			labels[t] = t - 1
		}
	}
	if drops == 0 {
		return []op{splitOnly(labels, L+1)}
	}
	cur := plus
	var ops []op
	for k := range drops {
		r := cur[0] // dropping the value of rank r merges gaps r-1 and r
		cur = pattern.Standardize(cur[1:])
		if k == 0 {
			ops = append(ops, firstDrop(labels, L+1, r))
			continue
		}
		ops = append(ops, laterDrop(len(cur)+2, r))
	}
	return ops
}

// splitOnly is the op of a move that drops nothing: source coordinate t
// sits at its own destination gap, and the split gap is the sum of its
// two pieces.
func splitOnly(labels []int, srcParts int) op {
	o := op{src: make([][2]int, srcParts), off: make([]int, srcParts)}
	for t := range o.src {
		o.src[t] = [2]int{-1, -1}
	}
	for j, lab := range labels {
		o.addSource(sourceOf(lab, labels), j)
	}
	return o
}

// sourceOf returns the source coordinate a gap label stands for.
func sourceOf(lab int, labels []int) int {
	if lab >= 0 {
		return lab
	}
	for j, l := range labels {
		if l == pieceLow {
			return j // the split gap's source coordinate is its position i
		}
	}
	panic("transfer: no split gap")
}

func (o *op) addSource(t, j int) {
	if o.src[t][0] < 0 {
		o.src[t][0] = j
		return
	}
	o.src[t][1] = j
}

// firstDrop is the op of the first drop, fused with the split: the gaps
// of p+ (labels) lose gap r-1 and r to one merged gap of their sum plus
// one. The merged gap holds at least one whole source coordinate u (the
// two pieces are never merged: the new value lies between them); its
// other part is a source coordinate v or a piece of v = i. Summing over
// the ways to share the merged gap is one look-up in the running sums
// along (u, v), at a_u = merged - 1 and a_v = 0 or the other piece.
func firstDrop(labels []int, srcParts, r int) op {
	o := op{prefix: true, src: make([][2]int, srcParts), off: make([]int, srcParts)}
	for t := range o.src {
		o.src[t] = [2]int{-1, -1}
	}
	dest := func(j int) int { // destination gap of p+'s gap j
		if j < r {
			return j
		}
		return j - 1
	}
	lo, hi := labels[r-1], labels[r]
	split := sourceOf(pieceLow, labels)
	merged := r - 1
	switch {
	case lo >= 0 && hi >= 0:
		o.u, o.v = lo, hi
	case lo == pieceHigh && hi >= 0:
		o.u, o.v = hi, split
		o.src[split][0] = dest(indexOf(labels, pieceLow))
	case lo >= 0 && hi == pieceLow:
		o.u, o.v = lo, split
		o.src[split][0] = dest(indexOf(labels, pieceHigh))
	default:
		panic(fmt.Sprintf("transfer: drop of rank %d merges gaps labelled %d and %d", r, lo, hi))
	}
	o.src[o.u][0], o.off[o.u] = merged, -1
	for j, lab := range labels {
		if j == r-1 || j == r {
			continue
		}
		t := sourceOf(lab, labels)
		if t == o.u || t == o.v {
			continue
		}
		o.addSource(t, dest(j))
	}
	return o
}

func indexOf(labels []int, lab int) int {
	for j, l := range labels {
		if l == lab {
			return j
		}
	}
	panic("transfer: missing gap label")
}

// laterDrop is the op of a drop after the first: the source (an
// intermediate array with srcParts gaps) loses gaps r-1 and r to one gap
// of their sum plus one.
func laterDrop(srcParts, r int) op {
	o := op{prefix: true, u: r - 1, v: r, src: make([][2]int, srcParts), off: make([]int, srcParts)}
	for t := range o.src {
		switch {
		case t < r-1:
			o.src[t] = [2]int{t, -1}
		case t == r-1:
			o.src[t], o.off[t] = [2]int{r - 1, -1}, -1
		case t == r:
			o.src[t] = [2]int{-1, -1}
		default:
			o.src[t] = [2]int{t - 1, -1}
		}
	}
	return o
}
