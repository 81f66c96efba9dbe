package transfer_test

import (
	"context"
	"testing"

	"avoidcert/internal/settest"
	"avoidcert/transfer"
)

// go test ./transfer/ -run XXX -bench . -benchtime 1x
func BenchmarkCounts1342To200(b *testing.B) { benchCounts(b, "1342", 200) }
func BenchmarkCounts2413To300(b *testing.B) { benchCounts(b, "2413", 300) }
func BenchmarkCounts123To1000(b *testing.B) { benchCounts(b, "123", 1000) }

func benchCounts(b *testing.B, set string, n int) {
	s := settest.Must(b, set)
	for b.Loop() {
		if _, err := transfer.Counts(context.Background(), s, n, nil); err != nil {
			b.Fatal(err)
		}
	}
}
func BenchmarkCounts123To600(b *testing.B)  { benchCounts(b, "123", 600) }
func BenchmarkCounts2413To200(b *testing.B) { benchCounts(b, "2413", 200) }
