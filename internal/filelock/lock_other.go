//go:build !unix

package filelock

// Lock does not lock where flock is missing: two runs on one folder must
// be avoided by hand there.
func Lock(string) (func(), error) { return func() {}, nil }
