package claims_test

import (
	"context"
	"fmt"

	"avoidcert/claims"
)

// Judge a two-claim manifest: a_5 for the pattern 123 is 70 (OEIS
// A049774), not 71.
func ExampleRun() {
	manifest := `
[[claim]]
id = "right"
kind = "count"
patterns = ["123"]
n = 4
count = "17"

[[claim]]
id = "wrong"
kind = "count"
patterns = ["123"]
n = 5
count = "71"
`
	m, err := claims.Parse("example.toml", []byte(manifest))
	if err != nil {
		fmt.Println(err)
		return
	}
	results, _ := claims.Run(context.Background(), m, claims.Options{})
	for _, r := range results {
		fmt.Printf("%s: %s, %s\n", r.ID, r.Verdict, r.Evidence)
	}
	// Output:
	// right: proved, a_4 = 17 (engine and checker agree)
	// wrong: refuted, a_5 = 70, not 71 (engine and checker agree)
}
