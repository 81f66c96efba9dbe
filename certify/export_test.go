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
