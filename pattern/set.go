package pattern

import (
	"sort"
	"strings"
)

// Dropped records a pattern removed from a set and why.
type Dropped struct {
	Pattern Perm
	// Inside is the member that Pattern consecutively contains, or nil when
	// Pattern was a duplicate.
	Inside Perm
}

// Set is a non-empty, irredundant set of consecutive patterns. The zero
// value is not a valid set; build one with NewSet or ParseSet. A Set is
// immutable: methods return fresh values.
type Set struct {
	patterns []Perm
	given    []string
	dropped  []Dropped
}

// NewSet builds a set from patterns (at least one, each valid and of length
// at most MaxLength), dropping duplicates and redundant patterns.
func NewSet(perms ...Perm) Set {
	if len(perms) == 0 {
		panic("pattern: NewSet needs at least one pattern")
	}
	sorted := make([]Perm, len(perms))
	for i, p := range perms {
		sorted[i] = append(Perm(nil), p...)
	}
	sort.Slice(sorted, func(i, j int) bool { return sorted[i].Less(sorted[j]) })
	var s Set
	for _, p := range sorted {
		if n := len(s.patterns); n > 0 && s.patterns[n-1].Equal(p) {
			s.dropped = append(s.dropped, Dropped{Pattern: p})
			continue
		}
		var inside Perm
		for _, q := range s.patterns {
			if len(q) < len(p) && Contains(p, q) {
				inside = q
				break
			}
		}
		if inside != nil {
			s.dropped = append(s.dropped, Dropped{Pattern: p, Inside: inside})
			continue
		}
		s.patterns = append(s.patterns, p)
	}
	for _, p := range perms {
		s.given = append(s.given, p.String())
	}
	return s
}

// Patterns returns the members, shorter first, then lexicographically.
func (s Set) Patterns() []Perm {
	out := make([]Perm, len(s.patterns))
	for i, p := range s.patterns {
		out[i] = append(Perm(nil), p...)
	}
	return out
}

// Given returns the patterns as the user wrote them, in order, before
// duplicates and redundant patterns were dropped.
func (s Set) Given() []string { return append([]string(nil), s.given...) }

// Dropped lists the patterns removed when the set was built.
func (s Set) Dropped() []Dropped { return append([]Dropped(nil), s.dropped...) }

// Strings returns the members as strings, in set order.
func (s Set) Strings() []string {
	out := make([]string, len(s.patterns))
	for i, p := range s.patterns {
		out[i] = p.String()
	}
	return out
}

// String writes the set as a comma list of its members ("123,321").
func (s Set) String() string { return strings.Join(s.Strings(), ",") }

// Equal reports whether two sets have the same members.
func (s Set) Equal(t Set) bool { return s.String() == t.String() }

// Window returns w, the length of the longest member. For n >= w, a_n
// depends on the set only through its lifted windows of length w.
func (s Set) Window() int {
	w := 0
	for _, p := range s.patterns {
		w = max(w, len(p))
	}
	return w
}

// Avoids reports whether the text (distinct values) contains no member
// consecutively.
func (s Set) Avoids(text []int) bool {
	for _, p := range s.patterns {
		if Contains(text, p) {
			return false
		}
	}
	return true
}

func (s Set) mapped(f func(Perm) Perm) Set {
	out := make([]Perm, len(s.patterns))
	for i, p := range s.patterns {
		out[i] = f(p)
	}
	return NewSet(out...)
}

// Reverse returns the set of reversed members.
func (s Set) Reverse() Set { return s.mapped(Perm.Reverse) }

// Complement returns the set of complemented members.
func (s Set) Complement() Set { return s.mapped(Perm.Complement) }

// ReverseComplement returns the set of reversed complemented members.
func (s Set) ReverseComplement() Set {
	return s.mapped(func(p Perm) Perm { return p.Reverse().Complement() })
}

// Inverse returns the set of inverted members (not a symmetry of a_n).
func (s Set) Inverse() Set { return s.mapped(Perm.Inverse) }

// Symmetric returns s and its images under reversal, complement and
// reverse-complement, in that order. All four have the same counts a_n.
func (s Set) Symmetric() [4]Set {
	return [4]Set{s, s.Reverse(), s.Complement(), s.ReverseComplement()}
}

// Canonical returns the representative of the symmetry class of s: the
// image whose member list is least (by Less, member by member, then by
// size).
func (s Set) Canonical() Set {
	best := s
	images := s.Symmetric()
	for _, t := range images[1:] {
		if setLess(t, best) {
			best = t
		}
	}
	return NewSet(best.patterns...)
}

func setLess(a, b Set) bool {
	for i := range min(len(a.patterns), len(b.patterns)) {
		if !a.patterns[i].Equal(b.patterns[i]) {
			return a.patterns[i].Less(b.patterns[i])
		}
	}
	return len(a.patterns) < len(b.patterns)
}

// Class is one symmetry class of single patterns.
type Class struct {
	Representative Perm   // the least member
	Members        []Perm // all distinct members, sorted
}

// SymmetryClasses returns the classes of the patterns of length k under
// reversal and complement, ordered by representative.
func SymmetryClasses(k int) []Class {
	seen := make(map[string]bool)
	var classes []Class
	for _, p := range All(k) {
		if seen[p.String()] {
			continue
		}
		var c Class
		for _, q := range []Perm{p, p.Reverse(), p.Complement(), p.Reverse().Complement()} {
			if !seen[q.String()] {
				seen[q.String()] = true
				c.Members = append(c.Members, q)
			}
		}
		sort.Slice(c.Members, func(i, j int) bool { return c.Members[i].Less(c.Members[j]) })
		c.Representative = c.Members[0]
		classes = append(classes, c)
	}
	return classes
}
