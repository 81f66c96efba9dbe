package certify

import (
	"math/big"

	"avoidcert/pattern"
)

// IterateDigest recomputes G_k of the system of s on cells (nil: the whole
// system) with the checker's own code, for the conformance tests.
func IterateDigest(s pattern.Set, cells []int, k int) (digest [32]byte, sum *big.Int) {
	sys := newSystem(windowsOf(s), cells, k)
	g := sys.first()
	for range k {
		g = sys.next(g)
	}
	return sys.digest(g), g.sum()
}

// JointSets returns the members (ranks over S_2m) of R_m, ..., R_top and
// of the domain, recomputed with the checker's own code, for the
// conformance tests.
func JointSets(s pattern.Set, top int) (sets [][]int, domain []int) {
	jp := newJointPatterns(windowsOf(s))
	members := func(b bitset) []int {
		var out []int
		b.each(func(r int) bool {
			out = append(out, r)
			return true
		})
		return out
	}
	cur := jp.first
	for k := jp.m; k <= top; k++ {
		if k > jp.m {
			cur = jp.step(cur)
		}
		sets = append(sets, members(cur))
	}
	return sets, members(jp.domain)
}

// RankOf exposes the checker's rank of the pattern of a sequence.
func RankOf(seq []int) int { return rankOf(seq) }
