package report_test

import (
	"context"
	"fmt"
	"os"

	"avoidcert/report"
)

// A certificate for 123 (made with "avoidcert bound 123 --digits 12"),
// re-checked and stated. The growth rate of 123 is 3*sqrt(3)/(2*pi) =
// 0.82699334313268... (interval.Lambda123 names its source).
func ExampleFromCertificate() {
	data, err := os.ReadFile("testdata/cert-123.json")
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := report.FromCertificate(context.Background(), "cert-123.json", data)
	if err != nil {
		fmt.Println(err)
		return
	}
	lo, hi := r.Lambda()
	fmt.Println(lo, hi)
	fmt.Println(r.Recheck())
	// Output:
	// 0.82699334313267 0.826993343132697
	// avoidcert check cert-123.json --expect 123
}
