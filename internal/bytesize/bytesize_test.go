package bytesize

import "testing"

func TestFormat(t *testing.T) {
	for _, c := range []struct {
		n    int64
		want string
	}{
		{512, "512 bytes"},
		{2048, "2.0 KiB"},
		{100 << 20, "100.0 MiB"},
		{8 << 30, "8.0 GiB"},
		{3 << 29, "1.5 GiB"},
		{5 << 40, "5.0 TiB"},
		{3 << 49, "1.5 PiB"},
		{1 << 60, "1 EiB or more"},
		{1<<63 - 1, "1 EiB or more"},
	} {
		if got := Format(c.n); got != c.want {
			t.Errorf("Format(%d) = %q, want %q", c.n, got, c.want)
		}
	}
}

func TestParse(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want int64
		ok   bool
	}{
		{"8G", 8 << 30, true}, {"512M", 512 << 20, true}, {"2GiB", 2 << 30, true},
		{"1000000", 1000000, true}, {"1.5K", 1536, true}, {"", 0, false}, {"-1G", 0, false}, {"lots", 0, false},
	} {
		got, err := Parse(tc.in)
		if (err == nil) != tc.ok || got != tc.want {
			t.Errorf("Parse(%q) = %d, %v; want %d (ok %v)", tc.in, got, err, tc.want, tc.ok)
		}
	}
}

// Estimates from Beyond on may come from capped counts: they are said as
// lower bounds.
func TestAbout(t *testing.T) {
	for _, tc := range []struct {
		n    int64
		want string
	}{
		{3 << 30, "about 3.0 GiB"},
		{Beyond - 1, "about 512.0 GiB"},
		{Beyond, "more than 512.0 GiB"},
		{1 << 62, "more than 512.0 GiB"},
	} {
		if got := About(tc.n); got != tc.want {
			t.Errorf("About(%d) = %q, want %q", tc.n, got, tc.want)
		}
	}
}

// A size past the int64 range is refused, not wrapped around.
func TestParseTooLarge(t *testing.T) {
	for _, s := range []string{"99999999999999999999999", "9000000T", "1e300"} {
		if v, err := Parse(s); err == nil {
			t.Errorf("Parse(%q) = %d, want a refusal", s, v)
		}
	}
	if v, err := Parse("8E6T"); err != nil || v != 8e6*(1<<40) { // just below 2^63
		t.Errorf("Parse(8E6T) = %d, %v", v, err)
	}
}

// TestFlag: a value that Parse reads back as at least n, with two
// significant digits.
func TestFlag(t *testing.T) {
	for _, c := range []struct {
		n    int64
		want string
	}{
		{1, "1M"},
		{300 << 20, "300M"},
		{300<<20 + 1, "310M"},
		{99<<20 + 5, "100M"},
		{1 << 30, "1G"},
		{1<<30 + 1, "1.1G"},
		{9<<30 + 1<<29, "9.5G"},
		{12 << 30, "12G"},
		{12<<30 + 1, "13G"},
		{1 << 50, "1048577G"},
	} {
		got := Flag(c.n)
		if got != c.want {
			t.Errorf("Flag(%d) = %q, want %q", c.n, got, c.want)
		}
		if back, err := Parse(got); err != nil || back < c.n {
			t.Errorf("Flag(%d) = %q reads back as %d (%v)", c.n, got, back, err)
		}
	}
}
