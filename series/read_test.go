package series

import (
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// readAll reads every value of text in format f.
func readAll(text string, f Format) ([]Value, *Reader, error) {
	rd, err := NewReader(context.Background(), "data", strings.NewReader(text), f)
	if err != nil {
		return nil, nil, err
	}
	var out []Value
	for {
		v, err := rd.Next()
		if errors.Is(err, io.EOF) {
			return out, rd, nil
		}
		if err != nil {
			return out, rd, err
		}
		out = append(out, v)
	}
}

func TestReadFormats(t *testing.T) {
	for _, tc := range []struct {
		name, text string
		f          Format
		want       []Value
		header     string
	}{
		{"one a line", "1.5\n -2 \n3e2\r\n", Format{}, []Value{{1.5, 1}, {-2, 2}, {300, 3}}, ""},
		{"no final newline", "1\n2", Format{}, []Value{{1, 1}, {2, 2}}, ""},
		{"csv by name", "t,price\n0,10\n1,11.5\n", Format{Column: "price"}, []Value{{10, 2}, {11.5, 3}}, "price"},
		{"csv by name, spaces", "t, price\n0, 10\n", Format{Column: "price"}, []Value{{10, 2}}, "price"},
		{"csv by number with header", "t,price\n0,10\n1,11\n", Format{Column: "2"}, []Value{{10, 2}, {11, 3}}, "price"},
		{"csv by number without header", "0,10\n1,11\n", Format{Column: "2"}, []Value{{10, 1}, {11, 2}}, ""},
		{"tsv detected", "a\tb\n1\t2\n3\t4\n", Format{Column: "b"}, []Value{{2, 2}, {4, 3}}, "b"},
		{"semicolon-free csv with tab forced", "a,b\tc\n1,2\t3\n", Format{Column: "2", Delimiter: '\t'}, []Value{{3, 2}}, "c"},
		{"quoted fields", "name,v\n\"a, b\",1\n\"c\",\"2\"\n", Format{Column: "v"}, []Value{{1, 2}, {2, 3}}, "v"},
		{"quoted newline keeps line numbers", "name,v\n\"a\nb\",1\nc,2\n", Format{Column: "v"}, []Value{{1, 2}, {2, 4}}, "v"},
	} {
		got, rd, err := readAll(tc.text, tc.f)
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		if diff := cmp.Diff(tc.want, got); diff != "" {
			t.Errorf("%s: values (-want +got):\n%s", tc.name, diff)
		}
		if rd.Header != tc.header {
			t.Errorf("%s: header %q, want %q", tc.name, rd.Header, tc.header)
		}
	}
}

// Bad files: each refused with a message in our words that names the line
// where there is one.
func TestReadRefuses(t *testing.T) {
	for _, tc := range []struct {
		name, text string
		f          Format
		want       string // part of the message
		line       int
	}{
		{"text", "12\nhello\n", Format{}, `"hello" is not a finite number`, 2},
		{"header without --column", "price\n1\n", Format{}, "read the file with --column 1", 1},
		{"NaN", "1\nNaN\n", Format{}, "a missing value", 2},
		{"empty line", "1\n\n2\n", Format{}, "a missing value", 2},
		{"NA in a column", "v\n1\nNA\n", Format{Column: "v"}, "a missing value", 3},
		{"infinity", "1\n+Inf\n", Format{}, "not a finite number", 2},
		{"out of range", "1e400\n", Format{}, "not a finite number", 1},
		{"no such column", "a,b\n1,2\n", Format{Column: "c"}, `no column named "c"`, 1},
		{"column past the row", "a,b\n1\n", Format{Column: "b"}, "has 1 columns, not the 2 needed", 2},
		{"column 0", "1,2\n", Format{Column: "0"}, "numbered from 1", 0},
		{"two columns of one name", "a,a\n1,2\n", Format{Column: "a"}, "two columns are named", 1},
		{"empty csv", "", Format{Column: "a"}, "is empty", 0},
		{"bad quote", "a\n\"1\n", Format{Column: "a"}, "a quote is not closed", 2},
	} {
		_, _, err := readAll(tc.text, tc.f)
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("%s: error %v, want an input error", tc.name, err)
			continue
		}
		if !strings.Contains(e.Error(), tc.want) || e.Line != tc.line {
			t.Errorf("%s: %q (line %d), want %q at line %d", tc.name, e.Error(), e.Line, tc.want, tc.line)
		}
		if strings.Contains(e.Error(), "strconv") || strings.Contains(e.Error(), "ParseFloat") {
			t.Errorf("%s: Go's wording in %q", tc.name, e.Error())
		}
	}
}

func TestSkipMissing(t *testing.T) {
	got, rd, err := readAll("1\nNA\n\nx\n2\n", Format{SkipMissing: true})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([]Value{{1, 1}, {2, 5}}, got); diff != "" {
		t.Errorf("one a line: values (-want +got):\n%s", diff)
	}
	if want := (Skipped{Missing: 2, NotNumbers: 1, FirstLine: 2}); rd.Skipped != want {
		t.Errorf("one a line: skipped %+v, want %+v", rd.Skipped, want)
	}
	got, rd, err = readAll("v\n1\nNA\n\nx\n2\nnan\n", Format{Column: "v", SkipMissing: true})
	if err != nil {
		t.Fatal(err)
	}
	// a CSV file's blank lines are no records (encoding/csv skips them)
	if diff := cmp.Diff([]Value{{1, 2}, {2, 6}}, got); diff != "" {
		t.Errorf("values (-want +got):\n%s", diff)
	}
	if want := (Skipped{Missing: 2, NotNumbers: 1, FirstLine: 3}); rd.Skipped != want {
		t.Errorf("skipped %+v, want %+v", rd.Skipped, want)
	}
}

// A line past MaxLine is refused, in both formats, without reading the
// rest of it into memory.
func TestLongLine(t *testing.T) {
	long := "1\n" + strings.Repeat("7", MaxLine+10) + "\n2\n"
	for _, f := range []Format{{}, {Column: "1"}} {
		_, _, err := readAll(long, f)
		var e *Error
		if !errors.As(err, &e) || !strings.Contains(e.Error(), "longer than") {
			t.Errorf("column %q: %v, want a refusal of the long line", f.Column, err)
		}
	}
}

func TestOpen(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "v.txt")
	if err := os.WriteFile(file, []byte("1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	f, err := Open(file)
	if err != nil {
		t.Fatal(err)
	}
	f.Close()
	fifo := filepath.Join(dir, "pipe")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skip("no FIFO here:", err)
	}
	for path, want := range map[string]string{filepath.Join(dir, "none"): "does not exist", dir: "is a folder", fifo: "not a regular file"} {
		if _, err := Open(path); err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("Open(%s): %v, want %q", path, err, want)
		}
	}
}

// Cancelling the context stops a long read.
func TestReadCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	rd, err := NewReader(ctx, "data", &endless{}, Format{})
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; ; i++ {
		if _, err := rd.Next(); err != nil {
			if !errors.Is(err, context.Canceled) {
				t.Fatalf("after %d values: %v, want cancelled", i, err)
			}
			return
		}
	}
}

// endless is an unending series "0.5\n0.25\n...".
type endless struct{ i int }

func (e *endless) Read(p []byte) (int, error) {
	n := 0
	for n+16 <= len(p) {
		e.i++
		n += copy(p[n:], []byte("0.5\n0.25\n"[:4+5*(e.i%2)]))
	}
	return n, nil
}

// A huge series streams: the live heap measured while the read is under way,
// at 100,000 and at 3,000,000 values, differs by less than 256 KiB.
func TestHugeSeriesStreams(t *testing.T) {
	if testing.Short() {
		t.Skip("reads 3,000,000 values")
	}
	g := &generated{limit: 3_000_000, marks: map[int]*uint64{100_000: new(uint64), 2_999_000: new(uint64)}}
	rd, err := NewReader(context.Background(), "generated", g, Format{})
	if err != nil {
		t.Fatal(err)
	}
	got, err := Count(rd, Options{Lengths: []int{7}, Delay: 3})
	if err != nil {
		t.Fatal(err)
	}
	if got.Values != 3_000_000 {
		t.Fatalf("%d values", got.Values)
	}
	early, late := *g.marks[100_000], *g.marks[2_999_000]
	if late > early+256<<10 {
		t.Errorf("the live heap grew from %d to %d bytes while reading", early, late)
	}
}

// generated is a series of limit values "0.1234\n"..., which records the
// live heap (after a collection) when it has produced the marked numbers
// of values.
type generated struct {
	limit, i int
	marks    map[int]*uint64
}

func (g *generated) Read(p []byte) (int, error) {
	n := 0
	for n+24 <= len(p) && g.i < g.limit {
		if m, ok := g.marks[g.i]; ok {
			var ms runtime.MemStats
			runtime.GC()
			runtime.ReadMemStats(&ms)
			*m = ms.HeapAlloc
		}
		n += copy(p[n:], strconv.AppendFloat(p[n:n], float64(g.i%9973)/9973+float64(g.i)*1e-9, 'f', 9, 64))
		p[n] = '\n'
		n++
		g.i++
	}
	if n == 0 {
		return 0, io.EOF
	}
	return n, nil
}
