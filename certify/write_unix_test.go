//go:build unix

package certify_test

import (
	"os"
	"path/filepath"
	"syscall"
	"testing"

	"avoidcert/certify"
)

// Write never replaces what is not a regular file: a FIFO stays a FIFO,
// a folder a folder.
func TestWriteRefusesSpecialFiles(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe.json")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skip("no FIFOs here:", err)
	}
	for _, path := range []string{fifo, dir} {
		if err := certify.Write(path, goldenCert(t)); err == nil {
			t.Errorf("%s: Write replaced a non-regular file", path)
		}
	}
	if info, err := os.Lstat(fifo); err != nil || info.Mode()&os.ModeNamedPipe == 0 {
		t.Fatalf("the FIFO is gone or changed: %v %v", info, err)
	}
}
