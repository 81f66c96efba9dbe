package main

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"

	"avoidcert/certify"
	"avoidcert/pattern"
)

func init() {
	commands["check"] = command{
		summary: "re-verify a certificate with the independent checker",
		usage: `Usage: avoidcert check FILE [--expect PATTERN...]

Re-verifies a certificate written by 'avoidcert bound' with the independent
checker: it recomputes every iterate with its own plain code (nothing shared
with the fast engine) and checks every inequality exactly. Prints one line:
"valid", or "invalid: " and the reason.

Flags:
  --expect PATTERN... the set the certificate must be about (123,321 or
                      123 321 after the flag); a certificate for any other
                      set is invalid. Without it, any set is accepted: say which
                      set you expect whenever you know it.
  --max-work N        refuse certificates whose recomputation is estimated
                      above N coefficient operations (default 1e10, about
                      ten minutes: the checker sums each line of the
                      iteration term by term, about k/(m+1) times the
                      engine's work, so that it shares no shortcut with it)
  --max-memory B      refuse certificates whose recomputation is estimated
                      to need more memory (default 8G)

Exit codes: 0 valid, 1 invalid, 2 the file cannot be read, or bad usage.
`,
		run: runCheck,
	}
}

// checkWork is the default work limit of check: enough for the 50-digit
// certificates of the length-4 patterns (about 3e9 operations).
const checkWork = 1e10

func runCheck(ctx context.Context, e *env, args []string) int {
	flags := newFlags("check")
	expect := flags.String("expect", "", "")
	maxWork := flags.Float64("max-work", checkWork, "")
	maxMem := byteSize(8 << 30)
	flags.Var(&maxMem, "max-memory", "")
	pos, err := parseArgs(flags, args)
	if err != nil {
		return failure(e, err)
	}
	// "check FILE --expect 123 321": patterns after the file belong to --expect.
	if len(pos) == 0 || (len(pos) > 1 && *expect == "") {
		return failure(e, usagef("check: name exactly one certificate file, e.g. 'avoidcert check avoidcert-1342.json'"))
	}
	var opts certify.CheckOptions
	if *expect != "" {
		given := append([]string{*expect}, pos[1:]...)
		if _, err := pattern.ParseSet(given); err != nil {
			return failure(e, usagef("check: --expect: %v", err))
		}
		opts.Expect = given
	}
	if *maxWork < 1 {
		return failure(e, usagef("check: --max-work must be at least 1"))
	}
	opts.MaxWork = int64(*maxWork)
	opts.MaxMemory = int64(maxMem)
	f, err := os.Open(pos[0])
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return failure(e, usagef("check: %s does not exist", pos[0]))
		}
		return failure(e, usagef("check: cannot read %s: %v", pos[0], err))
	}
	defer f.Close()
	cert, err := certify.Read(f)
	if err == nil {
		err = certify.Check(ctx, cert, opts)
	}
	if err != nil {
		fmt.Fprintf(e.stdout, "invalid: %v\n", err)
		return exitFailed
	}
	fmt.Fprintln(e.stdout, "valid")
	return exitOK
}
