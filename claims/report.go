package claims

import (
	"encoding/xml"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"
)

// Summary counts the verdicts.
type Summary struct {
	Proved, Refuted, Undecided, Failed int
}

// Summarize counts the verdicts of results.
func Summarize(results []Result) Summary {
	var s Summary
	for _, r := range results {
		switch r.Verdict {
		case Proved:
			s.Proved++
		case Refuted:
			s.Refuted++
		case Undecided:
			s.Undecided++
		default:
			s.Failed++
		}
	}
	return s
}

func (s Summary) String() string {
	return fmt.Sprintf("%d proved, %d refuted, %d undecided, %d failed", s.Proved, s.Refuted, s.Undecided, s.Failed)
}

// shownVerdict writes refutations and failures in capitals, so that they
// stand out in a long table.
func shownVerdict(v Verdict) string {
	if v == Refuted || v == Failed {
		return strings.ToUpper(string(v))
	}
	return string(v)
}

// WriteTable writes one row per claim: id, kind, verdict, evidence.
func WriteTable(w io.Writer, results []Result) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "claim\tkind\tverdict\tevidence")
	for _, r := range results {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\n", r.ID, r.Kind, shownVerdict(r.Verdict), r.Evidence)
	}
	return tw.Flush()
}

// The JUnit XML elements written by JUnit.
type (
	junitSuites struct {
		XMLName  xml.Name     `xml:"testsuites"`
		Name     string       `xml:"name,attr"`
		Tests    int          `xml:"tests,attr"`
		Failures int          `xml:"failures,attr"`
		Errors   int          `xml:"errors,attr"`
		Skipped  int          `xml:"skipped,attr"`
		Time     string       `xml:"time,attr"`
		Suites   []junitSuite `xml:"testsuite"`
	}
	junitSuite struct {
		Name     string      `xml:"name,attr"`
		Tests    int         `xml:"tests,attr"`
		Failures int         `xml:"failures,attr"`
		Errors   int         `xml:"errors,attr"`
		Skipped  int         `xml:"skipped,attr"`
		Time     string      `xml:"time,attr"`
		Cases    []junitCase `xml:"testcase"`
	}
	junitCase struct {
		Name      string        `xml:"name,attr"`
		Classname string        `xml:"classname,attr"`
		File      string        `xml:"file,attr,omitempty"`
		Line      int           `xml:"line,attr,omitempty"`
		Time      string        `xml:"time,attr"`
		Failure   *junitMessage `xml:"failure,omitempty"`
		Error     *junitMessage `xml:"error,omitempty"`
		Skipped   *junitMessage `xml:"skipped,omitempty"`
		SystemOut string        `xml:"system-out,omitempty"`
	}
	junitMessage struct {
		Message string `xml:"message,attr"`
		Type    string `xml:"type,attr,omitempty"`
		Text    string `xml:",chardata"`
	}
)

// JUnit renders the results as JUnit XML: one test suite named after the
// manifest, one test case per claim, named by its id and the claim
// restated ("g-1342: lambda(1342) = 0.954612 (rounded)"), with the
// manifest's file and line; a refuted claim is a failure whose message
// gives the claim and the evidence, an undecided one is skipped with the
// reason, a claim the tool failed on is an error. Certificate paths are
// as in WriteJSON.
func JUnit(suite string, results []Result) ([]byte, error) {
	s := Summarize(results)
	var total float64
	js := junitSuite{Name: suite, Tests: len(results), Failures: s.Refuted, Errors: s.Failed, Skipped: s.Undecided}
	for _, r := range results {
		total += r.Elapsed.Seconds()
		jc := junitCase{Name: r.ID, Classname: "claims." + string(r.Kind), File: r.Manifest, Line: r.Line, Time: seconds(r.Elapsed.Seconds())}
		stated := ""
		if r.Claim.ID != "" {
			stated = r.Claim.Statement()
			jc.Name += ": " + stated
		}
		msg := &junitMessage{Message: r.Evidence}
		switch r.Verdict {
		case Refuted:
			msg.Type, msg.Text = "refuted", r.Evidence
			if stated != "" {
				msg.Message = "claimed " + stated + "; " + r.Evidence
			}
			jc.Failure = msg
		case Undecided:
			jc.Skipped = msg
		case Failed:
			msg.Type, msg.Text = "error", r.Evidence
			jc.Error = msg
		}
		var out strings.Builder
		if stated != "" {
			fmt.Fprintf(&out, "claim: %s (%s line %d)\n", stated, r.Manifest, r.Line)
		}
		if r.Claim.Note != "" {
			fmt.Fprintf(&out, "note: %s\n", r.Claim.Note)
		}
		fmt.Fprintf(&out, "%s: %s\n", r.Verdict, r.Evidence)
		for _, c := range r.Certificates {
			fmt.Fprintf(&out, "certificate for %s: %s sha256 %s\n", strings.Join(c.Patterns, ","), shownPath(r.Manifest, c.Path), c.SHA256)
		}
		jc.SystemOut = out.String()
		js.Cases = append(js.Cases, jc)
	}
	js.Time = seconds(total)
	doc := junitSuites{Name: "avoidcert gate", Tests: js.Tests, Failures: js.Failures, Errors: js.Errors,
		Skipped: js.Skipped, Time: js.Time, Suites: []junitSuite{js}}
	body, err := xml.MarshalIndent(doc, "", "  ")
	if err != nil {
		return nil, err
	}
	return append([]byte(xml.Header), append(body, '\n')...), nil
}

func seconds(s float64) string { return fmt.Sprintf("%.3f", s) }
