package certify

import (
	"fmt"
	"math/big"
	"slices"

	"avoidcert/pattern"
)

// Format versions. Version 2 is version 1 with a structure section; Marshal
// writes version 2 for a certificate with a Structure and version 1
// (exactly the version 1 format) for one without, and Read and Check
// accept both.
const (
	Version  = 2
	Version1 = 1
)

// Fixed strings of format versions 1 and 2. A file whose strings differ is
// not a certificate.
const (
	Format        = "avoidcert certificate"
	EndMarker     = "avoidcert certificate end"
	Quantity      = "growth rate lambda = lim (a_n/n!)^(1/n)"
	Method        = "coefficientwise Collatz-Wielandt"
	MethodVersion = 1
)

// Limits a certificate must respect; Read and Check refuse anything beyond
// them before doing work that depends on the values.
const (
	MaxFileSize     = 4 << 20 // bytes of a certificate file
	MaxNumberLength = 4096    // characters of any integer or rational string
	MaxDigits       = 1000    // significant digits of a decimal
	MaxK            = 1000    // degree k of a bracket
	MaxStep         = 64      // step d of a bracket
	MaxBrackets     = 1024
	MaxGiven        = 10000   // patterns as given
	MaxTokenLength  = 32      // characters of one given pattern
	MaxToolLength   = 200     // characters of the tool string
	MaxWitnesses    = 3628800 // witnesses of a structure section: (2m)! at m = 5
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
	// with their evidence. nil makes a format version 1 certificate.
	Structure *Structure
}

// Statement is what the certificate claims.
type Statement struct {
	// Given lists the patterns as the user wrote them (one token each, digits
	// or dot-separated entries). Patterns is the irredundant set that
	// pattern.ParseSet makes of them and Canonical its symmetry-class
	// representative (Set.Canonical); both are derived.
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

// Evidence is what the checker recomputes for the bounds. The evidence of
// the structure section is in Certificate.Structure.
type Evidence struct {
	CellLength int // m = longest pattern length - 1 (derived)
	Brackets   []Bracket
}

// Bracket is one coefficientwise Collatz-Wielandt bracket: with G_k the
// iterate of the system on Cells and H = the d-fold integer degree elevation
// of G_k, Lo*H[a] <= G_{k+d}[a] <= Hi*H[a] at every index a of degree k+d,
// which bounds lambda^d of that system to [Lo, Hi].
type Bracket struct {
	// Cells lists the order cells of the system (ranks of permutations of
	// 1..m), strictly increasing. All m! cells means the whole system; a
	// proper subset means the restricted system on those cells.
	Cells []int
	Step  int      // d >= 1
	K     int      // k >= 0
	Lo    *big.Rat // lower bound of lambda^d
	Hi    *big.Rat // upper bound of lambda^d; nil means +inf
	// Upper marks the brackets that carry the upper bound of lambda: one
	// whole-system bracket, or brackets whose cell sets partition all
	// cells in an acyclic block order of the window digraph.
	Upper bool
	// IterateDigest is the SHA-256 of the canonical byte stream of G_k
	// (derived).
	IterateDigest [32]byte
}

// Derive fills the derived fields of c from its free fields: Patterns and
// Canonical from Given, CellLength, the decimals from the rationals, and the
// canonical order of the brackets. AN0 and the iterate digests need the
// iterates and are left to the producer, and so is the structure section
// (its derived fields come from the structure pass). Derive reports an error when Given
// does not parse; it does not check the mathematics (Check does).
func Derive(c *Certificate) error {
	set, err := pattern.ParseSet(c.Statement.Given)
	if err != nil {
		return fmt.Errorf("statement: patterns given: %v", err)
	}
	c.Statement.Patterns = set.Strings()
	c.Statement.Canonical = set.Canonical().Strings()
	c.Evidence.CellLength = set.Window() - 1
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

// compareBrackets is the canonical bracket order: more cells first, then
// the cell lists lexicographically, then the step, then k.
func compareBrackets(x, y Bracket) int {
	if len(x.Cells) != len(y.Cells) {
		return len(y.Cells) - len(x.Cells)
	}
	if c := slices.Compare(x.Cells, y.Cells); c != 0 {
		return c
	}
	if x.Step != y.Step {
		return x.Step - y.Step
	}
	return x.K - y.K
}
