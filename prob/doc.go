// Package prob gives the probability that N independent draws from one
// continuous distribution avoid a set of consecutive patterns, a_N/N!, and
// the distribution of the number of windows that match the set: its exact
// mean and variance, its exact law, and tail probabilities of an observed
// count.
//
// Ties have probability 0 under a continuous distribution and every order
// of N distinct draws is equally likely, so a_N/N! is exactly that
// probability, and P(count = j) is the number of permutations of 1..N with
// exactly j matching windows, divided by N!.
//
// Guarantees:
//   - Exact returns a_N/N! as an exact fraction from counts that the fast
//     engine and the checker's own iteration agree on (prove.Counts). It
//     refuses, before any work, an N past MaxExactN or a count whose
//     estimated memory is over the caller's limit.
//   - Enclose returns an interval proved to contain a_N/N!, read from the
//     explicit bound for every n >= N0 of a certificate the checker
//     accepted (A mu_lo^(N-N0) <= a_N/N! <= A mu_hi^(N-N0), A = a_N0/N0!);
//     the powers are rounded outward (interval.PowDown, PowUp).
//   - Occurrences returns exact counts from its own layered iteration
//     (layers.go), which shares no iteration code with package transfer
//     (it borrows only the composition indexer); its tests compare it with
//     brute force, with a_N, with the Eulerian numbers and with the closed
//     forms of the mean and variance. OccurrenceCost estimates its work and
//     memory before it starts, for budgets.
//   - WindowMoments returns the exact mean and variance of the number of
//     matching windows from closed forms (moments.go, derived in
//     docs/series.md); InterleavedMoments and InterleavedLaw do the same
//     over the independent subsequences of a delay (the law is the
//     convolution of theirs).
//   - Assess compares observed counts with those laws: exact tails within
//     a budget, otherwise a normal approximation that is marked as such
//     (Assessment.Exact false) and never a bound.
//   - AvoidAll gives the probability that several independent sequences
//     avoid a set: exact through Exact, or enclosed through Certify and
//     Enclose from a certificate the checker accepted in the same call.
//
// All results are fresh values owned by the caller.
package prob
