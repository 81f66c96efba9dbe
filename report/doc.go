// Package report turns checked certificates into pages for people:
// Markdown, a standalone HTML page with inline SVG figures (no network
// access), and a LaTeX fragment to \input into a preprint.
//
// Guarantees:
//   - FromCertificate re-verifies the certificate with the independent
//     checker (prove.Recheck, bound to the certificate's own pattern set)
//     before anything is rendered; a certificate the checker refuses is an
//     error, never a page.
//   - Every number stated as proved is read from the checked certificate
//     and printed rounded outward (interval.DecimalDown / DecimalUp at the
//     certificate's digits), so a printed bound still holds.
//   - The figures' data are not in the certificate (it keeps only its
//     final brackets): FromCertificate recomputes them with the engine (a
//     bracket run through prove.Certify to the certificate's digits, and
//     exact counts from transfer.Counts), and the page says so. The
//     observed rate in the width figure is an estimate and labelled one.
//   - A series run (the JSON of 'avoidcert series', FromSeries) is restated
//     as recorded, except that every exact mean and variance is recomputed
//     from its patterns, number of values and delay (a run whose recorded
//     ones differ is refused) and every avoidance probability is derived
//     again (prob.AvoidAll: exact, or from a certificate the checker
//     accepts while the report is made). The page says which is which.
//   - Rendering is deterministic: the same certificate gives the same
//     bytes (no times, no host names), which the golden files rely on.
//
// Values returned are fresh; the caller owns them.
package report
