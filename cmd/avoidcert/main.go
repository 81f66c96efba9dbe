// Command avoidcert counts, brackets and certifies permutations that avoid
// consecutive patterns. Run "avoidcert help" for the commands.
package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/debug"
	"sort"
)

// Exit codes, documented in the README.
const (
	exitOK        = 0 // success; for claims and checks: proved / valid
	exitFailed    = 1 // a claim was refuted or a check failed
	exitUsage     = 2 // usage or input error; nothing was written to stdout
	exitUndecided = 3 // undecided within the budget
	exitAborted   = 4 // interrupted, or an internal error
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
}

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	code := run(ctx, &env{stdout: os.Stdout, stderr: os.Stderr}, os.Args[1:])
	stop()
	os.Exit(code)
}

func run(ctx context.Context, e *env, args []string) int {
	if len(args) == 0 {
		printOverview(e.stderr)
		return exitUsage
	}
	name := args[0]
	if name == "help" || name == "-h" || name == "--help" || name == "-help" {
		if len(args) > 1 {
			if c, ok := commands[args[1]]; ok {
				fmt.Fprint(e.stdout, c.usage)
				return exitOK
			}
			fmt.Fprintf(e.stderr, "avoidcert: no command %q; run 'avoidcert help' for the list\n", args[1])
			return exitUsage
		}
		printOverview(e.stdout)
		return exitOK
	}
	if name == "version" || name == "--version" {
		fmt.Fprintln(e.stdout, "avoidcert", version)
		return exitOK
	}
	c, ok := commands[name]
	if !ok {
		fmt.Fprintf(e.stderr, "avoidcert: no command %q; run 'avoidcert help' for the list\n", name)
		return exitUsage
	}
	return c.run(ctx, e, args[1:])
}

// version is the producing tool's version, written into certificates.
const version = "0.1.0"

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
3 undecided within the budget, 4 interrupted or internal error.
`)
}

// failure reports an error on stderr and picks the exit code: usage and
// input errors are 2, an interrupt or anything unexpected is 4.
func failure(e *env, err error) int {
	var ue usageError
	switch {
	case errors.As(err, &ue):
		fmt.Fprintf(e.stderr, "avoidcert: %v\n", err)
		return exitUsage
	case errors.Is(err, context.Canceled):
		fmt.Fprintln(e.stderr, "avoidcert: interrupted; nothing was written")
		return exitAborted
	default:
		fmt.Fprintf(e.stderr, "avoidcert: %v\n", err)
		return exitAborted
	}
}

// usageError marks bad flags, arguments or input files.
type usageError struct{ msg string }

func (u usageError) Error() string { return u.msg }

func usagef(format string, args ...any) error {
	return usageError{msg: fmt.Sprintf(format, args...)}
}

// limitMemory tells the garbage collector the memory budget, so that it
// reclaims dropped iterates before the heap grows past the budget rather
// than at twice the live size.
func limitMemory(bytes int64) {
	debug.SetMemoryLimit(bytes)
}

// writeJSON prints v as one line of JSON, without HTML escaping ("<" stays
// "<": the explanations compare numbers).
func writeJSON(e *env, v any) {
	enc := json.NewEncoder(e.stdout)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		panic(err) // only plain data is encoded here
	}
}
