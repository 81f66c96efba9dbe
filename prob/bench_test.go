package prob

import (
	"context"
	"testing"

	"avoidcert/internal/settest"
)

// BenchmarkOccurrences times the layered iteration at the sizes quoted in
// docs/benchmarks.md.
func BenchmarkOccurrences(b *testing.B) {
	for _, c := range []struct {
		name string
		set  []string
		N, J int
	}{{"123-N150-J3", []string{"123"}, 150, 3}, {"1342-N60-J5", []string{"1342"}, 60, 5}} {
		b.Run(c.name, func(b *testing.B) {
			set := settest.Must(b, c.set...)
			for b.Loop() {
				if _, err := Occurrences(context.Background(), set, c.N, c.J); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
