package pattern

import (
	"fmt"
	"strconv"
	"strings"
)

// MaxLength is the longest pattern accepted: 9, so that a pattern is
// still written with one digit per entry. Counting, brackets and the
// structure test run on prefix states (at most 0! + 1! + ... + 8! of
// them), and their own estimates decide whether a set fits a memory
// budget; the certificate format has the same limit.
const MaxLength = 9

// ParseError describes a rejected pattern token.
type ParseError struct {
	Token  string // the token as written
	Reason string // what is wrong and what to do
}

func (e *ParseError) Error() string {
	return fmt.Sprintf("pattern %q: %s", e.Token, e.Reason)
}

// Parse reads one pattern written as digits ("1342") or as entries
// separated by dots ("1.3.4.2").
func Parse(token string) (Perm, error) {
	fail := func(format string, args ...any) (Perm, error) {
		return nil, &ParseError{Token: token, Reason: fmt.Sprintf(format, args...)}
	}
	s := strings.TrimSpace(token)
	if s == "" {
		return fail("empty pattern; write a permutation of 1..k such as 132")
	}
	var entries []string
	if strings.Contains(s, ".") {
		entries = strings.Split(s, ".")
	} else {
		entries = strings.Split(s, "")
	}
	p := make(Perm, 0, len(entries))
	for _, e := range entries {
		if e == "" {
			return fail("empty entry between dots; write entries like 1.3.4.2")
		}
		for _, c := range e {
			if c < '0' || c > '9' {
				return fail("character %q is not a digit; write a permutation of 1..k such as 132 or 1.3.2", c)
			}
		}
		v, err := strconv.Atoi(e)
		if err != nil {
			return fail("entry %q is too large; the longest pattern accepted has length %d", e, MaxLength)
		}
		p = append(p, v)
	}
	if len(p) > MaxLength {
		return fail("length %d is over the limit of %d; write patterns of length 1 to %d", len(p), MaxLength, MaxLength)
	}
	seen := make([]int, len(p)+1)
	for i, v := range p {
		if v < 1 || v > len(p) {
			return fail("entry %d is out of range: a pattern of length %d uses each of 1..%d once (missing: %s)",
				v, len(p), len(p), missing(p))
		}
		if seen[v] != 0 {
			return fail("value %d repeats (positions %d and %d); a pattern uses each of 1..%d once", v, seen[v], i+1, len(p))
		}
		seen[v] = i + 1
	}
	return p, nil
}

// ParseSet reads a pattern set from command-line arguments; each argument
// may itself be a comma-separated list ("123,321"). Duplicates and
// redundant patterns are dropped (see Set.Dropped).
func ParseSet(args []string) (Set, error) {
	var perms []Perm
	var given []string
	for _, arg := range args {
		for _, tok := range strings.Split(arg, ",") {
			p, err := Parse(tok)
			if err != nil {
				return Set{}, err
			}
			perms = append(perms, p)
			given = append(given, strings.TrimSpace(tok))
		}
	}
	if len(perms) == 0 {
		return Set{}, fmt.Errorf("no pattern given; name at least one, such as 132 or 123,321")
	}
	s := NewSet(perms...)
	s.given = given
	return s, nil
}

// missing lists the values of 1..len(p) that p does not use.
func missing(p Perm) string {
	used := make([]bool, len(p)+1)
	for _, v := range p {
		if v >= 1 && v <= len(p) {
			used[v] = true
		}
	}
	var out []string
	for v := 1; v <= len(p); v++ {
		if !used[v] {
			out = append(out, strconv.Itoa(v))
		}
	}
	return strings.Join(out, ", ")
}
