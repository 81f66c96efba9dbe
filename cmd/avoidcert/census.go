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
		usage: `Usage: avoidcert census --length K [--to N] [--digits D] [--refine-digits R] [--out DIR] [--jobs J] [--shard I/N]
       avoidcert census merge [--out DIR] [--jobs J] SHARD-DIR...

Tabulates every symmetry class (reverse, complement, both) of single
patterns of length K (3..8): exact counts a_0..a_N, lambda and 1/lambda
certified to D significant digits with a certificate the checker accepted,
the asymptotic form and primitivity exponent; the groups of classes with
equal counts up to N (candidate c-Wilf equivalences; different groups are
proved inequivalent at the recorded first n where counts differ), numbered
by rank (group 1 holds the class of largest lambda); and the order of the
groups by lambda: where two neighbouring groups' certified ranges overlap,
the classes reaching into the overlap are bracketed again at more digits,
up to R, until the groups separate; pairs still overlapping are named.

Before any work it prints its estimate per class and in all (an estimate
from the engine's closed forms and a calibrated model, not a bound) and the
memory budget of each worker; a class the budget cannot count or test is
refused at once (exit 3).

DIR receives census.md, census.csv, census.json (everything),
certificates/ and refined/ (the classes bracketed again). A run killed at
any moment continues where it stopped when run again with the same flags:
finished classes are in DIR/journal, refined certificates in refined/.

Flags:
  --length K         pattern length, 3 to 8 (required)
  --to N             counts a_0..a_N (default 20)
  --digits D         significant digits of lambda to certify (default 10);
                     0: counts, groups and forms only (each class certified
                     by its structure test's certificate, lambda coarse)
  --refine-digits R  the most digits a class is bracketed at to order its
                     group (default 2D; R = D orders at D digits only)
  --out DIR          output folder (default census-K, or census-K-shard-I-of-N),
                     created if missing in an existing folder
  --jobs J           classes certified at once (default: the number of CPUs)
  --shard I/N        only the I-th of N slices of the classes (1 <= I <= N),
                     for a cluster job array; merge the N folders afterwards
                     (a shard orders its own groups only and refines nothing)
  --max-memory B     memory budget shared by the J workers (default 4G): each
                     class's counting, structure test, bracket and check are
                     held to B/J
  --quiet            no progress bar (it is shown only when stderr is a terminal)
  --json             print the census (the content of DIR/census.json, format
                     avoidcert-census; docs/json.md) instead of the summary

merge combines the folders of all N shards of one census into DIR (default
census-K), refines the order of the groups as an unsharded run does, and
writes the same bytes as an unsharded run (with the same budget per
worker). A shard is untrusted input: every row's certificate (inside the
shard's folder, matching its SHA-256) must be accepted by the checker for
the row's class, and every certified field and count of the row must be
what that certificate and the checker's own counting give, the shard's
order and groups what its rows give; otherwise the merge is refused (exit
1, naming the shard, the row and the field) and nothing is written. It
refuses shards of different parameters and a missing or duplicated shard or
class (exit 2). Merge flags: --out DIR, --jobs J (certificates checked and
classes refined at once), --max-memory B, --quiet, --json.

A journal is untrusted too: a continued run re-checks the certificate of
every class in the journal and does a class again whose record its
certificate does not support. Paths inside a census folder stay inside it:
no "..", no absolute path, no symbolic link that leads out.

Exit codes: 0 done, 1 (merge) a shard its certificates do not support, 2 bad
input (or a folder holding another census), 3 a class over one worker's
memory budget (the finished classes are kept), 4 interrupted (Ctrl-C,
SIGTERM), out of space or a class failed (the finished classes are kept: run
again).
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
	refineDigits := fs.Int("refine-digits", 0, "")
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
	if *refineDigits == 0 {
		*refineDigits = min(2**digits, certify.MaxDigits-5)
	}
	params := census.Params{Length: *length, To: *to, Digits: *digits, RefineDigits: *refineDigits}
	switch {
	case len(pos) > 0:
		return failure(e, usagef("census: %s is not a flag; the census takes flags only (or 'census merge DIR...')", quote(pos[0])))
	case *length == 0:
		return failure(e, usagef("census: --length is required, e.g. 'avoidcert census --length 5'"))
	case *jobs < 1:
		return failure(e, usagef("census: --jobs must be at least 1"))
	case *digits < 0 || *digits > certify.MaxDigits-5:
		return failure(e, usagef("census: --digits must be between 0 (counts, groups and forms only) and %d", certify.MaxDigits-5))
	case *refineDigits < *digits || *refineDigits > certify.MaxDigits-5:
		return failure(e, usagef("census: --refine-digits must be between --digits (%d) and %d", *digits, certify.MaxDigits-5))
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
	if err := openOutDir("census", "--out", dir, false); err != nil {
		return failure(e, err)
	}
	perClass := int64(maxMemory) / int64(*jobs)
	if over := censusFits(shard, params, perClass); over != nil {
		return censusBudget(e, over, *jobs, "nothing was done")
	}
	limitMemory(int64(maxMemory))
	plan := census.EstimateRun(params, shard, *jobs, perClass)
	if class, what, need, over := plan.Over(); over {
		fmt.Fprintf(e.stderr, "avoidcert: census: undecided: class %s: %s needs %s, over the memory budget of one worker (%s: --max-memory %s shared by --jobs %d); raise --max-memory, lower --jobs or --to; nothing was done\n",
			class, what, bytesize.About(need), bytesize.Format(perClass), bytesize.Format(int64(maxMemory)), *jobs)
		return exitUndecided
	}
	if err := openOutDir("census", "--out", dir, true); err != nil {
		return failure(e, err)
	}
	fmt.Fprintf(e.stderr, "avoidcert: census of length %d, %s in %s: %s\n", *length, censusNoun(len(plan.Classes), "class", "classes"), dir, plan.Summary())
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
			if ev.Class == "" && ev.Round == 0 && ev.Resumed > 0 {
				fmt.Fprintf(e.stderr, "avoidcert: continuing the census in %s: %d of %d classes are in its journal\n", dir, ev.Resumed, ev.Total)
			}
			refiningLine(e, ev)
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
	case errors.Is(err, prove.ErrBudget):
		fmt.Fprintf(e.stderr, "avoidcert: census: undecided: %s; raise --max-memory (shared by the --jobs workers) or lower --jobs; finished classes are kept in %s\n",
			ownWords(err.Error()), filepath.Join(dir, "journal"))
		return exitUndecided
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
	quiet := fs.Bool("quiet", false, "")
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
	worker := int64(maxMemory) / int64(*jobs)
	bar := newCensusBar(ctx, e, *quiet)
	rep, err := census.Merge(ctx, census.MergeOptions{Out: dir, Dirs: dirs, Jobs: *jobs,
		Check: census.CheckerOf(censusOptions(worker)), Certify: censusCertifier(worker),
		Progress: func(ev census.Event) {
			refiningLine(e, ev)
			bar.update(ev)
		}})
	bar.finish(err == nil)
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
	case outOfSpace(err):
		return failure(e, err)
	case errors.As(err, &in):
		return failure(e, usagef("census merge: %v", err))
	case errors.As(err, &refused):
		fmt.Fprintf(e.stderr, "avoidcert: census merge: refused: %s; nothing was written\n", ownWords(err.Error()))
		return exitFailed
	case errors.Is(err, prove.ErrBudget):
		fmt.Fprintf(e.stderr, "avoidcert: census merge: undecided: %s; raise --max-memory (shared by the --jobs workers) or lower --jobs\n", ownWords(err.Error()))
		return exitUndecided
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
	strict, proved, digits := 0, 0, 0
	for _, s := range rep.Order {
		if s.Relation == ">" {
			strict++
		}
	}
	for _, s := range rep.GroupOrder {
		if s.Relation == ">" {
			proved++
			digits = max(digits, s.Digits)
		}
	}
	what := fmt.Sprintf("census of length %d", rep.Params.Length)
	if rep.Shard != nil {
		what += ", shard " + rep.Shard.String()
	}
	fmt.Fprintf(e.stdout, "%s: %s, %s with equal counts up to n = %d (separated by n = %d)",
		what, censusNoun(len(rep.Rows), "class", "classes"), censusNoun(len(rep.Groups), "group", "groups"), rep.Params.To, rep.SeparatingN)
	if rep.Params.Digits == 0 {
		fmt.Fprintln(e.stdout, "; lambda not bracketed (--digits 0), so the groups are not ordered")
	} else {
		fmt.Fprintf(e.stdout, ", %d of %d adjacent pairs strictly ordered by lambda\n", strict, len(rep.Order))
	}
	if len(rep.GroupOrder) > 0 && rep.Params.Digits > 0 {
		fmt.Fprintf(e.stdout, "order of the groups: %d of %d adjacent pairs proved (certificates of at most %d digits)", proved, len(rep.GroupOrder), digits)
		if rep.Shard != nil {
			fmt.Fprint(e.stdout, ", in this shard alone: the merge refines the order")
		}
		fmt.Fprintln(e.stdout)
	}
	fmt.Fprintf(e.stdout, "tables: %s, %s, %s; certificates in %s\n",
		filepath.Join(dir, census.MarkdownFile), filepath.Join(dir, census.CSVFile), filepath.Join(dir, census.JSONFile),
		filepath.Join(dir, "certificates"))
}

// censusNoun writes n with its noun, singular for one.
func censusNoun(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// refiningLine says, once per round of the refinement, how many classes
// are bracketed again (a line for logs, where no bar is drawn).
func refiningLine(e *env, ev census.Event) {
	if ev.Round > 0 && ev.Done == 0 {
		fmt.Fprintf(e.stderr, "avoidcert: ordering the groups, round %d: %d classes of overlapping neighbouring groups bracketed again at more digits\n", ev.Round, ev.Total)
	}
}

// censusBar shows the classes done on a terminal, then each round of the
// refinement; without one (or with --quiet) it does nothing.
type censusBar struct {
	progress *mpb.Progress
	bar      *mpb.Bar
	round    int
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
	if b.progress == nil {
		return
	}
	if b.bar != nil && ev.Round != b.round {
		b.bar.SetTotal(-1, true) // the phase before is complete
		b.bar = nil
	}
	b.round = ev.Round
	if ev.Round == 0 && ev.Total == ev.Resumed {
		return
	}
	if b.bar == nil {
		// The bar counts this run's classes, so the estimate of the time
		// left is not skewed by the ones taken from the journal.
		name, total := "classes", ev.Total
		switch {
		case ev.Round > 0:
			name = fmt.Sprintf("refining, round %d", ev.Round)
		case ev.Resumed > 0:
			name = fmt.Sprintf("classes (%d from the journal)", ev.Resumed)
			total -= ev.Resumed
		}
		b.bar = b.progress.AddBar(int64(total),
			mpb.PrependDecorators(decor.Name(name+" "), decor.CountersNoUnit("%d/%d")),
			mpb.AppendDecorators(decor.Percentage(), decor.Name(" left "), decor.AverageETA(decor.ET_STYLE_GO)))
	}
	if ev.Round > 0 {
		b.bar.SetCurrent(int64(ev.Done))
	} else {
		b.bar.SetCurrent(int64(ev.Done - ev.Resumed))
	}
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
