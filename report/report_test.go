package report

import (
	"bytes"
	"context"
	"flag"
	"io"
	"math/big"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"avoidcert/interval"

	"github.com/google/go-cmp/cmp"
)

var update = flag.Bool("update", false, "rewrite the golden files")

// load builds the reports of the test certificates (made with
// "avoidcert bound 1342 --digits 12", "... 123 --digits 12" and "... 1342
// --digits 50"), named as a user in testdata/ would name them. Each is
// built once per test binary (the figures' data take seconds to
// recompute); tests only read them.
func load(t *testing.T, names ...string) []*Certificate {
	t.Helper()
	var rs []*Certificate
	for _, n := range names {
		if r, ok := loaded.Load(n); ok {
			rs = append(rs, r.(*Certificate))
			continue
		}
		data, err := os.ReadFile(filepath.Join("testdata", n))
		if err != nil {
			t.Fatal(err)
		}
		r, err := FromCertificate(context.Background(), n, data)
		if err != nil {
			t.Fatal(err)
		}
		loaded.Store(n, r)
		rs = append(rs, r)
	}
	return rs
}

var loaded sync.Map // name -> *Certificate

// goldenDocument is the test certificates, census and gate output.
func goldenDocument(t *testing.T) *Document {
	t.Helper()
	cen, err := FromCensus(context.Background(), "testdata/census-4")
	if err != nil {
		t.Fatal(err)
	}
	return &Document{Certificates: load(t, "cert-1342.json", "cert-123.json"), Censuses: []*Census{cen}, Gates: loadGates(t, "gate.jsonl", "gate-restated.jsonl")}
}

// loadGates reads gate outputs in testdata: gate.jsonl is a run of this
// version's 'avoidcert gate --json' on the demo's manifest with
// --certificates certs (its certificates in testdata/certs);
// gate-restated.jsonl is a run of the gate that restates its claims
// (format avoidcert-gate version 1, built from the branch that brings it)
// on the demo's manifest and one claim more, a_60 of 123 (the count from
// 'avoidcert count 123 --from 60 --to 60'), the same certificates, and one
// edit by hand: claim 3a's certificate moved to a path that does not exist.
func loadGates(t *testing.T, names ...string) []*Gate {
	t.Helper()
	var gs []*Gate
	for _, n := range names {
		data, err := os.ReadFile(filepath.Join("testdata", n))
		if err != nil {
			t.Fatal(err)
		}
		g, err := FromGate(context.Background(), filepath.Join("testdata", n), data)
		if err != nil {
			t.Fatal(err)
		}
		gs = append(gs, g)
	}
	return gs
}

func TestGolden(t *testing.T) {
	checkGolden(t, goldenDocument(t), "report")
}

// checkGolden renders doc in the three formats and compares each with
// testdata/BASE.{md,html,tex}.golden (or rewrites them with -update).
func checkGolden(t *testing.T, doc *Document, base string) {
	t.Helper()
	for _, tc := range []struct {
		ext    string
		render func(io.Writer, *Document) error
	}{{"md", Markdown}, {"html", HTML}, {"tex", TeX}} {
		name := base + "." + tc.ext
		var b bytes.Buffer
		if err := tc.render(&b, doc); err != nil {
			t.Fatal(err)
		}
		path := filepath.Join("testdata", name+".golden")
		if *update {
			if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		want, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if d := cmp.Diff(string(want), b.String()); d != "" {
			t.Errorf("%s differs from its golden file (go test ./report -update to accept):\n%s", name, d)
		}
	}
}

// The statement is read from the certificate: the printed range of lambda
// for 1342 meets the published digits (interval.PublishedGrowth, which names
// its OEIS entry), the bound holds from the certificate's n0, and the
// re-check names the file.
func TestStatement(t *testing.T) {
	r := load(t, "cert-1342.json")[0]
	pub, ok := interval.PublishedGrowth("1342")
	if !ok {
		t.Fatal("no published growth rate for 1342")
	}
	lo, hi := r.Lambda()
	plo, _ := new(big.Rat).SetString(lo)
	phi, _ := new(big.Rat).SetString(hi)
	want := pub.LambdaRange()
	if plo == nil || phi == nil || phi.Cmp(want.Lo) < 0 || plo.Cmp(want.Hi) > 0 {
		t.Errorf("lambda [%s, %s] misses the published range (%s) [%s, %s]", lo, hi, pub.Source(), want.Lo.FloatString(12), want.Hi.FloatString(12))
	}
	if got := r.Recheck(); got != "avoidcert check cert-1342.json --expect 1342" {
		t.Errorf("re-check %q", got)
	}
	if r.Bound().N0 != r.Cert.Statement.AllN.N0 || r.Digits < 12 {
		t.Errorf("bound from n0 %d, digits %d", r.Bound().N0, r.Digits)
	}
	if len(r.Widths) < 3 || !(r.Rate > 0 && r.Rate < 1) {
		t.Errorf("widths %v, rate %g", r.Widths, r.Rate)
	}
}

// A certificate whose numbers were altered gives no report: the format's
// content digest catches the edit when the file is read.
func TestRefusesAlteredCertificate(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("testdata", "cert-1342.json"))
	if err != nil {
		t.Fatal(err)
	}
	bad := bytes.Replace(data, []byte(`"n0": `), []byte(`"n0": 1`), 1)
	if bytes.Equal(bad, data) {
		t.Fatal("test certificate has no n0 field to alter")
	}
	_, err = FromCertificate(context.Background(), "bad.json", bad)
	if err == nil || !strings.Contains(err.Error(), "bad.json") {
		t.Fatalf("an altered certificate: error %v, want one naming the file", err)
	}
}

// The LaTeX fragment (every kind of input) compiles inside a minimal
// document (no packages) when a TeX engine is installed, and everything
// fits the page: the log has no "Overfull \hbox" (a line too wide) nor
// "Overfull \vbox" (a table too tall for a page), although the document
// holds a certificate to 50 digits (set whole in display math, its range
// of lambda ran 82 mm off the page and its bound for every n 300 mm), a
// census of 32 classes (a table longer than a page), a gate's lines with a
// claimed count of 78 digits and a series run (nine columns ran 50 mm
// off). CI has no TeX, so there this test skips; install
// texlive-latex-base to run it.
func TestTeXCompiles(t *testing.T) {
	engine := findTool("pdflatex", "lualatex", "xelatex")
	if engine == "" {
		t.Skip("no TeX engine (pdflatex, lualatex, xelatex) on PATH: the LaTeX fragment is not compiled (apt-get install texlive-latex-base)")
	}
	dir := t.TempDir()
	var b bytes.Buffer
	all := goldenDocument(t)
	all.Certificates = append(all.Certificates, load(t, "cert-1342-50.json")...)
	cen5, err := FromCensus(context.Background(), "testdata/census-5")
	if err != nil {
		t.Fatal(err)
	}
	all.Censuses = append(all.Censuses, cen5)
	all.Series = loadSeries(t, "series-levels.json", "series-levels-3.json")
	if err := TeX(&b, all); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir, "fragment.tex"), b.Bytes(), 0o644)
	doc := "\\documentclass{article}\n\\begin{document}\n\\input{fragment}\n\\end{document}\n" // no package: the fragment says it needs none
	os.WriteFile(filepath.Join(dir, "doc.tex"), []byte(doc), 0o644)
	cmd := exec.Command(engine, "-interaction=nonstopmode", "-halt-on-error", "doc.tex")
	cmd.Dir = dir
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("%s: %v\n%s", engine, err, out)
	}
	log, err := os.ReadFile(filepath.Join(dir, "doc.log"))
	if err != nil {
		t.Fatal(err)
	}
	for _, block := range strings.Split(string(log), "\n\n") {
		if strings.Contains(block, "Overfull \\") {
			t.Errorf("something runs off the page:\n%s", block)
		}
	}
	if *update {
		// keep the PDF beside the golden files' output, to look at
		if pdf, err := os.ReadFile(filepath.Join(dir, "doc.pdf")); err == nil {
			os.WriteFile(filepath.Join(os.TempDir(), "avoidcert-report-fragment.pdf"), pdf, 0o644)
		}
	}
}

// findTool returns the first of names found on PATH, or "".
func findTool(names ...string) string {
	for _, n := range names {
		if _, err := exec.LookPath(n); err == nil {
			return n
		}
	}
	return ""
}

// A census whose certificate does not match the SHA-256 in census.json is
// refused, and so is a gate line with an unknown field.
func TestCensusAndGateInputs(t *testing.T) {
	dir := t.TempDir()
	if err := os.CopyFS(dir, os.DirFS(filepath.Join("testdata", "census-4"))); err != nil {
		t.Fatal(err)
	}
	if _, err := FromCensus(context.Background(), dir); err != nil {
		t.Fatalf("a copy of the census: %v", err)
	}
	cert := filepath.Join(dir, "certificates", "1234.json")
	data, err := os.ReadFile(cert)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(cert, append(data, '\n'), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := FromCensus(context.Background(), dir); !IsRefused(err) {
		t.Errorf("a census with an edited certificate: %v, want a refusal", err)
	}
	if IsGateJSON(data) {
		t.Error("a certificate taken for a gate's output")
	}
	bad := []byte(`{"format":"avoidcert-gate","version":1,"id":"x","kind":"count","verdict":"proved","extra":1}`)
	if !IsGateJSON(bad) {
		t.Error("a gate line not recognised")
	}
	if _, err := FromGate(context.Background(), "bad.jsonl", bad); err == nil || !strings.Contains(err.Error(), `a member "extra" that this format does not have`) {
		t.Errorf("a gate line with an unknown field: %v", err)
	}
	if _, err := FromGate(context.Background(), "old.jsonl", []byte(`{"id":"x","kind":"count","verdict":"proved"}`)); err == nil || !strings.Contains(err.Error(), "an earlier gate") {
		t.Errorf("a line of an earlier gate, without format: %v", err)
	}
	for _, line := range []string{
		`{"format":"avoidcert-gate","version":1,"id":"x","kind":"count","verdict":"PROVED!!"}`,
		`{"format":"avoidcert-gate","version":1,"id":"x","kind":"theorem","verdict":"proved"}`,
		`{"format":"avoidcert-gate","version":2,"id":"x","kind":"count","verdict":"proved"}`,
	} {
		if _, err := FromGate(context.Background(), "forged.jsonl", []byte(line)); err == nil {
			t.Errorf("a gate line with a verdict or kind the gate never writes accepted: %s", line)
		}
	}
}

// A census row whose lambda was edited is refused, with the class and the
// field named, although every certificate is intact.
func TestCensusRowComparedWithItsCertificate(t *testing.T) {
	dir := t.TempDir()
	if err := os.CopyFS(dir, os.DirFS(filepath.Join("testdata", "census-4"))); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "census.json")
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	forged := bytes.Replace(data, []byte(`"lo": "0.`), []byte(`"lo": "0.5`), 1)
	if err := os.WriteFile(path, forged, 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = FromCensus(context.Background(), dir)
	if !IsRefused(err) || !strings.Contains(err.Error(), ": lambda.lo: \"0.5") {
		t.Errorf("a census with a forged lambda: %v, want a refusal naming lambda.lo", err)
	}
}
