package prove_test

import (
	"context"
	"fmt"

	"avoidcert/bounds"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// Judge a printed growth rate: lambda(1342) = 0.95461183447...
// (OEIS A117156), so "0.954612" (rounded) is right and "0.954613" is not.
func ExampleJudge() {
	set, _ := pattern.ParseSet([]string{"1342"})
	for _, printed := range []string{"0.954612", "0.954613"} {
		lo, hi, _ := interval.ClaimRange(printed, false)
		j, err := prove.Judge(context.Background(), set, interval.Interval{Lo: lo, Hi: hi}, bounds.QuantityLambda, prove.Options{})
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("lambda(1342) = %s: %s (certificate checked)\n", printed, j.Verdict)
	}
	// Output:
	// lambda(1342) = 0.954612: proved (certificate checked)
	// lambda(1342) = 0.954613: refuted (certificate checked)
}
