// Package conformance holds only tests: they compare the independent
// checker (package certify) with the engine (packages transfer, bounds,
// structure, pattern, interval) on the things both compute from the same
// specification, docs/prefix-states.md and docs/certificate.md. The
// checker's own tests import no engine package; the comparisons live
// here, so that a disagreement fails a test without the checker ever
// depending on the engine.
package conformance
