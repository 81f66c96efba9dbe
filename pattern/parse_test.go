package pattern_test

import (
	"errors"
	"strconv"
	"strings"
	"testing"

	"avoidcert/pattern"
)

func TestParseAccepts(t *testing.T) {
	tests := []struct{ token, want string }{
		{"132", "132"},
		{"1342", "1342"},
		{"1.3.4.2", "1342"},
		{" 2413\t", "2413"},
		{"1", "1"},
		{"12", "12"},
		{"21", "21"},
		{"1234567", "1234567"},
		{"7.6.5.4.3.2.1", "7654321"},
		{"12345678", "12345678"},
		{"123456789", "123456789"},
		{"9.8.7.6.5.4.3.2.1", "987654321"},
	}
	for _, tc := range tests {
		p, err := pattern.Parse(tc.token)
		if err != nil {
			t.Errorf("Parse(%q): %v", tc.token, err)
			continue
		}
		if p.String() != tc.want {
			t.Errorf("Parse(%q) = %v, want %s", tc.token, p, tc.want)
		}
	}
}

func TestParseRejects(t *testing.T) {
	tests := []struct {
		token string
		want  []string // substrings the message must contain
	}{
		{"", []string{"empty pattern"}},
		{"   ", []string{"empty pattern"}},
		{"1234567891", []string{"length 10", "limit of 9", "length 1 to 9"}},
		{"1.2.3.4.5.6.7.8.9.10", []string{"length 10", "limit of 9"}},
		{"1223", []string{"value 2 repeats", "positions 2 and 3"}},
		{"3.1.3.2", []string{"value 3 repeats"}},
		{"124", []string{"entry 4", "1..3", "missing: 3"}},
		{"0", []string{"entry 0", "out of range"}},
		{"12a", []string{"'a'", "not a digit"}},
		{"-12", []string{"'-'", "not a digit"}},
		{"1,2", []string{"','", "not a digit"}},
		{"1 2", []string{"' '", "not a digit"}},
		{"1..2", []string{"empty entry"}},
		{"1.2.", []string{"empty entry"}},
		{"1000.1", []string{"entry 1000", "out of range"}},
		{"1.99999999999999999999", []string{"too large"}},
		{"99999999999999999999999.1", []string{"too large"}},
	}
	for _, tc := range tests {
		p, err := pattern.Parse(tc.token)
		if err == nil {
			t.Errorf("Parse(%q) = %v, want an error", tc.token, p)
			continue
		}
		var pe *pattern.ParseError
		if !errors.As(err, &pe) || pe.Token != tc.token {
			t.Errorf("Parse(%q): error %v is not a ParseError naming the token", tc.token, err)
			continue
		}
		msg := err.Error()
		if !strings.Contains(msg, strconv.Quote(tc.token)) {
			t.Errorf("Parse(%q): message %q does not quote the token", tc.token, msg)
		}
		for _, w := range tc.want {
			if !strings.Contains(msg, w) {
				t.Errorf("Parse(%q): message %q does not say %q", tc.token, msg, w)
			}
		}
	}
}

func TestParseSet(t *testing.T) {
	s, err := pattern.ParseSet([]string{"1234,123", " 321", "123", "21543"})
	if err != nil {
		t.Fatal(err)
	}
	if got := s.String(); got != "123,321" {
		t.Errorf("set = %s, want 123,321", got)
	}
	if got := strings.Join(s.Given(), " "); got != "1234 123 321 123 21543" {
		t.Errorf("Given() = %s, want the tokens as written (trimmed)", got)
	}
	var dropped []string
	for _, d := range s.Dropped() {
		why := "duplicate"
		if d.Inside != nil {
			why = "contains " + d.Inside.String()
		}
		dropped = append(dropped, d.Pattern.String()+": "+why)
	}
	// 1234 contains 123; 21543 contains 321 (entries 5,4,3); 123 repeats
	want := "123: duplicate; 1234: contains 123; 21543: contains 321"
	if got := strings.Join(dropped, "; "); got != want {
		t.Errorf("Dropped() = %s, want %s", got, want)
	}

	bad := []struct {
		args []string
		want string
	}{
		{nil, "no pattern given"},
		{[]string{}, "no pattern given"},
		{[]string{"123,,321"}, `pattern "": empty pattern`},
		{[]string{"123", "13"}, `pattern "13"`},
		{[]string{"123,4x"}, `pattern "4x"`},
	}
	for _, tc := range bad {
		if _, err := pattern.ParseSet(tc.args); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("ParseSet(%q): error %v, want one containing %q", tc.args, err, tc.want)
		}
	}
}

// FuzzParse checks that Parse never panics, that every rejection is a
// ParseError naming the token with a reason, and that every accepted token
// is a valid permutation whose String parses back to it. ParseSet gets the
// same input as one argument.
func FuzzParse(f *testing.F) {
	for _, s := range []string{"132", "1.3.4.2", "", "12345678", "1223", "124", "12a", "1..2", "1000.1", "123,321", " 1 ", "١٢"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, token string) {
		p, err := pattern.Parse(token)
		if err != nil {
			var pe *pattern.ParseError
			if !errors.As(err, &pe) || pe.Token != token || pe.Reason == "" {
				t.Fatalf("Parse(%q): rejection %#v is not a ParseError with the token and a reason", token, err)
			}
			if !strings.Contains(err.Error(), strconv.Quote(token)) {
				t.Fatalf("Parse(%q): message %q does not name the token", token, err)
			}
		} else {
			if len(p) < 1 || len(p) > pattern.MaxLength {
				t.Fatalf("Parse(%q) = %v: length outside 1..%d", token, p, pattern.MaxLength)
			}
			seen := make([]bool, len(p)+1)
			for _, v := range p {
				if v < 1 || v > len(p) || seen[v] {
					t.Fatalf("Parse(%q) = %v is not a permutation", token, p)
				}
				seen[v] = true
			}
			back, err := pattern.Parse(p.String())
			if err != nil || !back.Equal(p) {
				t.Fatalf("Parse(%q) = %v, but Parse(%q) = %v, %v", token, p, p.String(), back, err)
			}
		}

		s, err := pattern.ParseSet([]string{token})
		if err != nil {
			var pe *pattern.ParseError
			if !errors.As(err, &pe) || pe.Reason == "" || !strings.Contains(token, pe.Token) {
				t.Fatalf("ParseSet(%q): rejection %v does not name a token of the argument", token, err)
			}
			return
		}
		if len(s.Patterns()) == 0 || s.Window() < 1 || s.Window() > pattern.MaxLength {
			t.Fatalf("ParseSet(%q) = %v: not a valid set", token, s)
		}
	})
}
