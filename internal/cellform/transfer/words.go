package celltransfer

import (
	"math/big"
	"math/bits"
)

// limbsFor returns the words per coefficient of G_k for cell length m:
// enough for 2 (m+k)!, which bounds every coefficient, every prefix sum of
// G_k and every partial sum while G_{k+1} is accumulated from G_k's
// prefix sums (those stay below (m+k+1)! + (m+k)!, and G_{k+1} gets
// limbsFor(m, k+1)).
func limbsFor(m, k int) int {
	f := big.NewInt(1)
	for i := 2; i <= m+k; i++ {
		f.Mul(f, big.NewInt(int64(i)))
	}
	return (f.BitLen()+1)/bits.UintSize + 1
}
