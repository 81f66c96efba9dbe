// Package atomicfile writes files so that a reader, or a process killed at
// any moment, sees either the old file or the whole new one: the data go
// to a temporary file in the same folder, are flushed to disk, and the
// temporary file is renamed over the target.
//
// A temporary file is named ".NAME.avoidcert-tmp-PID-DIGITS": PID is the
// writer's process id, so that a later run can tell a live writer's file
// from one a killed run left behind (RemoveStale). The rule, in the
// README: a temporary file is removed only when the process that made it
// is no longer running on this machine and the file has not changed for
// StaleAfter, or, whatever its process id says (ids are reused, and a
// writer on another machine sharing the folder has an id that means
// nothing here), when it is older than MaxTempAge.
//
// Package certify keeps its own writer (it depends on the standard library
// only); everything else writes through this package.
package atomicfile

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"
)

// tempInfix marks the temporary files: "." + base name + tempInfix + PID +
// "-" + random digits (earlier versions wrote no PID).
const tempInfix = ".avoidcert-tmp-"

// The ages of RemoveStale's rule.
const (
	// StaleAfter is how long a temporary file of a process that is gone
	// is kept: a minute, far longer than any write takes, so that a
	// writer on another machine (whose id names no process here) is not
	// disturbed while it writes.
	StaleAfter = time.Minute
	// MaxTempAge is the age after which any temporary file is removed.
	MaxTempAge = 24 * time.Hour
)

// TempPattern is the os.CreateTemp pattern of this process's temporary
// files for base; a caller probing whether it may write in a folder uses
// it too, so that a probe left behind is cleaned like any other.
func TempPattern(base string) string {
	return "." + base + tempInfix + strconv.Itoa(os.Getpid()) + "-*"
}

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
// names: ".BASE.avoidcert-tmp-PID-DIGITS", or ".BASE.avoidcert-tmp-DIGITS"
// from earlier versions.
func IsTemp(name string) bool {
	_, _, ok := parseTemp(name)
	return ok
}

// parseTemp splits a temporary name into the base it is for and the
// writer's process id (0 when the name has none).
func parseTemp(name string) (base string, pid int, ok bool) {
	rest, ok := strings.CutPrefix(name, ".")
	if !ok {
		return "", 0, false
	}
	i := strings.LastIndex(rest, tempInfix)
	if i <= 0 {
		return "", 0, false
	}
	base, tail := rest[:i], rest[i+len(tempInfix):]
	owner, random, hasPID := strings.Cut(tail, "-")
	if !hasPID {
		owner, random = "", tail
	}
	if !allDigits(random) || hasPID && !allDigits(owner) {
		return "", 0, false
	}
	if hasPID {
		pid, _ = strconv.Atoi(owner) // over int: no such process, pid stays 0 (unknown)
	}
	return base, pid, true
}

func allDigits(s string) bool { return s != "" && strings.Trim(s, "0123456789") == "" }

// RemoveStale removes the temporary files in dir that RemoveStale's rule
// (package doc) finds abandoned. It never removes a file that a running
// writer on this machine may still rename, nor one changed in the last
// StaleAfter.
func RemoveStale(dir string) error {
	return removeTemps(dir, "", time.Now())
}

// RemoveStaleOf is RemoveStale for the temporary files of base only.
func RemoveStaleOf(dir, base string) error {
	return removeTemps(dir, base, time.Now())
}

// removeTemps applies the rule at time now to the regular temporary files
// in dir, of base only when base is not empty.
func removeTemps(dir, base string, now time.Time) error {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return err
	}
	for _, e := range entries {
		name := e.Name()
		of, pid, ok := parseTemp(name)
		if !ok || !e.Type().IsRegular() || (base != "" && of != base) {
			continue
		}
		info, err := e.Info()
		if err != nil || !abandoned(pid, now.Sub(info.ModTime())) {
			continue
		}
		if err := os.Remove(filepath.Join(dir, name)); err != nil && !os.IsNotExist(err) {
			return err
		}
	}
	return nil
}

// abandoned is the rule: a temporary file of age age written by process
// pid (0: unknown) is removed when that process is gone and the file has
// rested for StaleAfter, or when it is older than MaxTempAge.
func abandoned(pid int, age time.Duration) bool {
	switch {
	case age > MaxTempAge:
		return true
	case pid == os.Getpid() || pid <= 0 || age < StaleAfter:
		return false
	}
	return processGone(pid)
}
