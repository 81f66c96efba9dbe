package structure

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"avoidcert/pattern"
)

// The configuration space (docs/prefix-states.md, "Joint configurations").
//
// A configuration (s, c, o, w) is stored as one integer: configurations
// are grouped in pair blocks, one per start state s, current state c and
// overlap o whose o shared values can exist (the last o entries of s and
// the first o of c have one pattern), and numbered densely inside a block
// by which of its |s|+|c|-o values (in increasing order) are start values:
// a mask of |s| ones among |s|+|c|-o bits, ranked in the colexicographic
// order of its ones. That mask and the block fix w: the start values take
// their ranks in the order of s, and the current values that are not start
// values in the order of the last |c|-o entries of c. So every R_k is a
// bitset over the space, and a step is a table look-up per configuration
// and gap, the table filled the first time a configuration is reached.

// maxValues bounds the values of a configuration: two states of at most
// pattern.MaxLength-1 values each.
const maxValues = 2 * (pattern.MaxLength - 1)

// noTarget marks a gap whose move is forbidden or leaves the recurrent
// states; unfilled marks a table entry not computed yet.
const (
	noTarget = -1
	unfilled = math.MinInt32
)

// pairBlock holds the configurations of one start state, current state
// and overlap.
type pairBlock struct {
	s, c, o int
	values  int   // |s| + |c| - o
	base    int   // the index of its first configuration
	size    int   // C(values, |s|)
	fresh   []int // std of the last |c|-o entries of c, 0-based: the order of the current values that are not start values
	// next[local*(values+1)+g] is the configuration reached with the new
	// value in gap g (above exactly g of the values), noTarget, or
	// unfilled; nil until a configuration of the block is reached.
	next []int32
}

// space is the configuration space of a set's recurrent states. It is
// used by one goroutine at a time (it fills its tables lazily).
type space struct {
	d       *stateDigraph
	perm    [][]int // per state, its pattern
	rec     []int   // the recurrent states, increasing
	recPos  []int   // state -> its position in rec, or -1
	maxL    int     // M, the longest state's length
	blocks  []pairBlock
	blockAt []int32 // (recPos[s]*len(rec) + recPos[c])*(maxL+1) + o -> block, or -1
	size    int     // configurations in all blocks
	domain  bitset  // the configurations with o = 0: the domain D
	binom   [maxValues + 2][maxValues + 2]int
}

// eachBlock calls f with the start state, current state, overlap, number
// of values and size of every pair block, in block order (start state,
// current state, overlap).
func eachBlock(perm [][]int, rec []int, binom *[maxValues + 2][maxValues + 2]int, f func(s, c, o, values, size int)) {
	for _, s := range rec {
		for _, c := range rec {
			ls, lc := len(perm[s]), len(perm[c])
			for o := 0; o <= min(ls, lc); o++ {
				if o > 0 && !sameOrder(perm[s][ls-o:], perm[c][:o]) {
					continue
				}
				v := ls + lc - o
				f(s, c, o, v, binom[v][ls])
			}
		}
	}
}

func binomials() *[maxValues + 2][maxValues + 2]int {
	var b [maxValues + 2][maxValues + 2]int
	for n := range b {
		b[n][0] = 1
		for k := 1; k <= n; k++ {
			b[n][k] = b[n-1][k-1] + b[n-1][k]
		}
	}
	return &b
}

// sameOrder reports whether two sequences of distinct numbers of one
// length have the same pattern.
func sameOrder(a, b []int) bool {
	for i := range a {
		for j := i + 1; j < len(a); j++ {
			if (a[i] < a[j]) != (b[i] < b[j]) {
				return false
			}
		}
	}
	return true
}

func newSpace(d *stateDigraph) *space {
	st := d.st
	sp := &space{d: d, maxL: st.MaxLength(), rec: marked(d.recurrent), recPos: make([]int, st.Len())}
	sp.binom = *binomials()
	for p := range st.Len() {
		sp.perm = append(sp.perm, st.Perm(p))
		sp.recPos[p] = -1
	}
	for i, p := range sp.rec {
		sp.recPos[p] = i
	}
	nr := len(sp.rec)
	sp.blockAt = make([]int32, nr*nr*(sp.maxL+1))
	for i := range sp.blockAt {
		sp.blockAt[i] = -1
	}
	eachBlock(sp.perm, sp.rec, &sp.binom, func(s, c, o, values, size int) {
		sp.blockAt[sp.key(s, c, o)] = int32(len(sp.blocks))
		fresh := pattern.Standardize(sp.perm[c][o:])
		for i := range fresh {
			fresh[i]--
		}
		sp.blocks = append(sp.blocks, pairBlock{s: s, c: c, o: o, values: values, base: sp.size, size: size, fresh: fresh})
		sp.size += size
	})
	sp.domain = newBitset(sp.size)
	for _, b := range sp.blocks {
		if b.o == 0 {
			for i := range b.size {
				sp.domain.set(b.base + i)
			}
		}
	}
	return sp
}

func (sp *space) key(s, c, o int) int {
	return (sp.recPos[s]*len(sp.rec)+sp.recPos[c])*(sp.maxL+1) + o
}

// block returns the block of configuration r.
func (sp *space) block(r int) *pairBlock {
	i := sort.Search(len(sp.blocks), func(i int) bool { return sp.blocks[i].base > r }) - 1
	return &sp.blocks[i]
}

// start returns the configuration (s, s, |s|, s) of R_0.
func (sp *space) start(s int) int {
	return sp.blocks[sp.blockAt[sp.key(s, s, len(sp.perm[s]))]].base
}

// config is a decoded configuration: the values 0..values-1 of its start
// values x and current values y, each in position order (the first o
// entries of y are the last o of x).
type config struct {
	s, c, o int
	x, y    []int
}

// decode returns configuration r with its values.
func (sp *space) decode(r int) config {
	b := sp.block(r)
	var x, y, starts [maxValues / 2]int
	nx, ny := sp.decodeInto(b, r, &x, &y, &starts)
	return config{s: b.s, c: b.c, o: b.o, x: append([]int(nil), x[:nx]...), y: append([]int(nil), y[:ny]...)}
}

// decodeInto writes the values of configuration r of block b into x and
// y (position order) and its start values in increasing order into
// starts, and returns |s| and |c|.
func (sp *space) decodeInto(b *pairBlock, r int, x, y, starts *[maxValues / 2]int) (ls, lc int) {
	ls, lc = len(sp.perm[b.s]), len(sp.perm[b.c])
	var isStart [maxValues]bool
	sp.unrankMask(r-b.base, b.values, ls, isStart[:])
	var others [maxValues]int
	nx, no := 0, 0
	for v := range b.values {
		if isStart[v] {
			starts[nx] = v
			nx++
		} else {
			others[no] = v
			no++
		}
	}
	for i, rank := range sp.perm[b.s] {
		x[i] = starts[rank-1]
	}
	copy(y[:b.o], x[ls-b.o:ls])
	for i, rank := range b.fresh {
		y[b.o+i] = others[rank]
	}
	return ls, lc
}

// unrankMask sets isStart[v] for the ones of the mask of the given rank
// (ones ones among values bits, colexicographic order).
func (sp *space) unrankMask(rank, values, ones int, isStart []bool) {
	for j := ones; j >= 1; j-- {
		p := j - 1
		for p+1 < values && sp.binom[p+1][j] <= rank {
			p++
		}
		rank -= sp.binom[p][j]
		isStart[p] = true
	}
}

// targets returns the row of configuration r of block b: per gap g =
// 0..values, the configuration reached with the new value above exactly g
// of r's values, or noTarget. The row is filled the first time it is asked
// for and is shared: callers must not modify it.
func (sp *space) targets(b *pairBlock, r int) []int32 {
	if b.next == nil {
		b.next = make([]int32, b.size*(b.values+1))
		for i := range b.next {
			b.next[i] = unfilled
		}
	}
	row := b.next[(r-b.base)*(b.values+1):][:b.values+1]
	if row[0] == unfilled {
		sp.fill(b, r, row)
	}
	return row
}

// fill computes the row of configuration r (docs/prefix-states.md, "One
// step R_k -> R_(k+1)"): the new value z in gap g lies above i of the
// current values; the move of the current state at gap i, when allowed
// and into a recurrent state, drops the oldest values of y + (z); the
// start values all stay.
//
// The new configuration's mask ranks the start values among the values
// kept: the j-th smallest start value x_(j) (j = 1..|s|) has below it the
// j-1 smaller start values, the kept current values that are not start
// values and lie below it, and z when g <= x_(j); its colexicographic rank
// is the sum over j of C(that count, j). The kept current values depend
// only on the move, so they are counted once per move, not per gap.
func (sp *space) fill(b *pairBlock, r int, row []int32) {
	var x, y, starts [maxValues / 2]int
	ls, lc := sp.decodeInto(b, r, &x, &y, &starts)
	sorted := y
	slices.Sort(sorted[:lc])
	var keptBelow [maxValues / 2]int
	base, below, counted := 0, 0, -1
	for g := range row {
		for below < lc && sorted[below] < g {
			below++
		}
		mv := sp.d.next[b.c][below]
		if mv.to < 0 || !sp.d.recurrent[mv.to] {
			row[g] = noTarget
			continue
		}
		if counted != below {
			counted = below
			// Kept: y + (z) without its first mv.drops entries; of those,
			// the first max(0, o - drops) are start values.
			from := max(b.o, mv.drops)
			for j := range ls {
				keptBelow[j] = 0
				for _, v := range y[from:lc] {
					if v < starts[j] {
						keptBelow[j]++
					}
				}
			}
			o := max(0, b.o-mv.drops)
			bi := sp.blockAt[sp.key(b.s, mv.to, o)]
			if bi < 0 || sp.blocks[bi].values != ls+lc-from+1 {
				panic(fmt.Sprintf("structure: configuration %d gap %d reaches no block (%d, %d, %d)", r, g, b.s, mv.to, o))
			}
			base = sp.blocks[bi].base
		}
		rank := 0
		for j := range ls {
			pos := j + keptBelow[j]
			if g <= starts[j] {
				pos++
			}
			rank += sp.binom[pos][j+1]
		}
		row[g] = int32(base + rank)
	}
}

// describe writes configuration r as its joint order: the start values
// in position order, a bar, the current values in position order (values
// 1..|s|+|c|-o; a shared value appears on both sides; with ten values or
// more, entries are separated by dots).
func (sp *space) describe(r int) string {
	cf := sp.decode(r)
	sep := ""
	if sp.block(r).values >= 10 {
		sep = "."
	}
	return joinValues(cf.x, sep) + "|" + joinValues(cf.y, sep)
}

func joinValues(vs []int, sep string) string {
	parts := make([]string, len(vs))
	for i, v := range vs {
		parts[i] = strconv.Itoa(v + 1)
	}
	return strings.Join(parts, sep)
}
