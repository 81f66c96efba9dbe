package census_test

import (
	"fmt"

	"avoidcert/census"
)

// The 8 symmetry classes of length 4 dealt to 3 shards: class i goes to
// shard i mod 3 + 1, in the order of pattern.SymmetryClasses.
func ExampleShard_Classes() {
	for i := 1; i <= 3; i++ {
		s := census.Shard{Index: i, Of: 3}
		fmt.Print(s, ":")
		for _, c := range s.Classes(4) {
			fmt.Print(" ", c.Representative)
		}
		fmt.Println()
	}
	// Output:
	// 1/3: 1234 1342 2143
	// 2/3: 1243 1423 2413
	// 3/3: 1324 1432
}
