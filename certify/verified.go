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
	// structure section. Period is 1 for a primitive class and p for a
	// periodic one, Exponent e for a primitive one; 0 where they do not
	// apply.
	Class            string
	Period, Exponent int
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
		Window:   c.Evidence.CellLength + 1,
		Lambda:   [2]string{st.Lambda.LoDecimal, st.Lambda.HiDecimal},
		Radius:   [2]string{st.Radius.LoDecimal, st.Radius.HiDecimal},
	}
	if s := c.Structure; s != nil {
		v.Class, v.Period, v.Exponent = string(s.Class), s.Period, s.Exponent
		if s.Class == ClassPrimitive {
			v.Period = 1
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

// Lines states v one claim a line, in plain text.
func (v Verified) Lines() []string {
	end := func(s string) string {
		if s == "" {
			return "inf"
		}
		return s
	}
	lines := []string{
		fmt.Sprintf("the set %s (window length %d)", strings.Join(v.Patterns, ","), v.Window),
		fmt.Sprintf("lambda   in [%s, %s]", end(v.Lambda[0]), end(v.Lambda[1])),
		fmt.Sprintf("1/lambda in [%s, %s]", end(v.Radius[0]), end(v.Radius[1])),
	}
	switch {
	case v.Class == "":
		lines = append(lines, "no structure section: the class is not certified")
	case v.Exponent > 0:
		lines = append(lines, fmt.Sprintf("class %s, exponent %d", v.Class, v.Exponent))
	case v.Period > 1:
		lines = append(lines, fmt.Sprintf("class %s, period %d", v.Class, v.Period))
	default:
		lines = append(lines, "class "+v.Class)
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
