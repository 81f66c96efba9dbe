package prob_test

import (
	"context"
	"fmt"

	"avoidcert/pattern"
	"avoidcert/prob"
	"avoidcert/prove"
)

// Ten i.i.d. continuous draws have no increasing run of three with
// probability 822041/10! (OEIS A049774 gives a_10 = 822041); the numbers
// of permutations of 1..10 with 0, 1 and 2 windows in increasing order
// were also counted once by brute force over all 10! permutations (a
// separate script, not part of the suite), with the same result.
func Example() {
	set, _ := pattern.ParseSet([]string{"123"})
	a, p, _ := prob.Exact(context.Background(), set, 10, prove.Options{})
	fmt.Println(a, p.RatString())
	counts, _ := prob.Occurrences(context.Background(), set, 10, 2)
	fmt.Println(counts[0], counts[1], counts[2])
	// Output:
	// 822041 822041/3628800
	// 822041 1365354 966114
}

// The number of windows of 20 i.i.d. draws in the order low-high-middle
// (132): mean (N-k+1)/k! = 18/6 = 3. The variance, by hand from the
// overlaps of 132 with itself (docs/series.md): 18(1/6 - 1/36) for a window
// with itself, 2*17(0 - 1/36) for shifts 1 (132 cannot overlap itself by
// two values), 2*16(3/120 - 1/36) for shifts 2 (3 orders of 5 draws have
// both windows 132) = 22/15. P(count <= 1) is the layered iteration's (it
// matches brute force for N <= 9 in the tests).
func ExampleWindowMoments() {
	set, _ := pattern.ParseSet([]string{"132"})
	m := prob.WindowMoments(set, 20)
	fmt.Println(m.Mean.RatString(), m.Variance.RatString())
	law, _ := prob.InterleavedLaw(context.Background(), set, []int{20}, 1)
	fmt.Println(law.AtMost(1).FloatString(6))
	// Output:
	// 3 22/15
	// 0.103808
}
