package transfer_test

import (
	"context"
	"fmt"

	"avoidcert/pattern"
	"avoidcert/transfer"
)

// Counting the permutations that avoid 1342 consecutively (OEIS A117156)
// on its four prefix states.
func ExampleCounts() {
	s, _ := pattern.ParseSet([]string{"1342"})
	st := transfer.NewStates(s)
	for p := range st.Len() {
		fmt.Print(st.String(p), ";")
	}
	fmt.Println()
	counts, err := transfer.Counts(context.Background(), s, 8, nil)
	if err != nil {
		panic(err)
	}
	fmt.Println(counts)
	// Output:
	// ();1;12;123;
	// [1 1 2 6 23 110 630 4210 32150]
}

// A restricted system: the moves among the states 12 and 123 of 1342,
// started with 1 on every coefficient at n = 3 (three on 12, one on 123).
// One step keeps 4 sequences from 12 (the new value on top, every split)
// and 1 from 123 (the new value on top, forgetting the oldest).
func ExampleStates_Restrict() {
	s, _ := pattern.ParseSet([]string{"1342"})
	st := transfer.NewStates(s)
	sys, err := st.Restrict([]int{2, 3}, transfer.StartOnes)
	if err != nil {
		panic(err)
	}
	e := transfer.New(sys)
	g, _ := e.Start(context.Background())
	g, _ = e.Next(context.Background(), g)
	fmt.Println(sys.StartN(), g.N, g.Sum())
	for _, edge := range st.Edges() {
		fmt.Print(st.String(edge.From), "->", st.String(edge.To), ";")
	}
	fmt.Println()
	// Output:
	// 3 4 5
	// ()->1;1->1;1->12;12->1;12->123;123->1;123->123;
}
