package certify_test

import (
	"context"
	"os"
	"slices"
	"strings"
	"testing"

	"avoidcert/certify"
)

// Summarize states the golden certificate of 123 in the checker's own
// decimals: the lambda ends as in the file, mu_lo = 21/26 rounded down and
// mu_hi = 41/49 rounded up at its 12 digits, a_8 = 13358 (OEIS A049774).
func TestSummarizeGolden(t *testing.T) {
	f, err := os.Open(goldenPath)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	c, err := certify.Read(f)
	if err != nil {
		t.Fatal(err)
	}
	if err := certify.Check(context.Background(), c, certify.CheckOptions{Expect: []string{"123"}}); err != nil {
		t.Fatal(err)
	}
	v := certify.Summarize(c)
	want := []string{
		"the set 123 (window length 3)",
		"lambda   in [0.807692307692, 0.836734693878]",
		"1/lambda in [1.19512195121, 1.2380952381]",
		"class primitive, exponent 4",
		"bracket of G_8 against G_9, step 1, on the whole system",
		"for every n >= 8: A*0.807692307692^(n-8) <= a_n/n! <= A*0.836734693878^(n-8), A = a_8/8!, a_8 = 13358",
	}
	if got := v.Lines(); !slices.Equal(got, want) {
		t.Errorf("lines\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	if v.Period != 1 || v.Exponent != 4 || !slices.Equal(v.N, []int{8}) || v.AllN.AN0 != "13358" {
		t.Errorf("summary %+v", v)
	}
}

// A certificate without a structure section and with restricted brackets
// says so; an infinite end is shown as inf.
func TestSummarizeWords(t *testing.T) {
	c := cert123(t)
	c.Structure = nil
	c.Statement.Radius.HiDecimal = ""
	c.Evidence.Brackets = append(c.Evidence.Brackets, certify.Bracket{States: []int{1}, Start: certify.StartOnes, Step: 2, N: 7})
	lines := certify.Summarize(c).Lines()
	for _, want := range []string{"no structure section: the class is not certified", "bracket of G_7 against G_9, step 2, on 1 of the 3 prefix states (start ones)"} {
		if !slices.Contains(lines, want) {
			t.Errorf("no line %q in %q", want, lines)
		}
	}
	if !strings.HasSuffix(lines[2], ", inf]") {
		t.Errorf("radius line %q, want an infinite upper end", lines[2])
	}
}

// The checker's splitting and parsing of typed arguments: comma lists,
// spaces around tokens, dots; a token it cannot read is named.
func TestParsePatterns(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want []string
		err  string
	}{
		{[]string{"123,321"}, []string{"123", "321"}, ""},
		{[]string{"321", " 123 ", "1.2.3"}, []string{"123", "321"}, ""},
		{[]string{"12,1342"}, []string{"12"}, ""}, // 1342 contains 12
		{[]string{"123,"}, nil, "empty"},
		{[]string{"123,3211"}, nil, `"3211"`},
		{[]string{"1a3"}, nil, `"1a3"`},
	} {
		got, err := certify.ParsePatterns(tc.args)
		if tc.err != "" {
			if err == nil || !strings.Contains(err.Error(), tc.err) {
				t.Errorf("%q: %v, %v; want an error naming %s", tc.args, got, err, tc.err)
			}
			continue
		}
		if err != nil || !slices.Equal(got, tc.want) {
			t.Errorf("%q: %v, %v; want %v", tc.args, got, err, tc.want)
		}
	}
	if got := certify.PatternTokens([]string{"123, 321", "1.3.2"}); !slices.Equal(got, []string{"123", "321", "1.3.2"}) {
		t.Errorf("PatternTokens: %q", got)
	}
}

// Counts reads comma lists as a user types them: {123, 321} counts the
// alternating permutations, 2 E_n for n >= 2 (OEIS A001250).
func TestCountsOfACommaList(t *testing.T) {
	got, err := certify.Counts(context.Background(), []string{"123,321"}, 7)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"1", "1", "2", "4", "10", "32", "122", "544"} // OEIS A001250 (a_0 = 1: the empty permutation)
	for n, a := range got {
		if a.String() != want[n] {
			t.Errorf("a_%d = %s, want %s", n, a, want[n])
		}
	}
}
