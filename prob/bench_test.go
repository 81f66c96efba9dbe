package prob

import (
	"context"
	"math"
	"testing"

	"avoidcert/internal/settest"
	"avoidcert/pattern"
	"avoidcert/prove"
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

// BenchmarkOccurrencesAt2000 is the exact range's target: one pattern of
// length 3 or 4 (the monotone ones keep one value a state) at N = 2000 with
// layers to J = 10, within a minute on the shared two-core machine.
func BenchmarkOccurrencesAt2000(b *testing.B) {
	for _, p := range []string{"123", "1234"} {
		b.Run(p+"-N2000-J10", func(b *testing.B) {
			set := settest.Must(b, p)
			for b.Loop() {
				if _, err := Occurrences(context.Background(), set, 2000, 10); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(OccurrenceCost(set, 2000, 10).Work, "word-additions")
		})
	}
}

// rangeLayers is the J that series asks of a typical observation: the
// count's mean plus 3 standard deviations (for its central 95% range).
func rangeLayers(set pattern.Set, N int) int {
	m := WindowMoments(set, N)
	mean, _ := m.Mean.Float64()
	variance, _ := m.Variance.Float64()
	return int(math.Ceil(mean + 3*math.Sqrt(variance)))
}

// exactRange is the largest N (up to 100,000) whose layered iteration to
// rangeLayers is estimated within DefaultWork and 1 GiB.
func exactRange(set pattern.Set) int {
	fits := func(N int) bool {
		c := OccurrenceCost(set, N, rangeLayers(set, N))
		return c.Work <= DefaultWork && c.Memory <= prove.DefaultMaxMemory
	}
	lo, hi := 1, 100_000
	for lo < hi {
		mid := (lo + hi + 1) / 2
		if fits(mid) {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
	return lo
}

// BenchmarkExactRange runs the layered iteration at the edge of the exact
// range of series (exactRange: the default budget, J for a typical
// observation) for patterns of lengths 3 to 7, and reports that N.
func BenchmarkExactRange(b *testing.B) {
	for _, p := range []string{"123", "132", "1234", "1342", "2413", "12345", "13524", "123456", "1234567", "1324657"} {
		b.Run(p, func(b *testing.B) {
			set := settest.Must(b, p)
			N := exactRange(set)
			for b.Loop() {
				if _, err := Occurrences(context.Background(), set, N, rangeLayers(set, N)); err != nil {
					b.Fatal(err)
				}
			}
			// after the loop: b.Loop resets what was reported before it
			b.ReportMetric(float64(N), "N")
			b.ReportMetric(float64(rangeLayers(set, N)), "J")
		})
	}
}
