// Package certify defines the growth-rate certificate (format Version),
// writes and reads it, and checks it independently of the engine that
// produced it.
//
// A certificate states, for a set of consecutive patterns, an interval of
// exact rationals for the growth rate lambda = lim (a_n/n!)^(1/n) and for
// 1/lambda, with outward decimals, and explicit bounds on a_n/n! valid for
// every n >= n0. Its evidence is a list of coefficientwise Collatz-Wielandt
// brackets: each names a system (the whole transfer system or its
// restriction to a set of order cells), a degree k, a step d, bounds lo and
// hi of lambda^d and the SHA-256 of the iterate G_k. Format version 2 adds
// a structure section (Structure): a class of the transfer operator
// (primitive with exponent e, periodic with period p, reducible, finite,
// subexponential, or undecided) and whether lambda > 0, lambda = 0 or
// neither, with their evidence: one witness permutation per joint pattern,
// a cyclic avoider, or nothing where the checker recomputes the finite
// automaton behind the claim. A certificate without the section is written
// as version 1, and both versions are read. docs/certificate.md specifies
// every field and byte.
//
// Guarantees:
//   - Check is the trusted core. It depends only on the standard library
//     and package pattern, and recomputes every iterate from the
//     combinatorial recurrence with plain big.Int arithmetic; it shares no
//     code with the fast engine (package transfer), and the tests compare
//     the two.
//   - Check accepts a certificate only when each claim is proved: every
//     bracket inequality is verified exactly at every Bernstein index, and
//     every derived field (patterns, a_n0, digests, decimals, cell length,
//     exponent, period, N1, the unreached pair, the joint cycle) must equal
//     its derivation, so a certificate has one form and a changed claim is
//     caught even when the content digest is recomputed.
//   - The structure section is proved with the checker's own code as well:
//     the window digraph from the allowed windows, the joint-pattern sets
//     R_k on plain bitsets (m <= 5), the witnesses and the cyclic avoider
//     window by window. It shares no code with package structure, and the
//     tests compare the two. The bounds and the structure section are
//     proved independently of each other.
//   - Check never panics on any Certificate value, and refuses before doing
//     the work a certificate whose recomputation would exceed the limits of
//     CheckOptions (errors.Is(err, ErrLimit)).
//   - Read accepts only canonical files: byte-identical to what Marshal
//     writes, with a matching content digest and the end marker, within
//     MaxFileSize. Marshal is deterministic: the same certificate gives the
//     same bytes on every machine, with nothing time- or machine-dependent.
//   - Write replaces its file atomically (temporary file, fsync, rename).
//
// Read and Check return fresh values and never modify their arguments.
package certify
