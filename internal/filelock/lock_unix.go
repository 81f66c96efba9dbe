//go:build unix

package filelock

import (
	"errors"
	"os"
	"syscall"
)

// Lock takes an exclusive lock on path (created if missing) without
// waiting: ErrHeld when another process holds it. The returned function
// releases it.
func Lock(path string) (release func(), err error) {
	f, err := os.OpenFile(path, os.O_CREATE|os.O_RDWR, 0o644)
	if err != nil {
		return nil, err
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
