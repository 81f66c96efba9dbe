package transfer_test

import (
	"testing"

	"avoidcert/internal/oeistest"
	"avoidcert/internal/settest"
)

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
		tab := oeistest.Read(t, tc.id)
		if tab.Offset != 0 {
			t.Fatalf("OEIS %s: offset %d; the table test assumes a(0) first", tc.id, tab.Offset)
		}
		N := len(tab.Terms) - 1
		got := counts(t, settest.Must(t, tc.set), N)
		for n, want := range tab.Terms {
			if got[n].Cmp(want) != 0 {
				t.Errorf("{%s}: a_%d = %v, OEIS %s has %v", tc.set, n, got[n], tc.id, want)
			}
		}
		t.Logf("{%s}: a_0..a_%d agree with OEIS %s", tc.set, N, tc.id)
	}
}
