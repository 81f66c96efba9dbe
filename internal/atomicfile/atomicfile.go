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
	"time"
)

// tempInfix marks the temporary files: "." + base name + tempInfix + random
// digits. Stale ones (left by a killed process) match IsTemp.
const tempInfix = ".avoidcert-tmp-"

// TempPattern is the os.CreateTemp pattern of the temporary files for
// base; a caller probing whether it may write in a folder uses it too, so
// that a probe left behind is cleaned like any other.
func TempPattern(base string) string { return "." + base + tempInfix + "*" }

// WriteFile writes data to path atomically with permissions perm. It
// refuses to replace anything that is not a regular file (a folder, a
// device, a FIFO, a socket). On any error path is left as it was.
func WriteFile(path string, data []byte, perm fs.FileMode) (err error) {
	if info, err := os.Lstat(path); err == nil && !info.Mode().IsRegular() {
		return fmt.Errorf("%s exists and is not a regular file (%s); it is left alone: choose another path", path, info.Mode().Type())
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), TempPattern(filepath.Base(path)))
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
// names: ".BASE.avoidcert-tmp-DIGITS".
func IsTemp(name string) bool {
	rest, ok := strings.CutPrefix(name, ".")
	if !ok {
		return false
	}
	i := strings.LastIndex(rest, tempInfix)
	if i <= 0 {
		return false
	}
	digits := rest[i+len(tempInfix):]
	return digits != "" && strings.Trim(digits, "0123456789") == ""
}

// RemoveStale removes the temporary files that a killed writer left in
// dir. Call it only when no other process writes to dir.
func RemoveStale(dir string) error {
	return removeTemps(dir, "", time.Time{})
}

// RemoveStaleOf removes the temporary files of base in dir last modified
// before the given time (a writer that started earlier and was killed),
// leaving those of writers that may still be running.
func RemoveStaleOf(dir, base string, before time.Time) error {
	return removeTemps(dir, base, before)
}

// removeTemps removes the regular temporary files in dir, of base only when
// base is not empty, and older than before when before is not zero.
func removeTemps(dir, base string, before time.Time) error {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return err
	}
	for _, e := range entries {
		name := e.Name()
		if !e.Type().IsRegular() || !IsTemp(name) || (base != "" && !strings.HasPrefix(name, "."+base+tempInfix)) {
			continue
		}
		if !before.IsZero() {
			if info, err := e.Info(); err != nil || !info.ModTime().Before(before) {
				continue
			}
		}
		if err := os.Remove(filepath.Join(dir, name)); err != nil {
			return err
		}
	}
	return nil
}
