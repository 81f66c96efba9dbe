package report

import (
	"fmt"
	"math/big"
	"strings"

	"avoidcert/certify"
	"avoidcert/claims"
	"avoidcert/prove"
)

// certifiedPart is one certified range of a claim's row: symbol ∈ [lo, hi].
type certifiedPart struct {
	symbol string // λ, 1/λ, λ(1324)
	tex    string // the symbol in LaTeX math
	lo, hi string // outward decimals
}

// comparison is what a claim's re-checked certificates say of the claim as
// its line restates it: the certified ranges, a few words, and whether
// they bear the claim out, contradict it, or leave it open.
type comparison struct {
	parts []certifiedPart
	words string
	// bears is +1 when the certificates prove the claim as restated, -1
	// when they refute it, 0 when they decide nothing (or there are none).
	bears int
}

// compare reads claim c against its certificates, all re-checked (nil when
// a file was not found: then nothing is compared). Claims on counts have
// no certificate.
func compare(c GateClaim, checked []CheckedCertificate) comparison {
	if len(c.Certificates) == 0 {
		return comparison{words: "no certificate: exact counts, not recomputed here"}
	}
	var certs []*certify.Certificate
	var missing []string
	for i, ch := range checked {
		switch {
		case ch.Cert != nil:
			certs = append(certs, ch.Cert)
		case c.Certificates[i].Path == "":
			return comparison{words: "not re-checked: the gate kept no certificate (run it with --certificates)"}
		default:
			missing = append(missing, c.Certificates[i].Path)
		}
	}
	if len(missing) > 0 {
		return comparison{words: fmt.Sprintf("not re-checked: certificate not found (%s)", strings.Join(missing, ", "))}
	}
	switch c.Kind {
	case claims.KindForm:
		return compareForm(c.Claim, prove.FormOf(certs[0]))
	case claims.KindOrder:
		return compareOrder(certs)
	}
	st := certs[0].Statement
	lam, rad := rangePart("λ", `\lambda`, st.Lambda), rangePart("1/λ", `1/\lambda`, st.Radius)
	switch c.Claim.Quantity {
	case "lambda":
		return compareRange(lam, st.Lambda, c.Claim.Claimed)
	case "radius":
		return compareRange(rad, st.Radius, c.Claim.Claimed)
	}
	return comparison{parts: []certifiedPart{lam, rad}} // a line that does not say which
}

func rangePart(symbol, tex string, x certify.Range) certifiedPart {
	lo, hi := rangeOf(x)
	return certifiedPart{symbol, tex, lo, hi}
}

// compareRange sets a certified range against the claimed interval (a
// missing end unbounded): inside it proves the claim, apart from it
// refutes it, across an end leaves it open at these digits.
func compareRange(p certifiedPart, x certify.Range, claimed *claims.JSONEnds) comparison {
	out := comparison{parts: []certifiedPart{p}}
	if claimed == nil {
		return out
	}
	lo, okLo := endOf(claimed.Lo)
	hi, okHi := endOf(claimed.Hi)
	if !okLo || !okHi {
		out.words = "the claimed interval does not read as decimals"
		return out
	}
	// x.Hi nil: no upper end, +inf
	below := func(a, b *big.Rat) bool { return a != nil && b != nil && a.Cmp(b) < 0 }
	switch {
	case (lo == nil || x.Lo.Cmp(lo) >= 0) && (hi == nil || (x.Hi != nil && x.Hi.Cmp(hi) <= 0)):
		out.words, out.bears = "inside the claimed interval", 1
	case below(x.Hi, lo) || below(hi, x.Lo):
		out.words, out.bears = "outside the claimed interval", -1
	default:
		out.words = "across an end of the claimed interval: not decided at these digits"
	}
	return out
}

// endOf reads an end of a claimed interval (nil: unbounded).
func endOf(s *string) (*big.Rat, bool) {
	if s == nil {
		return nil, true
	}
	r, ok := new(big.Rat).SetString(*s)
	return r, ok
}

// compareOrder compares lambda of an order claim's two sets: the claim is
// lambda(first) < lambda(second).
func compareOrder(certs []*certify.Certificate) comparison {
	var out comparison
	for _, cert := range certs {
		set := strings.Join(cert.Statement.Patterns, ",")
		out.parts = append(out.parts, rangePart("λ("+set+")", `\lambda(`+set+")", cert.Statement.Lambda))
	}
	if len(certs) != 2 {
		return out
	}
	a, b := certs[0].Statement.Lambda, certs[1].Statement.Lambda
	name := func(c *certify.Certificate) string { return "λ(" + strings.Join(c.Statement.Patterns, ",") + ")" }
	switch {
	case a.Hi != nil && b.Lo != nil && a.Hi.Cmp(b.Lo) < 0:
		out.words, out.bears = fmt.Sprintf("disjoint: %s < %s, as claimed", name(certs[0]), name(certs[1])), 1
	case b.Hi != nil && a.Lo != nil && b.Hi.Cmp(a.Lo) < 0:
		out.words, out.bears = fmt.Sprintf("disjoint: %s > %s, contrary to the claim", name(certs[0]), name(certs[1])), -1
	default:
		out.words = "the ranges overlap: not ordered at these digits"
	}
	return out
}

// compareForm sets the checked structure class against the claimed form
// (a period of 0: any).
func compareForm(claim claims.JSONClaim, f prove.Form) comparison {
	out := comparison{words: formShort(f)}
	switch {
	case claim.Form == "" || f.Class == certify.ClassUndecided:
	case string(f.Class) == claim.Form && (claim.Period == 0 || claim.Period == f.Period):
		out.words, out.bears = out.words+", as claimed", 1
	default:
		out.words, out.bears = out.words+", not the claimed form", -1
	}
	return out
}

// formShort is a structure class in a few words.
func formShort(f prove.Form) string {
	switch f.Class {
	case certify.ClassPrimitive:
		return fmt.Sprintf("primitive (primitivity exponent %d)", f.Exponent)
	case certify.ClassPeriodic:
		return fmt.Sprintf("periodic, period %d", f.Period)
	case certify.ClassReducible:
		return fmt.Sprintf("reducible (%d blocks)", f.Blocks)
	}
	return string(f.Class)
}

// contradicts reports that a recorded verdict says the opposite of what
// the claim's re-checked certificates prove of it.
func (cmp comparison) contradicts(v claims.Verdict) bool {
	return cmp.bears > 0 && v == claims.Refuted || cmp.bears < 0 && v == claims.Proved
}
