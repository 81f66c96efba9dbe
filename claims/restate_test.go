package claims

import "testing"

// Every kind of claim restates itself in one line, as the manifest states
// it. The values are those of docs/claims.md's examples (sources there).
func TestStatement(t *testing.T) {
	const manifest = `[[claim]]
id = "c1"
kind = "count"
patterns = ["123"]
n = 12
count = "74207209"
[[claim]]
id = "c2"
kind = "count"
patterns = ["12345"]
from = 5
counts = ["119", "709", "4928", "39144", "349776", "3472811"]
[[claim]]
id = "g1"
kind = "growth"
patterns = ["1342"]
value = "0.954612"
[[claim]]
id = "g2"
kind = "growth"
patterns = ["123", "321"]
of = "radius"
interval = ["1.57079", "1.5708"]
[[claim]]
id = "g3"
kind = "growth"
patterns = ["1342"]
value = "0.9546"
reading = "truncated"
[[claim]]
id = "f1"
kind = "form"
patterns = ["123", "321"]
form = "periodic"
period = 2
[[claim]]
id = "f2"
kind = "form"
patterns = ["1342"]
form = "primitive"
[[claim]]
id = "o"
kind = "order"
patterns = ["1342"]
less_than = ["1324"]
[[claim]]
id = "e"
kind = "equal-counts"
patterns = ["1342"]
other = ["1432"]
to = 12
[[claim]]
id = "p1"
kind = "probability"
patterns = ["123"]
n = 4
exact = "17/24"
[[claim]]
id = "p2"
kind = "probability"
patterns = ["123"]
n = 10
value = "0.2265"
`
	m, err := Parse("m.toml", []byte(manifest))
	if err != nil {
		t.Fatal(err)
	}
	want := map[string][2]string{
		"c1": {"count", "a_12(123) = 74207209"},
		"c2": {"count", "a_5..a_10(12345) = 119, 709, 4928, ... (6 counts)"},
		"g1": {"lambda", "lambda(1342) = 0.954612 (rounded)"},
		"g2": {"radius", "radius(123,321) in [1.57079, 1.5708]"},
		"g3": {"lambda", "lambda(1342) = 0.9546 (truncated)"},
		"f1": {"form", "123,321 is periodic with period 2"},
		"f2": {"form", "1342 is primitive"},
		"o":  {"lambda", "lambda(1342) < lambda(1324)"},
		"e":  {"count", "a_n(1342) = a_n(1432) for every n <= 12"},
		"p1": {"probability", "a_4(123)/4! = 17/24"},
		"p2": {"probability", "a_10(123)/10! = 0.2265 (rounded)"},
	}
	for _, c := range m.Claims {
		if got := [2]string{c.Quantity(), c.Statement()}; got != want[c.ID] {
			t.Errorf("claim %s: %q, want %q", c.ID, got, want[c.ID])
		}
	}
	// the claimed interval of a decimal, exactly
	if lo, hi, _ := m.Claims[2].claimedEnds(); lo != "0.9546115" || hi != "0.9546125" {
		t.Errorf("0.954612 read as [%s, %s]", lo, hi)
	}
	if lo, hi, _ := m.Claims[4].claimedEnds(); lo != "0.9546" || hi != "0.9547" {
		t.Errorf("0.9546 truncated read as [%s, %s]", lo, hi)
	}
}
