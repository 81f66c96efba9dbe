package report

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The series runs in testdata were made by 'avoidcert series --json' on a
// 7-value TSV column (the patterns 123,321 and 132; all of length 3).
func loadSeries(t *testing.T, names ...string) []*Series {
	t.Helper()
	var out []*Series
	for _, n := range names {
		data, err := os.ReadFile(filepath.Join("testdata", n))
		if err != nil {
			t.Fatal(err)
		}
		if !IsSeriesJSON(data) {
			t.Fatalf("%s is not recognised as a series run", n)
		}
		s, err := FromSeries(context.Background(), n, data)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, s)
	}
	return out
}

func TestSeriesGolden(t *testing.T) {
	doc := &Document{Series: loadSeries(t, "series-levels.json", "series-levels-3.json")}
	// the avoidance probability of 123,321 in 7 values is derived again:
	// 544/5040 (alternating permutations, 2 E_7, OEIS A000111)
	if got := doc.Series[0].Avoidance[0]; !strings.HasPrefix(got, "[0.107936, 0.107937], exact") {
		t.Errorf("avoidance derived as %q", got)
	}
	checkGolden(t, doc, "series")
}

// A run whose recorded mean or variance is not that of its patterns is
// refused; so is anything else that is not a series run.
func TestSeriesRefused(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("testdata", "series-levels.json"))
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct{ old, new, want string }{
		{`"mean":"5/6"`, `"mean":"6/7"`, "edited, or from another version"},
		{`"values":7`, `"values":8`, "edited, or from another version"},
		{`"version":2`, `"version":1`, "version 1"},
		{`"version":2`, `"version":3`, "version 3"},
		{`"delay":1`, `"delay":1,"extra":true`, "not the JSON of"},
	} {
		bad := strings.Replace(string(data), tc.old, tc.new, 1)
		if _, err := FromSeries(context.Background(), "bad.json", []byte(bad)); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s -> %s: %v, want %q", tc.old, tc.new, err, tc.want)
		}
	}
	if IsSeriesJSON([]byte(`{"verdict":"proved","kind":"count"}`)) || IsSeriesJSON([]byte("not json")) {
		t.Error("a gate line or text taken for a series run")
	}
}
