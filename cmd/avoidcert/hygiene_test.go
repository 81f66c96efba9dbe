package main

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// No built binary gets into the repository: .gitignore covers the command
// and test binaries wherever they are built, keeps the command's source
// folder, and no tracked file is an executable (ELF, Mach-O or PE).
func TestNoBinariesTracked(t *testing.T) {
	top, err := exec.Command("git", "rev-parse", "--show-toplevel").Output()
	if err != nil {
		t.Skip("not in a git work tree:", err)
	}
	root := strings.TrimSpace(string(top))
	ignored := func(path string) bool {
		cmd := exec.Command("git", "check-ignore", "-q", "--no-index", path)
		cmd.Dir = root
		return cmd.Run() == nil
	}
	for _, p := range []string{"avoidcert", "cmd/avoidcert/avoidcert", "some/folder/avoidcert", "cmd/avoidcert/avoidcert.test", "avoidcert.exe"} {
		if !ignored(p) {
			t.Errorf(".gitignore does not cover a binary at %s", p)
		}
	}
	for _, p := range []string{"cmd/avoidcert/main.go", "cmd/avoidcert/testdata/script/bound.txtar"} {
		if ignored(p) {
			t.Errorf(".gitignore hides the source file %s", p)
		}
	}
	files, err := exec.Command("git", "-C", root, "ls-files", "-z").Output()
	if err != nil {
		t.Fatal(err)
	}
	magic := [][]byte{{0x7f, 'E', 'L', 'F'}, {0xcf, 0xfa, 0xed, 0xfe}, {0xfe, 0xed, 0xfa, 0xcf}, {'M', 'Z'}}
	for _, f := range strings.Split(strings.TrimRight(string(files), "\x00"), "\x00") {
		head := make([]byte, 4)
		fh, err := os.Open(filepath.Join(root, f))
		if err != nil {
			continue // deleted in the work tree
		}
		n, _ := fh.Read(head)
		fh.Close()
		for _, m := range magic {
			if n >= len(m) && bytes.Equal(head[:len(m)], m) {
				t.Errorf("%s is tracked and is a built binary", f)
			}
		}
	}
}
