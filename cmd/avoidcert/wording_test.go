package main

import (
	"fmt"
	"os"
	"regexp"
	"strings"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

// foreignWording is the one list of wording that must never reach a user:
// the words of Go, of its runtime, of the libraries we use, and the
// names inside our own packages. Every message a script test provokes is
// scanned against it (scanStderr). Each entry names what it forbids; a
// message that needs one of these words says the same thing in our own
// words instead.
var foreignWording = []struct {
	what string
	re   *regexp.Regexp
}{
	{"Go's flag package", regexp.MustCompile(`flag provided but not defined|flag needs an argument|invalid (boolean )?value .* for flag|: parse error|value out of range|invalid syntax`)},
	{"Go's file errors (op PATH: reason)", regexp.MustCompile(`\b(open|mkdir|stat|lstat|rename|readlink|remove|unlinkat|openat|fstatat|mkdirat|chmod) \S+: `)},
	{"the system's words for a missing file or folder", regexp.MustCompile(`no such file or directory|not a directory|is a directory|file exists\b`)},
	{"Go's JSON package", regexp.MustCompile(`(^|\s)json: |json: unknown field|invalid character|cannot unmarshal|unexpected end of JSON|Go (struct field|value)`)},
	{"the TOML library", regexp.MustCompile(`(^|\s)toml: |Key '|has already been defined|bare keys`)},
	{"Go's number parsing", regexp.MustCompile(`strconv\.|out of range for int|ParseInt|ParseFloat|ParseUint`)},
	{"a crash", regexp.MustCompile(`(?i)\bpanic\b|goroutine \d|runtime error|nil pointer|\bSIGSEGV\b|index out of range`)},
	{"Go's words for an early end and for cancellation", regexp.MustCompile(`(?i)\bunexpected\b|\bEOF\b|context canceled|deadline exceeded|exit status`)},
	{"fmt's marks of a wrong verb or a nil value", regexp.MustCompile(`%!|<nil>|\b0x[0-9a-f]{6,}`)},
	{"a Go name (Type.Field, an Options field)", regexp.MustCompile(`\b[A-Z][a-z0-9]+(?:[A-Z][a-z0-9]*)+\.[A-Z]\w*|\b[A-Z]\w*Options\b`)},
	{"an internal package's prefix", regexp.MustCompile(`(^|[\s(])(prove|bounds|certify|transfer|claims|interval|pattern|input|atomicfile|filelock|par|words|bytesize|brief|census|prob|report|series|structure): `)},
}

// commandPrefix is how every message starts: the tool's name and the
// command (which may share a package's name: census, prob, report, series,
// structure).
var commandPrefix = regexp.MustCompile(`^avoidcert: (?:(?:census merge|bound|census|check|claim|count|demo|gate|prob|report|series|structure|help|version): )?`)

// scanStderr returns, for every line of a command's messages, each entry
// of foreignWording it matches. The progress lines a command prints for
// logs are scanned too.
func scanStderr(text string) []string {
	var found []string
	for line := range strings.SplitSeq(text, "\n") {
		rest := commandPrefix.ReplaceAllString(line, "")
		for _, w := range foreignWording {
			if w.re.MatchString(rest) {
				found = append(found, fmt.Sprintf("%s: %q", w.what, line))
			}
		}
	}
	return found
}

// stderrLog is the environment variable that names the file into which
// the command, run by a script, copies everything it writes on stderr.
const stderrLog = "AVOIDCERT_TEST_STDERR_LOG"

// scanScriptStderr is the scripts' Setup: every command a script runs
// appends its messages to a log outside the script's folder, and at the
// end of the script the log is scanned for foreign wording.
func scanScriptStderr(env *testscript.Env) error {
	dir, err := os.MkdirTemp("", "avoidcert-stderr-")
	if err != nil {
		return err
	}
	log := dir + string(os.PathSeparator) + "stderr.log"
	env.Setenv(stderrLog, log)
	env.Defer(func() {
		defer os.RemoveAll(dir)
		data, err := os.ReadFile(log)
		if err != nil {
			return // the script ran no command
		}
		if found := scanStderr(string(data)); len(found) > 0 {
			env.T().Fatal("wording that is not the tool's own:\n" + strings.Join(found, "\n"))
		}
	})
	return nil
}

// The scan finds what it is meant to find, and passes the tool's own
// wording.
func TestScanStderr(t *testing.T) {
	for _, bad := range []string{
		"avoidcert: count: flag provided but not defined: --bogus",
		"avoidcert: check: open x.json: no such file or directory",
		"avoidcert: gate: cannot create the folder \"a\": mkdir a: not a directory",
		`avoidcert: report: gate.jsonl:1: json: unknown field "extra"`,
		"avoidcert: gate: Key 'claim.n' has already been defined",
		"avoidcert: count: --to: value out of range for int64",
		"avoidcert: undecided: bounds: stopped before the first bracket",
		"avoidcert: bound: prove: checking the certificate",
		"raise the work limit (CheckOptions.MaxWork, --max-work)",
		"panic: runtime error: index out of range [3] with length 3",
		"goroutine 1 [running]:",
		"avoidcert: gate: invalid character 'x' looking for beginning of value",
		"avoidcert: series: unexpected EOF",
	} {
		if len(scanStderr(bad)) == 0 {
			t.Errorf("scan passes %q", bad)
		}
	}
	for _, good := range []string{
		"avoidcert: census: --length is required, e.g. 'avoidcert census --length 5'",
		"avoidcert: report: census-4/census.json is a census table: name its folder, census-4",
		`avoidcert: check: "nope.json" does not exist; name a certificate file`,
		"avoidcert: structure: no pattern given; name at least one, e.g. 'avoidcert structure 132'",
		"n=38: lambda in [0.82699334311, 0.82699334315] (10 of 10 digits agreed)",
		"[1/3] g1: proved (0.1 s)",
	} {
		if f := scanStderr(good); len(f) > 0 {
			t.Errorf("scan refuses our own wording: %v", f)
		}
	}
}
