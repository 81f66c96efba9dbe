package structure

import (
	"context"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/pattern"
)

// The brute-force references below use internal/brute (which shares no
// code with this package) and pattern's own Standardize and Rank.

func members(s pattern.Set) [][]int {
	var out [][]int
	for _, p := range s.Patterns() {
		out = append(out, p)
	}
	return out
}

func analyze(t testing.TB, s pattern.Set, opts Options) *Report {
	t.Helper()
	rep, err := Analyze(context.Background(), s, opts)
	if err != nil {
		t.Fatalf("%v: %v", s, err)
	}
	return rep
}

// bruteWalk calls visit with every permutation of length n that avoids
// s, grown one entry at a time and pruned with brute.Avoids on the last
// Window() entries (the only windows a new last entry creates).
func bruteWalk(s pattern.Set, n int, visit func(p []int)) {
	pats, w := members(s), s.Window()
	var grow func(seq []int)
	grow = func(seq []int) {
		if len(seq) == n {
			visit(seq)
			return
		}
		for v := 1; v <= len(seq)+1; v++ {
			next := make([]int, 0, len(seq)+1)
			for _, a := range seq {
				if a >= v {
					a++
				}
				next = append(next, a)
			}
			next = append(next, v)
			if brute.Avoids(next[max(0, len(next)-w):], pats) {
				grow(next)
			}
		}
	}
	grow(nil)
}

// bruteJoint returns the joint patterns (ranks over S_2m) of the avoiding
// permutations of length n >= 2m.
func bruteJoint(s pattern.Set, m, n int) map[int]bool {
	out := map[int]bool{}
	bruteWalk(s, n, func(p []int) {
		seq := append(append([]int(nil), p[:m]...), p[n-m:]...)
		out[pattern.Rank(pattern.Standardize(seq))] = true
	})
	return out
}

// bruteCyclic counts the permutations of length L whose L cyclic windows
// of length Window() all avoid s, over every permutation of 1..L.
func bruteCyclic(s pattern.Set, L int) int {
	pats, w := members(s), s.Window()
	count := 0
	win := make([]int, w)
	brute.Permutations(L, func(p []int) {
		for i := range L {
			for t := range w {
				win[t] = p[(i+t)%L]
			}
			if !brute.Avoids(win, pats) {
				return
			}
		}
		count++
	})
	return count
}

// isCyclicAvoider checks a claimed cyclic avoider directly.
func isCyclicAvoider(s pattern.Set, p []int) bool {
	pats, w := members(s), s.Window()
	if len(p) < w || !isPerm(p) {
		return false
	}
	win := make([]int, w)
	for i := range p {
		for t := range w {
			win[t] = p[(i+t)%len(p)]
		}
		if !brute.Avoids(win, pats) {
			return false
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
