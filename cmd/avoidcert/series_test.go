package main

import (
	"bytes"
	"context"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/santhosh-tekuri/jsonschema/v6"
)

// The JSON of real runs of 'series' satisfies docs/schema/series.schema.json:
// exact and approximate tails, an exact and a certified avoidance
// probability, a histogram, ties at random, a delay, a column.
func TestSeriesJSONSchema(t *testing.T) {
	schema := schemas(t)["series"]
	dir := t.TempDir()
	rng := rand.New(rand.NewPCG(18, 1))
	var values, table strings.Builder
	table.WriteString("t,reading\n")
	for i := range 300 {
		x := rng.Float64()
		fmt.Fprintf(&values, "%g\n", x)
		fmt.Fprintf(&table, "%d,%g\n", i, x)
	}
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	iid := write("iid.txt", values.String())
	csv := write("iid.csv", table.String())
	ties := write("ties.txt", "1\n2\n2\n1\n3\n4\n0.5\n")
	for _, args := range [][]string{
		{iid, "123", "1342", "123,321", "12345", "--max-work", "2e9"},
		{iid, "1234567", "--delay", "3"},
		{iid, "132", "--max-work", "1"},
		{csv, "--column", "reading", "--length", "3"},
		{ties, "123", "--ties", "random", "--seed", "18446744073709551615"},
	} {
		var stdout, stderr bytes.Buffer
		code := run(context.Background(), &env{stdout: &stdout, stderr: &stderr}, append([]string{"series", "--json"}, args...))
		if code != exitOK {
			t.Fatalf("series %v: exit %d: %s", args, code, stderr.String())
		}
		doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(stdout.Bytes()))
		if err != nil {
			t.Fatal(err)
		}
		if err := schema.Validate(doc); err != nil {
			t.Errorf("series %v: the output does not satisfy the schema: %v\n%s", args, err, stdout.String())
		}
		// the schema can fail: a tampered output is refused
		bad := strings.Replace(stdout.String(), `"version":2`, `"version":3`, 1)
		doc, _ = jsonschema.UnmarshalJSON(strings.NewReader(bad))
		if schema.Validate(doc) == nil {
			t.Errorf("series %v: the schema accepts version 3", args)
		}
	}
}

// Ctrl-C ends series at once while it waits for standard input.
func TestSeriesInterruptWhileReading(t *testing.T) {
	r, w, err := os.Pipe()
	if err != nil {
		t.Fatal(err)
	}
	defer w.Close()
	defer r.Close()
	w.Write([]byte("1\n2\n")) // some values, then nothing more
	saved := os.Stdin
	os.Stdin = r
	defer func() { os.Stdin = saved }()
	ctx, cancel := context.WithTimeout(context.Background(), 200*time.Millisecond)
	defer cancel()
	var stdout, stderr bytes.Buffer
	start := time.Now()
	code := run(ctx, &env{stdout: &stdout, stderr: &stderr}, []string{"series", "-", "123"})
	if code != exitAborted || stdout.Len() != 0 || time.Since(start) > 10*time.Second {
		t.Errorf("exit %d after %v, stdout %q, stderr %q; want 4 at once, nothing written", code, time.Since(start), stdout.String(), stderr.String())
	}
}
