// Package prove is the one library call that certifies: for a pattern set
// it runs the structure pass, chooses how to bracket the growth rate from
// the structure (step d = the period for periodic sets, the strongly
// connected blocks in block order for reducible ones), runs the bracket
// within the budgets of Options, builds the certificate, and has the
// independent checker (package certify) verify that certificate before it
// returns anything. Every command that states a growth rate, a structure
// class or an order between growth rates goes through it.
//
// Guarantees:
//   - A Result, Judgement or Comparison is only returned for certificates
//     that certify.Check accepted, bound to the set asked about. A
//     certificate the checker refuses is an error, never a verdict.
//   - Verdicts are read from the checked certificates alone (Decide,
//     DecideOrder, Form), never from the engine's own conclusion, so a
//     verdict rests on what the checker proved.
//   - Counts returns a_0..a_n only when the fast engine (package transfer)
//     and the checker's own iteration (certify.Counts) give the same
//     numbers; otherwise its error names the first n where they differ.
//   - A budget (Options.MaxK, MaxMemory, the context's deadline) never
//     turns into a verdict: a bracket stopped by it still gives a checked
//     certificate whose verdict may be undecided, and a refusal before the
//     work is an error wrapping ErrBudget. The deadline bounds the
//     engine's work; the check of the certificate of the bracket it kept
//     follows it (the checker does not take a context yet). Cancelling
//     the context (an interrupt) stops everything with its error.
//
// This package is the only one outside package main that calls into
// transfer, bounds and certify together; the claims gate, the census and
// the command line call it instead of orchestrating on their own.
//
// Results are fresh values; the caller may keep and read them from any
// goroutine, and must not modify them while another goroutine reads them.
package prove
