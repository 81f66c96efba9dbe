package pattern

import (
	"sort"
	"strconv"
	"strings"
)

// Perm is a permutation of 1..len(p), one entry per element.
type Perm []int

// String writes the permutation as digits ("1342"), or with dots between
// entries ("1.10.2...") when some entry has more than one digit.
func (p Perm) String() string {
	sep := ""
	if len(p) > 9 {
		sep = "."
	}
	parts := make([]string, len(p))
	for i, v := range p {
		parts[i] = strconv.Itoa(v)
	}
	return strings.Join(parts, sep)
}

// Equal reports whether p and q are the same permutation.
func (p Perm) Equal(q Perm) bool {
	if len(p) != len(q) {
		return false
	}
	for i := range p {
		if p[i] != q[i] {
			return false
		}
	}
	return true
}

// Less orders permutations by length, then lexicographically.
func (p Perm) Less(q Perm) bool {
	if len(p) != len(q) {
		return len(p) < len(q)
	}
	for i := range p {
		if p[i] != q[i] {
			return p[i] < q[i]
		}
	}
	return false
}

// Reverse returns p read backwards.
func (p Perm) Reverse() Perm {
	r := make(Perm, len(p))
	for i, v := range p {
		r[len(p)-1-i] = v
	}
	return r
}

// Complement returns p with each entry v replaced by len(p)+1-v.
func (p Perm) Complement() Perm {
	r := make(Perm, len(p))
	for i, v := range p {
		r[i] = len(p) + 1 - v
	}
	return r
}

// Inverse returns the inverse permutation. It is not a symmetry of
// consecutive-pattern avoidance; it is here so tests can show that.
func (p Perm) Inverse() Perm {
	r := make(Perm, len(p))
	for i, v := range p {
		r[v-1] = i + 1
	}
	return r
}

// Standardize returns the pattern of a sequence of distinct values: the
// permutation of 1..len(seq) with the same relative order.
func Standardize(seq []int) Perm {
	idx := make([]int, len(seq))
	for i := range idx {
		idx[i] = i
	}
	sort.Slice(idx, func(a, b int) bool { return seq[idx[a]] < seq[idx[b]] })
	p := make(Perm, len(seq))
	for r, i := range idx {
		p[i] = r + 1
	}
	return p
}

// OrderIsomorphic reports whether the window seq (distinct values) has
// pattern p. len(seq) must equal len(p).
func OrderIsomorphic(seq []int, p Perm) bool {
	for i := range p {
		for j := i + 1; j < len(p); j++ {
			if (seq[i] < seq[j]) != (p[i] < p[j]) {
				return false
			}
		}
	}
	return true
}

// Contains reports whether the text (distinct values) contains p
// consecutively.
func Contains(text []int, p Perm) bool {
	for i := 0; i+len(p) <= len(text); i++ {
		if OrderIsomorphic(text[i:i+len(p)], p) {
			return true
		}
	}
	return false
}

// Factorial returns n! for 0 <= n <= 20.
func Factorial(n int) int {
	f := 1
	for i := 2; i <= n; i++ {
		f *= i
	}
	return f
}

// Rank returns the position of p among the permutations of its length in
// lexicographic order (the identity has rank 0).
func Rank(p Perm) int {
	r := 0
	for i, v := range p {
		smaller := 0
		for _, w := range p[i+1:] {
			if w < v {
				smaller++
			}
		}
		r = r*(len(p)-i) + smaller
	}
	return r
}

// Unrank returns the permutation of 1..n with the given lexicographic rank,
// 0 <= rank < n!.
func Unrank(n, rank int) Perm {
	digits := make([]int, n)
	for i := n - 1; i >= 0; i-- {
		base := n - i
		digits[i] = rank % base
		rank /= base
	}
	free := make([]int, n)
	for i := range free {
		free[i] = i + 1
	}
	p := make(Perm, n)
	for i, d := range digits {
		p[i] = free[d]
		free = append(free[:d], free[d+1:]...)
	}
	return p
}

// All returns every permutation of 1..n in lexicographic order, so that
// All(n)[Rank(p)] equals p.
func All(n int) []Perm {
	out := make([]Perm, Factorial(n))
	for r := range out {
		out[r] = Unrank(n, r)
	}
	return out
}
