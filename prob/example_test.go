package prob_test

import (
	"context"
	"fmt"

	"avoidcert/pattern"
	"avoidcert/prob"
)

// Ten i.i.d. continuous draws have no increasing run of three with
// probability 822041/10! (OEIS A049774 gives a_10 = 822041); the numbers
// of permutations of 1..10 with 0, 1 and 2 windows in increasing order
// were also counted once by brute force over all 10! permutations (a
// separate script, not part of the suite), with the same result.
func Example() {
	set, _ := pattern.ParseSet([]string{"123"})
	a, p, _ := prob.Exact(context.Background(), set, 10, prob.ExactMemory)
	fmt.Println(a, p.RatString())
	counts, _ := prob.Occurrences(context.Background(), set, 10, 2)
	fmt.Println(counts[0], counts[1], counts[2])
	// Output:
	// 822041 822041/3628800
	// 822041 1365354 966114
}
