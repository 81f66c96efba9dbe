package certify

import (
	"fmt"
	"math/big"
	"slices"
	"strings"
)

// Version is the certificate format version this package writes and
// checks: 4, brackets and the structure section on prefix states
// (docs/prefix-states.md). Versions 1 and 2 (order cells) and 3 (a
// structure section on order cells) are refused with a message that says
// how to re-issue the certificate.
const Version = 4

// Fixed strings of format version 4. A file whose strings differ is not a
// certificate.
const (
	Format        = "avoidcert certificate"
	EndMarker     = "avoidcert certificate end"
	Quantity      = "growth rate lambda = lim (a_n/n!)^(1/n)"
	Method        = "prefix-state Collatz-Wielandt"
	MethodVersion = 1
)

// Limits a certificate must respect; Read and Check refuse anything beyond
// them before doing work that depends on the values.
const (
	MaxFileSize     = 4 << 20 // bytes of a certificate file
	MaxNumberLength = 4096    // characters of any integer or rational string
	MaxDigits       = 1000    // significant digits of a decimal
	MaxN            = 1000    // n of a bracket
	MaxStep         = 64      // step d of a bracket
	MaxBrackets     = 1024
	MaxGiven        = 10000 // patterns as given
	MaxTokenLength  = 32    // characters of one given pattern
	MaxToolLength   = 200   // characters of the tool string
	// MaxStates is the most prefix states a set can have: every pattern
	// of length 0..8 (MaxPatternLength - 1), 0! + 1! + ... + 8!.
	MaxStates = 46234
)

// Certificate is a growth-rate certificate. Read returns fresh values;
// Marshal, Write and Check never modify a certificate or the numbers and
// permutations it points to. Derive fills the fields that follow from the
// others.
type Certificate struct {
	Tool      string // the producing tool and its version; free text, printable ASCII
	Statement Statement
	Evidence  Evidence
	// Structure is the structure section: a class and a lambda status
	// with their evidence, or nil for none (it is optional).
	Structure *Structure
}

// Statement is what the certificate claims.
type Statement struct {
	// Given lists the patterns as the user wrote them (one token each, digits
	// or dot-separated entries). Patterns is the irredundant set that
	// docs/certificate.md defines (the checker derives it with its own
	// parser) and Canonical its representative under reversal and
	// complement; both are derived.
	Given, Patterns, Canonical []string

	Lambda Range // the growth rate lambda; Hi is required
	Radius Range // 1/lambda; Hi is nil (infinite) exactly when Lambda.Lo is 0
	AllN   AllN  // explicit bounds on a_n/n! for every n >= N0
}

// Range is an interval [Lo, Hi] of exact rationals with outward decimals.
// LoDecimal is Lo rounded down and HiDecimal is Hi rounded up, both to Digits
// significant digits (derived; "" when the bound is nil). A nil Hi means +inf.
type Range struct {
	Lo, Hi               *big.Rat
	Digits               int
	LoDecimal, HiDecimal string
}

// AllN states, with A = AN0/N0!,
//
//	A MuLo^(n-N0) <= a_n/n! <= A MuHi^(n-N0)   for every n >= N0.
//
// A nil MuHi means no upper bound. N0 and AN0 are derived from the
// whole-system step-1 bracket with k = N0 - m.
type AllN struct {
	N0         int
	AN0        *big.Int
	MuLo, MuHi *big.Rat
}

// Evidence is what the checker recomputes for the bounds: brackets on the
// prefix states of the set (docs/prefix-states.md). The evidence of the
// structure section is in Certificate.Structure.
type Evidence struct {
	States   int // number of prefix states (derived)
	Brackets []Bracket
}

// Start is how a bracket's system starts (docs/prefix-states.md,
// "Systems").
type Start string

const (
	// StartEmpty: the whole system, G_0 = 1 on the empty state.
	StartEmpty Start = "empty"
	// StartOnes: a restricted system, G = 1 on every coefficient of its
	// states at n_s, the longest of them; its hi bounds the block from
	// above.
	StartOnes Start = "ones"
	// StartWhole: a restricted system started from the whole system's
	// iterate at n_s; its lo bounds lambda from below.
	StartWhole Start = "whole"
)

// Bracket is one coefficientwise Collatz-Wielandt bracket: with G_N the
// iterate of its system and H the d-fold integer elevation of G_N,
// Lo*H[a] <= G_(N+d)[a] <= Hi*H[a] at every state of the system and every
// composition a of N+d-|p|, which bounds lambda^d of that system to
// [Lo, Hi].
type Bracket struct {
	// States lists the prefix-state indices of the system, strictly
	// increasing; all states means the whole system.
	States []int
	// Start is StartEmpty for the whole system, StartOnes or StartWhole
	// for a restricted one.
	Start Start
	Step  int      // d >= 1
	N     int      // the bracket compares G_N and G_(N+d)
	Lo    *big.Rat // lower bound of lambda^d
	Hi    *big.Rat // upper bound of lambda^d; nil means +inf
	// Upper marks the brackets that carry the upper bound of lambda: one
	// whole-system bracket, or StartOnes brackets whose state sets
	// partition all states in an acyclic block order.
	Upper bool
	// IterateDigest is the SHA-256 of G_N's byte stream avoidcert-iterate-v3
	// (docs/prefix-states.md; derived).
	IterateDigest [32]byte
}

// Derive fills the derived fields of c from its free fields: Patterns and
// Canonical from Given, States, the decimals from the
// rationals, and the canonical order of the brackets. AN0 and the iterate
// digests need the iterates and are left to the producer, and so is the
// structure section (its derived fields come from the structure pass).
// Derive reports an error when Given does not parse; it does not check the
// mathematics (Check does).
func Derive(c *Certificate) error {
	set, err := parseSet(c.Statement.Given)
	if err != nil {
		return fmt.Errorf("statement: patterns given: %v", err)
	}
	c.Statement.Patterns = set.strings()
	c.Statement.Canonical = set.canonical().strings()
	c.Evidence.States = len(newStateSpace(set).states)
	for _, r := range []*Range{&c.Statement.Lambda, &c.Statement.Radius} {
		r.LoDecimal, r.HiDecimal = "", ""
		if r.Digits < 1 || r.Digits > MaxDigits {
			return fmt.Errorf("statement: digits %d out of range 1..%d", r.Digits, MaxDigits)
		}
		if r.Lo != nil && r.Lo.Sign() >= 0 {
			r.LoDecimal = decimalOutward(r.Lo, r.Digits, false)
		}
		if r.Hi != nil && r.Hi.Sign() >= 0 {
			r.HiDecimal = decimalOutward(r.Hi, r.Digits, true)
		}
	}
	slices.SortStableFunc(c.Evidence.Brackets, compareBrackets)
	return nil
}

// compareBrackets is the canonical bracket order: more states first, then
// the state lists lexicographically, then the start (empty, ones, whole),
// the step and N.
func compareBrackets(x, y Bracket) int {
	if len(x.States) != len(y.States) {
		return len(y.States) - len(x.States)
	}
	if c := slices.Compare(x.States, y.States); c != 0 {
		return c
	}
	if x.Start != y.Start {
		return strings.Compare(string(x.Start), string(y.Start))
	}
	if x.Step != y.Step {
		return x.Step - y.Step
	}
	return x.N - y.N
}
