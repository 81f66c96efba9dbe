// Package brute counts permutations that avoid consecutive patterns by
// plain enumeration. It is a reference for tests of the pattern and
// transfer packages: it imports neither and shares no code with them, and
// it is written to be obviously correct rather than fast.
//
// Patterns and permutations hold 1..len in any slice type with underlying
// type []int (so a caller's own permutation type passes as it is).
// Functions never modify their arguments. RandomPatterns draws pattern lists for
// randomised tests.
package brute

import "math/rand/v2"

// Permutations calls visit with every permutation of 1..n in lexicographic
// order (once, with the empty slice, for n = 0). The slice is reused
// between calls: visit must not keep or modify it.
func Permutations(n int, visit func(p []int)) {
	p := make([]int, n)
	for i := range p {
		p[i] = i + 1
	}
	for {
		visit(p)
		// next permutation: the longest decreasing suffix p[i+1:] is
		// the last arrangement of its values; bump p[i] to the next
		// larger value of the suffix and sort the suffix back up.
		i := n - 2
		for i >= 0 && p[i] > p[i+1] {
			i--
		}
		if i < 0 {
			return
		}
		j := n - 1
		for p[j] < p[i] {
			j--
		}
		p[i], p[j] = p[j], p[i]
		for l, r := i+1, n-1; l < r; l, r = l+1, r-1 {
			p[l], p[r] = p[r], p[l]
		}
	}
}

// Contains reports whether some run of len(pat) adjacent entries of text
// has the relative order of pat: every pair of positions compares the same
// way in the run as in pat.
func Contains[P ~[]int](text []int, pat P) bool {
	for start := 0; start+len(pat) <= len(text); start++ {
		run := text[start : start+len(pat)]
		same := true
		for a := 0; a < len(pat) && same; a++ {
			for b := a + 1; b < len(pat); b++ {
				if (run[a] < run[b]) != (pat[a] < pat[b]) {
					same = false
					break
				}
			}
		}
		if same {
			return true
		}
	}
	return false
}

// Avoids reports whether text contains none of the patterns.
func Avoids[P ~[]int](text []int, patterns []P) bool {
	for _, pat := range patterns {
		if Contains(text, pat) {
			return false
		}
	}
	return true
}

// Count returns the number of permutations of 1..n that avoid every
// pattern, checking each permutation window by window.
func Count[P ~[]int](n int, patterns []P) int {
	c := 0
	Permutations(n, func(p []int) {
		if Avoids(p, patterns) {
			c++
		}
	})
	return c
}

// CensusMaxLength is the longest pattern a Census can answer for.
const CensusMaxLength = 5

// A content is the set of patterns of length 1..CensusMaxLength that occur
// consecutively in a permutation: one bit per pattern, patterns of length j
// at bits offset[j] .. offset[j]+j!-1 (1+2+6+24+120 = 153 bits).
type content [3]uint64

var offset = [CensusMaxLength + 2]int{0, 0, 1, 3, 9, 33, 153}

// code numbers the relative order of a run of distinct values: the
// factorial-base number whose digits count, for each entry, the later
// entries smaller than it. Runs with the same relative order get the same
// code, and the codes of length j are exactly 0..j!-1.
func code(run []int) int {
	c := 0
	for i, v := range run {
		smaller := 0
		for _, w := range run[i+1:] {
			if w < v {
				smaller++
			}
		}
		c = c*(len(run)-i) + smaller
	}
	return c
}

func (c *content) add(run []int) {
	bit := offset[len(run)] + code(run)
	c[bit/64] |= 1 << (bit % 64)
}

// Census holds, for one n, how many permutations of 1..n have each
// content. CensusCount answers for any set of patterns of length at most
// CensusMaxLength without enumerating again, so that many sets can be
// checked against one enumeration.
type Census struct {
	n      int
	counts map[content]int
}

// NewCensus enumerates the permutations of 1..n once.
func NewCensus(n int) *Census {
	cs := &Census{n: n, counts: make(map[content]int)}
	Permutations(n, func(p []int) {
		var c content
		for j := 1; j <= min(n, CensusMaxLength); j++ {
			for start := 0; start+j <= n; start++ {
				c.add(p[start : start+j])
			}
		}
		cs.counts[c]++
	})
	return cs
}

// N returns the permutation length of the census.
func (cs *Census) N() int { return cs.n }

// CensusCount returns the number of permutations of 1..cs.N() that avoid
// every pattern. It panics on an empty pattern or one longer than
// CensusMaxLength.
func CensusCount[P ~[]int](cs *Census, patterns []P) int {
	var forbidden content
	for _, pat := range patterns {
		if len(pat) < 1 || len(pat) > CensusMaxLength {
			panic("brute: Census.Count needs patterns of length 1 to 5")
		}
		forbidden.add(pat)
	}
	total := 0
	for c, k := range cs.counts {
		if c[0]&forbidden[0] == 0 && c[1]&forbidden[1] == 0 && c[2]&forbidden[2] == 0 {
			total += k
		}
	}
	return total
}

// RandomPatterns draws 1 to maxCount patterns (the count uniform), each a
// uniform permutation of a length uniform in minLen..maxLen. Repeats and
// patterns inside others are left in: building a set must cope with them.
func RandomPatterns[P ~[]int](rng *rand.Rand, maxCount, minLen, maxLen int) []P {
	out := make([]P, 1+rng.IntN(maxCount))
	for i := range out {
		p := rng.Perm(minLen + rng.IntN(maxLen-minLen+1))
		for j := range p {
			p[j]++
		}
		out[i] = p
	}
	return out
}
