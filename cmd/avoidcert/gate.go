package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"time"

	"avoidcert/claims"
	"avoidcert/internal/atomicfile"
	"avoidcert/internal/filelock"
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
                       (created if missing in an existing folder, and locked
                       for the run: a second gate on it is refused)
  --cache DIR          certificates kept between runs and re-checked by the
                       checker instead of recomputed (default: .avoidcert-cache
                       beside FILE; "off" for none; locked for the run)
  --timeout T          the whole run's budget, e.g. 10m (overrides [run] timeout)
  --max-memory B       cap every claim's memory (overrides [run] max_memory;
                       a claim's own max_memory defaults to 4G)
  --progress           one line on stderr as each claim is judged

Exit codes: 0 every claim proved, 1 some claim refuted, 3 none refuted but
some undecided within the budget, 2 a malformed manifest or bad flags (the
message names the file, line and field; also a folder in use by another
gate), 4 interrupted (Ctrl-C, SIGTERM), out of space or an internal error.
`,
		run: runGate,
	}
}

// gateRun is one judged manifest and where its reports go.
type gateRun struct {
	manifest  *claims.Manifest
	opts      claims.Options
	junitPath string   // --junit, "" for none
	junit     *outFile // where the JUnit XML goes, once prepared
	progress  bool
	release   []func() // the folder locks prepare took
}

// lockName is the lock file a gate holds in its --certificates and
// --cache folders for the whole run.
const lockName = ".avoidcert-lock"

func runGate(ctx context.Context, e *env, args []string) int {
	fs := newFlags("gate")
	asJSON := fs.Bool("json", false, "")
	junit := fs.String("junit", "", "")
	certs := fs.String("certificates", "", "")
	cache := fs.String("cache", "", "")
	var timeout duration
	fs.Var(&timeout, "timeout", "")
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
	g := &gateRun{manifest: m, junitPath: *junit, progress: *progress,
		opts: claims.Options{CacheDir: *cache, CertDir: *certs, Timeout: time.Duration(timeout), MaxMemory: int64(mem), Tool: toolName()}}
	if err := g.prepare("gate"); err != nil {
		return failure(e, err)
	}
	defer g.done()
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
	// The TOML library takes seconds on the largest manifests and cannot
	// be stopped: Ctrl-C leaves it behind.
	m, err := cancellable(ctx, func() (*claims.Manifest, error) { return claims.Parse(path, data) })
	if err != nil {
		if ctx.Err() != nil {
			return nil, err
		}
		return nil, usagef("%s: %v", cmd, err)
	}
	return m, nil
}

// prepare creates the cache and certificate folders, locks them against
// a concurrent run (whose certificates would replace this run's under the
// SHA-256 values it records), removes the temp files of killed runs there,
// and refuses before the work an unusable --junit and any file the run
// would read or replace that is not a regular file. Call done afterwards.
func (g *gateRun) prepare(cmd string) (err error) {
	defer func() {
		if err != nil {
			g.done()
		}
	}()
	var locked []string
	for _, d := range []struct{ dir, flag string }{{g.opts.CacheDir, "--cache"}, {g.opts.CertDir, "--certificates"}} {
		if d.dir == "" || slices.ContainsFunc(locked, func(l string) bool { return sameFolder(l, d.dir) }) {
			continue
		}
		if err := openOutDir(cmd, d.flag, d.dir, true); err != nil {
			return err
		}
		release, err := filelock.Lock(filepath.Join(d.dir, lockName))
		if errors.Is(err, filelock.ErrHeld) {
			return usagef("%s: the folder %s is in use by another gate run (it holds %s); wait for that run to finish or choose another %s",
				cmd, quote(d.dir), lockName, d.flag)
		}
		if err != nil {
			return usagef("%s: cannot lock the folder %s (%v); choose another %s", cmd, quote(d.dir), err, d.flag)
		}
		g.release = append(g.release, release)
		locked = append(locked, d.dir)
		// with the lock held, no other gate writes here: what is left are
		// killed runs' temp files (removed by the rule of the README)
		atomicfile.RemoveStale(d.dir)
	}
	for _, path := range g.manifest.Files(g.opts) {
		if info, err := os.Lstat(path); err == nil && !info.Mode().IsRegular() {
			return usagef("%s: %s is a %s, not a regular file; the gate never reads or replaces one: remove it or choose another folder",
				cmd, quote(path), input.TypeName(info.Mode()))
		}
	}
	if g.junitPath != "" {
		if g.junit, err = openOut(cmd, "--junit", g.junitPath, false); err != nil {
			return err
		}
	}
	return nil
}

// done releases the folder locks.
func (g *gateRun) done() {
	for _, release := range g.release {
		release()
	}
	g.release = nil
}

// sameFolder reports whether two paths name one folder.
func sameFolder(a, b string) bool {
	x, errA := os.Stat(a)
	y, errB := os.Stat(b)
	return errA == nil && errB == nil && os.SameFile(x, y)
}

// run judges the claims and writes the JUnit file. A code other than
// exitOK means the run did not finish (interrupted) or the report could
// not be written; the message is already printed.
func (g *gateRun) run(ctx context.Context, e *env) ([]claims.Result, int) {
	limitMemory(g.manifest.MemoryLimit(g.opts))
	if g.progress {
		total := len(g.manifest.Claims)
		done := 0
		log := newProgressLog(e.stderr)
		defer log.close()
		next := func() {
			if done < total {
				c := g.manifest.Claims[done]
				log.doing(fmt.Sprintf("judging claim %s (%d of %d, line %d)", c.ID, done+1, total, c.Line))
			}
		}
		next()
		g.opts.Done = func(r claims.Result) {
			done++
			log.printf("[%d/%d] %s: %s (%.1f s)", done, total, r.ID, r.Verdict, r.Elapsed.Seconds())
			next()
		}
	}
	start := time.Now()
	results, err := claims.Run(ctx, g.manifest, g.opts)
	if err != nil {
		fmt.Fprintf(e.stderr, "avoidcert: interrupted after %d of %d claims (%.1f s); no report was written\n",
			len(results), len(g.manifest.Claims), time.Since(start).Seconds())
		return nil, exitAborted
	}
	if g.junit != nil {
		data, err := claims.JUnit(filepath.Base(g.manifest.File), results)
		if err == nil {
			err = g.junit.write(e.stdout, data)
		}
		if err != nil {
			return nil, failure(e, fmt.Errorf("cannot write the JUnit file: %w", err))
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
