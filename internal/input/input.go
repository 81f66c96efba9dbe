package input

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"

	"avoidcert/certify"
	"avoidcert/internal/brief"
	"avoidcert/internal/bytesize"
)

// Kind is a kind of input and the most bytes read of one.
type Kind struct {
	Name  string // in messages: "certificate file", "claims manifest", ...
	Limit int64  // bytes
}

// The kinds of input and their limits (README, "Input limits").
var (
	// Certificate is a certificate file: the checker's own limit.
	Certificate = Kind{"certificate file", certify.MaxFileSize}
	// Manifest is a claims manifest (TOML).
	Manifest = Kind{"claims manifest", 2 << 20}
	// Census is a census folder's census.json: a census of length 8
	// counted to n = 40 takes about 30 MiB.
	Census = Kind{"census file", 64 << 20}
	// JournalEntry is one file of a census journal: a finished class's row,
	// or the run's parameters.
	JournalEntry = Kind{"census journal entry", 1 << 20}
	// GateLines is the output of 'avoidcert gate --json'.
	GateLines = Kind{"gate output file", 64 << 20}
	// ReportInput is a file given to 'avoidcert report': a certificate or a
	// gate's JSON lines, told apart after reading (a certificate among them
	// is still held to Certificate's limit by its reader).
	ReportInput = Kind{"certificate or gate output file", GateLines.Limit}
)

// Error is a refused input: the file, and the problem with what to do.
type Error struct {
	Path    string // "standard input" for a stream
	Problem string
	err     error // what it wraps (fs.ErrNotExist for a missing file)
}

func (e *Error) Error() string { return e.Path + " " + e.Problem }

func (e *Error) Unwrap() error { return e.err }

func refuse(path string, wrapped error, format string, args ...any) *Error {
	return &Error{Path: brief.Quote(path), Problem: fmt.Sprintf(format, args...), err: wrapped}
}

// chunk is how much is read between two looks at the context.
const chunk = 1 << 20

// ReadFile reads the regular file at path, of at most k.Limit bytes. Any
// other file is refused at once with an *Error; a cancelled context ends
// the read with ctx.Err().
func ReadFile(ctx context.Context, path string, k Kind) ([]byte, error) {
	return read(ctx, path, os.Stat, openNoWait, k)
}

// ReadIn is ReadFile for name inside root: a name that leads out of the
// root (by "..", an absolute path or a symbolic link) is refused by the
// root itself. Messages name the file as root's name joined with name.
func ReadIn(ctx context.Context, root *os.Root, name string, k Kind) ([]byte, error) {
	open := func(string) (*os.File, error) { return root.OpenFile(name, os.O_RDONLY|nonBlocking, 0) }
	stat := func(string) (fs.FileInfo, error) { return root.Stat(name) }
	return read(ctx, filepath.Join(root.Name(), name), stat, open, k)
}

// read is ReadFile with its way to look at and to open the file.
func read(ctx context.Context, path string, stat func(string) (fs.FileInfo, error), open func(string) (*os.File, error), k Kind) ([]byte, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	// Look before opening: opening a FIFO for reading waits for a writer,
	// and opening a device can have effects of its own.
	info, err := stat(path)
	if err != nil {
		return nil, statError(path, k, err)
	}
	if err := fits(path, k, info); err != nil {
		return nil, err
	}
	f, err := open(path)
	if err != nil {
		return nil, statError(path, k, err)
	}
	defer f.Close()
	// The path may have been replaced between the look and the open.
	if info, err = f.Stat(); err != nil {
		return nil, statError(path, k, err)
	}
	if err := fits(path, k, info); err != nil {
		return nil, err
	}
	data, err := readBounded(ctx, f, k.Limit, int(min(info.Size(), k.Limit)))
	switch {
	case errors.Is(err, errTooLarge):
		return nil, tooLarge(path, k)
	case err != nil && ctx.Err() != nil:
		return nil, ctx.Err()
	case err != nil:
		return nil, refuse(path, err, "cannot be read (%s); check the file and its permissions", reason(err))
	}
	return data, nil
}

// ReadStream reads r (standard input, named name in messages) to its end,
// at most k.Limit bytes. A cancelled context returns ctx.Err() at once,
// even while r blocks (the pending read is abandoned).
func ReadStream(ctx context.Context, r io.Reader, name string, k Kind) ([]byte, error) {
	type result struct {
		data []byte
		err  error
	}
	done := make(chan result, 1)
	go func() {
		data, err := readBounded(ctx, r, k.Limit, 0)
		done <- result{data, err}
	}()
	select {
	case <-ctx.Done():
		return nil, ctx.Err()
	case res := <-done:
		switch {
		case errors.Is(res.err, errTooLarge):
			return nil, &Error{Path: name, Problem: fmt.Sprintf("holds more than %s, the most a %s may have", bytesize.Format(k.Limit), k.Name)}
		case res.err != nil && ctx.Err() != nil:
			return nil, ctx.Err()
		case res.err != nil:
			return nil, &Error{Path: name, Problem: fmt.Sprintf("cannot be read (%s)", reason(res.err)), err: res.err}
		}
		return res.data, nil
	}
}

var errTooLarge = errors.New("over the limit")

// readBounded reads r to its end in chunks, looking at ctx between them;
// more than limit bytes is errTooLarge. size is a hint for the first
// allocation.
func readBounded(ctx context.Context, r io.Reader, limit int64, size int) ([]byte, error) {
	data := make([]byte, 0, size+1)
	for {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		want := min(int64(chunk), limit+1-int64(len(data)))
		if want <= 0 {
			return nil, errTooLarge
		}
		if int64(cap(data)-len(data)) < want {
			grown := make([]byte, len(data), min(int64(2*cap(data))+want, limit+1))
			copy(grown, data)
			data = grown
		}
		n, err := r.Read(data[len(data) : int64(len(data))+want])
		data = data[:len(data)+n]
		switch {
		case int64(len(data)) > limit:
			return nil, errTooLarge
		case err == io.EOF:
			return data, nil
		case err != nil:
			return nil, err
		}
	}
}

// fits refuses anything but a regular file of at most k.Limit bytes.
func fits(path string, k Kind, info fs.FileInfo) error {
	switch {
	case info.IsDir():
		return refuse(path, nil, "is a folder; name a %s", k.Name)
	case !info.Mode().IsRegular():
		return refuse(path, nil, "is a %s, not a regular file, and is never read; name a %s", TypeName(info.Mode()), k.Name)
	case info.Size() > k.Limit:
		return tooLarge(path, k)
	}
	return nil
}

func tooLarge(path string, k Kind) *Error {
	return refuse(path, nil, "is larger than %s, the most a %s may have; it is not read", bytesize.Format(k.Limit), k.Name)
}

func statError(path string, k Kind, err error) *Error {
	if errors.Is(err, fs.ErrNotExist) {
		return refuse(path, fs.ErrNotExist, "does not exist; name a %s", k.Name)
	}
	return refuse(path, err, "cannot be read (%s); check the path and its permissions", reason(err))
}

// reason is the system's own few words for a failure ("permission
// denied"), without the path and the operation that Go puts around them.
func reason(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// TypeName names a file's type for a message: "FIFO (named pipe)",
// "socket", "character device", ...
func TypeName(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "folder"
	case m.IsRegular():
		return "file"
	case m&fs.ModeNamedPipe != 0:
		return "FIFO (named pipe)"
	case m&fs.ModeSocket != 0:
		return "socket"
	case m&fs.ModeCharDevice != 0:
		return "character device"
	case m&fs.ModeDevice != 0:
		return "device"
	case m&fs.ModeSymlink != 0:
		return "symbolic link"
	}
	return "special file"
}

// Series is a data series, read as a stream by a reader that bounds its
// own memory line by line: no limit on the file's size.
var Series = Kind{"series file", 1<<63 - 1}

// Open opens the regular file at path for a reader that streams it and
// bounds its own memory: the same refusals as ReadFile (a folder, FIFO,
// socket or device at once, without waiting on a FIFO; looked at before
// and after opening), nothing read. The caller closes the file.
func Open(path string, k Kind) (*os.File, error) {
	info, err := os.Stat(path)
	if err != nil {
		return nil, statError(path, k, err)
	}
	if err := fits(path, k, info); err != nil {
		return nil, err
	}
	f, err := openNoWait(path)
	if err != nil {
		return nil, statError(path, k, err)
	}
	if info, err = f.Stat(); err == nil {
		err = fits(path, k, info)
	} else {
		err = statError(path, k, err)
	}
	if err != nil {
		f.Close()
		return nil, err
	}
	return f, nil
}
