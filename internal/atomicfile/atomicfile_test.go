package atomicfile

import (
	"os"
	"path/filepath"
	"syscall"
	"testing"
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
	for _, name := range []string{".a.json.123.tmp", "a.json", "notes.tmp"} {
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
	if len(left) != 2 || left[0] != "a.json" || left[1] != "notes.tmp" {
		t.Fatalf("left %v, want [a.json notes.tmp]", left)
	}
}
