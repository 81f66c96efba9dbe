//go:build linux

package main

import (
	"bytes"
	"strings"
	"syscall"
	"testing"
)

// programSlack is what the process holds beyond the memory budget, which
// bounds the data of the work: the program itself (its code, the Go
// runtime, goroutine stacks). 'avoidcert version' peaks at about 9 MB,
// this test binary at a few MB more (measured with GNU time on the 2-core
// machine); the README states the same allowance.
const programSlack = 32 << 20

// A run whose bracket run, certificate and check would go far past a small
// --max-memory stays within it: peak resident memory, as the kernel counts
// it for the finished child (getrusage), is at most the budget plus the
// program itself. The run stops at the best bracket it can still certify
// (1342 to 150 digits needs gigabytes; 150M holds about 50 digits), prints
// it and exits 3, as a budget stop does.
func TestPeakMemoryWithinBudget(t *testing.T) {
	if testing.Short() {
		t.Skip("a run of several seconds")
	}
	const budget = 150 << 20
	cmd := asCommand(t.TempDir(), "bound", "1342", "--digits", "150", "--max-memory", "150M", "--out", "c.json")
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	code := exitOf(t, cmd.Run())
	if code != exitUndecided || !strings.Contains(stdout.String(), "--max-memory 150.0 MiB") || !strings.Contains(stdout.String(), "certificate: c.json") {
		t.Fatalf("exit %d, stdout %q, stderr %q; want the best certifiable bracket, a budget stop naming --max-memory, exit 3", code, stdout.String(), stderr.String())
	}
	peak := int64(cmd.ProcessState.SysUsage().(*syscall.Rusage).Maxrss) << 10 // KiB on Linux
	t.Logf("peak resident memory %.1f MiB under --max-memory 150M", float64(peak)/(1<<20))
	if peak > budget+programSlack {
		t.Fatalf("peak resident memory %.1f MiB, over the budget of 150 MiB and %d MiB for the program", float64(peak)/(1<<20), programSlack>>20)
	}
}
