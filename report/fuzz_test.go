package report

import (
	"io"
	"os"
	"path/filepath"
	"testing"
)

// FuzzFromGate: the gate-output parser never panics, and what it accepts
// has an id and a verdict on every claim.
func FuzzFromGate(f *testing.F) {
	if data, err := os.ReadFile(filepath.Join("testdata", "gate.jsonl")); err == nil {
		f.Add(data)
	}
	f.Add([]byte(`{"id":"a","kind":"count","verdict":"proved"}`))
	f.Add([]byte(`{"format":"avoidcert-gate","version":1,"id":"a","kind":"count","verdict":"proved","claim":{"patterns":["1"]}}`))
	f.Add([]byte("{}\n{"))
	f.Fuzz(func(t *testing.T, data []byte) {
		IsGateJSON(data)
		g, err := parseGate("fuzz", data)
		if err != nil {
			return
		}
		for _, c := range g.Claims {
			if c.ID == "" || c.Verdict == "" {
				t.Fatalf("accepted a claim without id or verdict: %+v", c)
			}
		}
		if err := JSON(io.Discard, &Document{Gates: []*Gate{g}}); err != nil {
			t.Fatalf("an accepted gate output does not restate as JSON: %v", err)
		}
	})
}
