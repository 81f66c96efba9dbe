package certify_test

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"avoidcert/internal/brute"
)

// A brute-force reference for the structure test, from permutations
// enumerated by internal/brute and the definitions of docs/prefix-states.md
// read directly: the state of a sequence is the pattern of its longest
// suffix whose pattern is a proper prefix of a member. It shares no code
// with the checker.

// bruteSet is a pattern set with its prefix states, by name.
type bruteSet struct {
	pats     [][]int
	prefixes map[string]bool
	longest  int
}

// newBruteSet makes the irredundant set of the patterns given (a pattern
// that equals or consecutively contains another is dropped, as the
// contract's sets are irredundant) and its prefix states.
func newBruteSet(given []string) bruteSet {
	b := bruteSet{prefixes: map[string]bool{}}
	all := parsePats(given)
	for i, p := range all {
		redundant := false
		for j, q := range all {
			if i != j && (len(q) < len(p) && brute.Contains(p, q) || slices.Equal(p, q) && j < i) {
				redundant = true
			}
		}
		if !redundant {
			b.pats = append(b.pats, p)
		}
	}
	for _, p := range b.pats {
		b.longest = max(b.longest, len(p))
		for l := 0; l < len(p); l++ {
			b.prefixes[name(patternOf(p[:l]))] = true
		}
	}
	return b
}

// patternOf returns the ranks of a sequence of distinct numbers.
func patternOf(x []int) []int {
	out := make([]int, len(x))
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

// name writes a pattern: "()" when empty, digits up to 9 entries, dotted
// entries beyond.
func name(p []int) string {
	if len(p) == 0 {
		return "()"
	}
	parts := make([]string, len(p))
	for i, v := range p {
		parts[i] = strconv.Itoa(v)
	}
	if len(p) > 9 {
		return strings.Join(parts, ".")
	}
	return strings.Join(parts, "")
}

// stateOf returns the pattern of the longest suffix of seq whose pattern is
// a prefix state.
func (b bruteSet) stateOf(seq []int) []int {
	for l := len(seq); l > 0; l-- {
		if p := patternOf(seq[len(seq)-l:]); b.prefixes[name(p)] {
			return p
		}
	}
	return nil
}

// recurrent returns the states that some avoiding permutation of length n
// is in at two different positions (so a walk leads from the empty state
// to them and back to them), sorted by length, then entries.
func (b bruteSet) recurrent(n int) []string {
	found := map[string][]int{}
	brute.Permutations(n, func(q []int) {
		if !brute.Avoids(q, b.pats) {
			return
		}
		seen := map[string]bool{}
		for t := 1; t <= n; t++ {
			p := b.stateOf(q[:t])
			if seen[name(p)] {
				found[name(p)] = p
			}
			seen[name(p)] = true
		}
	})
	var out [][]int
	for _, p := range found {
		out = append(out, p)
	}
	slices.SortFunc(out, func(x, y []int) int {
		if len(x) != len(y) {
			return len(x) - len(y)
		}
		return slices.Compare(x, y)
	})
	names := make([]string, len(out))
	for i, p := range out {
		names[i] = name(p)
	}
	return names
}

// jointSet returns R_k by enumeration: for every recurrent state s and
// every avoiding permutation of length |s| + k whose first |s| entries x
// have the pattern s and whose states after each of the k later entries
// are recurrent, the configuration "s c o w" of its end: c its state, y
// its last |c| entries, o = max(0, |c| - k) of them start values, w the
// pattern of x followed by the other entries of y. Sorted.
func (b bruteSet) jointSet(recurrent []string, k int) []string {
	isRec := map[string]bool{}
	for _, r := range recurrent {
		isRec[r] = true
	}
	set := map[string]bool{}
	for _, s := range recurrent {
		ls := len(s)
		brute.Permutations(ls+k, func(q []int) {
			if name(patternOf(q[:ls])) != s || !brute.Avoids(q, b.pats) {
				return
			}
			c := b.stateOf(q[:ls])
			for t := 1; t <= k; t++ {
				if c = b.stateOf(q[:ls+t]); !isRec[name(c)] {
					return
				}
			}
			o := max(0, len(c)-k)
			y := q[len(q)-len(c):]
			w := patternOf(append(slices.Clone(q[:ls]), y[o:]...))
			set[fmt.Sprintf("%s %s %d %s", s, name(c), o, name(w))] = true
		})
	}
	var out []string
	for m := range set {
		out = append(out, m)
	}
	slices.Sort(out)
	return out
}

// cyclicAvoider returns the least permutation (by length, then
// lexicographically) of length w..most whose cyclic windows of every
// member's length avoid that member, or nil.
func (b bruteSet) cyclicAvoider(most int) []int {
	for L := b.longest; L <= most; L++ {
		var found []int
		brute.Permutations(L, func(q []int) {
			if found != nil {
				return
			}
			for _, p := range b.pats {
				for i := range q {
					window := make([]int, len(p))
					for t := range window {
						window[t] = q[(i+t)%L]
					}
					if slices.Equal(patternOf(window), p) {
						return
					}
				}
			}
			found = slices.Clone(q)
		})
		if found != nil {
			return found
		}
	}
	return nil
}

// jointCycle returns where the enumerated R_k first repeat, R_start =
// R_(start+length), looking at k up to the largest with |s| + k <= most.
func (b bruteSet) jointCycle(most int) (start, length int, ok bool) {
	rec := b.recurrent(most)
	longest := 0 // the longest recurrent state (its name is its digits)
	for _, r := range rec {
		longest = max(longest, len(r))
	}
	seen := map[string]int{}
	for k := 0; longest+k <= most; k++ {
		key := strings.Join(b.jointSet(rec, k), ";")
		if i, dup := seen[key]; dup {
			return i, k - i, true
		}
		seen[key] = k
	}
	return 0, 0, false
}

// blocks returns the strongly connected components of the recurrent
// states: p and q share one when some avoiding permutation of length n is
// in p and later in q, and another in q and later in p. Each block in
// increasing state number (numbers from stateNumbers), ordered by least.
func (b bruteSet) blocks(recurrent []string, n int) [][]int {
	number := b.stateNumbers()
	leads := map[[2]string]bool{}
	brute.Permutations(n, func(q []int) {
		if !brute.Avoids(q, b.pats) {
			return
		}
		var states []string
		for t := 1; t <= n; t++ {
			states = append(states, name(b.stateOf(q[:t])))
		}
		for i := range states {
			for j := i + 1; j < len(states); j++ {
				leads[[2]string{states[i], states[j]}] = true
			}
		}
	})
	var out [][]int
	placed := map[string]bool{}
	for _, p := range recurrent {
		if placed[p] {
			continue
		}
		var block []int
		for _, q := range recurrent {
			if p == q || (leads[[2]string{p, q}] && leads[[2]string{q, p}]) {
				placed[q] = true
				block = append(block, number[q])
			}
		}
		slices.Sort(block)
		out = append(out, block)
	}
	slices.SortFunc(out, func(x, y []int) int { return x[0] - y[0] })
	return out
}

// stateNumbers numbers the prefix states shorter first, then
// lexicographically (docs/prefix-states.md).
func (b bruteSet) stateNumbers() map[string]int {
	var states [][]int
	for n := range b.prefixes {
		var p []int
		if n != "()" {
			for _, c := range n {
				p = append(p, int(c-'0'))
			}
		}
		states = append(states, p)
	}
	slices.SortFunc(states, func(x, y []int) int {
		if len(x) != len(y) {
			return len(x) - len(y)
		}
		return slices.Compare(x, y)
	})
	number := map[string]int{}
	for i, p := range states {
		number[name(p)] = i
	}
	return number
}

// domain returns D by its definition, as configurations "s c 0 w": for
// every ordered pair of recurrent states, every pattern w of length
// |s| + |c| whose first |s| entries have the pattern s and whose last |c|
// the pattern c. Sorted.
func domain(recurrent []string) []string {
	var out []string
	for _, s := range recurrent {
		for _, c := range recurrent {
			brute.Permutations(len(s)+len(c), func(w []int) {
				if name(patternOf(w[:len(s)])) == s && name(patternOf(w[len(s):])) == c {
					out = append(out, fmt.Sprintf("%s %s 0 %s", s, c, name(w)))
				}
			})
		}
	}
	slices.Sort(out)
	return out
}
