package interval_test

import (
	"fmt"
	"math/big"

	"avoidcert/interval"
)

func ExampleDecimalDown() {
	r := big.NewRat(2, 3)
	fmt.Println(interval.DecimalDown(r, 4), interval.DecimalUp(r, 4))
	fmt.Println(interval.DecimalDown(big.NewRat(-1, 7_000_000_000), 3))
	// Output:
	// 0.6666 0.6667
	// -1.43e-10
}

func ExampleLambda123() {
	lambda := interval.Lambda123(128)
	fmt.Println(lambda.String(25))
	fmt.Println(interval.CommonDigits(lambda.Lo, lambda.Hi) >= 25)
	// Output:
	// [0.8269933431326880742669897, 0.8269933431326880742669898]
	// true
}

func ExampleClaimRange() {
	// A manuscript claims lambda = 0.9546 (rounded): which values does that allow?
	lo, hi, err := interval.ClaimRange("0.9546", false)
	if err != nil {
		fmt.Println(err)
		return
	}
	claim := interval.Interval{Lo: lo, Hi: hi}
	fmt.Println(claim.String(6), claim.ContainsInterval(interval.LambdaNonOverlapping(4, 2, 64)))
	// Output:
	// [0.95455, 0.95465] true
}
