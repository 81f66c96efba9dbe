// Package pattern holds permutations, consecutive-pattern sets and their symmetries.
//
// A Perm is a permutation of 1..len(p). A text (any sequence of distinct
// integers) contains a pattern consecutively when some run of len(p) adjacent
// entries is order-isomorphic to it. A Set is a validated, irredundant set of
// patterns: duplicates are removed and a pattern that consecutively contains
// another member is dropped, because avoiding the shorter member already
// avoids it. Dropped patterns are kept for reporting.
//
// Guarantees: every Perm returned by this package is a valid permutation;
// every Set is non-empty, sorted (shorter first, then lexicographically),
// irredundant and has patterns of length at most MaxLength. Functions never
// modify their arguments; returned slices are fresh and owned by the caller.
//
// Permutations of length n are indexed by Rank, their position in
// lexicographic order (0 for the identity); Unrank inverts it. Packages that
// store per-permutation data index it this way.
package pattern
