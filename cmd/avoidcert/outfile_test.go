package main

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestOpenOutRefusesDevices checks the device case on the real null device
// without ever writing to it: openOut only inspects.
func TestOpenOutRefusesDevices(t *testing.T) {
	if _, err := os.Stat(os.DevNull); err != nil {
		t.Skip("no null device")
	}
	_, err := openOut("bound", "--out", os.DevNull, false)
	var ue usageError
	if !errors.As(err, &ue) || !strings.Contains(err.Error(), "device") {
		t.Fatalf("openOut(%s) = %v, want a refusal naming a device", os.DevNull, err)
	}
	link := filepath.Join(t.TempDir(), "null.link")
	if err := os.Symlink(os.DevNull, link); err != nil {
		t.Skip("no symbolic links:", err)
	}
	if _, err := openOut("bound", "--out", link, false); err == nil || !strings.Contains(err.Error(), "device") {
		t.Fatalf("openOut(link to %s) = %v, want a refusal naming a device", os.DevNull, err)
	}
}

// TestOpenOutLinkLoop: a cycle of links is refused, not followed forever.
func TestOpenOutLinkLoop(t *testing.T) {
	dir := t.TempDir()
	a, b := filepath.Join(dir, "a"), filepath.Join(dir, "b")
	if os.Symlink(b, a) != nil || os.Symlink(a, b) != nil {
		t.Skip("no symbolic links")
	}
	if _, err := openOut("bound", "--out", a, false); err == nil || !strings.Contains(err.Error(), "too many levels") {
		t.Fatalf("openOut(loop) = %v, want a refusal", err)
	}
}
