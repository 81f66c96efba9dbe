// Package filelock keeps two runs of the tool out of one folder: Lock takes
// an exclusive lock (flock) on a lock file, held until released or until
// the process ends (the kernel drops it then, so a killed run never leaves
// a stale lock behind).
package filelock

import "errors"

// ErrHeld is returned by Lock when another process holds the lock.
var ErrHeld = errors.New("in use by another run")
