package certify

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// The checker's own permutations and pattern sets. Nothing here is taken
// from the engine's packages: the tests compare the results with them.

// MaxPatternLength is the longest pattern a certificate may name: its
// entries are the digits 1..9, and its prefix states (at most
// 0! + .. + 8! = MaxStates) hold at most 8 values.
const MaxPatternLength = 9

// perm is a permutation of 1..len(p).
type perm []int

// String writes p in its one spelling: digits for at most 9 entries
// ("1342"), entries separated by dots for more ("1.10.2.3.4.5.6.7.8.9").
func (p perm) String() string { return formatPerm(p) }

// std returns the pattern of a sequence of distinct numbers: the
// permutation of 1..len(x) in the same relative order.
func std(x []int) perm {
	out := make(perm, len(x))
	for i, v := range x {
		out[i] = 1
		for _, u := range x {
			if u < v {
				out[i]++
			}
		}
	}
	return out
}

// sameOrder reports whether x and y (equal lengths, distinct entries each)
// are order-isomorphic.
func sameOrder(x, y []int) bool {
	if len(x) != len(y) {
		return false
	}
	for i := range x {
		for j := i + 1; j < len(x); j++ {
			if (x[i] < x[j]) != (y[i] < y[j]) {
				return false
			}
		}
	}
	return true
}

// occursIn reports whether p occurs consecutively in x: some len(p)
// adjacent entries of x are order-isomorphic to p.
func occursIn(p perm, x []int) bool {
	for i := 0; i+len(p) <= len(x); i++ {
		if sameOrder(p, x[i:i+len(p)]) {
			return true
		}
	}
	return false
}

// permLess orders permutations by length, then lexicographically.
func permLess(p, q perm) int {
	if len(p) != len(q) {
		return len(p) - len(q)
	}
	return slices.Compare(p, q)
}

// parseToken reads one pattern as given: digits ("1342") or entries
// separated by dots ("1.3.4.2"), each value of 1..k used once, k at most
// MaxPatternLength. Entries may carry leading zeros, as the command line
// accepts them; the set's spelling (patternSet.strings) has none.
func parseToken(tok string) (perm, error) {
	fail := func(format string, args ...any) (perm, error) {
		return nil, fmt.Errorf("pattern %q: %s", abbreviate(tok), fmt.Sprintf(format, args...))
	}
	if tok == "" {
		return fail("empty; write a permutation of 1..k such as 132")
	}
	var entries []string
	if strings.Contains(tok, ".") {
		entries = strings.Split(tok, ".")
	} else {
		entries = strings.Split(tok, "")
	}
	if len(entries) > MaxPatternLength {
		return fail("length %d is over the limit of %d", len(entries), MaxPatternLength)
	}
	p := make(perm, 0, len(entries))
	for _, e := range entries {
		if e == "" {
			return fail("empty entry between dots; write entries like 1.3.4.2")
		}
		if strings.Trim(e, "0123456789") != "" {
			return fail("%q is not a number; write a permutation of 1..k such as 132 or 1.3.2", abbreviate(e))
		}
		v, err := strconv.Atoi(e)
		if err != nil || v < 1 || v > len(entries) {
			return fail("entry %q is outside 1..%d", abbreviate(e), len(entries))
		}
		if slices.Contains(p, v) {
			return fail("value %d repeats; a pattern uses each of 1..%d once", v, len(entries))
		}
		p = append(p, v)
	}
	return p, nil
}

// patternSet is an irredundant set: no duplicates, no member containing
// another consecutively; sorted shorter first, then lexicographically.
type patternSet []perm

// irredundant makes the set of the given patterns: sorted, duplicates
// removed, and every pattern dropped that contains a shorter member
// consecutively (a permutation avoiding the shorter one avoids it too).
// The members kept are looked up by key, window by window, so that ten
// thousand patterns take a fraction of a second.
func irredundant(ps []perm) patternSet {
	sorted := slices.Clone(ps)
	slices.SortFunc(sorted, permLess)
	var out patternSet
	kept := map[string]bool{}
	var lengths []int // of the members kept, increasing
	for _, p := range sorted {
		keep := !kept[stateKey(p)]
		for _, l := range lengths {
			for i := 0; keep && l < len(p) && i+l <= len(p); i++ {
				keep = !kept[stateKey(std(p[i:i+l]))]
			}
		}
		if keep {
			out = append(out, p)
			kept[stateKey(p)] = true
			if !slices.Contains(lengths, len(p)) {
				lengths = append(lengths, len(p))
			}
		}
	}
	return out
}

// parseSet reads the given tokens into their irredundant set.
func parseSet(given []string) (patternSet, error) {
	if len(given) == 0 {
		return nil, fmt.Errorf("no pattern given")
	}
	ps := make([]perm, len(given))
	for i, tok := range given {
		p, err := parseToken(tok)
		if err != nil {
			return nil, err
		}
		ps[i] = p
	}
	return irredundant(ps), nil
}

func (s patternSet) strings() []string {
	out := make([]string, len(s))
	for i, p := range s {
		out[i] = p.String()
	}
	return out
}

// longest returns the length of the longest member.
func (s patternSet) longest() int {
	w := 0
	for _, p := range s {
		w = max(w, len(p))
	}
	return w
}

// canonical returns the representative of the set's class under reversal
// and complement: of the four images (each made irredundant and sorted),
// the one whose member list is least, member by member (then the shorter
// list).
func (s patternSet) canonical() patternSet {
	image := func(f func(p perm) perm) patternSet {
		out := make([]perm, len(s))
		for i, p := range s {
			out[i] = f(p)
		}
		return irredundant(out)
	}
	reverse := func(p perm) perm {
		q := slices.Clone(p)
		slices.Reverse(q)
		return q
	}
	complement := func(p perm) perm {
		q := make(perm, len(p))
		for i, v := range p {
			q[i] = len(p) + 1 - v
		}
		return q
	}
	best := image(func(p perm) perm { return slices.Clone(p) })
	for _, t := range []patternSet{image(reverse), image(complement), image(func(p perm) perm { return complement(reverse(p)) })} {
		if slices.CompareFunc(t, best, permLess) < 0 {
			best = t
		}
	}
	return best
}

// avoids reports whether x (distinct entries) contains no member
// consecutively.
func (s patternSet) avoids(x []int) bool {
	for _, p := range s {
		if occursIn(p, x) {
			return false
		}
	}
	return true
}
