// Package transfer runs the exact integer iteration of a consecutive-pattern
// set on prefix states (docs/prefix-states.md; method note, section 8).
//
// The states (NewStates) are the patterns of the proper prefixes of the
// set's members, the empty one included, in the contract's order. After n
// values a sequence that avoids the set is in state p, the pattern of its
// longest suffix whose pattern is a state, with gaps a = (a_0..a_|p|): how
// many of its other values lie between consecutive values of that suffix.
// The iterate G_n holds, for every state p and every composition a of
// n - |p|, the number G_n[p][a] of permutations of 1..n that avoid the set
// and are in state p with gaps a; a_n is the sum of G_n. Patterns of
// different lengths are handled as they are: nothing is lifted to one
// window length.
//
// One step (Engine.Next) puts the new value into every gap at every split,
// refuses the moves that complete a member of the set, and forgets the
// oldest values that no member can still need, merging the gaps beside
// each. Each output coefficient is a sum along a line of the input (a
// merged gap can be shared in several ways); running sums along those
// lines make each coefficient of each move cost one look-up. A move that
// forgets several values goes through intermediate arrays, one forgotten
// value at a time.
//
// Systems (System): the whole system, or the moves among a subset of the
// states with the start StartOnes or StartWhole; States.Edges is the state
// digraph whose strongly connected components package bounds brackets
// block by block.
//
// Guarantees:
//   - all arithmetic is exact, in fixed-width words sized from a bound on
//     the iterate's sum (limbsFor), so no carry is lost;
//   - the results do not depend on GOMAXPROCS: every task writes its own
//     coefficients and integer sums do not depend on their order;
//   - Iterate.Digest is the SHA-256 of the byte stream of
//     docs/prefix-states.md, which the independent checker recomputes;
//   - Engine.Footprint and CountsFootprint are computed from the exact
//     sizes of the arrays a step allocates, before any work.
//
// Aliasing: an Iterate is not modified after it is returned, so it may be
// read from several goroutines, except the one passed to Engine.Advance as
// storage to recycle. Engines and States are read-only and safe for
// concurrent use.
package transfer
