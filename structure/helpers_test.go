package structure

import (
	"context"
	"slices"
	"strconv"
	"strings"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/pattern"
)

// The brute-force references below work on permutations themselves, from
// the definitions in docs/prefix-states.md: they use internal/brute (which
// shares no code with this package) and pattern.Standardize, never the
// moves of transfer.States.

func analyze(t testing.TB, s pattern.Set, opts Options) *Report {
	t.Helper()
	rep, err := Analyze(context.Background(), s, opts)
	if err != nil {
		t.Fatalf("%v: %v", s, err)
	}
	return rep
}

func members(s pattern.Set) [][]int {
	var out [][]int
	for _, p := range s.Patterns() {
		out = append(out, p)
	}
	return out
}

// bruteSystem is a set's prefix states and state digraph, computed on
// sequences.
type bruteSystem struct {
	set       pattern.Set
	pats      [][]int
	states    map[string]bool // prefix states by pattern.Perm.String, "" the empty one
	recurrent map[string]bool
}

func newBruteSystem(s pattern.Set) *bruteSystem {
	b := &bruteSystem{set: s, pats: members(s), states: map[string]bool{"": true}}
	for _, m := range s.Patterns() {
		for l := 1; l < len(m); l++ {
			b.states[pattern.Standardize(m[:l]).String()] = true
		}
	}
	// The state digraph: from each state (its pattern as the values), a
	// new value in every gap, kept when the sequence still avoids.
	succ := map[string][]string{}
	for p := range b.states {
		seq := permOf(p)
		for gap := 0; gap <= len(seq); gap++ {
			next := appendInGap(seq, gap)
			if brute.Avoids(next, b.pats) {
				succ[p] = append(succ[p], b.stateOf(next).String())
			}
		}
	}
	reach := func(from string, atLeastOne bool) map[string]bool {
		seen := map[string]bool{}
		queue := []string{from}
		if atLeastOne {
			queue = succ[from]
			for _, q := range queue {
				seen[q] = true
			}
		} else {
			seen[from] = true
		}
		for len(queue) > 0 {
			p := queue[0]
			queue = queue[1:]
			for _, q := range succ[p] {
				if !seen[q] {
					seen[q] = true
					queue = append(queue, q)
				}
			}
		}
		return seen
	}
	fromEmpty := reach("", false)
	b.recurrent = map[string]bool{}
	for p := range b.states {
		if fromEmpty[p] && reach(p, true)[p] {
			b.recurrent[p] = true
		}
	}
	return b
}

// permOf reads a state written by pattern.Perm.String (digits).
func permOf(s string) []int {
	out := make([]int, len(s))
	for i, c := range s {
		out[i] = int(c - '0')
	}
	return out
}

// appendInGap returns seq (a permutation) followed by a new value above
// exactly gap of its values, standardised.
func appendInGap(seq []int, gap int) []int {
	out := make([]int, 0, len(seq)+1)
	for _, v := range seq {
		if v > gap {
			v++
		}
		out = append(out, v)
	}
	return append(out, gap+1)
}

// stateOf returns the pattern of the longest suffix of seq whose pattern
// is a prefix state.
func (b *bruteSystem) stateOf(seq []int) pattern.Perm {
	for l := len(seq); l >= 0; l-- {
		p := pattern.Standardize(seq[len(seq)-l:])
		if b.states[p.String()] {
			return p
		}
	}
	panic("no state: the empty one is always a prefix state")
}

// configurations returns R_k computed from sequences: for every recurrent
// state s and every avoiding sequence x t_1 .. t_k with x of pattern s
// whose state after each t_i is recurrent, the configuration, written as
// Report's configurations are ("13|2": the start values, a bar, the
// current values, ranked among both).
func (b *bruteSystem) configurations(k int) map[string]bool {
	out := map[string]bool{}
	for s := range b.recurrent {
		var grow func(seq []int, depth int)
		grow = func(seq []int, depth int) {
			if depth == k {
				c := b.stateOf(seq)
				out[configString(seq, len(s), len(seq)-len(c))] = true
				return
			}
			for gap := 0; gap <= len(seq); gap++ {
				next := appendInGap(seq, gap)
				if brute.Avoids(next, b.pats) && b.recurrent[b.stateOf(next).String()] {
					grow(next, depth+1)
				}
			}
		}
		grow(permOf(s), 0)
	}
	return out
}

// configString writes the joint order of the first ls entries of seq and
// its entries from position from on (the two may share entries).
func configString(seq []int, ls, from int) string {
	var tracked []int
	for i, v := range seq {
		if i < ls || i >= from {
			tracked = append(tracked, v)
		}
	}
	slices.Sort(tracked)
	rank := func(part []int) string {
		ranks := make([]string, len(part))
		for i, v := range part {
			ranks[i] = strconv.Itoa(slices.Index(tracked, v) + 1)
		}
		sep := ""
		if len(tracked) >= 10 {
			sep = "."
		}
		return strings.Join(ranks, sep)
	}
	return rank(seq[:ls]) + "|" + rank(seq[from:])
}

// cyclicAvoiders counts the permutations of length L whose cyclic windows
// of each member's length all avoid that member.
func cyclicAvoiders(s pattern.Set, L int) int {
	count := 0
	brute.Permutations(L, func(p []int) {
		if isCyclicAvoider(s, p) {
			count++
		}
	})
	return count
}

// isCyclicAvoider checks a claimed cyclic avoider directly.
func isCyclicAvoider(s pattern.Set, p []int) bool {
	if len(p) < s.Window() || !isPerm(p) {
		return false
	}
	for _, m := range members(s) {
		win := make([]int, len(m))
		for i := range p {
			for t := range m {
				win[t] = p[(i+t)%len(p)]
			}
			if brute.Contains(win, m) {
				return false
			}
		}
	}
	return true
}

func isPerm(p []int) bool {
	seen := make([]bool, len(p)+1)
	for _, v := range p {
		if v < 1 || v > len(p) || seen[v] {
			return false
		}
		seen[v] = true
	}
	return true
}
