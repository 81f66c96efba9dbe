package certify

import (
	"fmt"
	"hash/maphash"
	"strings"
)

// Joint configurations (docs/prefix-states.md, "Joint configurations"),
// each written out as the values themselves: where a sequence started
// (state s with start values x), where it is now (state c with current
// values y), and how x and y interleave. The sets R_k are plain maps of
// them.

// maxValues is the most values a configuration holds: a start state and
// a current state of at most MaxPatternLength - 1 values each.
const maxValues = 2 * (MaxPatternLength - 1)

// config is a joint configuration (s, c, o, w): start state s, current
// state c, overlap o (the first o current values are the last o start
// values), and w, the pattern of the start values followed by the current
// values that are not start values, in w[:n] with n = |s| + |c| - o. It is
// a fixed-size value, so that maps of it need no allocation per member.
type config struct {
	s, c int32
	o, n uint8
	w    [maxValues]uint8
}

// values returns the ranks of w as ints, scaled by the given factor, so
// that new values can be placed between them.
func (cf config) values(scale int) []int {
	out := make([]int, cf.n)
	for i := range out {
		out[i] = scale * int(cf.w[i])
	}
	return out
}

// configOf makes the configuration of start state s with start values x
// and current state c whose current values that are not start values are
// fresh (o is the overlap): w is the pattern of x followed by fresh.
func configOf(s, c, o int, x, fresh []int) config {
	cf := config{s: int32(s), c: int32(c), o: uint8(o), n: uint8(len(x) + len(fresh))}
	var buf [maxValues]int
	all := append(append(buf[:0], x...), fresh...)
	for i, v := range all {
		rank := 1
		for _, u := range all {
			if u < v {
				rank++
			}
		}
		cf.w[i] = uint8(rank)
	}
	return cf
}

// configSet is a set R_k, or the domain D. sum is the sum of the members'
// hashes, which differs between sets that differ by one member or more
// with overwhelming likelihood and is the same for equal sets: sets whose
// sums differ are unequal, and sets whose sums agree are compared member
// by member.
type configSet struct {
	members map[config]struct{}
	sum     uint64
}

var configSeed = maphash.MakeSeed()

func newConfigSet() *configSet { return &configSet{members: map[config]struct{}{}} }

func (cs *configSet) add(cf config) {
	if _, dup := cs.members[cf]; !dup {
		cs.members[cf] = struct{}{}
		cs.sum += maphash.Comparable(configSeed, cf)
	}
}

func (cs *configSet) has(cf config) bool {
	_, ok := cs.members[cf]
	return ok
}

func (cs *configSet) equal(other *configSet) bool {
	if len(cs.members) != len(other.members) || cs.sum != other.sum {
		return false
	}
	for cf := range cs.members {
		if !other.has(cf) {
			return false
		}
	}
	return true
}

// least returns the least member of cs (in the order of compareConfigs)
// for which keep is true, so that messages do not depend on map order; ok
// is false when there is none.
func (cs *configSet) least(keep func(config) bool) (cf config, ok bool) {
	for m := range cs.members {
		if keep(m) && (!ok || compareConfigs(m, cf) < 0) {
			cf, ok = m, true
		}
	}
	return cf, ok
}

// compareConfigs orders configurations by s, c, o, then w.
func compareConfigs(a, b config) int {
	switch {
	case a.s != b.s:
		return int(a.s) - int(b.s)
	case a.c != b.c:
		return int(a.c) - int(b.c)
	case a.o != b.o:
		return int(a.o) - int(b.o)
	}
	return strings.Compare(string(a.w[:a.n]), string(b.w[:b.n]))
}

// jointSystem computes the sets R_k of a set's recurrent states.
type jointSystem struct {
	sp        *stateSpace
	recurrent []int
	isRec     []bool
	longest   int // w, the length of the longest member
}

func newJointSystem(sp *stateSpace, recurrent []int) *jointSystem {
	j := &jointSystem{sp: sp, recurrent: recurrent, isRec: make([]bool, len(sp.states)), longest: sp.set.longest()}
	for _, p := range recurrent {
		j.isRec[p] = true
	}
	return j
}

func (j *jointSystem) size(state int32) int { return len(j.sp.states[state]) }

// first returns R_0: every recurrent state s, started and not yet moved,
// (s, s, |s|, s).
func (j *jointSystem) first() *configSet {
	r := newConfigSet()
	for _, s := range j.recurrent {
		x := j.sp.states[s]
		r.add(configOf(s, s, len(x), x, nil))
	}
	return r
}

// domain returns D: for every ordered pair (s, c) of recurrent states,
// every way to interleave |s| start values with |c| current values, none
// shared: the start values take the ranks of a subset of 1..|s|+|c| in
// the order of s, and the current values the other ranks in the order of
// c.
func (j *jointSystem) domain() *configSet {
	d := newConfigSet()
	for _, s := range j.recurrent {
		for _, c := range j.recurrent {
			ps, pc := j.sp.states[s], j.sp.states[c]
			eachSubset(len(ps)+len(pc), len(ps), func(chosen, rest []int) {
				x, y := make([]int, len(ps)), make([]int, len(pc))
				for i, r := range ps {
					x[i] = chosen[r-1]
				}
				for i, r := range pc {
					y[i] = rest[r-1]
				}
				d.add(configOf(s, c, 0, x, y))
			})
		}
	}
	return d
}

// eachSubset calls f with every subset of size k of 1..n, increasing, and
// its complement, increasing.
func eachSubset(n, k int, f func(chosen, rest []int)) {
	chosen := make([]int, 0, k)
	var pick func(next int)
	pick = func(next int) {
		if len(chosen) == k {
			rest := make([]int, 0, n-k)
			for v, i := 1, 0; v <= n; v++ {
				if i < k && chosen[i] == v {
					i++
				} else {
					rest = append(rest, v)
				}
			}
			f(chosen, rest)
			return
		}
		for v := next; v <= n-(k-len(chosen))+1; v++ {
			chosen = append(chosen, v)
			pick(v + 1)
			chosen = chosen[:len(chosen)-1]
		}
	}
	pick(1)
}

// startAndCurrent returns the start values x and the current values y of
// a configuration, each value scaled by the given factor.
func (j *jointSystem) startAndCurrent(cf config, scale int) (x, y []int) {
	all := cf.values(scale)
	ls := j.size(cf.s)
	x = all[:ls]
	y = append(append(make([]int, 0, maxValues+1), x[ls-int(cf.o):]...), all[ls:]...)
	return x, y
}

// next adds to out every configuration one move after cf: the new value z
// in each gap g of the values (values scaled by 2, so z = 2g+1 lies above
// exactly g of them); the move of the current state at the gap of z among
// y, when it is allowed and its target recurrent; the oldest drops values
// of y and z dropped, start values among them staying start values.
func (j *jointSystem) next(cf config, out *configSet) {
	x, y := j.startAndCurrent(cf, 2)
	grown := make([]int, 0, len(y)+1)
	for g := 0; g <= int(cf.n); g++ {
		z := 2*g + 1
		below := 0
		for _, v := range y {
			if v < z {
				below++
			}
		}
		mv := j.sp.moves[cf.c][below]
		if !mv.allowed || !j.isRec[mv.to] {
			continue
		}
		drops := len(mv.drops)
		kept := append(append(grown[:0], y...), z)[drops:]
		o := max(0, int(cf.o)-drops)
		out.add(configOf(int(cf.s), mv.to, o, x, kept[o:]))
	}
}

// closable reports whether, from the current state with values y, the
// copies x'_1 .. x'_|s| of the start values, each put just above its
// x_i, can be appended by allowed moves ending in the start state s with
// exactly the values x' (docs/prefix-states.md, "closable
// configurations"). Values are scaled by 2, so x'_i = x_i + 1 lies above
// x_i and below every other value above it (the copies are odd, the
// values even).
func (j *jointSystem) closable(cf config) bool {
	x, y := j.startAndCurrent(cf, 2)
	state, held := int(cf.c), y
	for _, xi := range x {
		z := xi + 1
		below := 0
		for _, v := range held {
			if v < z {
				below++
			}
		}
		mv := j.sp.moves[state][below]
		if !mv.allowed {
			return false
		}
		held = append(held[:len(held):len(held)], z)[len(mv.drops):]
		state = mv.to
	}
	return state == int(cf.s)
}

// describe writes a configuration in one line for messages.
func (j *jointSystem) describe(cf config) string {
	return fmt.Sprintf("(start %s, current %s, overlap %d, order %s)", stateName(j.sp.states[cf.s]), stateName(j.sp.states[cf.c]), cf.o, formatPerm(cf.values(1)))
}

// stateName writes a state as its pattern, () for the empty one.
func stateName(p perm) string {
	if len(p) == 0 {
		return "()"
	}
	return p.String()
}
