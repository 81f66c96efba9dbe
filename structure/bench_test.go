package structure

import (
	"context"
	"testing"

	"avoidcert/pattern"
)

// BenchmarkAnalyze runs the structure test (state digraph, R_k to the
// exponent, the cyclic avoider) on single patterns of length 7, 8 and 9
// (targets in docs/benchmarks.md: 0.5 s, 2 s, 10 s) and on a set of four
// length-7 patterns (target 5 s). The increasing patterns have the
// largest exponent of their length (testdata/exponents.golden). Run:
// go test ./structure/ -run '^$' -bench Analyze -benchtime 1x
func BenchmarkAnalyze(b *testing.B) {
	for _, arg := range []string{"1234567", "12345678", "123456789", "192837465",
		"1234567,1324657,2143657,1526374"} {
		s, err := pattern.ParseSet([]string{arg})
		if err != nil {
			b.Fatal(err)
		}
		b.Run(arg, func(b *testing.B) {
			for b.Loop() {
				if _, err := Analyze(context.Background(), s, Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
