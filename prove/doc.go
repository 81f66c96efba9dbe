// Package prove is the one library call that certifies: for a pattern set
// it runs the structure pass, chooses how to bracket the growth rate from
// the structure (step d = the period for periodic sets, the strongly
// connected blocks in block order for reducible ones), runs the bracket
// within the budgets of Options, builds the certificate, and has the
// independent checker (package certify) verify that certificate before it
// returns anything. Every command that states a growth rate, a structure
// class or an order between growth rates goes through it.
//
// One rule binds this package as every command: everything stated as
// certified or proved is derived from certificates the independent
// checker accepted in this run, never from a table, a journal, a shard
// or a gate's output, which are untrusted input like any other file.
//
// Guarantees:
//   - A Result, Judgement or Comparison is only returned for certificates
//     that certify.Check accepted, bound to the set asked about: to
//     Options.Typed, the pattern arguments as the user wrote them, which
//     the checker splits and parses itself and which the certificate
//     states as patterns_given, so a set the engine misread is refused,
//     not answered for. A certificate the checker refuses is an error,
//     never a verdict. CheckBytes does the same for a file's bytes.
//   - Verdicts are read from the checked certificates alone (Decide,
//     DecideOrder, Form), never from the engine's own conclusion, so a
//     verdict rests on what the checker proved.
//   - Counts returns a_0..a_n only when the fast engine (package transfer)
//     and the checker's own iteration (certify.Counts) give the same
//     numbers; otherwise its error names the first n where they differ.
//   - A budget (Options.MaxK, MaxMemory, Deadline, the context's deadline)
//     never turns into a verdict: a bracket stopped by it still gives a
//     checked certificate whose verdict may be undecided, and a refusal
//     before the work is an error wrapping ErrBudget (and, from the
//     bracket run, a *bounds.BudgetError naming the budget). Options.Deadline
//     bounds the structure pass and the bracket run; building and checking
//     the certificate of the bracket it kept follow it. A deadline of the
//     context bounds the check too. Cancelling the context (an interrupt)
//     stops everything with an error wrapping context.Canceled.
//   - Estimates (Result.Estimates) are floating-point figures for
//     orientation, not proved; callers label them "estimate, not
//     certified" wherever they show them.
//
// This package is the only one outside package main that calls into
// transfer, bounds and certify together; the commands bound and claim,
// the claims gate and the census call it instead of orchestrating on
// their own. Progress reaches the caller through Options.Progress (the
// bracket runs' events, with the number of blocks) and
// Options.CheckProgress (the checker's work).
//
// Results are fresh values; the caller may keep and read them from any
// goroutine, and must not modify them while another goroutine reads them.
package prove
