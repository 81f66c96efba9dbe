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
		// the first dropped value, of rank r among the L+1 values after
		// the insertion (the new value has rank gap+1 and is never dropped)
		var t *table
		switch r, i := mv.drops[0], mv.gap; {
		case r == i:
			t = sys.bin.insertMerge(sc, src, i, -1, words)
		case r == i+2:
			t = sys.bin.insertMerge(sc, src, i, +1, words)
		case r < i: // merge a_(r-1) and a_r first; gap i is then gap i-1
			merged := sys.bin.merge(sc, src, r-1, words)
			t = sc.table(sys.bin, merged.parts+1, merged.degree, words)
			sys.bin.spreadAdd(t, merged, i-1)
			sc.release(merged)
		default: // r > i+2: a_(r-2) and a_(r-1)
			merged := sys.bin.merge(sc, src, r-2, words)
			t = sc.table(sys.bin, merged.parts+1, merged.degree, words)
			sys.bin.spreadAdd(t, merged, i)
			sc.release(merged)
		}
		for _, r := range mv.drops[1:] {
			merged := sys.bin.merge(sc, t, r-1, words)
			sc.release(t)
			t = merged
		}
		// one pass over the flat words (t and dst have one width): no
		// coefficient overflows it (wordsFor), so no carry crosses into
		// the next one
		addWords(dst.w, t.w)
		sc.release(t)
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

// iterateHeader starts the digest stream of format version 3.
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
