package brief

import (
	"strings"
	"testing"
)

func TestQuote(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"", `""`},
		{"1342", `"1342"`},
		{strings.Repeat("a", Most), `"` + strings.Repeat("a", Most) + `"`},
		{strings.Repeat("a", 50<<20), `"` + strings.Repeat("a", Most) + `"... (52428800 bytes)`},
		// a cut never splits a character: 59 bytes of 'a' and then 'é' (2 bytes)
		{strings.Repeat("a", Most-1) + "é" + "b", `"` + strings.Repeat("a", Most-1) + `"... (62 bytes)`},
	} {
		if got := Quote(tc.in); got != tc.want {
			t.Errorf("Quote(%d bytes) = %s, want %s", len(tc.in), got, tc.want)
		}
	}
}

func TestDigits(t *testing.T) {
	short := "74207209"
	if got := Digits(short); got != short {
		t.Errorf("Digits(%s) = %s", short, got)
	}
	long := "1" + strings.Repeat("0", 999999)
	got := Digits(long)
	if want := "100000000000000...000000000000000 (1000000 digits)"; got != want {
		t.Errorf("Digits(10^999999) = %s, want %s", got, want)
	}
	stated := "[0." + strings.Repeat("9", 998) + ", 1]"
	if got, want := Digits(stated), "[0.999999999999...99999999999, 1] (1005 characters)"; got != want {
		t.Errorf("Digits(an interval) = %s, want %s", got, want)
	}
}
