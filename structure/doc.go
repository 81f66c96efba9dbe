// Package structure decides, with checkable evidence, whether the counts
// a_n of a consecutive-pattern set behave like a_n/n! ~ c lambda^n. It
// runs on the prefix states of package transfer (the same states and
// moves as the counts and the brackets: transfer.NewStates), as
// docs/prefix-states.md, "The structure test", fixes exactly.
//
// The state digraph has an edge p -> q for every allowed move from p into
// q. A state is recurrent when it is reachable from the empty state and
// lies on a cycle; the others are transient. The blocks are the strongly
// connected components among the recurrent states (canonical order: each
// increasing, ordered by least state).
//
// The joint test follows configurations (s, c, o, w): a recurrent start
// state s with its values x, the current recurrent state c with its values
// y after k moves, their o shared values, and the joint order w of x and
// y. R_k is the set of configurations after exactly k moves; D is every
// configuration with o = 0 of every ordered pair of recurrent states. The
// sequence R_0, R_1, ... is computed until R_e = D or its first
// repetition (the joint cycle), at most MaxSteps sets. Each configuration
// is one integer (its pair block, and the rank of the mask saying which of
// its values are start values), each R_k a bitset, and a step a table
// look-up per configuration and gap, the table filled the first time a
// configuration is reached.
//
// What each class proves (Report.Class):
//
//   - Primitive: R_e = D, e the primitivity exponent (the least k with
//     T^k positive on the recurrent states); by Jentzsch's theorem lambda
//     is simple and strictly dominant and a_n/n! = c lambda^n
//     (1 + O(theta^n)), c > 0, theta < 1.
//   - Periodic: one block; the p >= 2 sets of the joint cycle are
//     disjoint, cover D and hold whole pairs of states, so
//     a_n/n! = lambda^n (c_(n mod p) + O(theta^n)); one constant for
//     every n is not proved.
//   - Reducible: two or more blocks, or one whose joint cycle misses a
//     configuration of D; lambda is the largest over the blocks, the
//     asymptotic form is not proved.
//   - Finite: no recurrent state; a_n > 0 exactly for n < N1 = P + 1, P the
//     longest walk from the empty state.
//   - Subexponential: recurrent states (a_n > 0 for every n) and lambda = 0.
//   - Undecided: one block whose joint cycle covers D without splitting it
//     into classes, or the step limit reached first.
//
// Report.Lambda: positive when some configuration of R_k with k + |s| >= w
// (w the longest member's length), or of the recurring part of the
// sequence, is closable; the evidence is a cyclic avoider realised from
// it and checked window by window before it is reported. Zero when the
// sequence recurs and none is. Undecided only at the step limit.
//
// Cost. Before it runs, Analyze estimates the test's memory (Estimate:
// its move table, and its first 32 sets R_k with their witness links) and
// refuses a test over Options.MaxMemory with a *BudgetError (errors.Is
// ErrBudget); each further set is checked against the budget as the test
// goes. Nothing else limits the pattern length: a single pattern of length
// 9 has |D| = 48602.
//
// The order-cell form of this test (window digraph, joint patterns over
// S_2m) is gone; its verdicts on 363 sets are kept in
// testdata/cellform-verdicts.txt, and a test checks that this one agrees
// with them wherever the difference is not a transient start cell.
//
// Guarantees: results are deterministic and do not depend on GOMAXPROCS.
// A Report is not modified after Analyze returns and may be read
// concurrently; its slices, its States and its Witnesses belong to it and
// callers must not modify them. Report.Witnesses rebuilds realisations on
// demand and is not safe for concurrent use. Analyze may run on several
// sets at once.
package structure
