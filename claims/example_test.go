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

// Each claim restates itself, as the gate's JSON lines and JUnit XML show
// it. The value is lambda of 1324 as a manuscript might misprint it (OEIS
// A113228 has 0.95585031...).
func ExampleClaim_Statement() {
	m, err := claims.Parse("paper.toml", []byte(`
[[claim]]
id = "t2-row3"
kind = "growth"
patterns = ["1324"]
value = "0.95589"
note = "Table 2, row 3"
`))
	if err != nil {
		fmt.Println(err)
		return
	}
	c := m.Claims[0]
	fmt.Printf("%s (%s, line %d): %s; quantity %s; note %q\n", c.ID, m.File, c.Line, c.Statement(), c.Quantity(), c.Note)
	// Output:
	// t2-row3 (paper.toml, line 2): lambda(1324) = 0.95589 (rounded); quantity lambda; note "Table 2, row 3"
}
