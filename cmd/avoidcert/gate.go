package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"time"

	"avoidcert/claims"
	"avoidcert/internal/atomicfile"
	"avoidcert/internal/input"
)

func init() {
	commands["gate"] = command{
		summary: "judge every claim of a manifest (a CI gate and a referee's check)",
		usage: `Usage: avoidcert gate [flags] FILE

Judges every claim of the TOML manifest FILE (schema: docs/claims.md):
counts, growth rates and radii, the structure class, the order of two
growth rates, equal counts of two sets, probabilities a_n/n!. Every verdict
rests on the independent checker: counts on the engine and the checker
agreeing, the others on certificates the checker accepted.

Prints a table (claim, kind, verdict, evidence), or one JSON object per
claim and line with --json.

Flags:
  --json               JSON lines on stdout instead of the table
  --junit FILE         also write JUnit XML (one test case per claim;
                       refuted = failure, undecided = skipped with the reason)
  --certificates DIR   keep every certificate there, named after the claim id
                       (the folder is created)
  --cache DIR          certificates kept between runs and re-checked by the
                       checker instead of recomputed (default: .avoidcert-cache
                       beside FILE; "off" for none)
  --timeout T          the whole run's budget, e.g. 10m (overrides [run] timeout)
  --max-memory B       cap every claim's memory, e.g. 4G (overrides [run] max_memory)
  --progress           one line on stderr as each claim is judged

Exit codes: 0 every claim proved, 1 some claim refuted, 3 none refuted but
some undecided within the budget, 2 a malformed manifest or bad flags (the
message names the file, line and field), 4 interrupted or an internal error.
`,
		run: runGate,
	}
}

// gateRun is one judged manifest and where its reports go.
type gateRun struct {
	manifest *claims.Manifest
	opts     claims.Options
	junit    string // "" for none
	progress bool
}

func runGate(ctx context.Context, e *env, args []string) int {
	fs := newFlags("gate")
	asJSON := fs.Bool("json", false, "")
	junit := fs.String("junit", "", "")
	certs := fs.String("certificates", "", "")
	cache := fs.String("cache", "", "")
	timeout := fs.Duration("timeout", 0, "")
	var mem byteSize
	fs.Var(&mem, "max-memory", "")
	progress := fs.Bool("progress", false, "")
	pos, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	if len(pos) != 1 {
		return failure(e, usagef("gate: name one manifest file, e.g. 'avoidcert gate claims.toml'"))
	}
	if *timeout < 0 {
		return failure(e, usagef("gate: --timeout must not be negative"))
	}
	m, err := readManifest(ctx, "gate", pos[0])
	if err != nil {
		return failure(e, err)
	}
	if *cache == "" {
		*cache = filepath.Join(filepath.Dir(pos[0]), ".avoidcert-cache")
	}
	if *cache == "off" {
		*cache = ""
	}
	g := &gateRun{manifest: m, junit: *junit, progress: *progress,
		opts: claims.Options{CacheDir: *cache, CertDir: *certs, Timeout: *timeout, MaxMemory: int64(mem), Tool: "avoidcert " + version}}
	if err := g.prepare("gate"); err != nil {
		return failure(e, err)
	}
	results, code := g.run(ctx, e)
	if code != exitOK {
		return code
	}
	if *asJSON {
		if err := claims.WriteJSON(e.stdout, results); err != nil {
			return failure(e, err)
		}
	} else {
		claims.WriteTable(e.stdout, results)
		fmt.Fprintf(e.stdout, "\n%s: %s\n", m.File, claims.Summarize(results))
	}
	return gateExit(results)
}

// readManifest reads and parses a manifest; every fault is a usage error.
func readManifest(ctx context.Context, cmd, path string) (*claims.Manifest, error) {
	data, err := input.ReadFile(ctx, path, input.Manifest)
	if err != nil {
		if ctx.Err() != nil {
			return nil, err
		}
		return nil, usagef("%s: %v", cmd, err)
	}
	m, err := claims.Parse(path, data)
	if err != nil {
		return nil, usagef("%s: %v", cmd, err)
	}
	return m, nil
}

// prepare creates the cache and certificate folders and refuses an
// unusable --junit before the work.
func (g *gateRun) prepare(cmd string) error {
	for _, dir := range []string{g.opts.CacheDir, g.opts.CertDir} {
		if dir == "" {
			continue
		}
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return usagef("%s: cannot create the folder %s: %v", cmd, dir, err)
		}
	}
	if g.junit != "" {
		if info, err := os.Stat(filepath.Dir(g.junit)); err != nil || !info.IsDir() {
			return usagef("%s: cannot write %s: folder %s does not exist", cmd, g.junit, filepath.Dir(g.junit))
		}
		if info, err := os.Stat(g.junit); err == nil && !info.Mode().IsRegular() {
			return usagef("%s: %s exists and is not a regular file; choose another --junit", cmd, g.junit)
		}
	}
	return nil
}

// run judges the claims and writes the JUnit file. A code other than
// exitOK means the run did not finish (interrupted) or the report could
// not be written; the message is already printed.
func (g *gateRun) run(ctx context.Context, e *env) ([]claims.Result, int) {
	if g.opts.MaxMemory > 0 {
		limitMemory(g.opts.MaxMemory)
	}
	if g.progress {
		total := len(g.manifest.Claims)
		done := 0
		g.opts.Done = func(r claims.Result) {
			done++
			fmt.Fprintf(e.stderr, "[%d/%d] %s: %s (%.1f s)\n", done, total, r.ID, r.Verdict, r.Elapsed.Seconds())
		}
	}
	start := time.Now()
	results, err := claims.Run(ctx, g.manifest, g.opts)
	if err != nil {
		fmt.Fprintf(e.stderr, "avoidcert: interrupted after %d of %d claims (%.1f s); no report was written\n",
			len(results), len(g.manifest.Claims), time.Since(start).Seconds())
		return nil, exitAborted
	}
	if g.junit != "" {
		data, err := claims.JUnit(filepath.Base(g.manifest.File), results)
		if err == nil {
			err = atomicfile.WriteFile(g.junit, data, 0o644)
		}
		if err != nil {
			return nil, failure(e, fmt.Errorf("cannot write the JUnit file: %v", err))
		}
	}
	return results, exitOK
}

// gateExit is the exit code of a judged manifest.
func gateExit(results []claims.Result) int {
	s := claims.Summarize(results)
	switch {
	case s.Failed > 0:
		return exitAborted
	case s.Refuted > 0:
		return exitFailed
	case s.Undecided > 0:
		return exitUndecided
	}
	return exitOK
}
