package claims

import (
	"errors"
	"strings"
	"testing"
)

// A valid manifest with one claim of every kind and every optional field.
// Only its parsing is tested here; its values are true all the same:
// counts of 123 from OEIS A049774, lambda(1342) = 0.95461183447... (OEIS
// A117156, so 1/lambda = 1.04754...), lambda(1324) = 0.95585... (OEIS
// A113228), {123, 321} periodic with period 2 (the alternating
// permutations, Andre 1879), 123 and 321 equal by complement (from memory).
const everyKind = `
title = "every kind"

[run]
timeout = "10m"
max_memory = "2G"

[defaults]
timeout = "60s"
max_k = 300
max_n = 30
max_memory = "1G"

[[claim]]
id = "count"
kind = "count"
patterns = ["123"]
n = 12
count = "74207209"

[[claim]]
id = "counts"
kind = "count"
patterns = ["123"]
from = 3
counts = ["5", 17]

[[claim]]
id = "growth"
kind = "growth"
patterns = ["1342"]
of = "radius"
value = "1.0475"
reading = "truncated"
max_k = 50

[[claim]]
id = "growth-interval"
kind = "growth"
patterns = ["1342"]
interval = ["0.95", "0.96"]

[[claim]]
id = "form"
kind = "form"
patterns = ["123", "321"]
form = "periodic"
period = 2

[[claim]]
id = "order"
kind = "order"
patterns = ["1342"]
less_than = ["1324"]

[[claim]]
id = "equal"
kind = "equal-counts"
patterns = ["123"]
other = ["321"]
to = 10

[[claim]]
id = "probability"
kind = "probability"
patterns = ["123"]
n = 4
exact = "17/24"
note = "a_4 = 17, OEIS A049774"
`

func TestParseEveryKind(t *testing.T) {
	m, err := Parse("every.toml", []byte(everyKind))
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Claims) != 8 || m.Title != "every kind" || m.Timeout.String() != "10m0s" || m.MaxMemory != 2<<30 {
		t.Fatalf("manifest read as %+v", m)
	}
	g := m.Claims[2]
	if g.Budget.MaxK != 50 || g.Budget.MaxN != 30 || g.Budget.Timeout.String() != "1m0s" || g.Budget.MaxMemory != 1<<30 {
		t.Errorf("budget of growth: %+v (its own max_k, the rest from [defaults])", g.Budget)
	}
	// truncated 1.0475 claims [1.0475, 1.0476]
	if g.Of != "radius" || g.Claimed.Lo.FloatString(4) != "1.0475" || g.Claimed.Hi.FloatString(4) != "1.0476" {
		t.Errorf("growth claim read as %s %s..%s", g.Of, g.Claimed.Lo.FloatString(5), g.Claimed.Hi.FloatString(5))
	}
	if c := m.Claims[1]; c.From != 3 || len(c.Counts) != 2 || c.Counts[1].Int64() != 17 {
		t.Errorf("count list read as from %d, %v", c.From, c.Counts)
	}
	if c := m.Claims[0]; c.Line != 14 {
		t.Errorf("first claim at line %d, want 14", c.Line)
	}
}

// Malformed manifests: the error names the file, the line and the field.
func TestParseErrors(t *testing.T) {
	const head = "[[claim]]\nid = \"a\"\n" // lines 1-2
	for _, tc := range []struct {
		name, text string
		line       int
		field      string
		says       string
	}{
		{"unknown kind", head + "kind = \"cout\"\npatterns = [\"123\"]\n", 3, "kind", "unknown kind \"cout\""},
		{"bad pattern", head + "kind = \"count\"\npatterns = [\"1223\"]\nn = 3\ncount = \"1\"\n", 4, "patterns", "1223"},
		{"missing field", head + "kind = \"count\"\npatterns = [\"123\"]\nn = 3\n", 1, "count", "missing"},
		{"missing id", "[[claim]]\nkind = \"count\"\n", 1, "id", "missing"},
		{"duplicate id", head + "kind = \"form\"\npatterns = [\"123\"]\nform = \"primitive\"\n\n" + head + "kind = \"form\"\npatterns = [\"132\"]\nform = \"primitive\"\n", 8, "id", "duplicate claim id (first used by the claim at line 1)"},
		{"unknown field", head + "kind = \"form\"\npatterns = [\"123\"]\nform = \"primitive\"\nperiood = 2\n", 6, "claim.periood", "unknown field"},
		{"field of another kind", head + "kind = \"form\"\npatterns = [\"123\"]\nform = \"primitive\"\nn = 2\n", 6, "n", "does not apply to a form claim"},
		{"float value", head + "kind = \"growth\"\npatterns = [\"123\"]\nvalue = 0.9546\n", 5, "claim.value", "string"},
		{"unknown form", head + "kind = \"form\"\npatterns = [\"123\"]\nform = \"cyclic\"\n", 5, "form", "unknown form"},
		{"bad reading", head + "kind = \"growth\"\npatterns = [\"123\"]\nvalue = \"0.9\"\nreading = \"cut\"\n", 6, "reading", "truncated"},
		{"bad budget", head + "kind = \"growth\"\npatterns = [\"123\"]\nvalue = \"0.9\"\nmax_k = 5000\n", 6, "max_k", "checker's limit"},
		{"bad default", "[defaults]\ntimeout = \"soon\"\n" + head, 2, "defaults.timeout", "duration"},
		{"syntax", head + "kind = \"form\npatterns = []\n", 3, "claim.kind", "a string is not closed on its line"},
		// the TOML library's words stay out of the message
		{"key twice", head + "kind = \"count\"\npatterns = [\"123\"]\nn = 3\nn = 4\n", 6, "claim.n", "given twice: keep one"},
		{"bad integer", head + "kind = \"count\"\npatterns = [\"123\"]\nn = 03\n", 5, "claim.n", "not a number TOML reads"},
		{"unclosed list", head + "kind = \"count\"\npatterns = [\"123\"", 4, "claim.patterns", "ends inside a value"},
		{"wrong type", head + "kind = \"count\"\npatterns = [\"123\"]\nn = \"3\"\ncount = \"1\"\n", 5, "claim.n", "wrong type"},
		{"no claims", "title = \"x\"\n", 0, "claim", "no [[claim]]"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse("m.toml", []byte(tc.text))
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("got %v, want an *Error", err)
			}
			if e.File != "m.toml" || e.Line != tc.line || e.Field != tc.field || !strings.Contains(e.Error(), tc.says) {
				t.Errorf("got %q (line %d, field %q); want line %d, field %q, saying %q", e, e.Line, e.Field, tc.line, tc.field, tc.says)
			}
		})
	}
}

// FuzzParse: the manifest parser never panics, accepts no manifest
// without claims, and every refusal is one short line (values are quoted
// by their start, never whole) naming the file.
func FuzzParse(f *testing.F) {
	f.Add([]byte(everyKind))
	f.Add([]byte("[[claim]]\nid = \"a\"\nkind = \"count\"\n"))
	f.Add([]byte("x = {a={b={c={d={e=1}}}}}\n"))
	f.Add([]byte("a.b.c.d.e = 1\n[[claim]]\n"))
	f.Add([]byte("[[claim]]\nid = \"g\"\nkind = \"growth\"\npatterns = [\"123\"]\nvalue = \"0.12345678901234567890\"\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		m, err := Parse("fuzz.toml", data)
		if err == nil && len(m.Claims) == 0 {
			t.Error("a manifest without claims was accepted")
		}
		if err != nil {
			msg := err.Error()
			if strings.Contains(msg, "\n") || len(msg) > 600 || !strings.HasPrefix(msg, "fuzz.toml") {
				t.Errorf("refusal is not one short line naming the file: %q", msg)
			}
		}
	})
}
