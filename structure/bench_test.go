package structure

import (
	"context"
	"testing"

	"avoidcert/pattern"
)

// BenchmarkAnalyzeLength6 runs the structure pass (m = 5, joint patterns
// over S_10) on the representative of each symmetry class of length 6,
// one sub-benchmark per class. Run a few briefly, e.g.
// go test ./structure/ -run '^$' -bench 'AnalyzeLength6/1234(56|65)$' -benchtime 1x
func BenchmarkAnalyzeLength6(b *testing.B) {
	for _, c := range pattern.SymmetryClasses(6) {
		s := pattern.NewSet(c.Representative)
		b.Run(c.Representative.String(), func(b *testing.B) {
			for b.Loop() {
				if _, err := Analyze(context.Background(), s, Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
