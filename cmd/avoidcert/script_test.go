package main

import (
	"bytes"
	"context"
	"os"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

// TestMain lets the test binary act as the real avoidcert command inside
// the scripts, so every script runs the program end to end; with
// AVOIDCERT_TEST_AS_COMMAND=1 in its environment it is the command itself
// (tests start it as a child process to kill it).
func TestMain(m *testing.M) {
	if os.Getenv("AVOIDCERT_TEST_AS_COMMAND") == "1" {
		os.Exit(run(context.Background(), &env{stdout: os.Stdout, stderr: os.Stderr}, os.Args[1:]))
	}
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
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){"replace": replaceCmd},
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
