package prob

import (
	"context"
	"fmt"
	"math/big"

	"avoidcert/pattern"
	"avoidcert/transfer"
)

// The layered iteration counts permutations by the number of windows that
// match the set. It is the prefix-state iteration (method note, section 8;
// docs/prefix-states.md) with one layer per occurrence count: after n
// values a permutation is in state p, the pattern of its longest suffix
// whose pattern is a proper prefix of a member (a state), with gaps
// a_0..a_|p| (how many other values lie below, between and above the
// suffix's values). A new value lands in gap r at split s (s of the a_r
// values of that gap below it); every suffix of the suffix-plus-new-value
// whose pattern is a member is a matching window that ends here, and the
// move goes up by that many layers instead of being refused. The new state
// is the longest suffix that is a state again; each value forgotten on the
// way merges the two gaps beside it, plus one for itself.
//
// Every window that matches ends at some value, and its first values form a
// suffix whose pattern is a proper prefix of a member, so a state no longer
// than the current one: all matches ending at the new value are among the
// suffixes checked. The code here is written on its own, directly from
// that definition, without the engine's running sums: a step costs one
// addition per coefficient, layer and landing place (Work), so it serves
// moderate N only.

// move is what happens to a state when the new value lands in gap r.
type move struct {
	to    int   // the new state
	hits  int   // matching windows that end at the new value
	drops []int // the forgotten values, oldest first: each one's rank (1-based) at the time it is forgotten
}

type layered struct {
	states []pattern.Perm
	moves  [][]move // moves[p][r], r = 0..len(states[p])
}

func newLayered(set pattern.Set) *layered {
	members := map[string]bool{}
	index := map[string]int{"": 0}
	l := &layered{states: []pattern.Perm{{}}}
	for _, m := range set.Patterns() {
		members[m.String()] = true
		for k := 1; k < len(m); k++ {
			p := pattern.Standardize(m[:k])
			if _, ok := index[p.String()]; !ok {
				index[p.String()] = len(l.states)
				l.states = append(l.states, p)
			}
		}
	}
	for _, p := range l.states {
		ms := make([]move, len(p)+1)
		for r := range ms {
			// the suffix with the new value: values above r move up by one
			seq := make([]int, 0, len(p)+1)
			for _, v := range p {
				if v > r {
					v++
				}
				seq = append(seq, v)
			}
			seq = append(seq, r+1)
			mv := move{to: -1}
			for start := 0; start <= len(seq); start++ { // start = len(seq): the empty suffix, always a state
				w := pattern.Standardize(seq[start:])
				if members[w.String()] {
					mv.hits++
				}
				if i, ok := index[w.String()]; ok && mv.to < 0 {
					mv.to = i
					rest := seq
					for range start {
						mv.drops = append(mv.drops, rest[0])
						rest = pattern.Standardize(rest[1:])
					}
				}
			}
			ms[r] = mv
		}
		l.moves = append(l.moves, ms)
	}
	return l
}

// OccurrenceWork returns the number of big-integer additions that
// Occurrences(set, N, J) makes, at most: every coefficient of every state
// at every n < N, times its J+1 layers and the n+1 places the new value can
// land.
func OccurrenceWork(set pattern.Set, N, J int) float64 {
	l := newLayered(set)
	w := 0.0
	for n := 0; n < N; n++ {
		for _, p := range l.states {
			if n >= len(p) {
				w += binomial(n, len(p)) * float64(n+1) * float64(J+1)
			}
		}
	}
	return w
}

// OccurrenceMemory estimates the bytes of the two iterates Occurrences
// holds at N: every coefficient and layer a big.Int of N!'s size.
func OccurrenceMemory(set pattern.Set, N, J int) float64 {
	l := newLayered(set)
	words := float64(factorial(N).BitLen()/64 + 1)
	c := 0.0
	for _, p := range l.states {
		if N >= len(p) {
			c += binomial(N, len(p))
		}
	}
	return 2 * c * float64(J+1) * (32 + 8*words)
}

// binomial is C(n, k) as a float, for estimates.
func binomial(n, k int) float64 {
	b := 1.0
	for i := 1; i <= k; i++ {
		b = b * float64(n-k+i) / float64(i)
	}
	return b
}

// Occurrences returns, for j = 0..J, the number of permutations of 1..N in
// which exactly j windows match a member of set (each window of each
// member's length counted once). Counts[0] is a_N. The set is the
// irredundant one of pattern.Set: a member that contains another was
// dropped, and its windows are not counted.
func Occurrences(ctx context.Context, set pattern.Set, N, J int) ([]*big.Int, error) {
	if N < 0 || J < 0 {
		return nil, fmt.Errorf("prob: occurrences need N >= 0 and J >= 0, not N = %d, J = %d", N, J)
	}
	l := newLayered(set)
	layers := J + 1
	ix := make([]*transfer.Indexer, len(l.states))
	for p, s := range l.states {
		ix[p] = transfer.NewIndexer(len(s), N+1)
	}
	// cur[p][rank*layers+j]: permutations in state p with gaps of that rank
	// and j matches so far.
	cur := make([][]big.Int, len(l.states))
	cur[0] = make([]big.Int, layers)
	cur[0][0].SetInt64(1)
	for n := 0; n < N; n++ {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		next := make([][]big.Int, len(l.states))
		for q, s := range l.states {
			next[q] = make([]big.Int, ix[q].Count(n+1-len(s))*layers)
		}
		for p, s := range l.states {
			if n < len(s) {
				continue
			}
			l.step(cur[p], n-len(s), ix[p], l.moves[p], ix, next, layers)
		}
		cur = next
	}
	out := make([]*big.Int, layers)
	for j := range out {
		out[j] = new(big.Int)
	}
	for _, c := range cur {
		for i := range c {
			out[i%layers].Add(out[i%layers], &c[i])
		}
	}
	return out, nil
}

// step adds the moves of one state's coefficients (gaps summing to D) into
// next.
func (l *layered) step(src []big.Int, D int, from *transfer.Indexer, moves []move, ix []*transfer.Indexer, next [][]big.Int, layers int) {
	m := len(moves) - 1 // the state's length
	a := make([]int, m+1)
	b := make([]int, 0, m+2)
	from.Unrank(D, 0, a)
	for rank := 0; ; rank++ {
		row := src[rank*layers : (rank+1)*layers]
		if nonZero(row) {
			for r, mv := range moves {
				for s := 0; s <= a[r]; s++ {
					b = append(b[:0], a[:r]...)
					b = append(b, s, a[r]-s)
					b = append(b, a[r+1:]...)
					for _, v := range mv.drops {
						// value v sits between gaps v-1 and v: it joins them
						b[v-1] += b[v] + 1
						b = append(b[:v], b[v+1:]...)
					}
					dst := next[mv.to][ix[mv.to].Rank(b)*layers:]
					for j := 0; j+mv.hits < layers; j++ {
						if row[j].Sign() != 0 {
							dst[j+mv.hits].Add(&dst[j+mv.hits], &row[j])
						}
					}
				}
			}
		}
		if !from.Next(a) {
			return
		}
	}
}

func nonZero(row []big.Int) bool {
	for i := range row {
		if row[i].Sign() != 0 {
			return true
		}
	}
	return false
}

// MaxOccurrenceWork is the largest OccurrenceWork that the command line
// accepts: about ten seconds on one core (docs/benchmarks.md: 123 at
// N = 150, J = 3, 2.5e8 additions in 4.7 s on the shared 2-core machine).
const MaxOccurrenceWork = 5e8
