// Package structure decides, with checkable evidence, whether the counts
// a_n of a consecutive-pattern set behave like a_n/n! ~ c lambda^n.
//
// For a set whose longest pattern has length w = m+1 it builds the window
// digraph W_S (one vertex per order cell of S_m, by pattern.Rank; one edge
// per allowed window of length m+1, loops and parallel edges kept, as a
// gonum multigraph), its strongly connected components with their periods
// and a topological order of the blocks, and, for m <= 5, the exact
// joint-pattern test of method.md section 5 on bitsets over S_2m.
//
// Joint patterns. For k >= m, the joint pattern of an avoiding permutation
// p of length m+k is the pattern of its first m entries followed by its
// last m entries (see Joint); R_k is the set of them. The two windows are
// disjoint from k = m on, where the test starts; for k < m the kernel of
// T^k lives on a null set and is never a.e. positive. The domain is the
// set of joint patterns whose halves avoid the shorter members (all of
// S_2m when every member has length w).
//
// What each class proves (Report.Class):
//
//   - Finite: the window digraph has no cycle; a_n > 0 exactly for
//     n < N1 = m + P + 1, P its longest path. Exact for any m.
//   - Primitive: R_e is the whole domain, so T^e has an a.e.-positive
//     kernel; by Jentzsch's theorem lambda is a simple, strictly dominant
//     eigenvalue and a_n/n! = c lambda^n (1 + O(theta^n)), c > 0,
//     theta < 1. The exponent e is least. With Options.Witnesses, every
//     joint pattern has a witness permutation of length m+e, which an
//     independent checker verifies in linear time. Nothing is said about
//     the value of lambda (package bounds brackets it).
//   - Subexponential: lambda = 0 proved (no cyclic avoider of any length),
//     while a_n > 0 for all n: a_n/n! decays faster than every exponential.
//   - Periodic: the R_k repeat with period p > 1 and every joint pattern
//     lies in exactly one R_k of the cycle: T is irreducible, not
//     primitive. Not proved: an asymptotic form with a single constant.
//   - Reducible: some start cell cannot reach another (Report.Unreached),
//     so T leaves a proper set of cells invariant and lambda is the largest
//     over the blocks. Not proved: a_n/n! ~ c lambda^n.
//   - Undecided: nothing above was proved within the limits (m = 6, or
//     Options.MaxSteps reached). The explanation says what was checked.
//
// Independently, Report.Lambda says whether lambda > 0 is proved (by a
// cyclic avoider, Report.CyclicAvoider: a permutation whose cyclic windows
// all avoid the set), lambda = 0 is proved (exactly for m <= 5 from the
// R_k, and for any m when every cycle of W_S is a monotone loop), or
// neither. It is never guessed.
//
// Guarantees: results are deterministic and do not depend on GOMAXPROCS;
// a Report, its Digraph and its Witnesses are not modified after Analyze
// returns and may be read concurrently. Slices in a Report belong to it:
// callers must not modify them.
package structure
