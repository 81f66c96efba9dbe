package main

import (
	"bytes"
	"context"
	"errors"
	"os"
	"os/exec"
	"strconv"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

// TestMain lets the test binary act as the real avoidcert command inside
// the scripts, so every script runs the program end to end.
func TestMain(m *testing.M) {
	testscript.Main(m, map[string]func(){
		"avoidcert": func() {
			os.Exit(run(context.Background(), &env{stdout: os.Stdout, stderr: os.Stderr}, os.Args[1:]))
		},
	})
}

// TestScripts runs testdata/script/*.txtar. Each script states the command
// lines, their exit codes and the expected output.
func TestScripts(t *testing.T) {
	testscript.Run(t, testscript.Params{
		Dir:  "testdata/script",
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){"replace": replaceCmd, "exits": exitsCmd},
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

// exitsCmd is the script command "exits CODE PROGRAM ARGS...": it runs the
// program like exec, keeps its output for stdout and stderr, and fails
// unless it exits with CODE.
func exitsCmd(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) < 2 {
		ts.Fatalf("usage: exits CODE PROGRAM ARGS...")
	}
	want, err := strconv.Atoi(args[0])
	ts.Check(err)
	got := 0
	if err := ts.Exec(args[1], args[2:]...); err != nil {
		var ee *exec.ExitError
		if !errors.As(err, &ee) {
			ts.Fatalf("%s: %v", args[1], err)
		}
		got = ee.ExitCode()
	}
	if got != want {
		ts.Fatalf("%s exited with %d, want %d", args[1], got, want)
	}
}
