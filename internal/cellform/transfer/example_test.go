package celltransfer_test

import (
	"context"
	"fmt"

	transfer "avoidcert/internal/cellform/transfer"
	"avoidcert/pattern"
)

func ExampleCounts() {
	s, err := pattern.ParseSet([]string{"1342"})
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := transfer.Counts(context.Background(), s, 12, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	// a_0..a_12 of OEIS A117156
	fmt.Println(a)
	// Output: [1 1 2 6 23 110 630 4210 32150 276210 2636720 27687440 317169270]
}
