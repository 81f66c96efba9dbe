package atomicfile

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"time"
)

func TestWriteFileReplacesAndLeavesNoTemp(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.json")
	for _, text := range []string{"first\n", "second\n"} {
		if err := WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		got, err := os.ReadFile(path)
		if err != nil || string(got) != text {
			t.Fatalf("read %q, %v; want %q", got, err, text)
		}
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Fatalf("folder holds %d entries, want only the file", len(entries))
	}
}

func TestWriteFileRefusesNonRegular(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skip("no FIFOs here:", err)
	}
	if err := WriteFile(fifo, []byte("x"), 0o644); err == nil {
		t.Fatal("a FIFO was replaced")
	}
	if err := WriteFile(dir, []byte("x"), 0o644); err == nil {
		t.Fatal("a folder was replaced")
	}
}

// goneID returns the id of a process that has exited (and been reaped).
func goneID(t *testing.T) int {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	if err := cmd.Run(); err != nil {
		t.Fatal(err)
	}
	return cmd.Process.Pid
}

// touch makes an empty file in dir, last modified age ago.
func touch(t *testing.T, dir, name string, age time.Duration) {
	t.Helper()
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	when := time.Now().Add(-age)
	if err := os.Chtimes(path, when, when); err != nil {
		t.Fatal(err)
	}
}

// The rule of RemoveStale: a temp file goes when its writer is gone and it
// has rested a minute, or when it is a day old whatever its writer; a live
// writer's file stays, however long it has been there (within the day).
func TestRemoveStale(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("no test for a running process here: only the age counts")
	}
	dir := t.TempDir()
	live, gone := os.Getpid(), goneID(t)
	tmp := func(base string, pid int) string {
		return fmt.Sprintf(".%s.avoidcert-tmp-%d-%d", base, pid, 12345)
	}
	cases := []struct {
		name string
		age  time.Duration
		kept bool
	}{
		{tmp("a.json", gone), 2 * StaleAfter, false},         // a killed writer's
		{tmp("b.json", gone), StaleAfter / 2, true},          // resting: maybe a writer on another machine
		{tmp("c.json", live), 10 * time.Hour, true},          // a live writer's
		{tmp("d.json", live), MaxTempAge + time.Hour, false}, // a day old: the id was reused
		{".e.json.avoidcert-tmp-123", time.Hour, true},       // no id (earlier versions): only the day counts
		{".f.json.avoidcert-tmp-123", MaxTempAge + time.Hour, false},
		{".g.avoidcert-tmp-x1", MaxTempAge + time.Hour, true}, // not a temp name
		{"a.json", MaxTempAge + time.Hour, true},
		{"notes.tmp", MaxTempAge + time.Hour, true},
	}
	for _, c := range cases {
		touch(t, dir, c.name, c.age)
	}
	if err := RemoveStale(dir); err != nil {
		t.Fatal(err)
	}
	for _, c := range cases {
		if _, err := os.Stat(filepath.Join(dir, c.name)); (err == nil) != c.kept {
			t.Errorf("%s (age %v): kept %v, want %v", c.name, c.age, err == nil, c.kept)
		}
	}
}

// RemoveStaleOf removes only the named file's abandoned temporary files.
func TestRemoveStaleOf(t *testing.T) {
	dir := t.TempDir()
	gone := goneID(t)
	mine := fmt.Sprintf(".a.json.avoidcert-tmp-%d-1", gone)
	other := fmt.Sprintf(".b.json.avoidcert-tmp-%d-2", gone)
	prefix := fmt.Sprintf(".a.json.x.avoidcert-tmp-%d-3", gone) // the temp of "a.json.x"
	for _, name := range []string{mine, other, prefix} {
		touch(t, dir, name, time.Hour)
	}
	if err := RemoveStaleOf(dir, "a.json"); err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string]bool{mine: false, other: true, prefix: true} {
		if _, err := os.Stat(filepath.Join(dir, name)); (err == nil) != want {
			t.Errorf("%s: exists %v, want %v", name, err == nil, want)
		}
	}
}

// The temp names this process makes carry its id, and parse back.
func TestTempNames(t *testing.T) {
	pattern := TempPattern("x.json")
	name := strings.Replace(pattern, "*", "987654", 1)
	base, pid, ok := parseTemp(name)
	if !ok || base != "x.json" || pid != os.Getpid() {
		t.Fatalf("parseTemp(%q) = %q, %d, %v", name, base, pid, ok)
	}
	for _, bad := range []string{"x.avoidcert-tmp-1", ".avoidcert-tmp-1", ".x.avoidcert-tmp-", ".x.avoidcert-tmp-1-", ".x.avoidcert-tmp-a-1", ".x.avoidcert-tmp-1-2-3"} {
		if IsTemp(bad) {
			t.Errorf("IsTemp(%q) = true", bad)
		}
	}
}
