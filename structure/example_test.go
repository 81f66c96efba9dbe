package structure_test

import (
	"context"
	"fmt"

	"avoidcert/pattern"
	"avoidcert/structure"
)

// A referee checks that the asymptotic form holds for 132 before trusting
// a growth constant, and sees why it cannot hold for 123,321 (alternating
// permutations) or 132,231 (lambda = 0).
func ExampleAnalyze() {
	for _, arg := range []string{"132", "123,321", "132,231"} {
		s, err := pattern.ParseSet([]string{arg})
		if err != nil {
			panic(err)
		}
		rep, err := structure.Analyze(context.Background(), s, structure.Options{})
		if err != nil {
			panic(err)
		}
		fmt.Printf("%s: %s, lambda %s, %d recurrent states\n", s, rep.Class, rep.Lambda, len(rep.Recurrent))
		switch rep.Class {
		case structure.Primitive:
			fmt.Printf("  primitivity exponent k = %d, |D| = %d, cyclic avoider %v\n", rep.Exponent, rep.Configurations, rep.CyclicAvoider)
		case structure.Periodic:
			fmt.Printf("  period %d (joint cycle from k = %d), cyclic avoider %v\n", rep.Period, rep.CycleStart, rep.CyclicAvoider)
		}
	}
	// Output:
	// 132: primitive, lambda positive, 2 recurrent states
	//   primitivity exponent k = 3, |D| = 14, cyclic avoider 231
	// 123,321: periodic, lambda positive, 2 recurrent states
	//   period 2 (joint cycle from k = 3), cyclic avoider 1324
	// 132,231: subexponential, lambda zero, 2 recurrent states
}
