package bounds_test

import (
	"context"
	"fmt"

	"avoidcert/bounds"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// A certified growth rate of the consecutive pattern 132 to 15 digits, with
// the explicit bound on a_n/n! at n = 60.
func ExampleRun() {
	s, err := pattern.ParseSet([]string{"132"})
	if err != nil {
		panic(err)
	}
	res, err := bounds.Run(context.Background(), transfer.NewStates(s), bounds.Options{Digits: 15}, nil)
	if err != nil {
		panic(err)
	}
	fmt.Println("lambda in", res.Lambda.String(17))
	fmt.Println("1/lambda in", res.Radius.String(17))
	fmt.Println("digits:", res.Digits >= 15, "stop:", res.Stop)
	lo, hi, err := res.Explicit.At(60, 64)
	if err != nil {
		panic(err)
	}
	fmt.Printf("a_60/60! in [%s, %s]\n", interval.DecimalDown(lo, 6), interval.DecimalUp(hi, 6))
	// Output:
	// lambda in [0.78397693120354748, 0.78397693120354752]
	// 1/lambda in [1.2755477364172153, 1.2755477364172155]
	// digits: true stop: target
	// a_60/60! in [8.05014e-7, 8.05015e-7]
}

// A referee's check of a printed growth rate: "0.8270" rounded. Judge stops
// as soon as the certified enclosure fits inside the claim.
func ExampleJudge() {
	s, _ := pattern.ParseSet([]string{"123"})
	lo, hi, _ := interval.ClaimRange("0.8270", false)
	v, res, err := bounds.Judge(context.Background(), transfer.NewStates(s), interval.Interval{Lo: lo, Hi: hi}, bounds.QuantityLambda, bounds.Options{})
	if err != nil {
		panic(err)
	}
	fmt.Println(v, "with lambda in", res.Lambda.String(8))
	// Output:
	// proved with lambda in [0.82698861, 0.82699571]
}
