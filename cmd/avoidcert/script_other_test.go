//go:build !unix

package main

import "github.com/rogpeppe/go-internal/testscript"

// mkfifoCmd is "mkfifo PATH"; named pipes need a Unix system (the scripts
// that use it say [unix]).
func mkfifoCmd(ts *testscript.TestScript, neg bool, args []string) {
	ts.Fatalf("mkfifo: not supported on this system")
}
