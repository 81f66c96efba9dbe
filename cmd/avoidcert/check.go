package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"strings"

	"avoidcert/certify"
	"avoidcert/internal/bytesize"
	"avoidcert/internal/input"
)

func init() {
	commands["check"] = command{
		summary: "re-verify a certificate with the independent checker",
		usage: `Usage: avoidcert check FILE [--expect PATTERN...] [--json]

Re-verifies a certificate written by 'avoidcert bound' with the independent
checker: it recomputes every iterate with its own plain code (nothing shared
with the fast engine) and checks every inequality exactly. Prints "valid" and
what was verified (the set, lambda and 1/lambda, the class, each bracket's
n, step and prefix states, the bound valid for every n), or "invalid: " and the reason. FILE "-"
reads standard input.

Flags:
  --expect PATTERN... the set the certificate must be about (123,321 or
                      123 321 after the flag); a certificate for any other
                      set is invalid. Repeating the flag adds to the set:
                      --expect 123 --expect 321 is {123, 321}. Without it,
                      any set is accepted, and check says so on stderr (and
                      in the JSON's "warning"): say which set you expect
                      whenever you know it.
  --json              {"format":"avoidcert-check","version":1,"verdict":"valid"|
                      "invalid"|"undecided","reason":...,"expected":[...]|null,
                      "warning":...,"patterns":[...],"structure_class":...,
                      "primitivity_exponent":k,"period":p,"finite_from":N1,
                      "blocks":[[...]],"lambda_status":...,"cyclic_avoider":...,
                      "lambda":{"lo","hi"},"radius":{...},"brackets":[{"n",
                      "statement"}],"all_n":{"n0","a_n0","lo","hi"}} (docs/json.md)
  --max-work N        refuse certificates whose recomputation is estimated
                      above N coefficient operations (default 1e12; the
                      memory limit is what binds in practice); values from
                      9.2e18 up ("inf" too) mean 9.2e18, no limit in practice
  --max-memory B      refuse certificates whose recomputation is estimated
                      to need more memory (default 4G)
  --progress          a line on stderr per percent of the work (for logs)
  --quiet             no live progress bar (shown on a terminal by default)

Exit codes: 0 valid, 1 invalid, 2 the file cannot be read, or bad usage,
3 over --max-work or --max-memory (undecided: raise the flag named),
4 interrupted (Ctrl-C or SIGTERM).
`,
		run: runCheck,
	}
}

// checkWork is the default work limit of check: the checker's own default.
const checkWork = float64(certify.DefaultMaxWork)

// patternList is a repeatable flag: every use adds patterns to the set.
type patternList []string

func (p *patternList) String() string { return strings.Join(*p, ",") }

func (p *patternList) Set(s string) error {
	*p = append(*p, s)
	return nil
}

func runCheck(ctx context.Context, e *env, args []string) int {
	flags := newFlags("check")
	var expect patternList
	flags.Var(&expect, "expect", "")
	maxWork := flags.Float64("max-work", checkWork, "")
	maxMem := byteSize(defaultMemory)
	flags.Var(&maxMem, "max-memory", "")
	asJSON := flags.Bool("json", false, "")
	progress := flags.Bool("progress", false, "")
	quiet := flags.Bool("quiet", false, "")
	pos, err := parseArgs(flags, args)
	if err != nil {
		return failure(e, err)
	}
	if *progress && *quiet {
		return failure(e, usagef("check: give --progress (lines for logs) or --quiet (no progress at all), not both"))
	}
	// "check FILE --expect 123 321": patterns after the file belong to --expect.
	if len(pos) == 0 || (len(pos) > 1 && len(expect) == 0) {
		return failure(e, usagef("check: name exactly one certificate file, e.g. 'avoidcert check avoidcert-1342.json'"))
	}
	var opts certify.CheckOptions
	var expected []string // the expected set as the checker reads it
	if len(expect) > 0 {
		// The expected set is read by the checker's parser alone.
		given := append(expect, pos[1:]...)
		if expected, err = certify.ParsePatterns(given); err != nil {
			return failure(e, usagef("check: --expect: %v", err))
		}
		opts.Expect = given
	}
	if opts.MaxWork, err = workLimit(*maxWork); err != nil {
		return failure(e, err)
	}
	opts.MaxMemory = int64(maxMem)
	limitMemory(opts.MaxMemory)
	data, err := readCertificateInput(ctx, pos[0])
	if err != nil {
		return failure(e, err)
	}
	if opts.Expect == nil {
		fmt.Fprintf(e.stderr, "avoidcert: check: %s\n", unbound)
	}
	out := checkOutput{asJSON: *asJSON, expect: expected}
	cert, err := certify.Read(bytes.NewReader(data))
	if err != nil {
		return out.verdict(e, nil, err)
	}
	var bar *liveBar // drawn from the first report on: a refusal before the work draws nothing
	var log *progressLog
	switch {
	case *progress:
		log = newProgressLog(e.stderr)
		opts.Progress = checkLines(log)
	case e.progress && !*quiet:
		opts.Progress = func(done, total int64) {
			if bar == nil {
				bar = newLiveBar(e.stderr, total, "operations")
			}
			bar.set("checking ", done, total)
		}
	}
	err = certify.Check(ctx, cert, opts)
	if bar != nil {
		bar.finish()
	}
	if log != nil {
		log.close()
	}
	if ctx.Err() != nil {
		return interrupted(e)
	}
	var limit *certify.LimitError
	if errors.As(err, &limit) {
		reason := fmt.Sprintf("re-checking the certificate needs about %.2g coefficient operations, over --max-work %.3g; raise --max-work to at least %.2g to check it",
			limit.Need, float64(opts.MaxWork), limit.Need)
		if limit.Resource == "memory" {
			reason = fmt.Sprintf("re-checking the certificate needs %s, over --max-memory %s; raise --max-memory to at least %s to check it",
				bytesize.About(int64(limit.Need)), bytesize.Format(opts.MaxMemory), bytesize.Flag(int64(limit.Need)))
		}
		return out.undecided(e, cert, reason)
	}
	return out.verdict(e, cert, err)
}

// unbound says what a check without --expect leaves out.
const unbound = "not bound to a set: without --expect, a valid certificate for any set passes; add --expect PATTERN... with the set you expect"

// workLimit converts --max-work to the checker's count of operations. A
// value above the largest count (about 9.2e18, "inf" included) is clamped
// to it, which is no limit in practice; a conversion would wrap around.
func workLimit(x float64) (int64, error) {
	switch {
	case !(x >= 1): // NaN too
		return 0, usagef("check: --max-work must be a number of at least 1, such as 1e12")
	case x >= math.MaxInt64:
		return math.MaxInt64, nil
	}
	return int64(x), nil
}

// readCertificateInput reads a certificate file ("-": standard input),
// bounded and regular files only (internal/input). A file that cannot be
// read is an input error (exit 2), not an invalid certificate.
func readCertificateInput(ctx context.Context, path string) ([]byte, error) {
	var data []byte
	var err error
	if path == "-" {
		data, err = input.ReadStream(ctx, os.Stdin, "standard input", input.Certificate)
	} else {
		data, err = input.ReadFile(ctx, path, input.Certificate)
	}
	if err != nil && ctx.Err() == nil {
		return nil, usagef("check: %v", err)
	}
	return data, err
}

// checkOutput is how check reports: text or JSON, and the set --expect
// named, as the checker's parser reads it (nil without --expect).
type checkOutput struct {
	asJSON bool
	expect []string
}

// head starts the JSON output: the format, the verdict, and the set the
// check was bound to, or a warning that it was bound to none.
func (o checkOutput) head(verdict, reason string) checkJSON {
	j := checkJSON{jsonHead: headOf("check"), Verdict: verdict, Reason: reason, Expected: o.expect}
	if o.expect == nil {
		j.Warning = unbound
	}
	return j
}

// undecided reports a certificate over the limits: exit 3.
func (o checkOutput) undecided(e *env, cert *certify.Certificate, reason string) int {
	if o.asJSON {
		j := o.head("undecided", reason)
		j.Patterns = cert.Statement.Patterns
		writeJSON(e.stdout, j)
	} else {
		fmt.Fprintf(e.stdout, "undecided: %s\n", reason)
	}
	return exitUndecided
}

// checkJSON is the --json output of check: the verdict and, when valid,
// what the certificate proves, every value from certify.Summarize (the
// checker's own statement of the accepted certificate).
type checkJSON struct {
	jsonHead
	Verdict  string        `json:"verdict"`
	Reason   string        `json:"reason,omitempty"`
	Expected []string      `json:"expected"`
	Warning  string        `json:"warning,omitempty"`
	Patterns []string      `json:"patterns"`
	Class    *string       `json:"structure_class"`
	Exponent *int          `json:"primitivity_exponent"`
	Period   *int          `json:"period"`
	N1       *int          `json:"finite_from"`
	Blocks   [][]int       `json:"blocks"`
	LambdaSt *string       `json:"lambda_status"`
	Avoider  *string       `json:"cyclic_avoider"`
	Lambda   *endsJSON     `json:"lambda"`
	Radius   *endsJSON     `json:"radius"`
	Brackets []bracketJSON `json:"brackets"`
	AllN     *allNJSON     `json:"all_n"`
}

// bracketJSON is one verified bracket: its n and the checker's statement
// of it.
type bracketJSON struct {
	N         int    `json:"n"`
	Statement string `json:"statement"`
}

// verdict prints valid (with what was verified) or invalid. Every
// statement printed as verified is the checker's own (certify.Summarize
// of the accepted certificate).
func (o checkOutput) verdict(e *env, cert *certify.Certificate, err error) int {
	if err != nil {
		if o.asJSON {
			out := o.head("invalid", err.Error())
			if cert != nil {
				out.Patterns = cert.Statement.Patterns
			}
			writeJSON(e.stdout, out)
		} else {
			fmt.Fprintf(e.stdout, "invalid: %v\n", err)
		}
		return exitFailed
	}
	v := certify.Summarize(cert)
	if !o.asJSON {
		fmt.Fprintln(e.stdout, "valid")
		for _, line := range v.Lines() {
			fmt.Fprintln(e.stdout, "verified: "+line)
		}
		return exitOK
	}
	out := o.head("valid", "")
	out.Patterns = v.Patterns
	out.Lambda = &endsJSON{Lo: nonEmpty(v.Lambda[0]), Hi: nonEmpty(v.Lambda[1])}
	if !v.LambdaZero() { // null when lambda = 0: 1/lambda has no value
		out.Radius = &endsJSON{Lo: nonEmpty(v.Radius[0]), Hi: nonEmpty(v.Radius[1])}
	}
	out.Class, out.LambdaSt, out.Avoider = nonEmpty(v.Class), nonEmpty(v.LambdaStatus), nonEmpty(v.CyclicAvoider)
	if v.Exponent > 0 {
		out.Exponent = &v.Exponent
	}
	if v.Period > 0 {
		out.Period = &v.Period
	}
	if v.N1 > 0 {
		out.N1 = &v.N1
	}
	out.Blocks = v.Blocks
	for i, n := range v.N {
		out.Brackets = append(out.Brackets, bracketJSON{N: n, Statement: v.Brackets[i]})
	}
	if a := v.AllN; a != nil {
		out.AllN = &allNJSON{N0: a.N0, AN0: a.AN0, Lo: nonEmpty(a.Lo), Hi: nonEmpty(a.Hi)}
	}
	writeJSON(e.stdout, out)
	return exitOK
}

// nonEmpty is s, or nil (JSON null) for "".
func nonEmpty(s string) *string {
	if s == "" {
		return nil
	}
	return &s
}
