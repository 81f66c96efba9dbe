package structure

import (
	"context"
	"errors"

	"avoidcert/pattern"
)

// errBudget reports that a bounded search ran out of nodes.
var errBudget = errors.New("structure: search budget exhausted")

// walker enumerates, depth first, the permutations of a length L >= m
// that the system allows: first m entries in a start cell, every window
// of m+1 adjacent entries allowed. A permutation is grown by appending a
// value in one of the gaps of the current values (existing values at or
// above it move up by one), so every sequence is visited exactly once,
// children in increasing order of the new value.
type walker struct {
	ctx    context.Context
	sys    Windows
	seq    []int
	nodes  int64
	budget int64 // 0: unlimited
	visit  func([]int) bool
	length int
}

func newWalker(ctx context.Context, sys Windows, budget int64) *walker {
	return &walker{ctx: ctx, sys: sys, budget: budget}
}

// run calls visit for every allowed permutation of length L in
// lexicographic order of its growth choices; visit returns false to stop.
// It reports whether the enumeration stopped early by visit's request.
func (w *walker) run(L int, visit func([]int) bool) (stopped bool, err error) {
	if L < w.sys.M {
		panic("structure: walker needs a length of at least m")
	}
	w.seq, w.visit, w.length = w.seq[:0], visit, L
	return w.grow()
}

func (w *walker) grow() (bool, error) {
	n := len(w.seq)
	if n == w.length {
		return !w.visit(w.seq), nil
	}
	w.nodes++
	if w.nodes&0xffff == 0 {
		if err := w.ctx.Err(); err != nil {
			return false, err
		}
	}
	if w.budget > 0 && w.nodes > w.budget {
		return false, errBudget
	}
	m := w.sys.M
	for v := 1; v <= n+1; v++ {
		for i, a := range w.seq {
			if a >= v {
				w.seq[i] = a + 1
			}
		}
		w.seq = append(w.seq, v)
		ok := true
		switch {
		case n+1 == m:
			ok = w.sys.Start[pattern.Rank(w.seq)]
		case n+1 > m:
			ok = w.sys.Allowed[pattern.Rank(w.seq[n-m:])]
		}
		if ok {
			stopped, err := w.grow()
			if stopped || err != nil {
				return stopped, err
			}
		}
		w.seq = w.seq[:n]
		for i, a := range w.seq {
			if a > v {
				w.seq[i] = a - 1
			}
		}
	}
	return false, nil
}

// closesCyclically reports whether the allowed sequence seq (length
// L >= m+1) is a cyclic avoider: the m windows that wrap around the end
// are allowed too.
func closesCyclically(sys Windows, seq []int) bool {
	m, L := sys.M, len(seq)
	win := make([]int, m+1)
	for s := L - m; s < L; s++ {
		for t := range win {
			win[t] = seq[(s+t)%L]
		}
		if !sys.Allowed[pattern.Rank(win)] {
			return false
		}
	}
	return true
}

// CyclicAvoiders returns the number of cyclic avoiders of length L: the
// permutations of 1..L whose L cyclic windows of length m+1 (wrapping
// around the end) all avoid s. L must be at least m+1, so that each
// window has distinct entries. Rotations count separately. By method.md
// section 5b, this is L! tr(T^L).
func CyclicAvoiders(ctx context.Context, s pattern.Set, L int) (int64, error) {
	sys := WindowsOf(s)
	if L < sys.M+1 {
		return 0, errors.New("structure: a cyclic avoider needs a length of at least the longest pattern's")
	}
	w := newWalker(ctx, sys, 0)
	var count int64
	_, err := w.run(L, func(seq []int) bool {
		if closesCyclically(sys, seq) {
			count++
		}
		return true
	})
	return count, err
}

// findCyclic searches the lengths lo..hi in order for a cyclic avoider and
// returns the first one found (nil if none). With budget 0 the search of
// each length is exhaustive, so nil means none exists at those lengths.
func findCyclic(ctx context.Context, sys Windows, lo, hi int, budget int64) (pattern.Perm, error) {
	w := newWalker(ctx, sys, budget)
	for L := lo; L <= hi; L++ {
		var found pattern.Perm
		_, err := w.run(L, func(seq []int) bool {
			if closesCyclically(sys, seq) {
				found = append(pattern.Perm(nil), seq...)
				return false
			}
			return true
		})
		if found != nil || err != nil {
			return found, err
		}
	}
	return nil, nil
}
