//go:build unix

package filelock

import (
	"errors"
	"fmt"
	"os"
	"syscall"
)

// Lock takes an exclusive lock on path (created if missing) without
// waiting: ErrHeld when another process holds it. The lock file must be a
// regular file (a FIFO or a device put in its place is refused, and never
// waited on). The returned function releases it.
func Lock(path string) (release func(), err error) {
	f, err := os.OpenFile(path, os.O_CREATE|os.O_RDWR|syscall.O_NONBLOCK, 0o644)
	if err != nil {
		return nil, err
	}
	if info, err := f.Stat(); err != nil || !info.Mode().IsRegular() {
		f.Close()
		return nil, fmt.Errorf("the lock file %s is not a regular file; remove it", path)
	}
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
		f.Close()
		if errors.Is(err, syscall.EWOULDBLOCK) {
			return nil, ErrHeld
		}
		return nil, err
	}
	return func() { f.Close() }, nil
}
