package atomicfile

import (
	"os"
	"path/filepath"
	"testing"
)

func TestWriteReplacesRegularFilesOnly(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.xml")
	for _, text := range []string{"first", "second"} {
		if err := Write(path, []byte(text)); err != nil {
			t.Fatal(err)
		}
		if got, _ := os.ReadFile(path); string(got) != text {
			t.Fatalf("read %q, wrote %q", got, text)
		}
	}
	if err := Write(dir, []byte("x")); err == nil {
		t.Error("a folder was replaced")
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("temporary files left behind: %v", entries)
	}
}
