// Package atomicfile writes files so that a reader, or a process killed at
// any moment, sees either the old file or the whole new one: the data go
// to a temporary file in the same folder, are flushed to disk, and the
// temporary file is renamed over the target.
//
// Package certify keeps its own writer (it depends on the standard library
// only); everything else writes through this package.
package atomicfile

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// tempSuffix ends the temporary files' names: "." + base name + a random
// part + ".tmp". Stale ones (left by a killed process) match IsTemp.
const tempSuffix = ".tmp"

// WriteFile writes data to path atomically with permissions perm. It
// refuses to replace anything that is not a regular file (a folder, a
// device, a FIFO, a socket). On any error path is left as it was.
func WriteFile(path string, data []byte, perm fs.FileMode) (err error) {
	if info, err := os.Lstat(path); err == nil && !info.Mode().IsRegular() {
		return fmt.Errorf("%s exists and is not a regular file (%s); it is left alone: choose another path", path, info.Mode().Type())
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*"+tempSuffix)
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if _, err = tmp.Write(data); err != nil {
		return err
	}
	if err = tmp.Chmod(perm); err != nil {
		return err
	}
	if err = tmp.Sync(); err != nil {
		return err
	}
	if err = tmp.Close(); err != nil {
		return err
	}
	if err = os.Rename(tmp.Name(), path); err != nil {
		return err
	}
	if dir, derr := os.Open(filepath.Dir(path)); derr == nil {
		dir.Sync() // make the rename durable where the platform allows
		dir.Close()
	}
	return nil
}

// IsTemp reports whether a file name is one of WriteFile's temporary
// names.
func IsTemp(name string) bool {
	return strings.HasPrefix(name, ".") && strings.HasSuffix(name, tempSuffix)
}

// RemoveStale removes the temporary files that a killed writer left in
// dir. Call it only when no other process writes to dir.
func RemoveStale(dir string) error {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return err
	}
	for _, e := range entries {
		if e.Type().IsRegular() && IsTemp(e.Name()) {
			if err := os.Remove(filepath.Join(dir, e.Name())); err != nil {
				return err
			}
		}
	}
	return nil
}
