//go:build unix

package census

import (
	"os"
	"syscall"
)

// lockFolder takes an exclusive lock on path (created if missing), held
// until the returned function is called or the process ends; the kernel
// drops it when a killed process exits, so a stale lock cannot block a
// resumed run.
func lockFolder(path string) (func(), error) {
	f, err := os.OpenFile(path, os.O_CREATE|os.O_RDWR, 0o644)
	if err != nil {
		return nil, err
	}
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
		f.Close()
		return nil, err
	}
	return func() { f.Close() }, nil
}
