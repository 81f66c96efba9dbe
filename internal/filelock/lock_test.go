//go:build unix

package filelock

import (
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"syscall"
	"testing"
)

// A second holder, in another process, is refused while the first holds
// the lock and gets it once the first releases it. (flock locks belong to
// open files, so a second Lock in this process would be refused too, but
// the point is another process.)
func TestLockExcludesAnotherProcess(t *testing.T) {
	if os.Getenv("FILELOCK_TEST_CHILD") != "" {
		_, err := Lock(os.Getenv("FILELOCK_TEST_CHILD"))
		if errors.Is(err, ErrHeld) {
			os.Exit(3)
		}
		if err != nil {
			os.Exit(4)
		}
		os.Exit(0)
	}
	path := filepath.Join(t.TempDir(), ".avoidcert-lock")
	child := func() int {
		cmd := exec.Command(os.Args[0], "-test.run=^TestLockExcludesAnotherProcess$")
		cmd.Env = append(os.Environ(), "FILELOCK_TEST_CHILD="+path)
		err := cmd.Run()
		var ee *exec.ExitError
		if errors.As(err, &ee) {
			return ee.ExitCode()
		}
		if err != nil {
			t.Fatal(err)
		}
		return 0
	}
	release, err := Lock(path)
	if err != nil {
		t.Fatal(err)
	}
	if code := child(); code != 3 {
		t.Fatalf("a second process took the held lock (exit %d, want 3)", code)
	}
	release()
	if code := child(); code != 0 {
		t.Fatalf("the released lock was refused (exit %d)", code)
	}
}

// A FIFO where the lock file should be is refused, not waited on.
func TestLockRefusesAFIFO(t *testing.T) {
	path := filepath.Join(t.TempDir(), "lock")
	if err := syscall.Mkfifo(path, 0o644); err != nil {
		t.Skip(err)
	}
	if _, err := Lock(path); err == nil {
		t.Fatal("a FIFO was taken as the lock file")
	}
}
