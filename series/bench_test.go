package series

import (
	"bufio"
	"context"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"testing"
)

// writeSeries writes n pseudo-random values, one a line, to a file in dir.
func writeSeries(tb testing.TB, dir string, n int) string {
	tb.Helper()
	path := filepath.Join(dir, fmt.Sprintf("series-%d.txt", n))
	f, err := os.Create(path)
	if err != nil {
		tb.Fatal(err)
	}
	w := bufio.NewWriter(f)
	rng := rand.New(rand.NewPCG(1, 2))
	var buf []byte
	for range n {
		buf = strconv.AppendFloat(buf[:0], rng.NormFloat64(), 'g', -1, 64)
		buf = append(buf, '\n')
		w.Write(buf)
	}
	if err := w.Flush(); err != nil {
		tb.Fatal(err)
	}
	if err := f.Close(); err != nil {
		tb.Fatal(err)
	}
	return path
}

// countFile reads and tallies a file as the command does.
func countFile(tb testing.TB, path string, o Options) *Tally {
	f, err := Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	rd, err := NewReader(context.Background(), path, f, Format{})
	if err != nil {
		tb.Fatal(err)
	}
	t, err := Count(rd, o)
	if err != nil {
		tb.Fatal(err)
	}
	return t
}

// BenchmarkCountLength7 reads a file of 10^7 values and tallies all 5,040
// patterns of length 7 (docs/benchmarks.md: the target is 5 s). The file
// is written once, outside the timing.
func BenchmarkCountLength7(b *testing.B) {
	path := writeSeries(b, b.TempDir(), 10_000_000)
	b.ResetTimer()
	for b.Loop() {
		t := countFile(b, path, Options{Lengths: []int{7}, Delay: 1})
		if t.Windows[7] != 10_000_000-6 {
			b.Fatalf("%d windows", t.Windows[7])
		}
	}
}

// BenchmarkCountMemory shows that memory does not grow with the series:
// allocations and bytes per value are the same for 10^5 and 10^6 values
// (reported as allocs/value and B/value).
func BenchmarkCountMemory(b *testing.B) {
	dir := b.TempDir()
	for _, n := range []int{100_000, 1_000_000} {
		path := writeSeries(b, dir, n)
		b.Run(fmt.Sprintf("values=%d", n), func(b *testing.B) {
			var before, after runtime.MemStats
			runtime.ReadMemStats(&before)
			for b.Loop() {
				countFile(b, path, Options{Lengths: []int{7, 3}, Delay: 2})
			}
			runtime.ReadMemStats(&after)
			per := float64(b.N) * float64(n)
			b.ReportMetric(float64(after.Mallocs-before.Mallocs)/per, "allocs/value")
			b.ReportMetric(float64(after.TotalAlloc-before.TotalAlloc)/per, "B/value")
		})
	}
}
