//go:build !unix

package input

import "os"

// openNoWait opens path for reading; where there is no O_NONBLOCK the look
// before the open is the only guard.
func openNoWait(path string) (*os.File, error) { return os.Open(path) }
