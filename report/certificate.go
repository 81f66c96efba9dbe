package report

import (
	"bytes"
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"math"
	"math/big"
	"strings"

	"avoidcert/certify"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prove"
	"avoidcert/transfer"
)

// Point is one point of a figure: a positive quantity at n, kept as its
// base-10 logarithm, since a certificate's widths reach 10^-995, far
// below the smallest float64.
type Point struct {
	N     int
	Log10 float64
}

// Ratio compares one ratio of exact counts with the certified range: the
// ratio r_n = a_(n+d)·n!/((n+d)!·a_n), d the ratio's step, against the
// certified range of lambda^d.
type Ratio struct {
	N int
	// Inside reports that r_n lies in the certified range of lambda^d: its
	// distance from lambda^d is then below what the certificate resolves.
	Inside bool
	// Log10 is log10 |r_n - m|, m the midpoint of the certified range of
	// lambda^d, when r_n lies outside that range (then the distance is
	// above the range's half-width); 0 when Inside.
	Log10 float64
}

// Certificate is what a report states about one checked certificate.
type Certificate struct {
	Name   string // the file name as given, used in the re-check command
	SHA256 [32]byte
	Cert   *certify.Certificate
	Form   prove.Form
	// Widths are the widths of the certified enclosure of lambda after
	// each bracket of a recomputed run to the certificate's digits.
	Widths []Point
	// Rate is the observed factor per unit of n by which the width shrinks
	// (a least-squares fit of log width against n): an estimate.
	Rate float64
	// RatioStep is the step d of the ratios: the period of a periodic
	// set (whose one-step ratios need not converge), else 1.
	RatioStep int
	// Ratios are the ratios of exact counts at n = 1, 2, ... up to the
	// last n of the recomputed bracket run (fewer when the counts would
	// take more than ratioMemory, or a_n = 0 from some n on). For
	// primitive sets (and periodic ones, with their step) they tend to
	// lambda^d.
	Ratios []Ratio
	// HalfWidth is log10 of half the width of the certified range of
	// lambda^d (lambda for d = 1); NaN when the range has no upper end.
	HalfWidth float64
	// Digits is the number of leading digits the certified ends share.
	Digits int
}

// The ratios run to the last n of the bracket run, at least minRatioN, and
// stop earlier when the counts would take more than ratioMemory.
const (
	minRatioN   = 20
	ratioMemory = 256 << 20
)

// FromCertificate reads a certificate, has the checker verify it and
// recomputes the figures' data.
func FromCertificate(ctx context.Context, name string, data []byte) (*Certificate, error) {
	c, err := checked(ctx, name, data)
	if err != nil {
		return nil, err
	}
	set, err := pattern.ParseSet(c.Statement.Given)
	if err != nil {
		return nil, err
	}
	r := &Certificate{Name: name, SHA256: sha256.Sum256(data), Cert: c, Form: prove.FormOf(c)}
	if err := r.recompute(ctx, set); err != nil {
		return nil, fmt.Errorf("%s: recomputing the figures: %v", name, err)
	}
	return r, nil
}

// checked reads a certificate and has the checker accept it for its own
// pattern set, as the certificate gives it (read by the checker alone).
func checked(ctx context.Context, name string, data []byte) (*certify.Certificate, error) {
	c, err := certify.Read(bytes.NewReader(data))
	if err != nil {
		// as 'check' says: a file that does not read as a certificate is
		// an invalid certificate (exit 1), not unreadable input (exit 2)
		return nil, refused{fmt.Errorf("%s: the checker refuses the certificate: %s", name, strings.TrimPrefix(err.Error(), "certificate: "))}
	}
	if err := prove.Recheck(ctx, c, pattern.Set{}, prove.Options{Typed: c.Statement.Given}); err != nil {
		switch {
		case ctx.Err() != nil:
			return nil, ctx.Err()
		case errors.Is(err, prove.ErrBudget):
			return nil, fmt.Errorf("%s: %w", name, err) // not refused: over the checker's limits
		}
		return nil, refused{fmt.Errorf("%s: the checker refuses the certificate: %v", name, err)}
	}
	return c, nil
}

func (r *Certificate) recompute(ctx context.Context, set pattern.Set) error {
	var widths []Point
	progress := func(e prove.Event) {
		if e.Bracket == nil || !e.Lambda.Finite() {
			return
		}
		if w := e.Lambda.Width(); w.Sign() > 0 {
			widths = append(widths, Point{N: e.N, Log10: log10Rat(w)})
		}
	}
	digits := max(r.Cert.Statement.Lambda.Digits-3, 1)
	if _, err := prove.Certify(ctx, set, prove.Options{Digits: digits, Progress: progress}); err != nil {
		return err
	}
	r.Widths, r.Rate = widths, fitRate(widths)
	r.RatioStep = 1
	if r.Form.Class == certify.ClassPeriodic && r.Form.Period > 1 {
		r.RatioStep = r.Form.Period
	}
	r.HalfWidth = math.NaN()
	lam := r.Cert.Statement.Lambda
	if lam.Lo == nil || lam.Hi == nil {
		return nil
	}
	r.Digits = interval.CommonDigits(lam.Lo, lam.Hi)
	last := minRatioN
	for _, w := range widths {
		last = max(last, w.N)
	}
	return r.ratios(ctx, set, last)
}

// ratios fills Ratios for n = 1..last (or less, within ratioMemory) and
// HalfWidth, from exact counts and the certified range of lambda^d.
func (r *Certificate) ratios(ctx context.Context, set pattern.Set, last int) error {
	d := r.RatioStep
	M := last + d
	for M > minRatioN && transfer.CountsFootprint(set, M) > ratioMemory {
		M -= max(M/10, 1)
	}
	counts, err := transfer.Counts(ctx, set, M, nil)
	if err != nil {
		return err
	}
	lam := r.Cert.Statement.Lambda
	lo, hi := ratPow(lam.Lo, d), ratPow(lam.Hi, d)
	mid := new(big.Rat).Add(lo, hi)
	mid.Quo(mid, big.NewRat(2, 1))
	if hw := new(big.Rat).Sub(hi, mid); hw.Sign() > 0 {
		r.HalfWidth = log10Rat(hw)
	}
	for n := 1; n+d <= M; n++ {
		if counts[n].Sign() == 0 {
			break
		}
		// r_n = a_(n+d) / (a_n·(n+1)···(n+d))
		q := new(big.Rat).SetFrac(counts[n+d], new(big.Int).Mul(counts[n], new(big.Int).MulRange(int64(n+1), int64(n+d))))
		if q.Cmp(lo) >= 0 && q.Cmp(hi) <= 0 {
			r.Ratios = append(r.Ratios, Ratio{N: n, Inside: true})
			continue
		}
		r.Ratios = append(r.Ratios, Ratio{N: n, Log10: log10Rat(q.Sub(q, mid).Abs(q))})
	}
	return nil
}

// ratPow is x^d, a fresh value.
func ratPow(x *big.Rat, d int) *big.Rat {
	p := big.NewRat(1, 1)
	for range d {
		p.Mul(p, x)
	}
	return p
}

// log10Rat is log10 of x > 0 to about float64 precision, for any size of
// x: x = m·2^e with m in [1/2, 1), so log10 x = log10 m + e·log10 2.
func log10Rat(x *big.Rat) float64 {
	var m big.Float
	e := new(big.Float).SetPrec(64).SetRat(x).MantExp(&m)
	f, _ := m.Float64()
	return math.Log10(f) + float64(e)*math.Log10(2)
}

// fitRate fits log10(width) = a + n log10(rate) by least squares over the
// second half of the points (the first brackets are far from the limit).
func fitRate(ps []Point) float64 {
	ps = ps[len(ps)/2:]
	if len(ps) < 2 {
		return math.NaN()
	}
	var sx, sy, sxx, sxy float64
	for _, p := range ps {
		x, y := float64(p.N), p.Log10
		sx, sy, sxx, sxy = sx+x, sy+y, sxx+x*x, sxy+x*y
	}
	k := float64(len(ps))
	den := k*sxx - sx*sx
	if den == 0 {
		return math.NaN()
	}
	return math.Pow(10, (k*sxy-sx*sy)/den)
}

// FirstInside is the least n from which every ratio lies inside the
// certified range, or 0 when the last one does not.
func (r *Certificate) FirstInside() int {
	first := 0
	for i := len(r.Ratios) - 1; i >= 0 && r.Ratios[i].Inside; i-- {
		first = r.Ratios[i].N
	}
	return first
}

// Patterns is the irredundant set as the certificate states it.
func (r *Certificate) Patterns() []string { return r.Cert.Statement.Patterns }

// Lambda returns the certified range of lambda, printed outward.
func (r *Certificate) Lambda() (lo, hi string) { return rangeOf(r.Cert.Statement.Lambda) }

// Radius returns the certified range of 1/lambda ("inf" for no upper end).
func (r *Certificate) Radius() (lo, hi string) { return rangeOf(r.Cert.Statement.Radius) }

func rangeOf(x certify.Range) (lo, hi string) {
	lo, hi = "0", "inf"
	if x.Lo != nil {
		lo = interval.DecimalDown(x.Lo, x.Digits)
	}
	if x.Hi != nil {
		hi = interval.DecimalUp(x.Hi, x.Digits)
	}
	return lo, hi
}

// AllN is the certificate's bound for every n >= N0, with A = a_N0/N0!
// and the rates printed outward: ALo*MuLo^(n-N0) <= a_n/n! <= AHi*MuHi^(n-N0).
type AllN struct {
	N0                   int
	ALo, AHi, MuLo, MuHi string // MuHi "" when there is no upper bound
}

// Bound returns the bound for every n at the certificate's digits.
func (r *Certificate) Bound() AllN {
	a := r.Cert.Statement.AllN
	d := r.Cert.Statement.Lambda.Digits
	A := new(big.Rat).SetFrac(a.AN0, new(big.Int).MulRange(1, int64(a.N0)))
	out := AllN{N0: a.N0, ALo: interval.DecimalDown(A, d), AHi: interval.DecimalUp(A, d), MuLo: interval.DecimalDown(a.MuLo, d)}
	if a.MuHi != nil {
		out.MuHi = interval.DecimalUp(a.MuHi, d)
	}
	return out
}

// Digest is the SHA-256 of the certificate's bytes, in hex.
func (r *Certificate) Digest() string { return fmt.Sprintf("%x", r.SHA256) }

// Recheck is the command that re-verifies the certificate.
func (r *Certificate) Recheck() string {
	cmd := "avoidcert check " + shellQuote(r.Name)
	for _, p := range r.Cert.Statement.Given {
		cmd += " --expect " + p
	}
	return cmd
}

func shellQuote(s string) string {
	for _, c := range s {
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '.' || c == '/' || c == '-' || c == '_') {
			return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
		}
	}
	return s
}

// Asymptotics states the asymptotic form the certificate's structure
// section proves, in words with plain-text formulas.
func (r *Certificate) Asymptotics() string {
	switch r.Form.Class {
	case certify.ClassPrimitive:
		return "primitive: a_n/n! = c·λ^n·(1 + O(θ^n)) with c > 0 and θ < 1"
	case certify.ClassPeriodic:
		return fmt.Sprintf("periodic with period %d: a_n/n! = λ^n·(c_(n mod %d) + o(1)), constants c_r ≥ 0; one constant for every n is not proved", r.Form.Period, r.Form.Period)
	case certify.ClassReducible:
		return "reducible: λ is the largest growth rate of the strongly connected blocks; no form a_n/n! ~ c·λ^n is proved"
	case certify.ClassFinite:
		return "finite: a_n = 0 for every large n"
	case certify.ClassSubexponential:
		return "subexponential: λ = 0, and a_n > 0 for every n"
	}
	return "undecided: the certificate has no structure section"
}

// refused marks a certificate the checker did not accept.
type refused struct{ error }

// IsRefused reports whether err says the checker refused a certificate.
func IsRefused(err error) bool {
	_, ok := err.(refused)
	return ok
}
