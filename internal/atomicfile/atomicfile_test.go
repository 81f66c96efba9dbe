package atomicfile

import (
	"os"
	"path/filepath"
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

func TestRemoveStale(t *testing.T) {
	dir := t.TempDir()
	for _, name := range []string{".a.json.avoidcert-tmp-123", "a.json", "notes.tmp", ".b.avoidcert-tmp-x1"} {
		if err := os.WriteFile(filepath.Join(dir, name), nil, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if err := RemoveStale(dir); err != nil {
		t.Fatal(err)
	}
	entries, _ := os.ReadDir(dir)
	var left []string
	for _, e := range entries {
		left = append(left, e.Name())
	}
	if len(left) != 3 || left[0] != ".b.avoidcert-tmp-x1" || left[1] != "a.json" || left[2] != "notes.tmp" {
		t.Fatalf("left %v, want [.b.avoidcert-tmp-x1 a.json notes.tmp]", left)
	}
}

// RemoveStaleOf removes only the named file's temporary files, and only
// those older than the cut (a concurrent writer's stays).
func TestRemoveStaleOf(t *testing.T) {
	dir := t.TempDir()
	cut := time.Now()
	old, recent, other := ".a.json.avoidcert-tmp-1", ".a.json.avoidcert-tmp-2", ".b.json.avoidcert-tmp-3"
	for _, name := range []string{old, recent, other} {
		if err := os.WriteFile(filepath.Join(dir, name), nil, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	for _, name := range []string{old, other} {
		if err := os.Chtimes(filepath.Join(dir, name), cut.Add(-time.Hour), cut.Add(-time.Hour)); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.Chtimes(filepath.Join(dir, recent), cut.Add(time.Minute), cut.Add(time.Minute)); err != nil {
		t.Fatal(err)
	}
	if err := RemoveStaleOf(dir, "a.json", cut); err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string]bool{old: false, recent: true, other: true} {
		if _, err := os.Stat(filepath.Join(dir, name)); (err == nil) != want {
			t.Errorf("%s: exists %v, want %v", name, err == nil, want)
		}
	}
}
