package certify

import (
	"fmt"
	"strconv"
	"strings"
)

// StructureClass names a property of a pattern set that a certificate
// states and the checker proves on the prefix states (docs/certificate.md,
// "What each class proves"). The strings are those of structure.Class.
type StructureClass string

const (
	// ClassPrimitive: R_e is the domain D of joint configurations and no
	// earlier R_k is, so T'^e has an a.e.-positive kernel on the recurrent
	// states.
	ClassPrimitive StructureClass = "primitive"
	// ClassPeriodic: one block of recurrent states; the R_k repeat with
	// period p >= 2, and the p sets of the cycle are disjoint unions of
	// whole pairs of states that cover D.
	ClassPeriodic StructureClass = "periodic"
	// ClassReducible: two or more blocks of recurrent states, or one whose
	// cycle sets miss a configuration of D.
	ClassReducible StructureClass = "reducible"
	// ClassFinite: no recurrent state; a_n = 0 exactly from n = N1 on.
	ClassFinite StructureClass = "finite"
	// ClassSubexponential: recurrent states exist (a_n > 0 for every n)
	// and lambda = 0.
	ClassSubexponential StructureClass = "subexponential"
	// ClassUndecided: no class is claimed.
	ClassUndecided StructureClass = "undecided"
)

// LambdaStatus is what a certificate claims about lambda > 0. The strings
// are those of structure.Lambda.
type LambdaStatus string

const (
	LambdaPositive  LambdaStatus = "positive"  // shown by a cyclic avoider
	LambdaZero      LambdaStatus = "zero"      // recomputed by the checker
	LambdaUndecided LambdaStatus = "undecided" // nothing claimed
)

// Fixed strings and limits of the structure section.
const (
	StructureMethod        = "prefix-state joint configurations"
	StructureMethodVersion = 1
	// MaxJointSteps bounds the exponent and CycleStart+CycleLength: the
	// number of steps of R_k the checker recomputes.
	MaxJointSteps = 1000
	// MaxPermLength bounds the length of a cyclic avoider.
	MaxPermLength = 2048
)

// Structure is the structure section (format version 4): a class and a
// lambda status with their evidence, all on prefix states
// (docs/prefix-states.md, "The structure test"). Check proves every claim
// with its own code.
//
// Free fields are Class and Lambda (any claim the checker proves, or
// undecided) and CyclicAvoider (any cyclic avoider). Every other field is
// derived from the set and the free fields and must equal its
// derivation; a field that does not belong to the class is zero or nil.
type Structure struct {
	Class StructureClass
	// Exponent is the primitivity exponent e: the least k with R_k = D
	// (ClassPrimitive only, else 0).
	Exponent int
	// Period is p >= 2 (ClassPeriodic only, else 0); it equals
	// CycleLength.
	Period int
	// N1 is finite_from: the least n with a_n = 0 (ClassFinite only,
	// else 0).
	N1 int
	// Blocks are the strongly connected components of the state digraph
	// restricted to the recurrent states, each increasing, ordered by
	// least state (ClassReducible only, else nil).
	Blocks [][]int
	Lambda LambdaStatus

	// Evidence.

	// Recurrent lists the recurrent states, increasing (every class but
	// finite and undecided, else nil).
	Recurrent []int
	// Configurations is |D| (the same classes as Recurrent, else 0).
	Configurations int
	// CycleStart and CycleLength are the joint cycle: R_CycleStart =
	// R_(CycleStart+CycleLength), R_0 .. R_(CycleStart+CycleLength-1)
	// pairwise distinct. Present (CycleLength > 0) exactly when Class is
	// periodic, reducible or subexponential.
	CycleStart, CycleLength int
	// CyclicAvoider is a permutation of length L >= w (w the longest
	// member) whose cyclic windows of every member's length avoid that
	// member (LambdaPositive only, else nil).
	CyclicAvoider []int
}

// parsePerm reads a permutation of 1..L (1 <= L <= MaxPermLength) in its
// one spelling, that of formatPerm.
func parsePerm(s string) ([]int, error) {
	switch {
	case s == "":
		return nil, fmt.Errorf("empty; write a permutation like 1342, or 1.10.2.3.4.5.6.7.8.9 with more than 9 entries")
	case len(s) > 5*MaxPermLength:
		return nil, fmt.Errorf("%d characters; a permutation of at most %d entries has at most %d", len(s), MaxPermLength, 5*MaxPermLength)
	}
	p := make([]int, 0, strings.Count(s, ".")+1)
	if strings.IndexByte(s, '.') < 0 {
		p = make([]int, 0, len(s))
		for i := 0; i < len(s); i++ {
			if s[i] < '0' || s[i] > '9' {
				return nil, fmt.Errorf("%q has a character other than a digit or a dot", abbreviate(s))
			}
			p = append(p, int(s[i]-'0'))
		}
	} else {
		v, digits := 0, 0
		for i := 0; i <= len(s); i++ {
			switch {
			case i == len(s) || s[i] == '.':
				if digits == 0 {
					return nil, fmt.Errorf("%q has an empty entry between dots", abbreviate(s))
				}
				p = append(p, v)
				v, digits = 0, 0
			case s[i] < '0' || s[i] > '9':
				return nil, fmt.Errorf("%q has a character other than a digit or a dot", abbreviate(s))
			case digits > 0 && v == 0:
				return nil, fmt.Errorf("%q has an entry with a leading zero", abbreviate(s))
			case digits == 4:
				return nil, fmt.Errorf("%q has an entry of more than 4 digits", abbreviate(s))
			default:
				v, digits = 10*v+int(s[i]-'0'), digits+1
			}
		}
		if len(p) <= 9 {
			return nil, fmt.Errorf("%q is written with dots, but a permutation of at most 9 entries is written as digits", abbreviate(s))
		}
	}
	if len(p) > MaxPermLength {
		return nil, fmt.Errorf("%d entries; at most %d", len(p), MaxPermLength)
	}
	seen := make([]bool, len(p)+1)
	for _, v := range p {
		switch {
		case v < 1 || v > len(p):
			return nil, fmt.Errorf("%q is not a permutation: entry %d is outside 1..%d", abbreviate(s), v, len(p))
		case seen[v]:
			return nil, fmt.Errorf("%q is not a permutation: value %d repeats", abbreviate(s), v)
		}
		seen[v] = true
	}
	return p, nil
}

// formatPerm writes a permutation in its one spelling: digits for
// at most 9 entries ("1342"), entries separated by dots for more
// ("1.10.2.3.4.5.6.7.8.9").
func formatPerm(p []int) string {
	buf := make([]byte, 0, 3*len(p))
	for i, v := range p {
		if i > 0 && len(p) > 9 {
			buf = append(buf, '.')
		}
		buf = strconv.AppendInt(buf, int64(v), 10)
	}
	return string(buf)
}
