//go:build !unix

package input

import "os"

// nonBlocking is no flag here: where there is no O_NONBLOCK the look before
// the open is the only guard.
const nonBlocking = 0

// openNoWait opens path for reading.
func openNoWait(path string) (*os.File, error) { return os.Open(path) }
