package prove

import (
	"context"
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

// BuildCertificate turns a bracket result for the set of rep (iterated as sys,
// whole or by blocks) into a certificate whose ranges are printed with the
// given significant digits. Every bracket the enclosure rests on carries
// the upper bound; the explicit all-n bounds need a whole-system step-1
// bracket, taken here when the run did not have one (periodic or
// reducible sets). res must come from a run with Options.Digests.
func BuildCertificate(ctx context.Context, tool string, rep *structure.Report, sys transfer.System, res *bounds.Result, digits int) (*certify.Certificate, error) {
	set := rep.Set
	c := &certify.Certificate{Tool: tool, Structure: Structure(rep)}
	st := &c.Statement
	st.Given = set.Given()
	st.Lambda = certify.Range{Lo: res.Lambda.Lo, Hi: res.Lambda.Hi, Digits: digits}
	st.Radius = certify.Range{Lo: res.Radius.Lo, Hi: res.Radius.Hi, Digits: digits}
	if st.Radius.Lo == nil {
		st.Radius.Lo = new(big.Rat) // lambda = 0 exactly: the format has no infinite lower end
	}
	for _, br := range res.Brackets {
		c.Evidence.Brackets = append(c.Evidence.Brackets, certify.Bracket{
			Cells: br.Cells, Step: br.Step, K: br.K, Lo: br.Lo, Hi: br.Hi, Upper: true, IterateDigest: br.Digest})
	}
	explicit := res.Explicit
	if explicit == nil {
		k := 0
		if len(res.Brackets) > 0 {
			k = res.Brackets[0].K
		}
		whole, err := bounds.BracketAt(ctx, sys, k, 1, res.Prec)
		if err != nil {
			return nil, err
		}
		c.Evidence.Brackets = append(c.Evidence.Brackets, certify.Bracket{
			Cells: whole.Cells, Step: 1, K: whole.K, Lo: whole.Lo, Hi: whole.Hi, IterateDigest: whole.Digest})
		explicit = &bounds.AllN{N0: whole.N0(), AN0: whole.Sum, MuLo: whole.Lo, MuHi: whole.Hi}
	}
	st.AllN = certify.AllN{N0: explicit.N0, AN0: explicit.AN0, MuLo: explicit.MuLo, MuHi: explicit.MuHi}
	if err := certify.Derive(c); err != nil {
		return nil, err
	}
	return c, nil
}
