//go:build unix

package atomicfile

import (
	"errors"
	"syscall"
)

// processGone reports whether no process with this id runs on this
// machine (signal 0 tests for one without sending anything; a process of
// another user answers EPERM, and is running).
func processGone(pid int) bool {
	return errors.Is(syscall.Kill(pid, 0), syscall.ESRCH)
}
