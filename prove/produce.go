package prove

import (
	"context"
	"math/big"
	"slices"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/interval"
	"avoidcert/structure"
	"avoidcert/transfer"
)

// Structure states the structure test's result in the certificate's
// terms (format version 4, docs/certificate.md): the class with its
// exponent, period, N1 or blocks, the lambda status, and the evidence the
// checker recomputes (the recurrent states, |D|, the joint cycle) or
// verifies (the cyclic avoider). The slices are copies.
func Structure(rep *structure.Report) *certify.Structure {
	st := &certify.Structure{Class: certify.StructureClass(rep.Class), Lambda: certify.LambdaStatus(rep.Lambda)}
	switch rep.Class {
	case structure.Primitive:
		st.Exponent = rep.Exponent
	case structure.Periodic:
		st.Period = rep.Period
	case structure.Finite:
		st.N1 = rep.N1
	case structure.Reducible:
		for _, b := range rep.Blocks {
			st.Blocks = append(st.Blocks, slices.Clone(b))
		}
	}
	if rep.Class != structure.Finite && rep.Class != structure.Undecided {
		st.Recurrent = slices.Clone(rep.Recurrent)
		st.Configurations = rep.Configurations
	}
	switch rep.Class {
	case structure.Periodic, structure.Reducible, structure.Subexponential:
		st.CycleStart, st.CycleLength = rep.CycleStart, rep.CycleLength
	}
	if rep.Lambda == structure.LambdaPositive {
		st.CyclicAvoider = slices.Clone([]int(rep.CyclicAvoider))
	}
	return st
}

// BuildCertificate turns a bracket result for the set of rep (bracketed
// on rep's prefix states, whole or by blocks) into a format version 4
// certificate whose ranges are printed with the given significant digits.
// Every bracket of the result is listed with its states, start, step, N
// and digest; those marked upper carry the upper bound (the whole system,
// or the ones-start blocks that partition the states). The explicit all-n
// bounds need a whole-system step-1 bracket, taken here when the run did
// not have one (periodic or reducible sets). res must come from a run
// with Options.Digests.
func BuildCertificate(ctx context.Context, tool string, rep *structure.Report, res *bounds.Result, digits int) (*certify.Certificate, error) {
	set, st := rep.Set, rep.States
	c := &certify.Certificate{Tool: tool, Structure: Structure(rep)}
	stmt := &c.Statement
	stmt.Given = set.Given()
	stmt.Lambda = certify.Range{Lo: res.Lambda.Lo, Hi: res.Lambda.Hi, Digits: digits}
	stmt.Radius = certify.Range{Lo: res.Radius.Lo, Hi: res.Radius.Hi, Digits: digits}
	if stmt.Radius.Lo == nil {
		stmt.Radius.Lo = new(big.Rat) // lambda = 0 exactly: the format has no infinite lower end
	}
	short := shortener{prec: res.Prec + 64, lambda: res.Lambda}
	for _, br := range res.Brackets {
		c.Evidence.Brackets = append(c.Evidence.Brackets, short.bracket(br, br.Upper))
	}
	explicit := res.Explicit
	if explicit == nil {
		n := st.MaxLength() // at the latest bracket's n: the iterate is closest to its limit shape there
		for _, br := range res.Brackets {
			n = max(n, br.N)
		}
		whole, err := bounds.BracketAt(ctx, transfer.Whole(st), n, 1, res.Prec)
		if err != nil {
			return nil, err
		}
		b := short.bracket(*whole, false)
		c.Evidence.Brackets = append(c.Evidence.Brackets, b)
		explicit = &bounds.AllN{N0: whole.N, AN0: whole.Sum, MuLo: b.Lo, MuHi: b.Hi}
	}
	stmt.AllN = certify.AllN{N0: explicit.N0, AN0: explicit.AN0, MuLo: explicit.MuLo, MuHi: explicit.MuHi}
	if err := certify.Derive(c); err != nil {
		return nil, err
	}
	return c, nil
}

// shortener writes brackets with short bounds. A bracket's exact ends are
// ratios of iterate coefficients, with about as many digits as n!; any lo'
// <= lo and hi' >= hi pass the same coefficientwise test, so each end is
// rounded outward to prec significant bits (a few dozen more than the
// statement's), unless that would stop it from carrying an end of the
// statement's lambda interval it carried exactly (lambda.lo^d <= lo,
// hi <= lambda.hi^d), when it stays exact.
// This keeps every number far below the format's length limit.
type shortener struct {
	prec   uint
	lambda bounds.Enclosure
}

// bracket states one bracket of the engine in the certificate's terms.
func (s shortener) bracket(br bounds.Bracket, upper bool) certify.Bracket {
	lo, hi := br.Lo, br.Hi
	if lo != nil && lo.Sign() > 0 {
		r := interval.RoundDown(lo, s.prec)
		if end := s.lambda.Lo; end == nil || pow(end, br.Step).Cmp(r) <= 0 || pow(end, br.Step).Cmp(lo) > 0 {
			lo = r
		}
	}
	if hi != nil && hi.Sign() > 0 {
		r := interval.RoundUp(hi, s.prec)
		if end := s.lambda.Hi; end == nil || pow(end, br.Step).Cmp(r) >= 0 || pow(end, br.Step).Cmp(hi) < 0 {
			hi = r
		}
	}
	return certify.Bracket{States: append([]int(nil), br.States...), Start: certify.Start(br.Start), Step: br.Step,
		N: br.N, Lo: lo, Hi: hi, Upper: upper, IterateDigest: br.Digest}
}

// pow returns r^d exactly.
func pow(r *big.Rat, d int) *big.Rat {
	p := new(big.Rat).SetInt64(1)
	for range d {
		p.Mul(p, r)
	}
	return p
}
