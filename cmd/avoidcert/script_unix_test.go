//go:build unix

package main

import (
	"syscall"

	"github.com/rogpeppe/go-internal/testscript"
)

// mkfifoCmd is "mkfifo PATH": it makes a named pipe.
func mkfifoCmd(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 1 {
		ts.Fatalf("usage: mkfifo PATH")
	}
	ts.Check(syscall.Mkfifo(ts.MkAbs(args[0]), 0o644))
}
