package claims

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"strings"
	"testing"
	"time"
)

// sampleResults are made-up results for the report formats (no claim is
// judged here); the numbers echo OEIS A049774 (a_12 of 123) and A113228
// (lambda(1324)).
var sampleResults = []Result{
	{ID: "a", Kind: KindCount, Verdict: Proved, Evidence: "a_12 = 74207209", Elapsed: time.Millisecond},
	{ID: "b", Kind: KindGrowth, Verdict: Refuted, Evidence: "lambda in [0.95584, 0.95586], outside the claim 0.95589 <&>",
		Certificates: []CertificateRef{{Set: "1324", Path: "certs/b.json", SHA256: strings.Repeat("ab", 32)}}},
	{ID: "c", Kind: KindOrder, Verdict: Undecided, Evidence: "budget stop (max-k)"},
	{ID: "d", Kind: KindForm, Verdict: Failed, Evidence: "the checker refused"},
}

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
	if cases[1].Failure == nil || !strings.Contains(cases[1].Failure.Message, "outside the claim 0.95589 <&>") {
		t.Errorf("refuted: %+v", cases[1].Failure)
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
	var b struct {
		ID           string
		Verdict      string
		Certificates []CertificateRef
	}
	if err := json.Unmarshal([]byte(lines[1]), &b); err != nil {
		t.Fatal(err)
	}
	if b.ID != "b" || b.Verdict != "refuted" || len(b.Certificates) != 1 || b.Certificates[0].Path != "certs/b.json" || len(b.Certificates[0].SHA256) != 64 {
		t.Errorf("second line read as %+v", b)
	}
}
