// Command avoidcert counts, brackets and certifies permutations that avoid
// consecutive patterns. Run "avoidcert help" for the commands.
package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"os/signal"
	"path/filepath"
	"regexp"
	"runtime/debug"
	"sort"
	"strings"
	"syscall"

	"avoidcert/internal/atomicfile"
	"avoidcert/internal/brief"
	"avoidcert/internal/memory"
	"avoidcert/prove"
)

// Exit codes, documented in the README.
const (
	exitOK        = 0 // success; for claims and checks: proved / valid
	exitFailed    = 1 // a claim was refuted or a check failed
	exitUsage     = 2 // usage or input error; nothing was written to stdout
	exitUndecided = 3 // undecided within the budget
	exitAborted   = 4 // interrupted, out of space, or an internal error
)

// command is one subcommand: its one-line summary, its usage text and the
// function that runs it.
type command struct {
	summary string
	usage   string
	run     func(ctx context.Context, env *env, args []string) int
}

var commands = map[string]command{}

// env is where a command reads and writes: the real process in main, a
// buffer in tests.
type env struct {
	stdout, stderr io.Writer
	// progress is true when live progress may be drawn on stderr (a
	// terminal); --quiet turns it off.
	progress bool
}

func main() {
	os.Exit(runProcess())
}

// runProcess runs the command line of this process. Ctrl-C (SIGINT) and
// SIGTERM (what 'timeout', CI cancellation and Slurm send) cancel the
// context: every command then stops and exits 4 with a message. A panic
// is an internal error, exit 4, never the usage code 2 (which is also
// what the Go runtime gives a crash it cannot recover).
func runProcess() int { return runProcessTo(os.Stderr) }

// runProcessTo is runProcess with its messages written to stderr (the
// tests copy them into a log that they scan for wording that is not the
// tool's own).
func runProcessTo(stderr io.Writer) int {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	stdout := &checkedWriter{w: os.Stdout}
	code := guarded(stderr, func() int {
		return run(ctx, &env{stdout: stdout, stderr: stderr, progress: progressWanted(os.Stderr)}, os.Args[1:])
	})
	if stdout.err != nil && code != exitAborted {
		return writeFailure(stderr, "standard output", stdout.err, "the output is incomplete")
	}
	return code
}

// guarded runs a command and turns a panic into an internal error: one
// line, then the stack for the report; exit 4.
func guarded(stderr io.Writer, command func() int) (code int) {
	defer func() {
		if r := recover(); r != nil {
			stack := debug.Stack()
			if w, ok := r.(interface{ PanicStack() []byte }); ok {
				stack = w.PanicStack() // a worker goroutine's panic, raised again here
			}
			fmt.Fprintf(stderr, "avoidcert: internal error, please report it with the lines below: %s\n%s", brief.Quote(fmt.Sprint(r)), stack)
			code = exitAborted
		}
	}()
	return command()
}

// cancellable runs work on its own goroutine and returns its result, or
// ctx.Err() as soon as ctx is cancelled (the work is then abandoned: the
// process is about to end). A panic in the work is raised again here, where
// guarded reports it.
func cancellable[T any](ctx context.Context, work func() (T, error)) (T, error) {
	type outcome struct {
		v     T
		err   error
		panic any
	}
	done := make(chan outcome, 1)
	go func() {
		defer func() {
			if r := recover(); r != nil {
				done <- outcome{panic: r}
			}
		}()
		v, err := work()
		done <- outcome{v: v, err: err}
	}()
	select {
	case <-ctx.Done():
		var zero T
		return zero, ctx.Err()
	case o := <-done:
		if o.panic != nil {
			panic(o.panic)
		}
		return o.v, o.err
	}
}

// checkedWriter keeps the first error of its writes: output that could not
// be written (standard output on a full disk) must not end in success.
type checkedWriter struct {
	w   io.Writer
	err error
}

func (c *checkedWriter) Write(p []byte) (int, error) {
	if c.err != nil {
		return 0, c.err
	}
	n, err := c.w.Write(p)
	c.err = err
	return n, err
}

// writeFailure reports output that could not be written after the work,
// and what became of it: exit 4, the same code for a full disk or quota in
// every command.
func writeFailure(w io.Writer, what string, err error, left string) int {
	if outOfSpace(err) {
		fmt.Fprintf(w, "avoidcert: out of space writing %s: the disk or the quota is full; %s: free space and run again\n", what, left)
	} else {
		fmt.Fprintf(w, "avoidcert: cannot write %s (%s); %s\n", what, osReason(err), left)
	}
	return exitAborted
}

// writtenWhere names where a failed write went: the folder of a temp file
// (the target's folder), or the file itself.
func writtenWhere(err error) string {
	var pe *fs.PathError
	if !errors.As(err, &pe) {
		return "the output"
	}
	if atomicfile.IsTemp(filepath.Base(pe.Path)) {
		return "in " + quote(filepath.Dir(pe.Path))
	}
	return quote(pe.Path)
}

// osReason is the system's few words for a failure, without the path and
// operation Go puts around them.
func osReason(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

func run(ctx context.Context, e *env, args []string) int {
	if len(args) == 0 {
		printOverview(e.stderr)
		return exitUsage
	}
	name := args[0]
	if name == "help" || name == "-h" || name == "--help" || name == "-help" {
		switch {
		case len(args) > 2:
			fmt.Fprintln(e.stderr, "avoidcert: help takes at most one command name, e.g. 'avoidcert help bound'")
			return exitUsage
		case len(args) == 1:
			printOverview(e.stdout)
		case args[1] == "help":
			fmt.Fprint(e.stdout, helpUsage)
		case args[1] == "version":
			fmt.Fprint(e.stdout, versionUsage)
		default:
			c, ok := commands[args[1]]
			if !ok {
				fmt.Fprintf(e.stderr, "avoidcert: no command %s; run 'avoidcert help' for the list\n", quote(args[1]))
				return exitUsage
			}
			fmt.Fprint(e.stdout, c.usage)
		}
		return exitOK
	}
	if name == "version" || name == "--version" {
		if len(args) > 1 {
			fmt.Fprintln(e.stderr, "avoidcert: version takes no arguments")
			return exitUsage
		}
		printVersion(e.stdout)
		return exitOK
	}
	c, ok := commands[name]
	if !ok {
		fmt.Fprintf(e.stderr, "avoidcert: no command %s; run 'avoidcert help' for the list\n", quote(name))
		return exitUsage
	}
	if asksHelp(args[1:]) {
		fmt.Fprint(e.stdout, c.usage)
		return exitOK
	}
	return c.run(ctx, e, args[1:])
}

// asksHelp reports whether a command's arguments ask for its help (-h,
// -help or --help before any "--").
func asksHelp(args []string) bool {
	for _, a := range args {
		switch a {
		case "--":
			return false
		case "-h", "-help", "--help":
			return true
		}
	}
	return false
}

const helpUsage = `Usage: avoidcert help [COMMAND]

Without a command, lists the commands; with one, prints its usage and flags.
`

func printOverview(w io.Writer) {
	fmt.Fprint(w, `avoidcert: exact counts, certified growth rates and checkable certificates
for permutations avoiding consecutive patterns.

Usage: avoidcert COMMAND [flags] PATTERN...

A pattern is a permutation of 1..k written as digits (1342) or with dots
(1.3.4.2); a set is several arguments or a comma list (123,321).

Commands:
`)
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-10s %s\n", n, commands[n].summary)
	}
	fmt.Fprint(w, `  help       help for a command: avoidcert help COMMAND
  version    print the version

Exit codes: 0 success, 1 a claim or check failed, 2 usage or input error,
3 undecided within the budget, 4 interrupted (Ctrl-C, SIGTERM), out of space
or internal error.
`)
}

// failure reports an error on stderr and picks the exit code: usage and
// input errors are 2, a budget that ran out before there was anything to
// report is 3, an interrupt or anything unexpected (a certificate the
// checker refused among them) is 4.
func failure(e *env, err error) int {
	var ue usageError
	var pbe *prove.BudgetError
	msg := ownWords(err.Error())
	switch {
	case outOfSpace(err):
		return writeFailure(e.stderr, writtenWhere(err), err, "nothing was replaced")
	case errors.As(err, &ue):
		fmt.Fprintf(e.stderr, "avoidcert: %s\n", msg)
		return exitUsage
	case errors.Is(err, context.Canceled):
		return interrupted(e)
	case errors.As(err, &pbe):
		fmt.Fprintf(e.stderr, "avoidcert: undecided: %s; nothing was written\n", ownWords(pbe.Explain(flagOf)))
		return exitUndecided
	case errors.Is(err, context.DeadlineExceeded):
		fmt.Fprintln(e.stderr, "avoidcert: undecided: --timeout ran out before a first result; nothing was written; raise --timeout")
		return exitUndecided
	case errors.Is(err, prove.ErrBudget):
		fmt.Fprintf(e.stderr, "avoidcert: undecided: %s; nothing was written; raise the budget\n", msg)
		return exitUndecided
	default:
		fmt.Fprintf(e.stderr, "avoidcert: %s\n", msg)
		return exitAborted
	}
}

// packagePrefix is the "name: " an internal package puts before its
// errors. A user reads the command's name, the input and the fault, not
// which package found it.
var packagePrefix = regexp.MustCompile(`(^|: )(?:prove|bounds|transfer|structure|interval|pattern|certify|census|claims|prob|series|input|report): `)

// ownWords is a message without the prefixes of internal packages; a
// first word that names the command (census, report, series, structure,
// prob) stays.
func ownWords(msg string) string {
	head := ""
	if cmd, rest, ok := strings.Cut(msg, ": "); ok {
		if _, isCommand := commands[cmd]; isCommand || cmd == "census merge" {
			head, msg = cmd+": ", rest
		}
	}
	for {
		plain := packagePrefix.ReplaceAllString(msg, "$1")
		if plain == msg {
			return head + msg
		}
		msg = plain
	}
}

// defaultMemory is the memory budget of every command without
// --max-memory (and of the gate without max_memory): the checker's own
// default, so that whatever one command writes at its defaults 'check'
// accepts at its defaults.
const defaultMemory = prove.DefaultMaxMemory

// flagOf names the flag that sets a budget (none for the checker's work
// limit, which only 'check' sets).
func flagOf(b prove.Budget) string {
	return map[prove.Budget]string{prove.BudgetMemory: "--max-memory", prove.BudgetTime: "--timeout", prove.BudgetMaxK: "--max-k"}[b]
}

// usageError marks bad flags, arguments or input files. It wraps what
// usagef's %w wraps (a full disk is then still recognised as such).
type usageError struct{ err error }

func (u usageError) Error() string { return u.err.Error() }

func (u usageError) Unwrap() error { return u.err }

func usagef(format string, args ...any) error {
	return usageError{err: fmt.Errorf(format, args...)}
}

// limitMemory tells the garbage collector the memory budget, so that it
// reclaims dropped iterates before the heap grows past the budget rather
// than at twice the live size (internal/memory). Every command with
// --max-memory calls it before its work.
func limitMemory(bytes int64) {
	memory.Limit(bytes)
}

// interrupted reports a Ctrl-C or SIGTERM: exit 4, nothing written.
func interrupted(e *env) int {
	fmt.Fprintln(e.stderr, "avoidcert: interrupted; nothing was written")
	return exitAborted
}

// jsonHead starts every JSON object the command line prints: the output's
// format, "avoidcert-" and its name, and the version of that format
// (docs/json.md; a schema per format in docs/schema/).
type jsonHead struct {
	Format  string `json:"format"`
	Version int    `json:"version"`
}

// headOf is the head of a command's JSON output; every one of them is at
// version 1.
func headOf(name string) jsonHead { return jsonHead{Format: "avoidcert-" + name, Version: 1} }

// writeJSON prints v as one line of JSON, without HTML escaping ("<" stays
// "<": the explanations compare numbers).
func writeJSON(w io.Writer, v any) {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		panic(err) // only plain data is encoded here
	}
}
