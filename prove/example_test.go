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

// Classify a set before trusting its growth constant: the class and the
// primitivity exponent are read from the structure section that the
// independent checker recomputed and accepted. {1423, 2413, 3412, 4123,
// 4312} has transient prefix states and is primitive with exponent 4
// (method note, section 9).
func ExampleClassify() {
	set, _ := pattern.ParseSet([]string{"1423,2413,3412,4123,4312"})
	r, err := prove.Classify(context.Background(), set, prove.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	cs := r.Certificate.Structure
	fmt.Printf("%s: %s, primitivity exponent %d, %d recurrent of %d states, lambda %s\n",
		set, cs.Class, cs.Exponent, len(cs.Recurrent), r.States.Len(), cs.Lambda)
	// Output:
	// 1423,2413,3412,4123,4312: primitive, primitivity exponent 4, 4 recurrent of 8 states, lambda positive
}
