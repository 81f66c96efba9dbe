package main

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"

	"github.com/vbauerster/mpb/v8"
	"github.com/vbauerster/mpb/v8/decor"

	"avoidcert/census"
	"avoidcert/certify"
	"avoidcert/internal/bytesize"
	"avoidcert/pattern"
	"avoidcert/prove"
)

func init() {
	commands["census"] = command{
		summary: "every symmetry class of one pattern length: counts, certified lambda, groups, order",
		usage: `Usage: avoidcert census --length K [--to N] [--digits D] [--out DIR] [--jobs J] [--shard I/N]
       avoidcert census merge [--out DIR] SHARD-DIR...

Tabulates every symmetry class (reverse, complement, both) of single
patterns of length K (3..8): exact counts a_0..a_N, lambda and 1/lambda
certified to D significant digits with a certificate the checker accepted,
the asymptotic form; the groups of classes with equal counts up to N
(candidate c-Wilf equivalences; different groups are proved inequivalent at
the recorded first n where counts differ); and the order of the classes by
lambda, strict where certified ranges are disjoint.

DIR receives census.md, census.csv, census.json (everything) and
certificates/. A run killed at any moment continues where it stopped when
run again with the same flags: finished classes are in DIR/journal.

Flags:
  --length K       pattern length, 3 to 8 (required)
  --to N           counts a_0..a_N (default 20)
  --digits D       significant digits of lambda to certify (default 10)
  --out DIR        output folder (default census-K, or census-K-shard-I-of-N),
                   created if missing in an existing folder
  --jobs J         classes certified at once (default: the number of CPUs)
  --shard I/N      only the I-th of N slices of the classes (1 <= I <= N), for
                   a cluster job array; merge the N folders afterwards
  --max-memory B   memory budget shared by the J classes at work (default 4G)
  --quiet          no progress bar (it is shown only when stderr is a terminal)
  --json           print the census (the content of DIR/census.json, format
                   avoidcert-census; docs/json.md) instead of the summary

merge combines the folders of all N shards of one census into DIR (default
census-K), writing the same bytes as an unsharded run. A shard is untrusted
input: every row's certificate (inside the shard's folder, matching its
SHA-256) must be accepted by the checker for the row's class, and every
certified field and count of the row must be what that certificate and the
checker's own counting give, the shard's order and groups what its rows give;
otherwise the merge is refused (exit 1, naming the shard, the row and the
field) and nothing is written. It refuses shards of different parameters and
a missing or duplicated shard or class (exit 2). Merge flags: --out DIR,
--jobs J (certificates checked at once), --max-memory B, --json.

A journal is untrusted too: a continued run re-checks the certificate of
every class in the journal and does a class again whose record its
certificate does not support. Paths inside a census folder stay inside it:
no "..", no absolute path, no symbolic link that leads out.

Exit codes: 0 done, 1 (merge) a shard its certificates do not support, 2 bad
input (or a folder holding another census), 4 interrupted (Ctrl-C, SIGTERM),
out of space or a class failed (the finished classes are kept: run again).
`,
		run: runCensus,
	}
}

func runCensus(ctx context.Context, e *env, args []string) int {
	if len(args) > 0 && args[0] == "merge" {
		return runCensusMerge(ctx, e, args[1:])
	}
	fs := newFlags("census")
	length := fs.Int("length", 0, "")
	to := fs.Int("to", 20, "")
	digits := fs.Int("digits", 10, "")
	out := fs.String("out", "", "")
	jobs := fs.Int("jobs", runtime.NumCPU(), "")
	shardFlag := fs.String("shard", "", "")
	quiet := fs.Bool("quiet", false, "")
	asJSON := fs.Bool("json", false, "")
	maxMemory := byteSize(defaultMemory)
	fs.Var(&maxMemory, "max-memory", "")
	pos, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	params := census.Params{Length: *length, To: *to, Digits: *digits}
	switch {
	case len(pos) > 0:
		return failure(e, usagef("census: %s is not a flag; the census takes flags only (or 'census merge DIR...')", quote(pos[0])))
	case *length == 0:
		return failure(e, usagef("census: --length is required, e.g. 'avoidcert census --length 5'"))
	case *jobs < 1:
		return failure(e, usagef("census: --jobs must be at least 1"))
	case *digits > certify.MaxDigits-5:
		return failure(e, usagef("census: --digits must be between 1 and %d", certify.MaxDigits-5))
	}
	if err := params.Validate(); err != nil {
		return failure(e, usagef("census: %v", err))
	}
	shard, err := parseShard(*shardFlag, len(pattern.SymmetryClasses(*length)))
	if err != nil {
		return failure(e, err)
	}
	dir := *out
	if dir == "" {
		dir = "census-" + strconv.Itoa(*length)
		if !shard.Whole() {
			dir += fmt.Sprintf("-shard-%d-of-%d", shard.Index, shard.Of)
		}
	}
	if err := openOutDir("census", "--out", dir, true); err != nil {
		return failure(e, err)
	}
	perClass := int64(maxMemory) / int64(*jobs)
	if over := censusFits(shard, params, perClass); over != nil {
		return censusBudget(e, over, *jobs, "nothing was done")
	}
	limitMemory(int64(maxMemory))
	bar := newCensusBar(ctx, e, *quiet)
	rep, err := census.Run(ctx, census.Options{
		Params:  params,
		Shard:   shard,
		Dir:     dir,
		Jobs:    *jobs,
		Tool:    toolName(),
		Certify: censusCertifier(perClass),
		Count:   censusCounter(perClass),
		Check:   census.CheckerOf(censusOptions(perClass)),
		Progress: func(ev census.Event) {
			if ev.Class == "" && ev.Resumed > 0 {
				fmt.Fprintf(e.stderr, "avoidcert: continuing the census in %s: %d of %d classes are in its journal\n", dir, ev.Resumed, ev.Total)
			}
			bar.update(ev)
		},
	})
	bar.finish(err == nil)
	if err != nil {
		return censusFailure(e, dir, *jobs, err)
	}
	writeCensusSummary(e, dir, rep, *asJSON)
	return exitOK
}

// censusCounter counts with the engine and the checker side by side and
// returns the counts only when they agree (prove.Counts), within the
// memory of one class.
func censusCounter(maxMemory int64) census.Counter {
	return func(ctx context.Context, set pattern.Set, n int) ([]*big.Int, error) {
		return prove.Counts(ctx, set, n, prove.Options{Typed: set.Strings(), MaxMemory: maxMemory})
	}
}

// censusFits refuses, before any class is done, a share of the memory
// budget below what every class of the shard needs at least
// (prove.LeastMemory: its counts, and a first bracket with its check).
func censusFits(shard census.Shard, params census.Params, perClass int64) *prove.BudgetError {
	for _, c := range shard.Classes(params.Length) {
		set := pattern.NewSet(c.Representative)
		if need := prove.LeastMemory(set, params.To, prove.Options{}); need > perClass {
			return &prove.BudgetError{Budget: prove.BudgetMemory, What: fmt.Sprintf("class %s (its counts to n = %d, a first bracket and its check)", c.Representative, params.To),
				Need: float64(need), Limit: float64(perClass)}
		}
	}
	return nil
}

// censusBudget reports a class over its share of the memory budget
// (--max-memory divided among the --jobs classes at work): exit 3, with
// the budget that would let it run, and what became of the work.
func censusBudget(e *env, b *prove.BudgetError, jobs int, kept string) int {
	total := int64(b.Need) * int64(jobs)
	fmt.Fprintf(e.stderr, "avoidcert: census: undecided: %s needs %s, over its share of --max-memory (%s for each of --jobs %d); raise --max-memory to at least %s, or lower --jobs; %s\n",
		b.What, bytesize.About(int64(b.Need)), bytesize.Format(int64(b.Limit)), jobs, bytesize.Flag(total), kept)
	return exitUndecided
}

// parseShard reads --shard I/N; "" is the whole census.
func parseShard(s string, classes int) (census.Shard, error) {
	if s == "" {
		return census.Shard{}, nil
	}
	i, n, ok := strings.Cut(s, "/")
	index, err1 := strconv.Atoi(i)
	of, err2 := strconv.Atoi(n)
	if !ok || err1 != nil || err2 != nil || of < 1 || index < 1 || index > of {
		return census.Shard{}, usagef("census: --shard %q is not I/N with 1 <= I <= N, e.g. --shard 2/8", s)
	}
	if of > classes {
		return census.Shard{}, usagef("census: --shard %s: there are only %d classes of this length; use at most %d shards", s, classes, classes)
	}
	return census.Shard{Index: index, Of: of}, nil
}

// censusFailure reports a failed run: an interrupt or a failed class
// keeps the journal, and the message says how to continue.
func censusFailure(e *env, dir string, jobs int, err error) int {
	var in *census.InputError
	var over *prove.BudgetError
	switch {
	case errors.As(err, &over) && over.Budget == prove.BudgetMemory:
		return censusBudget(e, over, jobs, "finished classes are kept in "+filepath.Join(dir, "journal"))
	case outOfSpace(err):
		fmt.Fprintf(e.stderr, "avoidcert: census: out of space writing %s: the disk or the quota is full; finished classes are kept in %s: free space and run the same command again\n",
			writtenWhere(err), filepath.Join(dir, "journal"))
	case errors.As(err, &in):
		return failure(e, usagef("census: %v", err))
	case errors.Is(err, context.Canceled):
		fmt.Fprintf(e.stderr, "avoidcert: census interrupted; finished classes are kept in %s: run the same command again to continue\n",
			filepath.Join(dir, "journal"))
	default:
		fmt.Fprintf(e.stderr, "avoidcert: census: %s; finished classes are kept in %s: run the same command again to continue\n",
			ownWords(err.Error()), filepath.Join(dir, "journal"))
	}
	return exitAborted
}

func runCensusMerge(ctx context.Context, e *env, args []string) int {
	fs := newFlags("census merge")
	out := fs.String("out", "", "")
	jobs := fs.Int("jobs", runtime.NumCPU(), "")
	asJSON := fs.Bool("json", false, "")
	maxMemory := byteSize(defaultMemory)
	fs.Var(&maxMemory, "max-memory", "")
	dirs, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	switch {
	case len(dirs) == 0:
		return failure(e, usagef("census merge: name the folders of every shard, e.g. 'avoidcert census merge --out census-5 census-5-shard-*'"))
	case *jobs < 1:
		return failure(e, usagef("census merge: --jobs must be at least 1"))
	}
	dir := *out
	if dir == "" {
		rep, err := census.ReadReport(ctx, dirs[0])
		if err != nil {
			return censusMergeFailure(e, err)
		}
		dir = "census-" + strconv.Itoa(rep.Params.Length)
	}
	if err := openOutDir("census merge", "--out", dir, false); err != nil {
		return failure(e, err)
	}
	limitMemory(int64(maxMemory))
	check := census.CheckerOf(censusOptions(int64(maxMemory) / int64(*jobs)))
	rep, err := census.Merge(ctx, dir, dirs, check, *jobs)
	if err != nil {
		return censusMergeFailure(e, err)
	}
	writeCensusSummary(e, dir, rep, *asJSON)
	return exitOK
}

// censusMergeFailure reports a merge that did not finish: shards that do
// not fit together or cannot be read are exit 2, a shard its certificates
// do not support 1.
func censusMergeFailure(e *env, err error) int {
	var in *census.InputError
	var refused *census.RefusedError
	switch {
	case errors.As(err, &in):
		return failure(e, usagef("census merge: %v", err))
	case errors.As(err, &refused):
		fmt.Fprintf(e.stderr, "avoidcert: census merge: refused: %s; nothing was written\n", ownWords(err.Error()))
		return exitFailed
	}
	return failure(e, err)
}

// writeCensusSummary says what the census holds and where, or with
// asJSON prints the census itself: the content of DIR/census.json, on one
// line.
func writeCensusSummary(e *env, dir string, rep *census.Report, asJSON bool) {
	if asJSON {
		writeJSON(e.stdout, rep)
		return
	}
	strict := 0
	for _, s := range rep.Order {
		if s.Relation == ">" {
			strict++
		}
	}
	what := fmt.Sprintf("census of length %d", rep.Params.Length)
	if rep.Shard != nil {
		what += ", shard " + rep.Shard.String()
	}
	fmt.Fprintf(e.stdout, "%s: %d classes, %d groups with equal counts up to n = %d (separated by n = %d), %d of %d adjacent pairs strictly ordered by lambda\n",
		what, len(rep.Rows), len(rep.Groups), rep.Params.To, rep.SeparatingN, strict, len(rep.Order))
	fmt.Fprintf(e.stdout, "tables: %s, %s, %s; certificates in %s\n",
		filepath.Join(dir, census.MarkdownFile), filepath.Join(dir, census.CSVFile), filepath.Join(dir, census.JSONFile),
		filepath.Join(dir, "certificates"))
}

// censusBar shows the classes done on a terminal; without one (or with
// --quiet) it does nothing.
type censusBar struct {
	progress *mpb.Progress
	bar      *mpb.Bar
}

func newCensusBar(ctx context.Context, e *env, quiet bool) *censusBar {
	b := &censusBar{}
	if f, ok := e.stderr.(*os.File); !quiet && ok {
		if info, err := f.Stat(); err == nil && info.Mode()&os.ModeCharDevice != 0 {
			b.progress = mpb.NewWithContext(ctx, mpb.WithOutput(f), mpb.WithWidth(40))
		}
	}
	return b
}

func (b *censusBar) update(ev census.Event) {
	if b.progress == nil || ev.Total == ev.Resumed {
		return
	}
	if b.bar == nil {
		// The bar counts this run's classes, so the estimate of the time
		// left is not skewed by the ones taken from the journal.
		name := "classes"
		if ev.Resumed > 0 {
			name = fmt.Sprintf("classes (%d from the journal)", ev.Resumed)
		}
		b.bar = b.progress.AddBar(int64(ev.Total-ev.Resumed),
			mpb.PrependDecorators(decor.Name(name+" "), decor.CountersNoUnit("%d/%d")),
			mpb.AppendDecorators(decor.Percentage(), decor.Name(" left "), decor.AverageETA(decor.ET_STYLE_GO)))
	}
	b.bar.SetCurrent(int64(ev.Done - ev.Resumed))
}

func (b *censusBar) finish(ok bool) {
	if b.progress == nil {
		return
	}
	if b.bar != nil && !ok {
		b.bar.Abort(false)
	}
	b.progress.Wait()
}
