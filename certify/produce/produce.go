// Package produce builds certificates from the results of the fast
// engine: a bracket run of package bounds and a report of package
// structure. It is the producer's side only; the checker in package certify
// never imports it, so a mistake here can only make the checker refuse.
package produce

import (
	"context"
	"errors"
	"math/big"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/structure"
	"avoidcert/transfer"
)

// MaxWitnessM is the largest cell length whose certificates list one
// witness per joint pattern.
const MaxWitnessM = 4

// Structure states the structure pass's classification in the
// certificate's terms (docs/certificate.md, "Filling it from the structure
// pass"). Witnesses are listed when the report has them and m is at most
// MaxWitnessM; otherwise the checker recomputes the joint-pattern sets.
func Structure(rep *structure.Report) *certify.Structure {
	st := &certify.Structure{Class: certify.StructureClass(rep.Class), Lambda: certify.LambdaStatus(rep.Lambda)}
	switch rep.Class {
	case structure.Primitive:
		st.Exponent = rep.Exponent
		st.Mode = certify.ModeRecompute
		if rep.Witnesses != nil && rep.M <= MaxWitnessM {
			st.Mode = certify.ModeWitnesses
			rep.Witnesses.Each(func(_ int, w pattern.Perm) bool {
				st.Witnesses = append(st.Witnesses, w)
				return true
			})
		}
	case structure.Periodic:
		st.Period = rep.Period
	case structure.Finite:
		st.N1 = rep.N1
	case structure.Reducible:
		st.Unreached = &certify.CellPair{From: rep.Unreached.From, To: rep.Unreached.To}
	}
	if rep.Class == structure.Periodic || (rep.Lambda == structure.LambdaZero && !rep.Digraph.SimpleCycles()) {
		st.CycleStart, st.CycleLength = rep.CycleStart, rep.CycleLength
	}
	if rep.Lambda == structure.LambdaPositive {
		st.CyclicAvoider = rep.CyclicAvoider
	}
	return st
}

// Certificate turns a bracket result for the set of rep (iterated as sys,
// whole or by blocks) into a certificate whose ranges are printed with the
// given significant digits. Every bracket the enclosure rests on carries
// the upper bound; the explicit all-n bounds need a whole-system step-1
// bracket, taken here when the run did not have one (periodic or
// reducible sets). res must come from a run with Options.Digests.
func Certificate(ctx context.Context, tool string, rep *structure.Report, sys transfer.System, res *bounds.Result, digits int) (*certify.Certificate, error) {
	set := rep.Set
	c := &certify.Certificate{Tool: tool, Structure: Structure(rep)}
	st := &c.Statement
	st.Given = set.Given()
	st.Lambda = certify.Range{Lo: res.Lambda.Lo, Hi: res.Lambda.Hi, Digits: digits}
	st.Radius = certify.Range{Lo: res.Radius.Lo, Hi: res.Radius.Hi, Digits: digits}
	if st.Radius.Lo == nil {
		st.Radius.Lo = new(big.Rat) // lambda = 0 exactly: the format has no infinite lower end
	}
	// Format version 3 names brackets on prefix states (States, Start, N);
	// the engine's results are still on order cells, so no valid
	// certificate can be assembled until bounds/ gives prefix-state
	// brackets (the engine's side of issue 8). Refuse loudly rather than
	// write a certificate the checker would reject.
	_, _ = ctx, sys
	return nil, errors.New("certify/produce: certificate format version 3 needs prefix-state brackets from bounds/, which it does not give yet; no certificate written")
}
