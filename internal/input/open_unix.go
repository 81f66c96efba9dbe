//go:build unix

package input

import (
	"os"
	"syscall"
)

// openNoWait opens path for reading without waiting: a FIFO that was put
// in place of a regular file after the look opens at once (and is then
// refused) instead of blocking until a writer comes.
func openNoWait(path string) (*os.File, error) {
	return os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
}
