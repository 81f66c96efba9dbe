package census

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzReadReport: the census.json reader never panics, refuses with an
// *InputError of one line, and what it accepts has a known format and
// valid parameters.
func FuzzReadReport(f *testing.F) {
	f.Add([]byte(`{"format":"avoidcert-census","version":1,"parameters":{"length":3,"to":5,"digits":4},"rows":[]}`))
	f.Add([]byte(`{"format":"avoidcert-census","version":1,"rows":[{"counts":["1","x"]}]}`))
	f.Add([]byte(strings.Repeat("[", 40)))
	f.Add([]byte(`{"rows":[{"lambda":{"lo":"1e99999999"}}]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, JSONFile), data, 0o644); err != nil {
			t.Fatal(err)
		}
		rep, err := ReadReport(context.Background(), dir)
		if err != nil {
			if _, ok := err.(*InputError); !ok || strings.Contains(err.Error(), "\n") {
				t.Fatalf("refusal is not a one-line *InputError: %T %q", err, err)
			}
			return
		}
		if rep.Format != ReportFormat || rep.Version != ReportVersion || rep.Params.Validate() != nil {
			t.Fatalf("accepted %+v", rep)
		}
	})
}
