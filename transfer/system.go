package transfer

import (
	"fmt"
	"slices"
)

// Start names how a system's iteration begins (docs/prefix-states.md,
// "Systems").
type Start string

// The starts. The whole system starts from the empty state at n = 0; a
// restricted system starts at n_s = the longest member's length, with 1
// on every coefficient of its states (StartOnes: a positive density, which
// an upper bound of a block needs) or with the whole system's G_(n_s) on
// its states (StartWhole: at most the whole iterate, which a lower bound
// needs).
const (
	StartEmpty Start = "empty"
	StartOnes  Start = "ones"
	StartWhole Start = "whole"
)

// System is a set of states, the moves between them and a start.
type System struct {
	States  *States
	Members []int // increasing state indices; all states for the whole system
	Start   Start
}

// Whole returns the whole system of a set of states.
func Whole(st *States) System {
	members := make([]int, st.Len())
	for i := range members {
		members[i] = i
	}
	return System{States: st, Members: members, Start: StartEmpty}
}

// Restrict returns the system on the given states (any order; they are
// sorted) keeping only the moves between them, with start ones or whole.
// All states with start empty is the whole system.
func (st *States) Restrict(members []int, start Start) (System, error) {
	ms := slices.Clone(members)
	slices.Sort(ms)
	ms = slices.Compact(ms)
	if len(ms) == 0 {
		return System{}, fmt.Errorf("transfer: a restricted system needs at least one state")
	}
	if ms[0] < 0 || ms[len(ms)-1] >= st.Len() {
		return System{}, fmt.Errorf("transfer: state indices must lie in 0..%d", st.Len()-1)
	}
	switch start {
	case StartOnes, StartWhole:
	case StartEmpty:
		if len(ms) != st.Len() {
			return System{}, fmt.Errorf("transfer: start %q is the whole system's; a proper subset of the states starts %q or %q", start, StartOnes, StartWhole)
		}
	default:
		return System{}, fmt.Errorf("transfer: unknown start %q (want %q, %q or %q)", start, StartEmpty, StartOnes, StartWhole)
	}
	return System{States: st, Members: ms, Start: start}, nil
}

// IsWhole reports whether the system is the whole system.
func (s System) IsWhole() bool { return s.Start == StartEmpty }

// StartN returns the n at which the system starts: 0 for the whole system,
// the longest member's length for a restricted one.
func (s System) StartN() int {
	if s.IsWhole() {
		return 0
	}
	n := 0
	for _, p := range s.Members {
		n = max(n, s.States.Length(p))
	}
	return n
}

// Edge is an edge of the state digraph: some allowed move leads from
// state From to state To.
type Edge struct{ From, To int }

// Edges returns the edges of the whole system's state digraph, each once,
// sorted (self-loops included).
func (st *States) Edges() []Edge {
	var out []Edge
	for p := range st.Len() {
		for _, mv := range st.moves[p] {
			out = append(out, Edge{mv.From, mv.To})
		}
	}
	slices.SortFunc(out, func(a, b Edge) int {
		if a.From != b.From {
			return a.From - b.From
		}
		return a.To - b.To
	})
	return slices.Compact(out)
}
