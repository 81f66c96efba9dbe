package certify

import (
	"context"
	"crypto/sha256"
	"encoding/binary"
	"math/big"
	"runtime"
)

// This file computes the iterates G_n on prefix states (docs/prefix-states.md)
// with the checker's own code. One step pulls, for every state q of the
// system, the moves (p, gap) that lead to q and adds what each move makes
// of G_n[p]: the new value spread over the splits of its gap, and the
// dropped values merged away (table.go). Running sums make every entry of
// a move cost O(1); the states are shared out among goroutines, each
// writing only its own states' tables.

// system is the whole system or a restricted one (docs/prefix-states.md,
// "Systems").
type system struct {
	sp      *stateSpace
	bin     binomials
	in      []bool     // per state: part of the system
	inbound [][]inMove // per state q: the moves of the system that lead to q
	scratch []scratch  // per goroutine of eachState
}

type inMove struct {
	from, gap int
	drops     []int
}

// iterate is G_n of a system: one table per state, nil for a state outside
// the system or longer than n.
type iterate struct {
	n      int
	tables []*table
}

// newSystem builds the system on the given states (nil: the whole system).
// maxN bounds the n that will be reached.
func newSystem(sp *stateSpace, states []int, maxN int) *system {
	sys := &system{sp: sp, bin: newBinomials(maxN + 2*MaxPatternLength + 2), in: make([]bool, len(sp.states)),
		inbound: make([][]inMove, len(sp.states)), scratch: make([]scratch, runtime.GOMAXPROCS(0))}
	if states == nil {
		for p := range sys.in {
			sys.in[p] = true
		}
	}
	for _, p := range states {
		sys.in[p] = true
	}
	for p, moves := range sp.moves {
		for gap, mv := range moves {
			if mv.allowed && sys.in[p] && sys.in[mv.to] {
				sys.inbound[mv.to] = append(sys.inbound[mv.to], inMove{from: p, gap: gap, drops: mv.drops})
			}
		}
	}
	return sys
}

// emptyStart returns the whole system's G_0: 1 on the empty state.
func (sys *system) emptyStart() *iterate {
	g := &iterate{n: 0, tables: make([]*table, len(sys.in))}
	g.tables[0] = sys.bin.newTable(1, 0, wordsFor(0))
	g.tables[0].at(0)[0] = 1
	return g
}

// onesStart returns G_n = 1 on every coefficient of every state of the
// system (n at least every state's length).
func (sys *system) onesStart(n int) *iterate {
	g := &iterate{n: n, tables: make([]*table, len(sys.in))}
	for p, ok := range sys.in {
		if ok {
			t := sys.bin.newTable(len(sys.sp.states[p])+1, n-len(sys.sp.states[p]), wordsFor(n))
			for r := range t.size() {
				t.at(r)[0] = 1
			}
			g.tables[p] = t
		}
	}
	return g
}

// restrict returns the part of g (an iterate of the whole system) on the
// states of sys; the tables are shared, and iterates are never modified.
func (sys *system) restrict(g *iterate) *iterate {
	out := &iterate{n: g.n, tables: make([]*table, len(sys.in))}
	for p, ok := range sys.in {
		if ok {
			out.tables[p] = g.tables[p]
		}
	}
	return out
}

// next returns G_(n+1) from g = G_n. It keeps g. The states run on up to
// GOMAXPROCS goroutines, each writing only its own state's table; ctx
// stops it between states.
func (sys *system) next(ctx context.Context, g *iterate) (*iterate, error) {
	out := &iterate{n: g.n + 1, tables: make([]*table, len(sys.in))}
	err := eachState(ctx, len(sys.scratch), len(sys.in), func(worker, q int) error {
		out.tables[q] = sys.pull(&sys.scratch[worker], g, q)
		return nil
	})
	if err != nil {
		return nil, err
	}
	return out, nil
}

// pull computes G_(n+1)[q] from the moves into q, with sc for its
// temporary tables.
func (sys *system) pull(sc *scratch, g *iterate, q int) *table {
	L := len(sys.sp.states[q])
	if !sys.in[q] || L > g.n+1 {
		return nil
	}
	words := wordsFor(g.n + 1)
	dst := sys.bin.newTable(L+1, g.n+1-L, words)
	var diff []uint64 // moves into a one-value state that drop old values
	for _, mv := range sys.inbound[q] {
		src := g.tables[mv.from]
		if src == nil {
			continue
		}
		if len(mv.drops) == 0 {
			sys.bin.spreadAdd(dst, src, mv.gap)
			continue
		}
		if L == 1 { // every old value is dropped: a range of dst per entry
			if diff == nil {
				diff = sc.words((dst.size() + 1) * words)
			}
			pushToOne(diff, words, src, mv.gap)
			continue
		}
		sys.dropMove(sc, dst, src, mv.gap, mv.drops)
	}
	if diff != nil {
		run := make([]uint64, words)
		for x := range dst.size() {
			addWords(run, diff[x*words:(x+1)*words]) // modulo 2^(64 words)
			addWords(dst.at(x), run)
		}
		sc.releaseWords(diff)
	}
	return dst
}

// dropMove adds into dst what a move that drops old values makes of src
// (the table of its source state, L values): the new value goes into gap
// i and the drops merge runs of gaps. Dropping is associative, so the
// runs of src's gaps that end up in one gap of dst away from the new value
// are merged first, in src (each merge a pass that shrinks the table), and
// so are the runs that join the gap just below the new value (X) or just
// above it (Y). Then the new value goes in: a spread, or a running sum
// along the line where X or Y meets its piece of gap i (insertMergeAdd),
// and where both do, one running sum into a temporary table and one merge.
func (sys *system) dropMove(sc *scratch, dst, src *table, i int, drops []int) {
	L := src.parts - 1
	// the final gaps as runs of the gaps c_0..c_(L+1) after the insertion
	// (c_i and c_(i+1) are the two pieces of gap i)
	runs := make([][2]int, L+2)
	for t := range runs {
		runs[t] = [2]int{t, t}
	}
	for _, r := range drops { // dropping the value of rank r joins runs r-1 and r
		runs[r-1][1] = runs[r][1]
		runs = append(runs[:r], runs[r+1:]...)
	}
	toA := func(t int) int { // the gap of src a c-gap other than c_i, c_(i+1) is
		if t > i {
			return t - 1
		}
		return t
	}
	var groups [][2]int // runs of src's gaps to merge, increasing
	below, above := false, false
	for _, run := range runs {
		lo, hi := run[0], run[1]
		switch {
		case lo <= i && i <= hi: // ends with c_i: a_lo..a_(i-1) become X
			below = lo < i
			hi = i - 1
		case lo <= i+1 && i+1 <= hi: // starts with c_(i+1): a_(i+1)..a_(hi-1) become Y
			above = hi > i+1
			lo, hi = i+1, hi-1
		default:
			lo, hi = toA(lo), toA(hi)
		}
		if hi > lo {
			groups = append(groups, [2]int{lo, hi})
		}
	}
	words := dst.words
	t, gap := src, i
	for g := len(groups) - 1; g >= 0; g-- { // from the right, so lower indices stay
		lo, hi := groups[g][0], groups[g][1]
		for range hi - lo {
			merged := sys.bin.merge(sc, t, lo, words)
			if t != src {
				sc.release(t)
			}
			t = merged
		}
		if hi < i {
			gap -= hi - lo
		}
	}
	switch {
	case below && above:
		tmp := sc.table(sys.bin, t.parts, t.degree+1, words)
		sys.bin.insertMergeAdd(tmp, t, gap, -1) // (.., X+b+1, a_i-b, Y, ..)
		joined := sys.bin.merge(sc, tmp, gap, words)
		sc.release(tmp)
		// one pass over the flat words (joined and dst have one width): no
		// coefficient overflows it (wordsFor), so no carry crosses into
		// the next one
		addWords(dst.w, joined.w)
		sc.release(joined)
	case below:
		sys.bin.insertMergeAdd(dst, t, gap, -1)
	case above:
		sys.bin.insertMergeAdd(dst, t, gap, +1)
	default:
		sys.bin.spreadAdd(dst, t, gap)
	}
	if t != src {
		sc.release(t)
	}
}

// sum returns the sum of every coefficient of g.
func (g *iterate) sum() *big.Int {
	s := new(big.Int)
	for _, t := range g.tables {
		if t != nil {
			total := make([]uint64, t.words)
			for r := range t.size() {
				addWords(total, t.at(r))
			}
			s.Add(s, toBig(total))
		}
	}
	return s
}

// isZero reports whether every coefficient of g is 0.
func (g *iterate) isZero() bool {
	for _, t := range g.tables {
		if t != nil && !isZeroWords(t.w) {
			return false
		}
	}
	return true
}

// iterateHeader starts the digest stream (its name from format version 3;
// version 4 keeps it).
const iterateHeader = "avoidcert-iterate-v3\n"

// digest returns the SHA-256 of g's byte stream: the header,
// uvarint(number of states), uvarint(n), then for every state in state
// order (all states of the set) and every composition in lexicographic
// order, uvarint(len(b)) and b, the big-endian bytes of the coefficient
// (states outside the system count as zeros; a state longer than n has no
// compositions).
func (sys *system) digest(g *iterate) [32]byte {
	h := sha256.New()
	var buf []byte
	buf = append(buf, iterateHeader...)
	buf = binary.AppendUvarint(buf, uint64(len(sys.sp.states)))
	buf = binary.AppendUvarint(buf, uint64(g.n))
	var word []byte
	for p, state := range sys.sp.states {
		if len(state) > g.n {
			continue
		}
		if g.tables[p] == nil {
			for range sys.bin.count(len(state)+1, g.n-len(state)) {
				buf = append(buf, 0)
			}
		} else {
			t := g.tables[p]
			for r := range t.size() {
				word = appendBytes(word[:0], t.at(r))
				buf = binary.AppendUvarint(buf, uint64(len(word)))
				buf = append(buf, word...)
				if len(buf) > 1<<16 {
					h.Write(buf)
					buf = buf[:0]
				}
			}
		}
		if len(buf) > 1<<16 {
			h.Write(buf)
			buf = buf[:0]
		}
	}
	h.Write(buf)
	var sum [32]byte
	h.Sum(sum[:0])
	return sum
}
