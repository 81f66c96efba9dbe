package census

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"avoidcert/internal/input"
)

// folder is a census folder opened so that every path read through it
// stays inside it: relative, without "..", and with no symbolic link
// leading out (os.Root refuses those, without a race between the check
// and the use). Writes go through atomicfile into subfolders that within
// has found inside.
type folder struct {
	dir  string
	root *os.Root
}

func openFolder(dir string) (*folder, error) {
	root, err := os.OpenRoot(dir)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, inputErrorf("%s does not exist; name a census folder", dir)
		}
		return nil, inputErrorf("cannot open the census folder %s (%v)", dir, err)
	}
	return &folder{dir: dir, root: root}, nil
}

func (f *folder) close() { f.root.Close() }

// path is rel as a path on the disk, for messages and the re-check command.
func (f *folder) path(rel string) string { return filepath.Join(f.dir, filepath.FromSlash(rel)) }

// escape says why rel, a slash-separated path from a census file, does
// not name a file inside the folder, or returns "".
func (f *folder) escape(rel string) string {
	local := filepath.FromSlash(rel)
	switch {
	case rel == "":
		return "an empty path"
	case filepath.IsAbs(local) || filepath.VolumeName(local) != "" || rel[0] == '/':
		return fmt.Sprintf("the absolute path %s, outside the census folder", quoteShort(rel))
	case !filepath.IsLocal(local):
		return fmt.Sprintf("the path %s, which leads out of the census folder", quoteShort(rel))
	}
	if f.linksOut(local) {
		return fmt.Sprintf("the path %s, where a symbolic link leads out of the census folder", quoteShort(rel))
	}
	return ""
}

// linksOut reports whether following the links of a local path leaves
// the folder (for the message only: reads go through the root, which
// refuses such a path anyway).
func (f *folder) linksOut(local string) bool {
	top, err := filepath.EvalSymlinks(f.dir)
	if err != nil {
		return false
	}
	target, err := filepath.EvalSymlinks(filepath.Join(f.dir, local))
	if err != nil {
		return false
	}
	rel, err := filepath.Rel(top, target)
	return err != nil || !filepath.IsLocal(rel)
}

// read returns the file rel of the folder, a regular file of at most k's
// size limit (internal/input). A path that leaves the folder is a
// *RefusedError naming it; a missing file wraps fs.ErrNotExist; a FIFO, a
// device or a file over the limit is an *InputError (never waited on, never
// read whole); a cancelled ctx returns ctx.Err().
func (f *folder) read(ctx context.Context, rel string, k input.Kind) ([]byte, error) {
	if why := f.escape(rel); why != "" {
		return nil, refusedf("%s names %s; a census refers only to files inside its folder", f.dir, why)
	}
	data, err := input.ReadIn(ctx, f.root, filepath.FromSlash(rel), k)
	var refused *input.Error
	switch {
	case ctx.Err() != nil:
		return nil, ctx.Err()
	case errors.Is(err, fs.ErrNotExist):
		return nil, fmt.Errorf("%s is missing: %w", f.path(rel), fs.ErrNotExist)
	case errors.As(err, &refused):
		return nil, inputErrorf("%v", err)
	case err != nil:
		return nil, fmt.Errorf("cannot read %s inside the census folder (%v)", f.path(rel), err)
	}
	return data, nil
}

// within refuses a subfolder that is a symbolic link leading out of the
// folder, before anything is written into it.
func (f *folder) within(sub string) error {
	if f.linksOut(sub) {
		return inputErrorf("%s is a symbolic link that leads out of %s; a census writes only inside its folder: remove the link or choose another --out", f.path(sub), f.dir)
	}
	return nil
}

// quoteShort quotes a path from a file, cut to a few dozen characters.
func quoteShort(s string) string {
	if len(s) > 60 {
		s = s[:28] + "..." + s[len(s)-28:]
	}
	return fmt.Sprintf("%q", s)
}
