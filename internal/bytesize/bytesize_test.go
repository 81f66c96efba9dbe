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
	} {
		if got := Format(c.n); got != c.want {
			t.Errorf("Format(%d) = %q, want %q", c.n, got, c.want)
		}
	}
}
