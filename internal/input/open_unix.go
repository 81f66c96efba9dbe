//go:build unix

package input

import (
	"os"
	"syscall"
)

// nonBlocking makes an open return at once: a FIFO that was put in place
// of a regular file after the look opens (and is then refused) instead of
// blocking until a writer comes.
const nonBlocking = syscall.O_NONBLOCK

// openNoWait opens path for reading without waiting.
func openNoWait(path string) (*os.File, error) {
	return os.OpenFile(path, os.O_RDONLY|nonBlocking, 0)
}
