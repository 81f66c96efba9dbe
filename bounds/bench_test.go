package bounds

import (
	"context"
	"testing"
	"time"

	"avoidcert/transfer"
)

// benchRun times Run to a digit target and plain counting (transfer.Counts)
// through the same iterates, reporting n and the ratio of the fastest runs
// of each as x-count (the target: at most 1.3). The machine may be
// shared: the fastest of several runs is the least disturbed.
func benchRun(b *testing.B, set string, digits int) {
	s, st := system(b, set)
	var res *Result
	fastest := time.Duration(1<<63 - 1)
	for b.Loop() {
		start := time.Now()
		var err error
		if res, err = Run(context.Background(), st, Options{Digits: digits}, nil); err != nil {
			b.Fatal(err)
		}
		fastest = min(fastest, time.Since(start))
	}
	b.StopTimer()
	n := res.Brackets[0].N
	counting := time.Duration(1<<63 - 1)
	for range max(b.N, 2) {
		start := time.Now()
		if _, err := transfer.Counts(context.Background(), s, n+1, nil); err != nil {
			b.Fatal(err)
		}
		counting = min(counting, time.Since(start))
	}
	b.ReportMetric(float64(n), "n")
	b.ReportMetric(float64(fastest)/float64(counting), "x-count")
}

func BenchmarkRun123Digits100(b *testing.B)  { benchRun(b, "123", 100) }
func BenchmarkRun132Digits100(b *testing.B)  { benchRun(b, "132", 100) }
func BenchmarkRun1342Digits50(b *testing.B)  { benchRun(b, "1342", 50) }
func BenchmarkRun12345Digits30(b *testing.B) { benchRun(b, "12345", 30) }
func BenchmarkRun1234Digits30(b *testing.B)  { benchRun(b, "1234", 30) }

func BenchmarkRun1342Digits100(b *testing.B)  { benchRun(b, "1342", 100) }
func BenchmarkRun12345Digits50(b *testing.B)  { benchRun(b, "12345", 50) }
func BenchmarkRun123456Digits30(b *testing.B) { benchRun(b, "123456", 30) }
