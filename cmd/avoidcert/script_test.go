package main

import (
	"context"
	"os"
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
	testscript.Run(t, testscript.Params{Dir: "testdata/script"})
}
