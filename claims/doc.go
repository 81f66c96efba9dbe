// Package claims reads a claims manifest (TOML, schema in docs/claims.md)
// and judges every claim in it: exact counts, growth rates and radii,
// the structure class, the order of two growth rates, equal counts of two
// sets, and probabilities a_n/n!.
//
// One rule binds this package as every command: everything it states as
// certified or proved is derived from certificates the independent
// checker accepted in this run (or counts the checker's own iteration
// agrees with), never from a table, a journal, a shard or a gate's
// output, which are untrusted input like any other file.
//
// Guarantees:
//   - Parse accepts only a manifest whose every field is known, typed and
//     valid; otherwise its *Error names the file, the line and the field.
//   - The checker is bound to the sets as the manifest writes them
//     (Claim.Typed, OtherTyped, handed over unparsed through
//     prove.Options.Typed), so a misreading of the engine's parser is a
//     Failed claim, never a verdict about another set.
//   - Every verdict rests on the checker, through package prove: count,
//     equal-counts and probability verdicts on counts that the engine and
//     the checker's own iteration agree on; growth and order verdicts on
//     certificates that certify.Check accepted; form verdicts on the
//     checked structure section of such a certificate. A budget that stops
//     the work makes a claim Undecided, never proved or refuted; a failure
//     of the tool (a certificate the checker refuses, the two counts
//     disagreeing) makes it Failed.
//   - A cached certificate is used only after the checker accepts it again
//     for the claim's set; one that was changed is refused, recomputed and
//     replaced, and the evidence says so.
//   - Equal counts up to n = N are reported as evidence of c-Wilf
//     equivalence, never as its proof.
//   - The reports (WriteJSON, JUnit) restate each claim as the manifest
//     states it (Claim.Statement, Quantity, the claimed interval exactly,
//     the note), where it is written (file and line), the checked
//     enclosures a growth or order verdict was read from, and the
//     certificates' paths relative to the manifest's folder (absolute
//     outside it), never to the folder the gate ran in. Manifest faults
//     that the TOML library finds are stated in this package's words.
//
// Run judges claims one after another; it is safe to run several Runs at
// once only with different cache and certificate folders.
package claims
