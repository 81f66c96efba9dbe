package main

import (
	"cmp"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"

	"avoidcert/internal/atomicfile"
	"avoidcert/internal/brief"
	"avoidcert/internal/input"
)

// The one rule of every flag that names where a command writes, a file
// (outFile: bound --out, report --out, gate --junit) or a folder
// (openOutDir: census --out, census merge --out, gate --certificates and
// --cache, demo --out): the file or folder itself is created when
// missing, but the folder it goes in must exist; no command creates a
// chain of missing folders. Everything is checked before any work.

// outFile is where a command writes a file it produces: a path, standard
// output ("-"), or nowhere (the zero value with skip set).
//
// The policy, checked before the work and again just before the write:
//   - a regular file is replaced atomically (a temp file in the same folder,
//     then a rename), keeping its permission bits;
//   - a missing file is created (mode 0644) in an existing folder;
//   - a symbolic link is written through: its final target is replaced or
//     created under the same rules, and the link itself stays;
//   - a folder, a device, a FIFO, a socket, or a link to one of them is
//     refused, as is a missing folder.
//
// Temp files are named ".NAME.avoidcert-tmp-PID-DIGITS" beside the target.
// A run killed while writing leaves one behind; the next write to the same
// NAME removes it by the rule of atomicfile.RemoveStale (its writer gone
// and a minute old, or a day old), never a live writer's.
type outFile struct {
	path   string // as the user gave it; "-" for standard output
	target string // the file to replace: path with symbolic links followed
	stdout bool
	skip   bool
}

// openOut checks path as a destination before any work is done. The
// error is a usageError that names the problem and what to do.
func openOut(cmd, flag, path string, skip bool) (*outFile, error) {
	switch {
	case skip:
		return &outFile{skip: true}, nil
	case path == "-":
		return &outFile{path: "-", stdout: true}, nil
	}
	o := &outFile{path: path}
	if err := o.resolve(); err != nil {
		return nil, usagef("%s: cannot write to %s: %v; choose another %s", cmd, quote(path), err, flag)
	}
	// A folder we may not write in fails now, not after the work.
	dir, base := filepath.Split(o.target)
	probe, err := os.CreateTemp(cmp.Or(dir, "."), atomicfile.TempPattern(base))
	if err != nil {
		return nil, usagef("%s: cannot write to %s: %v; choose another %s", cmd, quote(path), err, flag)
	}
	probe.Close()
	os.Remove(probe.Name())
	return o, nil
}

// resolve follows symbolic links from o.path and checks what it finds.
func (o *outFile) resolve() error {
	p := o.path
	for hops := 0; ; hops++ {
		if hops > 40 {
			return errors.New("too many levels of symbolic links")
		}
		info, err := os.Lstat(p)
		switch {
		case err != nil:
			// a folder on the way that is missing or a file is named as such
			if perr := parentExists(p); perr != nil {
				return perr
			}
			if !errors.Is(err, fs.ErrNotExist) {
				return errors.New(osReason(err))
			}
			o.target = p
			return nil
		case info.Mode()&fs.ModeSymlink != 0:
			link, err := os.Readlink(p)
			if err != nil {
				return err
			}
			if !filepath.IsAbs(link) {
				link = filepath.Join(filepath.Dir(p), link)
			}
			p = link
		case info.IsDir():
			return errors.New("it is a folder; name a file inside it")
		case !info.Mode().IsRegular():
			return fmt.Errorf("it is a %s, not a regular file, and is never replaced", input.TypeName(info.Mode()))
		default:
			o.target = p
			return nil
		}
	}
}

// parentExists checks that the folder a new file or folder goes in
// exists: commands create the last part of a path, never a chain.
func parentExists(p string) error {
	dir := filepath.Dir(p)
	d, err := os.Stat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return fmt.Errorf("the folder %s does not exist: create it first (a command creates the last part of a path only)", quote(dir))
	case err != nil:
		return fmt.Errorf("the folder %s cannot be reached (%s)", quote(dir), osReason(err))
	case !d.IsDir():
		return fmt.Errorf("%s is not a folder", quote(dir))
	}
	return nil
}

// openOutDir makes sure a folder a command writes into is usable before
// any work: an existing folder (or a link to one) is used, a missing one
// may be made when the folder it goes in exists (now when create is set,
// else by the writer when it has something to write), anything else is
// refused. The error is a usageError naming the flag.
func openOutDir(cmd, flag, dir string, create bool) error {
	info, err := os.Stat(dir)
	switch {
	case err == nil && info.IsDir():
		return nil
	case err == nil:
		return usagef("%s: %s is a %s, not a folder; choose another %s", cmd, quote(dir), input.TypeName(info.Mode()), flag)
	}
	if perr := parentExists(dir); perr != nil {
		return usagef("%s: cannot create the folder %s: %v; or choose another %s", cmd, quote(dir), perr, flag)
	}
	if !errors.Is(err, fs.ErrNotExist) {
		return usagef("%s: cannot use the folder %s (%s); choose another %s", cmd, quote(dir), osReason(err), flag)
	}
	if !create {
		return nil
	}
	if err := os.Mkdir(dir, 0o755); err != nil && !errors.Is(err, fs.ErrExist) {
		return usagef("%s: cannot create the folder %s (%s); choose another %s", cmd, quote(dir), osReason(err), flag)
	}
	return nil
}

// describe says where the file went, for the command's report.
func (o *outFile) describe() string {
	switch {
	case o.skip:
		return "not written (--no-certificate)"
	case o.stdout:
		return "written to standard output"
	case o.target != o.path:
		return fmt.Sprintf("%s (written through the link to %s)", o.path, o.target)
	}
	return o.path
}

// write stores data: to stdout, or atomically at the target, after the
// checks of openOut are repeated (the path may have changed during the
// work). Temp files left by earlier killed runs for the same target are
// removed first.
func (o *outFile) write(stdout io.Writer, data []byte) (err error) {
	switch {
	case o.skip:
		return nil
	case o.stdout:
		_, err := stdout.Write(data)
		return err
	}
	if err := o.resolve(); err != nil {
		return err
	}
	dir, base := filepath.Split(o.target)
	atomicfile.RemoveStaleOf(cmp.Or(dir, "."), base) // best effort: a killed run's leftovers
	mode := fs.FileMode(0o644)
	if info, err := os.Stat(o.target); err == nil {
		mode = info.Mode().Perm()
	}
	return atomicfile.WriteFile(o.target, data, mode)
}

// quote quotes s for a message, cut to a few dozen characters.
func quote(s string) string { return brief.Quote(s) }
