//go:build unix

package main

import (
	"bytes"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// asCommand returns the test binary set up to act as avoidcert with args.
func asCommand(dir string, args ...string) *exec.Cmd {
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), "AVOIDCERT_TEST_AS_COMMAND=1")
	cmd.Dir = dir
	return cmd
}

// exitOf returns a finished command's exit code.
func exitOf(t *testing.T, err error) int {
	t.Helper()
	var ee *exec.ExitError
	switch {
	case err == nil:
		return 0
	case errors.As(err, &ee):
		return ee.ExitCode()
	}
	t.Fatal(err)
	return -1
}

// Standard input that never ends (a pipe nobody writes to) is left as soon
// as SIGTERM comes: exit 4 with the message, like every other wait.
func TestStandardInputStopsOnSIGTERM(t *testing.T) {
	r, w, err := os.Pipe()
	if err != nil {
		t.Fatal(err)
	}
	defer w.Close()
	cmd := asCommand(t.TempDir(), "check", "-")
	var stderr bytes.Buffer
	cmd.Stdin, cmd.Stderr = r, &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	r.Close()
	time.Sleep(500 * time.Millisecond)
	if err := cmd.Process.Signal(syscall.SIGTERM); err != nil {
		t.Fatal(err)
	}
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	select {
	case err = <-done:
	case <-time.After(stopWithin):
		cmd.Process.Kill()
		t.Fatalf("check - still waits on standard input %v after SIGTERM", stopWithin)
	}
	if code := exitOf(t, err); code != exitAborted || !strings.Contains(stderr.String(), "interrupted") {
		t.Fatalf("exit %d, %q; want exit 4 and the interrupted message", code, stderr.String())
	}
}

// Standard output on a full disk (/dev/full) is not a success: exit 4 with
// the out-of-space message, as for files.
func TestStandardOutputOutOfSpace(t *testing.T) {
	full, err := os.OpenFile("/dev/full", os.O_WRONLY, 0)
	if err != nil {
		t.Skip("no /dev/full here:", err)
	}
	defer full.Close()
	for _, args := range [][]string{{"count", "123", "--to", "10"}, {"bound", "123", "--digits", "5", "--out", "-"}} {
		cmd := asCommand(t.TempDir(), args...)
		var stderr bytes.Buffer
		cmd.Stdout, cmd.Stderr = full, &stderr
		code := exitOf(t, cmd.Run())
		if code != exitAborted || !strings.Contains(stderr.String(), "out of space writing") {
			t.Errorf("%v to /dev/full: exit %d, %q; want exit 4 saying out of space", args, code, stderr.String())
		}
	}
}

// fullDisk mounts a small tmpfs and fills it, or skips the test where
// that is not allowed (not root, no tmpfs).
func fullDisk(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	if err := syscall.Mount("tmpfs", dir, "tmpfs", 0, "size=64k"); err != nil {
		t.Skip("cannot mount a small file system here (needs root):", err)
	}
	t.Cleanup(func() { syscall.Unmount(dir, 0) })
	f, err := os.Create(filepath.Join(dir, "filler"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	block := make([]byte, 4096)
	for {
		if _, err := f.Write(block); err != nil {
			if !errors.Is(err, syscall.ENOSPC) {
				t.Fatal(err)
			}
			return dir
		}
	}
}

// Out of space is one exit code, 4, in every command that writes files
// (it was 2 in bound and 4 elsewhere), with a message that says so and
// nothing half-written left under the target's name.
func TestOutOfSpace(t *testing.T) {
	full := fullDisk(t)
	work := t.TempDir()
	prepare := func(args ...string) {
		if out, err := asCommand(work, args...).CombinedOutput(); err != nil {
			t.Fatalf("%v: %v\n%s", args, err, out)
		}
	}
	prepare("bound", "123", "--digits", "5", "--out", "c.json")
	prepare("census", "--length", "3", "--to", "8", "--digits", "5", "--shard", "1/2", "--out", "s1", "--quiet")
	prepare("census", "--length", "3", "--to", "8", "--digits", "5", "--shard", "2/2", "--out", "s2", "--quiet")
	manifest := filepath.Join(work, "g.toml")
	if err := os.WriteFile(manifest, []byte("[[claim]]\nid = \"g1\"\nkind = \"growth\"\npatterns = [\"123\"]\nvalue = \"0.82699334\"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		args    []string
		say     string
		missing string // a file that must not exist afterwards
	}{
		{[]string{"bound", "123", "--digits", "5", "--out", full + "/c.json"}, "out of space writing in", "c.json"},
		{[]string{"report", "c.json", "--out", full + "/r.md"}, "out of space writing in", "r.md"},
		{[]string{"census", "--length", "3", "--to", "8", "--digits", "5", "--out", full + "/c3", "--quiet"}, "census: out of space writing", "c3/census.json"},
		{[]string{"census", "merge", "--out", full + "/m", "s1", "s2"}, "out of space writing in", "m/census.json"},
		{[]string{"gate", "g.toml", "--cache", "off", "--junit", full + "/j.xml"}, "out of space writing in", "j.xml"},
		// a kept certificate that cannot be written fails its claim: exit 4 too
		{[]string{"gate", "g.toml", "--cache", "off", "--certificates", full + "/certs"}, "", "certs/g1.json"},
	} {
		cmd := asCommand(work, tc.args...)
		var stdout, stderr bytes.Buffer
		cmd.Stdout, cmd.Stderr = &stdout, &stderr
		code := exitOf(t, cmd.Run())
		if code != exitAborted || !strings.Contains(stderr.String()+stdout.String(), tc.say) {
			t.Errorf("%v: exit %d, stderr %q; want exit 4 saying %q", tc.args[:2], code, stderr.String(), tc.say)
		}
		if strings.Count(strings.TrimSpace(stderr.String()), "\n") > 1 {
			t.Errorf("%v: more than two lines on stderr: %q", tc.args[:2], stderr.String())
		}
		if _, err := os.Stat(filepath.Join(full, tc.missing)); err == nil {
			t.Errorf("%v: %s was written on a full disk", tc.args[:2], tc.missing)
		}
	}
}
