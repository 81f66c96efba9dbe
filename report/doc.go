// Package report turns checked certificates into pages for people:
// Markdown, a standalone HTML page with inline SVG figures (no network
// access), and a LaTeX fragment to \input into a preprint.
//
// One rule binds this package as every command: everything it states as
// certified or proved is derived from certificates the independent
// checker accepted in this run, never from a table, a journal, a shard
// or a gate's output, which are untrusted input like any other file.
//
// Guarantees:
//   - FromCertificate re-verifies the certificate with the independent
//     checker (prove.Recheck, bound to the certificate's own pattern set as
//     the checker reads it) before anything is rendered; a certificate the
//     checker refuses is an error, never a page.
//   - FromCensus renders only the tables census.Verify derived: every
//     row's certificate accepted for the row's class, every certified field
//     of the row compared with it, the counts with the checker's own, the
//     order and groups derived again; a difference is a refusal
//     (IsRefused) naming the row and the field.
//   - A gate's verdicts and evidence are restated as recorded and labelled
//     so; they are never shown as this report's verdicts, and a line with a
//     verdict or kind the gate never writes is refused. What the page shows
//     as certified for a claim is read from the certificates its line
//     names, each found from the manifest's folder, the current one or the
//     gate file's, matching the recorded SHA-256 and accepted by the
//     checker for the recorded set while the report is made (FromGate,
//     Gate.Check), and set against the claim as the line restates it; a
//     file with other bytes, one the checker refuses, or a recorded verdict
//     the certificates contradict is a refusal.
//   - Every number stated as proved is read from the checked certificate
//     and printed rounded outward (interval.DecimalDown / DecimalUp at the
//     certificate's digits), so a printed bound still holds.
//   - The figures' data are not in the certificate (it keeps only its
//     final brackets): FromCertificate recomputes them with the engine (a
//     bracket run through prove.Certify to the certificate's digits, and
//     exact counts from transfer.Counts to that run's last n), and the page
//     says so. The observed rate in the width figure is an estimate and
//     labelled one.
//   - Every figure's legend is drawn below its plots, outside the axes;
//     long numbers in the LaTeX fragment break across lines, and its tables
//     come in chunks a page may break between (it needs no package).
//   - A series run (the JSON of 'avoidcert series', FromSeries) is restated
//     as recorded, except that every exact mean and variance is recomputed
//     from its patterns, number of values and delay (a run whose recorded
//     ones differ is refused) and every avoidance probability is derived
//     again (prob.AvoidAll: exact, or from a certificate the checker
//     accepts while the report is made). The page says which is which.
//   - Rendering is deterministic: the same certificate gives the same
//     bytes (no times, no host names), which the golden files rely on.
//   - JSON writes the same document as data (format avoidcert-report,
//     docs/json.md), with the same standing of every value: nothing it
//     holds as certified comes from anywhere but a certificate the
//     checker accepted while the report was made.
//
// Values returned are fresh; the caller owns them.
package report
