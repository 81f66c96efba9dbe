package series_test

import (
	"context"
	"fmt"
	"strings"

	"avoidcert/series"
)

// Tally the windows of length 3 of a short series: 2.1 3.5 1.0 4.2 0.3
// has the windows 231 (2.1 3.5 1.0), 213 (3.5 1.0 4.2) and 231 again
// (1.0 4.2 0.3). Ranks are lexicographic: 123 is 0, ..., 231 is 3.
func Example() {
	data := "2.1\n3.5\n1.0\n4.2\n0.3\n"
	rd, err := series.NewReader(context.Background(), "readings", strings.NewReader(data), series.Format{})
	if err != nil {
		fmt.Println(err)
		return
	}
	t, err := series.Count(rd, series.Options{Lengths: []int{3}, Delay: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(t.Values, "values,", t.Windows[3], "windows, by rank:", t.Patterns[3])
	// Output: 5 values, 3 windows, by rank: [0 0 1 2 0 0]
}
