package main

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"
)

// schemaBase is where the schemas of docs/schema name themselves ($id); a
// reference to another file resolves against it.
const schemaBase = "https://avoidcert.invalid/schema/"

// schemas compiles every schema of docs/schema, each registered under its
// $id (which must be its file's name), so that references between them
// resolve without the network.
func schemas(t *testing.T) map[string]*jsonschema.Schema {
	t.Helper()
	files, err := filepath.Glob(filepath.Join("..", "..", "docs", "schema", "*.schema.json"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no schemas in docs/schema: %v", err)
	}
	c := jsonschema.NewCompiler()
	for _, f := range files {
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(data))
		if err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		id, _ := doc.(map[string]any)["$id"].(string)
		if id != schemaBase+filepath.Base(f) {
			t.Fatalf("%s: $id %q, want %q", f, id, schemaBase+filepath.Base(f))
		}
		if err := c.AddResource(id, doc); err != nil {
			t.Fatal(err)
		}
	}
	out := map[string]*jsonschema.Schema{}
	for _, f := range files {
		name := strings.TrimSuffix(filepath.Base(f), ".schema.json")
		if out[name], err = c.Compile(schemaBase + filepath.Base(f)); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
	}
	return out
}

// outputRun is a command line whose JSON output a schema describes.
type outputRun struct {
	schema string   // the schema's name in docs/schema
	args   []string // the command line, in the test's folder
	code   int      // its exit code
	stderr bool     // the JSON goes to stderr (bound --out -)
	lines  bool     // one JSON object a line (gate)
	file   string   // the JSON is this file the command writes, not its output
}

// Every JSON output of the command line, from real runs, satisfies its
// schema in docs/schema; and each schema refuses the output with its
// version changed, so that the check can fail. The runs cover every
// structure class the outputs distinguish, both verdicts of check,
// claim and the gate, exact and certified probabilities, and every kind
// of input of report.
func TestJSONSchemas(t *testing.T) {
	compiled := schemas(t)
	dir := t.TempDir()
	write := func(name, text string) {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	// Sources of the claimed values: OEIS A049774 (123), A117156
	// (lambda(1342)), A113228 (lambda(1324)); {123, 321}: radius pi/2
	// (Andre 1879).
	write("claims.toml", `[[claim]]
id = "c"
kind = "count"
patterns = ["123"]
from = 0
counts = ["1", "1", "2", "5", "17"]
note = "Table 1"
[[claim]]
id = "g"
kind = "growth"
patterns = ["1342"]
value = "0.9546118"
[[claim]]
id = "r"
kind = "growth"
patterns = ["123", "321"]
of = "radius"
interval = ["1.57079", "1.5708"]
[[claim]]
id = "f"
kind = "form"
patterns = ["123", "321"]
form = "periodic"
period = 2
[[claim]]
id = "o"
kind = "order"
patterns = ["1342"]
less_than = ["1324"]
[[claim]]
id = "e"
kind = "equal-counts"
patterns = ["123"]
other = ["321"]
to = 10
[[claim]]
id = "p"
kind = "probability"
patterns = ["123"]
n = 4
exact = "17/24"
[[claim]]
id = "q"
kind = "probability"
patterns = ["123"]
n = 10
value = "0.2265"
reading = "truncated"
[[claim]]
id = "late"
kind = "growth"
patterns = ["1342"]
value = "0.9546118"
max_k = 2
`)
	write("levels.txt", "3\n1\n4\n1.5\n5\n9\n2\n6\n")
	reducible := "1243,1342,2314,2413,3421,4132"
	runs := []outputRun{
		{schema: "count", args: []string{"count", "123", "--to", "6", "--json"}},
		{schema: "count", args: []string{"count", "1342", "--from", "3", "--to", "8", "--format", "json"}},
		{schema: "structure", args: []string{"structure", "1342", "--json", "--witnesses"}},
		{schema: "structure", args: []string{"structure", "123,321", "--json"}},
		{schema: "structure", args: []string{"structure", "12,21", "--json"}},
		{schema: "structure", args: []string{"structure", reducible, "--json"}},
		{schema: "bound", args: []string{"bound", "1342", "--json", "--out", "c.json"}},
		{schema: "bound", args: []string{"bound", "123,321", "--json", "--no-certificate"}},
		{schema: "bound", args: []string{"bound", "12,21", "--json", "--no-certificate"}},
		{schema: "bound", args: []string{"bound", reducible, "--json", "--no-certificate"}},
		{schema: "bound", args: []string{"bound", "123", "--json", "--out", "-"}, stderr: true},
		{schema: "bound", args: []string{"bound", "1342", "--json", "--digits", "30", "--max-k", "8", "--out", "short.json"}, code: exitUndecided},
		{schema: "check", args: []string{"check", "c.json", "--json"}},
		{schema: "check", args: []string{"check", "c.json", "--json", "--expect", "1342"}},
		{schema: "check", args: []string{"check", "c.json", "--json", "--expect", "1324"}, code: exitFailed},
		{schema: "check", args: []string{"check", "claims.toml", "--json", "--expect", "1342"}, code: exitFailed},
		{schema: "check", args: []string{"check", "c.json", "--json", "--max-work", "1", "--expect", "1342"}, code: exitUndecided},
		{schema: "claim", args: []string{"claim", "1342", "--value", "0.95461183", "--json"}},
		{schema: "claim", args: []string{"claim", "1342", "--value", "0.9547", "--json"}, code: exitFailed},
		{schema: "claim", args: []string{"claim", "123,321", "--of", "radius", "--interval", "1.57,1.58", "--json"}},
		{schema: "claim", args: []string{"claim", "1342", "--value", "0.9546118344", "--max-k", "3", "--json"}, code: exitUndecided},
		{schema: "gate", args: []string{"gate", "claims.toml", "--json", "--certificates", "certs", "--cache", "off"}, code: exitUndecided, lines: true},
		{schema: "gate", args: []string{"demo", "--json", "--out", "demo"}, lines: true},
		{schema: "gate", args: []string{"demo", "--out", "demo2"}, lines: true, file: "demo2/verdicts.jsonl"},
		{schema: "census", args: []string{"census", "--length", "3", "--to", "8", "--digits", "5", "--out", "c3", "--json", "--quiet"}},
		{schema: "census", args: []string{"census", "--length", "3", "--to", "8", "--digits", "5", "--out", "c3", "--quiet"}, file: "c3/census.json"},
		{schema: "census", args: []string{"census", "--length", "3", "--to", "8", "--digits", "5", "--shard", "1/2", "--out", "s1", "--json", "--quiet"}},
		{schema: "census", args: []string{"census", "--length", "3", "--to", "8", "--digits", "5", "--shard", "2/2", "--out", "s2", "--quiet"}, file: "s2/census.json"},
		{schema: "census", args: []string{"census", "merge", "--out", "m3", "--json", "s1", "s2"}},
		{schema: "census", args: []string{"census", "--length", "4", "--to", "9", "--digits", "0", "--out", "d4", "--json", "--quiet"}},
		{schema: "prob", args: []string{"prob", "--n", "12", "123", "--json", "--occurrences", "3"}},
		{schema: "prob", args: []string{"prob", "--n", "1000", "1342", "--json"}},
		{schema: "prob", args: []string{"prob", "--n", "1000", "12,21", "--json"}},
		{schema: "series", args: []string{"series", "levels.txt", "123", "321", "123,321", "--json"}},
		{schema: "report", args: []string{"report", "--json", "c.json", "c3", "gate.jsonl", "series.json"}},
	}
	for _, r := range runs {
		var stdout, stderr bytes.Buffer
		code := run(context.Background(), &env{stdout: &stdout, stderr: &stderr}, inFolder(dir, r.args))
		if code != r.code {
			t.Fatalf("%v: exit %d, want %d: %s", r.args, code, r.code, stderr.String())
		}
		out := stdout.Bytes()
		switch {
		case r.stderr:
			out = stderr.Bytes()
		case r.file != "":
			data, err := os.ReadFile(filepath.Join(dir, r.file))
			if err != nil {
				t.Fatal(err)
			}
			out = data
		}
		// inputs of the report run, from the runs before it
		switch {
		case r.schema == "gate" && r.args[0] == "gate":
			write("gate.jsonl", string(out))
		case r.schema == "series":
			write("series.json", string(out))
		}
		docs := [][]byte{out}
		if r.lines {
			docs = bytes.Split(bytes.TrimSpace(out), []byte("\n"))
		}
		for _, d := range docs {
			validates(t, compiled[r.schema], r.args, d)
		}
	}
}

// validates checks one JSON document against its schema, and that the
// schema refuses it with its version changed.
func validates(t *testing.T, schema *jsonschema.Schema, args []string, data []byte) {
	t.Helper()
	doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(data))
	if err != nil {
		t.Fatalf("%v: not JSON: %v\n%s", args, err, data)
	}
	if err := schema.Validate(doc); err != nil {
		t.Errorf("%v: the output does not satisfy the schema: %v\n%s", args, err, data)
	}
	version := regexp.MustCompile(`"version": ?[0-9]+`)
	if !version.Match(data) {
		t.Fatalf("%v: no format version in the output", args)
	}
	bad, _ := jsonschema.UnmarshalJSON(bytes.NewReader(version.ReplaceAll(data, []byte(`"version": 99`))))
	if schema.Validate(bad) == nil {
		t.Errorf("%v: the schema accepts version 99", args)
	}
}

// inFolder makes the paths of a command line relative to dir.
func inFolder(dir string, args []string) []string {
	out := append([]string(nil), args...)
	takesPath := map[string]bool{"--out": true, "--certificates": true}
	for i := 1; i < len(out); i++ {
		a := out[i]
		switch {
		case takesPath[out[i-1]] && a != "-":
			out[i] = filepath.Join(dir, a)
		case strings.HasSuffix(a, ".json") || strings.HasSuffix(a, ".toml") || strings.HasSuffix(a, ".jsonl") || strings.HasSuffix(a, ".txt") || a == "c3" || a == "s1" || a == "s2":
			out[i] = filepath.Join(dir, a)
		}
	}
	return out
}
