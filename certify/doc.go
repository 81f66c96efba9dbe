// Package certify defines the growth-rate certificate (format Version 4),
// writes and reads it, and checks it independently of the engine that
// produced it.
//
// A certificate states, for a set of consecutive patterns, an interval of
// exact rationals for the growth rate lambda = lim (a_n/n!)^(1/n) and for
// 1/lambda, with outward decimals, and explicit bounds on a_n/n! valid for
// every n >= n0. Its evidence is a list of coefficientwise Collatz-Wielandt
// brackets on the prefix states of the set (docs/prefix-states.md): each
// names a system (the whole system, or the moves among some states with
// start ones or whole), a step d, the n of its iterate G_N, bounds lo and
// hi of lambda^d, and the SHA-256 of G_N. An optional structure section
// (Structure) states a class of the transfer operator on the same prefix
// states (primitive with primitivity exponent e, periodic with period p,
// reducible with its blocks, finite, subexponential, or undecided) and
// whether lambda > 0, lambda = 0 or neither, with its evidence: the
// recurrent states, the number of joint configurations, the joint cycle
// and a cyclic avoider, each of which the checker recomputes or checks.
// Versions 1 and 2 (order cells) and 3 (a structure section on order
// cells) are refused with the advice to re-issue them.
// docs/certificate.md specifies every field and byte.
//
// Guarantees:
//   - Check is the trusted core. The package imports the standard library
//     only and shares no code with the engine (packages pattern, transfer,
//     bounds, structure): it parses the patterns, makes the irredundant set
//     and its canonical representative, builds the prefix states and their
//     moves, and recomputes every iterate with its own code. The tests of
//     internal/conformance compare the two.
//   - Check accepts a certificate only when each claim is proved: every
//     bracket inequality is verified exactly at every state and
//     composition, and every derived field (patterns, number of states,
//     a_n0, digests, decimals, primitivity exponent, period, N1, blocks,
//     recurrent states, number of configurations, joint cycle) must equal
//     its derivation, so a certificate has one form and a changed claim is
//     caught even when the content digest is recomputed.
//   - The structure section is proved with the checker's own code as well:
//     the state digraph from its own moves, the recurrent states and
//     blocks, and the sets R_k of joint configurations, each a map of
//     configurations written out as the order of their values, recomputed
//     step by step to the primitivity exponent or to the end of the joint
//     cycle; lambda = 0 from the closable configurations, lambda > 0 from
//     the cyclic avoider window by window. The bounds and the structure
//     section are proved independently of each other.
//   - Check never panics on any Certificate value; it refuses before doing
//     the work a certificate whose estimated work or memory is over the
//     limits of CheckOptions (a *LimitError, errors.Is(err, ErrLimit);
//     the structure section's work and memory are estimated in closed
//     form from the recurrent states and the claimed number of steps);
//     it reports progress through CheckOptions.Progress and stops within
//     one state's step (or a few thousand configurations of a structure
//     step) when its context is cancelled. Every refusal is one
//     line that quotes at most a few dozen characters of any value.
//   - Check's iteration runs on up to GOMAXPROCS goroutines and gives the
//     same verdict and message for any number of them.
//   - Counts gives a_0..a_n from the checker's own iteration: a computation
//     of the counts independent of the engine's.
//   - Read accepts only canonical files: byte-identical to what Marshal
//     writes, every member name exactly as specified (lower case), with a
//     matching content digest and the end marker, within
//     MaxFileSize; a file with the same content in another layout is named
//     as re-indented. Marshal is deterministic: the same certificate gives
//     the same bytes on every machine, with nothing time- or
//     machine-dependent.
//   - Write replaces its file atomically (temporary file, fsync, rename).
//
// Read and Check return fresh values and never modify their arguments;
// Derive fills the derived fields of its argument in place.
package certify
