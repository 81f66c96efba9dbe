package claims

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"math/big"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"

	"avoidcert/bounds"
)

// sampleManifest holds the claims of sampleResults; the numbers echo OEIS
// A049774 (a_12 of 123) and A113228 (lambda(1324)).
const sampleManifest = `[[claim]]
id = "a"
kind = "count"
patterns = ["123"]
n = 12
count = "74207209"

[[claim]]
id = "b"
kind = "growth"
patterns = ["1324"]
value = "0.95589"
note = "Table 2, row 3 <&>"

[[claim]]
id = "c"
kind = "order"
patterns = ["1342"]
less_than = ["1324"]

[[claim]]
id = "d"
kind = "form"
patterns = ["123"]
form = "primitive"
`

// sampleResults are made-up results for the report formats (no claim is
// judged here), for the claims of sampleManifest in paper/claims.toml.
var sampleResults = func() []Result {
	m, err := Parse("paper/claims.toml", []byte(sampleManifest))
	if err != nil {
		panic(err)
	}
	rs := []Result{
		{Verdict: Proved, Evidence: "a_12 = 74207209", Elapsed: time.Millisecond},
		{Verdict: Refuted, Evidence: "lambda in [0.95584, 0.95586], outside the claim 0.95589 <&>",
			Certified:    []bounds.Enclosure{{Lo: big.NewRat(95584, 100000), Hi: big.NewRat(95586, 100000)}},
			Certificates: []CertificateRef{{Patterns: []string{"1324"}, Path: "paper/certs/b.json", SHA256: strings.Repeat("ab", 32)}}},
		{Verdict: Undecided, Evidence: "budget stop (max-k)"},
		{Verdict: Failed, Evidence: "the checker refused"},
	}
	for i, c := range m.Claims {
		rs[i].ID, rs[i].Kind, rs[i].Line, rs[i].Claim, rs[i].Manifest = c.ID, c.Kind, c.Line, c, m.File
	}
	return rs
}()

// The JUnit file parses as XML with one test case per claim: refuted is a
// failure, undecided is skipped with its reason, a tool failure an error.
func TestJUnitParses(t *testing.T) {
	data, err := JUnit("paper.toml", sampleResults)
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Tests    int `xml:"tests,attr"`
		Failures int `xml:"failures,attr"`
		Skipped  int `xml:"skipped,attr"`
		Errors   int `xml:"errors,attr"`
		Suites   []struct {
			Name  string `xml:"name,attr"`
			Cases []struct {
				Name    string `xml:"name,attr"`
				File    string `xml:"file,attr"`
				Line    int    `xml:"line,attr"`
				Failure *struct {
					Message string `xml:"message,attr"`
				} `xml:"failure"`
				Skipped *struct {
					Message string `xml:"message,attr"`
				} `xml:"skipped"`
				Error *struct{} `xml:"error"`
			} `xml:"testcase"`
		} `xml:"testsuite"`
	}
	if err := xml.Unmarshal(data, &doc); err != nil {
		t.Fatalf("not XML: %v\n%s", err, data)
	}
	if doc.Tests != 4 || doc.Failures != 1 || doc.Skipped != 1 || doc.Errors != 1 || len(doc.Suites) != 1 || doc.Suites[0].Name != "paper.toml" {
		t.Fatalf("totals: %+v", doc)
	}
	cases := doc.Suites[0].Cases
	if len(cases) != 4 {
		t.Fatalf("%d test cases for 4 claims", len(cases))
	}
	if cases[0].Failure != nil || cases[0].Skipped != nil || cases[0].Error != nil {
		t.Error("a proved claim is a passed test case")
	}
	if cases[1].Failure == nil || cases[1].Failure.Message != "claimed lambda(1324) = 0.95589 (rounded); lambda in [0.95584, 0.95586], outside the claim 0.95589 <&>" {
		t.Errorf("refuted: %+v", cases[1].Failure)
	}
	// each test case restates its claim and names where it is written
	if cases[0].Name != "a: a_12(123) = 74207209" || cases[2].Name != "c: lambda(1342) < lambda(1324)" ||
		cases[1].File != "paper/claims.toml" || cases[1].Line != 8 {
		t.Errorf("test cases named %q, %q, at %s:%d", cases[0].Name, cases[2].Name, cases[1].File, cases[1].Line)
	}
	if cases[2].Skipped == nil || cases[2].Skipped.Message != "budget stop (max-k)" {
		t.Errorf("undecided: %+v", cases[2].Skipped)
	}
	if cases[3].Error == nil {
		t.Error("a failed claim is not an error test case")
	}
}

func TestWriteJSON(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteJSON(&buf, sampleResults); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(buf.String()), "\n")
	if len(lines) != len(sampleResults) {
		t.Fatalf("%d lines for %d claims", len(lines), len(sampleResults))
	}
	var b JSONLine
	dec := json.NewDecoder(strings.NewReader(lines[1]))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&b); err != nil {
		t.Fatal(err)
	}
	// the line restates the claim: set, quantity, claimed interval, where
	// it is written, its note; certificate paths relative to the manifest
	want := JSONLine{Format: "avoidcert-gate", Version: 1, ID: "b", Kind: KindGrowth, Manifest: "paper/claims.toml", Line: 8,
		Claim: JSONClaim{Patterns: []string{"1324"}, Quantity: "lambda", Statement: "lambda(1324) = 0.95589 (rounded)",
			Claimed: &JSONEnds{Lo: ptr("0.955885"), Hi: ptr("0.955895")}, Note: "Table 2, row 3 <&>"},
		Verdict: Refuted, Evidence: sampleResults[1].Evidence,
		Certified:    []JSONEnclosure{{Patterns: []string{"1324"}, Quantity: "lambda", JSONEnds: JSONEnds{Lo: ptr("0.95584"), Hi: ptr("0.95586")}}},
		Certificates: []JSONCertRef{{Patterns: []string{"1324"}, Path: "certs/b.json", SHA256: strings.Repeat("ab", 32)}}}
	if diff := cmp.Diff(want, b); diff != "" {
		t.Errorf("second line (-want +got):\n%s", diff)
	}
	if !strings.Contains(lines[1], `"note":"Table 2, row 3 <&>"`) {
		t.Errorf("the note is not as the manifest writes it: %s", lines[1])
	}
}

func ptr(s string) *string { return &s }

// A certificate outside the manifest's folder is named by its absolute
// path; one inside it relative to that folder, whatever the working folder.
func TestShownPath(t *testing.T) {
	abs, _ := filepath.Abs("elsewhere/x.json")
	for _, tc := range []struct{ manifest, path, want string }{
		{"paper/claims.toml", "paper/certs/b.json", "certs/b.json"},
		{"claims.toml", "certs/b.json", "certs/b.json"},
		{"paper/claims.toml", "elsewhere/x.json", abs},
		{"paper/claims.toml", "/tmp/x.json", "/tmp/x.json"},
	} {
		if got := shownPath(tc.manifest, tc.path); got != filepath.FromSlash(tc.want) && got != tc.want {
			t.Errorf("shownPath(%q, %q) = %q, want %q", tc.manifest, tc.path, got, tc.want)
		}
	}
}
