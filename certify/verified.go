package certify

import (
	"fmt"
	"strings"
)

// Verified is what a certificate proves, in the words and decimals a
// reader is shown: the checker's own statement of it, so that nothing
// printed as verified passes through the engine's code. Summarize it only
// from a certificate that Check accepted.
type Verified struct {
	Patterns []string // the irredundant set
	Window   int      // the length of its longest pattern
	// Class is the structure class, "" when the certificate has no
	// structure section. Exponent is the primitivity exponent e of a
	// primitive class, Period p of a periodic one, N1 the first n with
	// a_n = 0 of a finite one, Blocks the blocks of recurrent states of a
	// reducible one; zero or nil where they do not apply. LambdaStatus is
	// "positive", "zero" or "undecided" ("" without a structure section),
	// and CyclicAvoider its evidence when positive.
	Class                string
	Exponent, Period, N1 int
	Blocks               [][]int
	LambdaStatus         string
	CyclicAvoider        string
	// Lambda and Radius are the statement's outward decimals, checked
	// against their rationals; an infinite end is "".
	Lambda, Radius [2]string
	Brackets       []string // each bracket in words
	N              []int    // each bracket's n
	// AllN is the bound for every n >= n0 with its rates rounded outward
	// at the digits of lambda, or nil when a_n0 is 0.
	AllN *VerifiedAllN
}

// VerifiedAllN is A*Lo^(n-N0) <= a_n/n! <= A*Hi^(n-N0) for every n >= N0,
// A = AN0/N0!; Lo or Hi is "" when the certificate states no such rate
// (or a rate of 0).
type VerifiedAllN struct {
	N0     int
	AN0    string
	Lo, Hi string
}

// Summarize states what c proves. It reads c and does not check it.
func Summarize(c *Certificate) Verified {
	st := c.Statement
	v := Verified{
		Patterns: append([]string(nil), st.Patterns...),
		Lambda:   [2]string{st.Lambda.LoDecimal, st.Lambda.HiDecimal},
		Radius:   [2]string{st.Radius.LoDecimal, st.Radius.HiDecimal},
	}
	for _, p := range st.Patterns {
		v.Window = max(v.Window, patternLength(p))
	}
	if s := c.Structure; s != nil {
		v.Class, v.Exponent, v.Period, v.N1 = string(s.Class), s.Exponent, s.Period, s.N1
		v.LambdaStatus = string(s.Lambda)
		for _, b := range s.Blocks {
			v.Blocks = append(v.Blocks, append([]int(nil), b...))
		}
		if s.CyclicAvoider != nil {
			v.CyclicAvoider = formatPerm(s.CyclicAvoider)
		}
	}
	for _, b := range c.Evidence.Brackets {
		v.N = append(v.N, b.N)
		v.Brackets = append(v.Brackets, bracketInWords(b, c.Evidence.States))
	}
	if a := st.AllN; a.AN0 != nil && a.AN0.Sign() > 0 {
		v.AllN = &VerifiedAllN{N0: a.N0, AN0: a.AN0.String()}
		if a.MuLo != nil && a.MuLo.Sign() > 0 {
			v.AllN.Lo = decimalOutward(a.MuLo, st.Lambda.Digits, false)
		}
		if a.MuHi != nil && a.MuHi.Sign() > 0 {
			v.AllN.Hi = decimalOutward(a.MuHi, st.Lambda.Digits, true)
		}
	}
	return v
}

func bracketInWords(b Bracket, states int) string {
	system := "the whole system"
	if len(b.States) < states {
		system = fmt.Sprintf("%d of the %d prefix states (start %s)", len(b.States), states, b.Start)
	}
	return fmt.Sprintf("bracket of G_%d against G_%d, step %d, on %s", b.N, b.N+b.Step, b.Step, system)
}

// LambdaZero reports whether the certificate proves lambda = 0 (its
// structure section, or an upper end of 0): then 1/lambda has no value,
// and Lines says so rather than print an interval up to infinity.
func (v Verified) LambdaZero() bool {
	return v.LambdaStatus == string(LambdaZero) || v.Lambda[1] == "0"
}

// Lines states v one claim a line, in plain text.
func (v Verified) Lines() []string {
	end := func(s string) string {
		if s == "" {
			return "inf"
		}
		return s
	}
	radius := fmt.Sprintf("1/lambda in [%s, %s]", end(v.Radius[0]), end(v.Radius[1]))
	if v.LambdaZero() {
		radius = "1/lambda: none (lambda = 0)"
	}
	lines := []string{
		fmt.Sprintf("the set %s (window length %d)", strings.Join(v.Patterns, ","), v.Window),
		fmt.Sprintf("lambda   in [%s, %s]", end(v.Lambda[0]), end(v.Lambda[1])),
		radius,
	}
	switch {
	case v.Class == "":
		lines = append(lines, "no structure section: the class is not certified")
	case v.Exponent > 0:
		lines = append(lines, fmt.Sprintf("class %s, primitivity exponent k = %d", v.Class, v.Exponent))
	case v.Period > 0:
		lines = append(lines, fmt.Sprintf("class %s, period %d", v.Class, v.Period))
	case v.N1 > 0:
		lines = append(lines, fmt.Sprintf("class %s, a_n = 0 exactly from n = %d on", v.Class, v.N1))
	case v.Blocks != nil:
		lines = append(lines, fmt.Sprintf("class %s, %d block(s) of recurrent states", v.Class, len(v.Blocks)))
	default:
		lines = append(lines, "class "+v.Class)
	}
	switch v.LambdaStatus {
	case string(LambdaPositive):
		lines = append(lines, fmt.Sprintf("lambda > 0 proved: %s is a cyclic avoider (length %d)", v.CyclicAvoider, patternLength(v.CyclicAvoider)))
	case string(LambdaZero):
		lines = append(lines, "lambda = 0 proved: no cyclic avoider of any length")
	case string(LambdaUndecided):
		lines = append(lines, "lambda > 0 undecided")
	}
	lines = append(lines, v.Brackets...)
	if a := v.AllN; a != nil {
		var lower, upper string
		if a.Lo != "" {
			lower = fmt.Sprintf("A*%s^(n-%d) <= ", a.Lo, a.N0)
		}
		if a.Hi != "" {
			upper = fmt.Sprintf(" <= A*%s^(n-%d)", a.Hi, a.N0)
		}
		lines = append(lines, fmt.Sprintf("for every n >= %d: %sa_n/n!%s, A = a_%d/%d!, a_%d = %s",
			a.N0, lower, upper, a.N0, a.N0, a.N0, shortInteger(a.AN0)))
	}
	return lines
}

// shortInteger shows a long integer by its first and last digits.
func shortInteger(s string) string {
	if len(s) <= 40 {
		return s
	}
	return fmt.Sprintf("%s...%s (%d digits)", s[:15], s[len(s)-15:], len(s))
}

// patternLength is the number of entries of a pattern in its one
// spelling: digits, or entries separated by dots.
func patternLength(p string) int {
	if strings.Contains(p, ".") {
		return strings.Count(p, ".") + 1
	}
	return len(p)
}
