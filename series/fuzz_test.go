package series

import (
	"context"
	"errors"
	"io"
	"math"
	"strings"
	"testing"
)

// FuzzReader feeds arbitrary text to the reader in both formats: it must
// end in io.EOF or an input error of its own, never panic, and every value
// it returns must be finite with a line number that grows.
func FuzzReader(f *testing.F) {
	for _, s := range []string{"1\n2\n", "a,b\n1,2\n", "v\n\"1\",NA\n", "\t\n\"", "1e400\n", "x\r\n-0\n"} {
		f.Add(s, "", false)
		f.Add(s, "2", true)
		f.Add(s, "b", false)
	}
	f.Fuzz(func(t *testing.T, text, column string, skip bool) {
		rd, err := NewReader(context.Background(), "fuzz", strings.NewReader(text), Format{Column: column, SkipMissing: skip})
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("NewReader: %v is not an input error", err)
			}
			return
		}
		last := 0
		for {
			v, err := rd.Next()
			if errors.Is(err, io.EOF) {
				return
			}
			if err != nil {
				var e *Error
				if !errors.As(err, &e) {
					t.Fatalf("Next: %v is not an input error", err)
				}
				return
			}
			if math.IsNaN(v.X) || math.IsInf(v.X, 0) || v.Line <= last {
				t.Fatalf("value %v at line %d after line %d", v.X, v.Line, last)
			}
			last = v.Line
		}
	})
}
