package transfer_test

import (
	"avoidcert/internal/settest"
	"bufio"
	"math/big"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// oeisTable is one reference file of ../testdata/oeis: the printed terms of
// an OEIS entry, a(offset), a(offset+1), ...
type oeisTable struct {
	id, title string
	offset    int
	terms     []*big.Int
}

// readOEIS reads ../testdata/oeis/<id>.txt: "key: value" lines (id, title,
// offset, terms as a comma list); lines starting with # are comments.
func readOEIS(t *testing.T, id string) oeisTable {
	t.Helper()
	path := filepath.Join("..", "testdata", "oeis", id+".txt")
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
	tab := oeisTable{id: fields["id"], title: fields["title"]}
	if tab.id != id || tab.title == "" {
		t.Fatalf("%s: id %q and title %q, want id %s and a title", path, tab.id, tab.title, id)
	}
	if tab.offset, err = strconv.Atoi(fields["offset"]); err != nil {
		t.Fatalf("%s: offset: %v", path, err)
	}
	for _, s := range strings.Split(fields["terms"], ",") {
		v, ok := new(big.Int).SetString(strings.TrimSpace(s), 10)
		if !ok {
			t.Fatalf("%s: term %q is not an integer", path, s)
		}
		tab.terms = append(tab.terms, v)
	}
	return tab
}

// Published counts, every term the entry prints (n = 0..20 to 0..24; the
// entries print no fewer than 21 terms).
var oeisCounts = []struct {
	id, set string
}{
	{"A049774", "123"},
	{"A111004", "132"},
	{"A117158", "1234"},
	{"A117226", "1243"},
	{"A117156", "1342"}, // prints a(0..20) only
	{"A113228", "1324"},
	{"A201692", "1423"},
	{"A113229", "2143"}, // the title names 3412, the reverse of 2143; %C names both
	{"A113229", "3412"},
	{"A201693", "2413"},
	{"A177523", "12345"},
	{"A202213", "12354"}, // the title names 45321, the reverse of 12354; %C names both
	{"A202213", "45321"},
	{"A177533", "123456"},
	{"A001250", "123,321"}, // alternating permutations (Andre); a(0..24)
}

func TestCountsMatchOEIS(t *testing.T) {
	for _, tc := range oeisCounts {
		tab := readOEIS(t, tc.id)
		if tab.offset != 0 {
			t.Fatalf("OEIS %s: offset %d; the table test assumes a(0) first", tc.id, tab.offset)
		}
		N := len(tab.terms) - 1
		got := counts(t, settest.Must(t, tc.set), N)
		for n, want := range tab.terms {
			if got[n].Cmp(want) != 0 {
				t.Errorf("{%s}: a_%d = %v, OEIS %s has %v", tc.set, n, got[n], tc.id, want)
			}
		}
		t.Logf("{%s}: a_0..a_%d agree with OEIS %s", tc.set, N, tc.id)
	}
}
