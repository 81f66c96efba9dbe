package pattern_test

import (
	"fmt"

	"avoidcert/pattern"
)

func ExampleParseSet() {
	// Arguments may hold comma lists; 1234 is dropped because avoiding 123
	// already avoids it, and the repeated 321 is dropped as a duplicate.
	s, err := pattern.ParseSet([]string{"123,1234", "321", "3.2.1"})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("set:", s)
	for _, d := range s.Dropped() {
		if d.Inside != nil {
			fmt.Printf("dropped %v: contains %v\n", d.Pattern, d.Inside)
		} else {
			fmt.Printf("dropped %v: duplicate\n", d.Pattern)
		}
	}

	_, err = pattern.ParseSet([]string{"1223"})
	fmt.Println(err)
	// Output:
	// set: 123,321
	// dropped 321: duplicate
	// dropped 1234: contains 123
	// pattern "1223": value 2 repeats (positions 2 and 3); a pattern uses each of 1..4 once
}

func ExampleSet_Canonical() {
	// 2431, 1342, 4213 and 3124 are one class under reversal and
	// complement; the canonical set is the least of the images.
	for _, arg := range []string{"2431", "4213", "231,4213"} {
		s, err := pattern.ParseSet([]string{arg})
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%v -> %v\n", s, s.Canonical())
	}
	// Output:
	// 2431 -> 1342
	// 4213 -> 1342
	// 231,4213 -> 132,3124
}
