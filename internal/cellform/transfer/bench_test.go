package celltransfer_test

import (
	"avoidcert/internal/settest"
	"context"
	"testing"

	transfer "avoidcert/internal/cellform/transfer"
)

// benchmarkCounts times Counts for a_0..a_N of a set and reports
// Footprint of its last step alongside.
func benchmarkCounts(b *testing.B, set string, N int) {
	s := settest.Must(b, set)
	for b.Loop() {
		if _, err := transfer.Counts(context.Background(), s, N, nil); err != nil {
			b.Fatal(err)
		}
	}
	// reported after the loop: b.Loop's first call deletes earlier metrics
	m := s.Window() - 1
	b.ReportMetric(float64(transfer.New(transfer.FromSet(s)).Footprint(N-m-1)), "footprint-bytes")
}

func BenchmarkCounts123_500(b *testing.B)   { benchmarkCounts(b, "123", 500) }
func BenchmarkCounts132_500(b *testing.B)   { benchmarkCounts(b, "132", 500) }
func BenchmarkCounts1342_200(b *testing.B)  { benchmarkCounts(b, "1342", 200) }
func BenchmarkCounts1234_200(b *testing.B)  { benchmarkCounts(b, "1234", 200) }
func BenchmarkCounts12345_60(b *testing.B)  { benchmarkCounts(b, "12345", 60) }
func BenchmarkCounts123456_30(b *testing.B) { benchmarkCounts(b, "123456", 30) }
func BenchmarkCounts1342_50(b *testing.B)   { benchmarkCounts(b, "1342", 50) }
func BenchmarkCountsMixed_100(b *testing.B) { benchmarkCounts(b, "21543,1324,2413", 100) }

// BenchmarkNext1342_k100 times one step G_100 -> G_101 of 1342 (m = 3).
func BenchmarkNext1342_k100(b *testing.B) {
	sys := transfer.FromSet(settest.Must(b, "1342"))
	g := iterate(b, sys, 100)
	e := transfer.New(sys)
	for b.Loop() {
		if _, err := e.Next(context.Background(), g); err != nil {
			b.Fatal(err)
		}
	}
}
