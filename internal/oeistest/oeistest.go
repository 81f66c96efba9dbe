// Package oeistest reads the reference tables of testdata/oeis for tests
// of the engine's packages (the checker in certify/ keeps its own reader,
// as it shares no code with the engine).
package oeistest

import (
	"bufio"
	"math/big"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
)

// Table is one reference file: the printed terms of an OEIS entry,
// a(Offset), a(Offset+1), ...
type Table struct {
	ID, Title string
	Offset    int
	Terms     []*big.Int
}

// Read reads testdata/oeis/<id>.txt of the module: "key: value" lines (id,
// title, offset, terms as a comma list); lines starting with # are
// comments. It fails the test on any fault.
func Read(t testing.TB, id string) Table {
	t.Helper()
	_, here, _, ok := runtime.Caller(0)
	if !ok {
		t.Fatal("oeistest: no source path to find testdata/oeis from")
	}
	path := filepath.Join(filepath.Dir(here), "..", "..", "testdata", "oeis", id+".txt")
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	fields := make(map[string]string)
	sc := bufio.NewScanner(f)
	sc.Buffer(nil, 1<<20)
	for line := 1; sc.Scan(); line++ {
		text := strings.TrimSpace(sc.Text())
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		key, value, ok := strings.Cut(text, ":")
		if !ok {
			t.Fatalf("%s:%d: want key: value", path, line)
		}
		fields[strings.TrimSpace(key)] = strings.TrimSpace(value)
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	tab := Table{ID: fields["id"], Title: fields["title"]}
	if tab.ID != id || tab.Title == "" {
		t.Fatalf("%s: id %q and title %q, want id %s and a title", path, tab.ID, tab.Title, id)
	}
	if tab.Offset, err = strconv.Atoi(fields["offset"]); err != nil {
		t.Fatalf("%s: offset: %v", path, err)
	}
	for _, s := range strings.Split(fields["terms"], ",") {
		v, ok := new(big.Int).SetString(strings.TrimSpace(s), 10)
		if !ok {
			t.Fatalf("%s: term %q is not an integer", path, s)
		}
		tab.Terms = append(tab.Terms, v)
	}
	return tab
}
