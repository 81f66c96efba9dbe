package main

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"

	"avoidcert/claims"
	"avoidcert/internal/atomicfile"
	"avoidcert/testdata/demo"
)

func init() {
	commands["demo"] = command{
		summary: "a referee checks a fictional manuscript's table with the claims gate",
		usage: `Usage: avoidcert demo [--manifest FILE] [--out DIR] [--json]

Runs the claims gate (see 'avoidcert help gate') on the built-in table of a
fictional manuscript (testdata/demo/manuscript.toml, invented for this
demo): counts, growth rates, a structure class, an order of growth rates,
equal counts and a probability, some right and some wrong. It writes the
certificates, the verdicts as JSON lines and a JUnit XML report into a
folder (--out, or a fresh one), prints its path, and lists the refuted entries with their evidence.

Flags:
  --manifest FILE   run your own manifest instead (schema: docs/claims.md)
  --out DIR         write into DIR, created if missing in an existing folder
                    (default: a fresh folder in the system's temporary folder)
  --json            print the gate's JSON lines (as in verdicts.jsonl; schema
                    docs/schema/gate.schema.json) instead of the table

The demo itself succeeds (exit 0) whatever the verdicts are; use
'avoidcert gate' where the verdicts must set the exit code.
`,
		run: runDemo,
	}
}

func runDemo(ctx context.Context, e *env, args []string) int {
	fs := newFlags("demo")
	manifest := fs.String("manifest", "", "")
	out := fs.String("out", "", "")
	asJSON := fs.Bool("json", false, "")
	pos, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	if len(pos) > 0 {
		return failure(e, usagef("demo: %s is not a flag; the demo takes flags only (give your own manifest with --manifest FILE)", quote(pos[0])))
	}
	var m *claims.Manifest
	if *manifest != "" {
		m, err = readManifest(ctx, "demo", *manifest)
	} else {
		m, err = claims.Parse(demo.ManuscriptName, demo.Manuscript)
	}
	if err != nil {
		return failure(e, err)
	}
	dir := *out
	if dir == "" {
		if dir, err = os.MkdirTemp("", "avoidcert-demo-"); err != nil {
			return failure(e, usagef("demo: cannot make a folder for the results in the temporary folder (%s); give one with --out DIR", osReason(err)))
		}
	} else if err := openOutDir("demo", "--out", dir, true); err != nil {
		return failure(e, err)
	}
	g := &gateRun{manifest: m, junitPath: filepath.Join(dir, "junit.xml"),
		opts: claims.Options{CertDir: filepath.Join(dir, "certificates"), Tool: toolName()}}
	if err := g.prepare("demo"); err != nil {
		return failure(e, err)
	}
	defer g.done()
	title := m.Title
	if title == "" {
		title = m.File
	}
	if !*asJSON {
		fmt.Fprintf(e.stdout, "Referee check of %s\n\n", title)
	}
	results, code := g.run(ctx, e)
	if code != exitOK {
		return code
	}
	var lines bytes.Buffer
	if err := claims.WriteJSON(&lines, results); err == nil {
		err = atomicfile.WriteFile(filepath.Join(dir, "verdicts.jsonl"), lines.Bytes(), 0o644)
	}
	if err != nil {
		return failure(e, fmt.Errorf("demo: cannot write the verdicts: %w", err))
	}
	if *asJSON {
		e.stdout.Write(lines.Bytes()) // the gate's JSON lines, as in verdicts.jsonl
		return demoExit(results)
	}
	claims.WriteTable(e.stdout, results)
	fmt.Fprintf(e.stdout, "\n%s.\n", claims.Summarize(results))
	for _, r := range results {
		if r.Verdict == claims.Refuted {
			fmt.Fprintf(e.stdout, "REFUTED %s (line %d of %s): claimed %s; %s\n", r.ID, r.Line, m.File, r.Claim.Statement(), r.Evidence)
		}
	}
	fmt.Fprintf(e.stdout, "\nWritten to %s:\n  certificates/   one checked certificate per growth, form and order claim\n  verdicts.jsonl  one JSON object per claim\n  junit.xml       JUnit XML, one test case per claim\n", dir)
	fmt.Fprintln(e.stdout, "Re-check any certificate with 'avoidcert check FILE --expect PATTERN...'; judge your own table with 'avoidcert gate FILE' (docs/claims.md).")
	return demoExit(results)
}

// demoExit is 0 whatever the verdicts, 4 when the tool failed on a claim.
func demoExit(results []claims.Result) int {
	if claims.Summarize(results).Failed > 0 {
		return exitAborted
	}
	return exitOK
}
