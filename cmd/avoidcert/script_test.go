package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/rogpeppe/go-internal/testscript"

	"avoidcert/pattern"
)

// TestMain lets the test binary act as the real avoidcert command inside
// the scripts, so every script runs the program end to end; with
// AVOIDCERT_TEST_AS_COMMAND=1 in its environment it is the command itself
// (tests start it as a child process to kill it).
func TestMain(m *testing.M) {
	if os.Getenv("AVOIDCERT_TEST_AS_COMMAND") == "1" {
		injectFault()
		os.Exit(runLogged())
	}
	testscript.Main(m, map[string]func(){
		"avoidcert": func() {
			injectFault()
			os.Exit(runLogged())
		},
	})
}

// runLogged runs the command as a script runs it: its messages go to
// stderr and, when the script asks for it (stderrLog), into a log that
// the script's end scans for wording that is not the tool's own. On a
// terminal (where live bars are drawn) nothing is logged.
func runLogged() int {
	path := os.Getenv(stderrLog)
	if path == "" || progressWanted(os.Stderr) {
		return runProcess() // a live bar needs the terminal itself
	}
	log, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_APPEND, 0o644)
	if err != nil {
		panic(err)
	}
	defer log.Close()
	return runProcessTo(io.MultiWriter(os.Stderr, log))
}

// injectFault gives the command, in tests only, the heartbeat of
// progress lines that AVOIDCERT_TEST_HEARTBEAT gives (a duration) and the
// fault that AVOIDCERT_TEST_FAULT names: "drop-last-token" makes the engine's parser
// drop the last pattern of every comma list, so that the scripts can show
// the checker refusing to answer for the set the engine misread.
func injectFault() {
	if d, err := time.ParseDuration(os.Getenv("AVOIDCERT_TEST_HEARTBEAT")); err == nil {
		heartbeat = d // a silent stretch long enough for a heartbeat line, in a short test
	}
	switch os.Getenv("AVOIDCERT_TEST_FAULT") {
	case "":
	case "drop-last-token":
		parseSet = func(args []string) (pattern.Set, error) {
			var misread []string
			for _, a := range args {
				if i := strings.LastIndex(a, ","); i >= 0 {
					a = a[:i]
				}
				misread = append(misread, a)
			}
			return pattern.ParseSet(misread)
		}
	default:
		panic("unknown AVOIDCERT_TEST_FAULT " + os.Getenv("AVOIDCERT_TEST_FAULT"))
	}
}

// TestScripts runs testdata/script/*.txtar. Each script states the command
// lines, their exit codes and the expected output.
func TestScripts(t *testing.T) {
	testscript.Run(t, testscript.Params{
		Dir:   "testdata/script",
		Setup: scanScriptStderr,
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){
			"replace":   replaceCmd,
			"exits":     exitsCmd,
			"interrupt": signalCmd(os.Interrupt),
			"terminate": signalCmd(syscall.SIGTERM),
			"age":       ageCmd,
			"mkfifo":    mkfifoCmd,
			"tempfile":  tempfileCmd,
			"repeat":    repeatCmd,
			"sha256":    sha256Cmd,
		},
	})
}

// replaceCmd is the script command "replace FILE OLD NEW": it replaces the
// first OLD in FILE by NEW, and fails when OLD is absent. The scripts use
// it to tamper with certificates.
func replaceCmd(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 3 {
		ts.Fatalf("usage: replace FILE OLD NEW")
	}
	path := ts.MkAbs(args[0])
	data, err := os.ReadFile(path)
	ts.Check(err)
	old := []byte(args[1])
	if !bytes.Contains(data, old) {
		ts.Fatalf("replace: %q not found in %s", args[1], args[0])
	}
	ts.Check(os.WriteFile(path, bytes.Replace(data, old, []byte(args[2]), 1), 0o644))
}

// sha256Cmd is the script command "sha256 FILE VAR": it sets the
// environment variable VAR to the SHA-256 of FILE in hex, so that a
// script can forge a census row that names another file by its true
// digest.
func sha256Cmd(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 2 {
		ts.Fatalf("usage: sha256 FILE VAR")
	}
	data, err := os.ReadFile(ts.MkAbs(args[0]))
	ts.Check(err)
	sum := sha256.Sum256(data)
	ts.Setenv(args[1], hex.EncodeToString(sum[:]))
}

// exitsCmd is "exits CODE PROG ARGS...": it runs the command like exec
// and fails unless it exits with exactly CODE.
func exitsCmd(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) < 2 {
		ts.Fatalf("usage: exits CODE PROG ARGS...")
	}
	want, err := strconv.Atoi(args[0])
	ts.Check(err)
	if got := exitCode(ts, ts.Exec(args[1], args[2:]...)); got != want {
		ts.Fatalf("exit code %d, want %d", got, want)
	}
}

// stopWithin is how long a command may take to stop after SIGINT or
// SIGTERM in the scripts: the promise is a second, the margin is for a
// loaded machine; a command that finishes its work first fails it.
const stopWithin = 10 * time.Second

// signalCmd makes "interrupt CODE AFTER PROG ARGS..." (SIGINT, Ctrl-C) and
// "terminate CODE AFTER PROG ARGS..." (SIGTERM, what timeout, CI
// cancellation and Slurm send): start the command, send the signal after
// the duration AFTER, and fail unless it then exits with exactly CODE
// within stopWithin. The command must still be running when the signal
// comes (else the script tests nothing).
func signalCmd(sig os.Signal) func(ts *testscript.TestScript, neg bool, args []string) {
	return func(ts *testscript.TestScript, neg bool, args []string) {
		if neg || len(args) < 3 {
			ts.Fatalf("usage: interrupt|terminate CODE AFTER PROG ARGS...")
		}
		want, err := strconv.Atoi(args[0])
		ts.Check(err)
		after, err := time.ParseDuration(args[1])
		ts.Check(err)
		cmd := exec.Command(args[2], args[3:]...)
		cmd.Dir = ts.MkAbs(".")
		cmd.Env = append(os.Environ(), stderrLog+"="+ts.Getenv(stderrLog))
		var stdout, stderr strings.Builder
		cmd.Stdout, cmd.Stderr = &stdout, &stderr
		ts.Check(cmd.Start())
		done := make(chan error, 1)
		go func() { done <- cmd.Wait() }()
		select {
		case err = <-done:
			ts.Fatalf("finished (%v) before the signal after %v; give it more work\n%s", err, after, stderr.String())
		case <-time.After(after):
		}
		ts.Check(cmd.Process.Signal(sig))
		select {
		case err = <-done:
		case <-time.After(stopWithin):
			cmd.Process.Kill()
			ts.Fatalf("still running %v after %v", stopWithin, sig)
		}
		ts.Stdout().Write([]byte(stdout.String()))
		ts.Stderr().Write([]byte(stderr.String()))
		if got := exitCode(ts, err); got != want {
			ts.Fatalf("exit code %d after %v, want %d\n%s", got, sig, want, stderr.String())
		}
	}
}

// tempfileCmd is "tempfile NAME OWNER AGE ID": it leaves the temp file of a
// write of NAME as a writer would, last modified AGE ago: OWNER "live" names
// a running process (this test's), "gone" one that has exited, "none" is a
// name without a process id (earlier versions). The file is
// ".NAME.avoidcert-tmp-PID-ID" (".NAME.avoidcert-tmp-ID" for none), beside
// NAME.
func tempfileCmd(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 4 {
		ts.Fatalf("usage: tempfile NAME live|gone|none AGE ID")
	}
	var owner string
	switch args[1] {
	case "live":
		owner = strconv.Itoa(os.Getpid()) + "-"
	case "gone":
		child := exec.Command(os.Args[0], "version")
		child.Env = append(os.Environ(), "AVOIDCERT_TEST_AS_COMMAND=1")
		child.Stdout = io.Discard
		ts.Check(child.Run())
		owner = strconv.Itoa(child.Process.Pid) + "-"
	case "none":
	default:
		ts.Fatalf("tempfile: owner %q is not live, gone or none", args[1])
	}
	age, err := time.ParseDuration(args[2])
	ts.Check(err)
	dir, base := filepath.Split(args[0])
	path := ts.MkAbs(filepath.Join(dir, "."+base+".avoidcert-tmp-"+owner+args[3]))
	ts.Check(os.WriteFile(path, []byte("partial"), 0o644))
	when := time.Now().Add(-age)
	ts.Check(os.Chtimes(path, when, when))
}

func exitCode(ts *testscript.TestScript, err error) int {
	var ee *exec.ExitError
	switch {
	case err == nil:
		return 0
	case errors.As(err, &ee):
		return ee.ExitCode()
	}
	ts.Fatalf("%v", err)
	return -1
}

// repeatCmd is "repeat FILE TEXT N [TEXT N]...": it writes FILE as each
// TEXT repeated N times, in order; "\n" in a TEXT is a newline. The scripts
// make huge and deeply nested inputs with it.
func repeatCmd(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) < 3 || len(args)%2 != 1 {
		ts.Fatalf("usage: repeat FILE TEXT N [TEXT N]...")
	}
	var b bytes.Buffer
	for i := 1; i < len(args); i += 2 {
		n, err := strconv.Atoi(args[i+1])
		ts.Check(err)
		b.WriteString(strings.Repeat(strings.ReplaceAll(args[i], `\n`, "\n"), n))
	}
	ts.Check(os.WriteFile(ts.MkAbs(args[0]), b.Bytes(), 0o644))
}

// ageCmd is "age FILE D": it sets FILE's modification time D back (a
// negative D is in the future), as if an earlier run had left it (or a
// concurrent one were writing it).
func ageCmd(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 2 {
		ts.Fatalf("usage: age FILE DURATION")
	}
	d, err := time.ParseDuration(args[1])
	ts.Check(err)
	when := time.Now().Add(-d)
	ts.Check(os.Chtimes(ts.MkAbs(args[0]), when, when))
}
