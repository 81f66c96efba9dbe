package input

import (
	"context"
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

var small = Kind{Name: "test file", Limit: 10}

func TestReadFileRegular(t *testing.T) {
	dir := t.TempDir()
	for _, text := range []string{"", "0123456789"} {
		path := filepath.Join(dir, "f")
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		got, err := ReadFile(context.Background(), path, small)
		if err != nil || string(got) != text {
			t.Fatalf("ReadFile of %q = %q, %v", text, got, err)
		}
	}
}

// Every refusal is an *Error with a one-line message that names the file;
// nothing is read from a file that is not regular.
func TestReadFileRefuses(t *testing.T) {
	dir := t.TempDir()
	big := filepath.Join(dir, "big")
	if err := os.WriteFile(big, []byte("01234567890"), 0o644); err != nil {
		t.Fatal(err)
	}
	fifo := filepath.Join(dir, "pipe")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	zeroLink := filepath.Join(dir, "zero-link")
	if err := os.Symlink("/dev/zero", zeroLink); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct{ path, want string }{
		{big, "is larger than 10 bytes, the most a test file may have"},
		{fifo, "is a FIFO (named pipe), not a regular file"},
		{"/dev/zero", "is a character device, not a regular file"},
		{zeroLink, "is a character device, not a regular file"},
		{dir, "is a folder; name a test file"},
		{filepath.Join(dir, "missing"), "does not exist"},
	} {
		start := time.Now()
		_, err := ReadFile(context.Background(), tc.path, small)
		var ie *Error
		if !errors.As(err, &ie) || !strings.Contains(err.Error(), tc.want) || strings.Contains(err.Error(), "\n") {
			t.Errorf("%s: %v, want an *Error saying %q", tc.path, err, tc.want)
		}
		if d := time.Since(start); d > 5*time.Second {
			t.Errorf("%s: refused only after %v", tc.path, d)
		}
	}
	_, err := ReadFile(context.Background(), filepath.Join(dir, "missing"), small)
	if !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("a missing file's error %v does not match fs.ErrNotExist", err)
	}
}

// ReadIn reads inside a root with the same refusals, and a name that
// leads out of the root is refused by the root.
func TestReadIn(t *testing.T) {
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "f"), []byte("inside"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := syscall.Mkfifo(filepath.Join(dir, "pipe"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink("/dev/zero", filepath.Join(dir, "zero")); err != nil {
		t.Fatal(err)
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		t.Fatal(err)
	}
	defer root.Close()
	got, err := ReadIn(context.Background(), root, "f", small)
	if err != nil || string(got) != "inside" {
		t.Fatalf("ReadIn = %q, %v", got, err)
	}
	for name, want := range map[string]string{
		"pipe":    "pipe\" is a FIFO",
		"zero":    "cannot be read", // a link out of the root
		"../x":    "cannot be read",
		"missing": "does not exist",
	} {
		_, err := ReadIn(context.Background(), root, name, small)
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("ReadIn(%s): %v, want %q", name, err, want)
		}
	}
}

func TestReadFileCancelled(t *testing.T) {
	path := filepath.Join(t.TempDir(), "f")
	if err := os.WriteFile(path, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := ReadFile(ctx, path, small); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled read: %v, want context.Canceled", err)
	}
}

// A file larger than one chunk is read whole (the chunked loop grows the
// buffer right) and one byte over the limit is refused.
func TestReadFileChunks(t *testing.T) {
	path := filepath.Join(t.TempDir(), "f")
	data := []byte(strings.Repeat("0123456789", chunk/4))
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	exact := Kind{Name: "test file", Limit: int64(len(data))}
	got, err := ReadFile(context.Background(), path, exact)
	if err != nil || string(got) != string(data) {
		t.Fatalf("read %d bytes, %v; want %d", len(got), err, len(data))
	}
	exact.Limit--
	if _, err := ReadFile(context.Background(), path, exact); err == nil {
		t.Fatal("a file one byte over the limit was read")
	}
}

func TestReadStream(t *testing.T) {
	got, err := ReadStream(context.Background(), strings.NewReader("0123456789"), "standard input", small)
	if err != nil || string(got) != "0123456789" {
		t.Fatalf("ReadStream = %q, %v", got, err)
	}
	zero, err := os.Open("/dev/zero")
	if err != nil {
		t.Skip(err)
	}
	defer zero.Close()
	_, err = ReadStream(context.Background(), zero, "standard input", small)
	if err == nil || !strings.Contains(err.Error(), "standard input holds more than 10 bytes") {
		t.Fatalf("/dev/zero as a stream: %v", err)
	}
}

// A stream that never delivers (a pipe nobody writes to) is left as soon as
// the context is cancelled.
func TestReadStreamCancelled(t *testing.T) {
	r, w := io.Pipe()
	defer w.Close()
	ctx, cancel := context.WithCancel(context.Background())
	time.AfterFunc(50*time.Millisecond, cancel)
	done := make(chan error, 1)
	go func() {
		_, err := ReadStream(ctx, r, "standard input", small)
		done <- err
	}()
	select {
	case err := <-done:
		if !errors.Is(err, context.Canceled) {
			t.Fatalf("ReadStream: %v, want context.Canceled", err)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("ReadStream did not return after the cancel")
	}
}
