package structure_test

import (
	"context"
	"fmt"

	"avoidcert/pattern"
	"avoidcert/structure"
)

// A referee checks that the asymptotic form holds for 132 before trusting
// a growth constant, and sees why it cannot hold for 123,321.
func ExampleAnalyze() {
	for _, arg := range []string{"132", "123,321", "132,231"} {
		s, err := pattern.ParseSet([]string{arg})
		if err != nil {
			panic(err)
		}
		rep, err := structure.Analyze(context.Background(), s, structure.Options{Witnesses: true})
		if err != nil {
			panic(err)
		}
		fmt.Printf("%s: %s, lambda %s\n", s, rep.Class, rep.Lambda)
		switch rep.Class {
		case structure.Primitive:
			w := rep.Witnesses
			fmt.Printf("  exponent %d, %d witnesses of length %d; the one for 1234: %v\n",
				rep.Exponent, w.Count(), w.Length(), w.Of(pattern.Rank(pattern.Perm{1, 2, 3, 4})))
		case structure.Periodic:
			fmt.Printf("  period %d, cyclic avoider %v\n", rep.Period, rep.CyclicAvoider)
		}
	}
	// Output:
	// 132: primitive, lambda positive
	//   exponent 3, 24 witnesses of length 5; the one for 1234: 12345
	// 123,321: periodic, lambda positive
	//   period 2, cyclic avoider 1324
	// 132,231: subexponential, lambda zero
}
