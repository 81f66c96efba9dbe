//go:build unix

package prove_test

import (
	"context"
	"os"
	"path/filepath"
	"syscall"
	"testing"

	"avoidcert/pattern"
	"avoidcert/prove"
)

// Save writes through the one atomic writer: a certificate lands as a
// regular file that Load reads back, and a FIFO in its place is refused
// and left alone; Load refuses it too, without blocking.
func TestSaveRefusesSpecialFiles(t *testing.T) {
	set, err := pattern.ParseSet([]string{"123"})
	if err != nil {
		t.Fatal(err)
	}
	r, err := prove.Certify(context.Background(), set, prove.Options{Digits: 5})
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "c.json")
	if err := prove.Save(path, r.Certificate); err != nil {
		t.Fatal(err)
	}
	if _, err := prove.Load(context.Background(), path); err != nil {
		t.Fatal(err)
	}
	fifo := filepath.Join(dir, "pipe.json")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skip("no FIFOs here:", err)
	}
	if err := prove.Save(fifo, r.Certificate); err == nil {
		t.Fatal("Save replaced a FIFO")
	}
	if info, err := os.Lstat(fifo); err != nil || info.Mode()&os.ModeNamedPipe == 0 {
		t.Fatalf("the FIFO is gone or changed: %v %v", info, err)
	}
	// Load refuses the FIFO at once instead of waiting for a writer.
	if _, err := prove.Load(context.Background(), fifo); err == nil {
		t.Fatal("Load read a FIFO")
	}
}
