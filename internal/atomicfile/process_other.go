//go:build !unix

package atomicfile

// processGone cannot tell here: every writer is taken to be running, and
// only MaxTempAge removes its temporary files.
func processGone(int) bool { return false }
