package report

import (
	"bytes"
	"context"
	"math/big"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"avoidcert/interval"
)

// The gate page states claimed against certified values: the restated
// claim of each line (testdata/gate-restated.jsonl) and the ranges of the
// certificates the report re-checked, which must hold the published growth
// rates (interval.PublishedGrowth names its OEIS entries), set against the
// claimed interval; a certificate not found is said to be not re-checked;
// refuted rows are marked by a sign and capitals in every format, and by a
// row class in HTML.
func TestGatePage(t *testing.T) {
	g := loadGates(t, "gate-restated.jsonl")[0]
	byID := map[string]gateRow{}
	for _, r := range g.rows() {
		byID[r.ID] = r
	}
	// the certified ranges of 1324 (claim 3c) and 1342 (3b) hold the
	// published lambda
	for id, pat := range map[string]string{"3c": "1324", "3b": "1342"} {
		parts := byID[id].cmp.parts
		if len(parts) != 1 || parts[0].symbol != "λ" {
			t.Fatalf("claim %s: certified %+v, want the range of λ alone (the line claims lambda)", id, parts)
		}
		pub, ok := interval.PublishedGrowth(pat)
		if !ok {
			t.Fatalf("no published growth rate for %s", pat)
		}
		lo, _ := new(big.Rat).SetString(parts[0].lo)
		hi, _ := new(big.Rat).SetString(parts[0].hi)
		want := pub.LambdaRange()
		if lo == nil || hi == nil || hi.Cmp(want.Lo) < 0 || lo.Cmp(want.Hi) > 0 {
			t.Errorf("claim %s: certified λ(%s) in [%s, %s] misses the published value (%s)", id, pat, parts[0].lo, parts[0].hi, pub.Source())
		}
	}
	// the certified radius of {123, 321} (3d) holds pi/2 (Andre 1879; its
	// digits OEIS A019669), here as interval.Pi encloses it
	if parts := byID["3d"].cmp.parts; len(parts) == 1 && parts[0].symbol == "1/λ" {
		lo, _ := new(big.Rat).SetString(parts[0].lo)
		hi, _ := new(big.Rat).SetString(parts[0].hi)
		half := interval.Pi(64).Mul(interval.Point(big.NewRat(1, 2)))
		if lo == nil || hi == nil || lo.Cmp(half.Lo) > 0 || hi.Cmp(half.Hi) < 0 {
			t.Errorf("claim 3d: certified 1/λ in [%s, %s] misses pi/2", parts[0].lo, parts[0].hi)
		}
	} else {
		t.Errorf("claim 3d: certified %+v, want the range of 1/λ alone (the line claims the radius)", parts)
	}
	for id, want := range map[string]string{
		"3a": "not re-checked: certificate not found (elsewhere/3a.json)",
		"3b": "inside the claimed interval",
		"3c": "outside the claimed interval",
		"4a": "primitive (primitivity exponent 4), as claimed",
		"4b": "disjoint: λ(1324) > λ(1342), contrary to the claim",
		"2b": "no certificate: exact counts, not recomputed here",
	} {
		if got := byID[id].certified(); !strings.Contains(got, want) {
			t.Errorf("claim %s: certified %q, want %q", id, got, want)
		}
	}
	if got := byID["3c"].claimed(); got != "lambda(1324) = 0.95589 (rounded), read as [0.955885, 0.955895]" {
		t.Errorf("claim 3c: claimed %q", got)
	}

	doc := &Document{Gates: []*Gate{g}}
	var md, page, tex bytes.Buffer
	if err := Markdown(&md, doc); err != nil {
		t.Fatal(err)
	}
	if err := HTML(&page, doc); err != nil {
		t.Fatal(err)
	}
	if err := TeX(&tex, doc); err != nil {
		t.Fatal(err)
	}
	refuted := []string{"2b", "3c", "4b"}
	rows := regexp.MustCompile(`<tr class="refuted"><td class="mark">✗</td><td>([^ <]+) `).FindAllStringSubmatch(page.String(), -1)
	var marked []string
	for _, r := range rows {
		marked = append(marked, r[1])
	}
	if strings.Join(marked, ",") != strings.Join(refuted, ",") {
		t.Errorf("HTML rows marked refuted: %v, want %v", marked, refuted)
	}
	if n := strings.Count(page.String(), "✗ REFUTED"); n != len(refuted) {
		t.Errorf("HTML: %d cells say ✗ REFUTED, want %d", n, len(refuted))
	}
	if n := strings.Count(md.String(), "| **✗ REFUTED** |"); n != len(refuted) {
		t.Errorf("Markdown: %d cells say ✗ REFUTED in bold, want %d", n, len(refuted))
	}
	if n := strings.Count(tex.String(), `\item[$\times$]`); n != len(refuted) {
		t.Errorf("LaTeX: %d items marked with a cross, want %d", n, len(refuted))
	}
	if !strings.Contains(md.String(), "Refuted by the gate's record (marked ✗ below): 2b, 3c, 4b.") {
		t.Error("Markdown: no list of the refuted claims above the table")
	}
}

// A certificate file that is not the one the gate recorded (other bytes),
// the recorded one named for another set, or a recorded verdict that its
// certificate contradicts makes the gate's output a refusal; the file is
// looked for beside the gate file as well.
func TestGateCertificatesRefused(t *testing.T) {
	dir := t.TempDir()
	if err := os.CopyFS(filepath.Join(dir, "certs"), os.DirFS(filepath.Join("testdata", "certs"))); err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(filepath.Join("testdata", "gate.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	var line3c string
	for _, l := range strings.Split(string(data), "\n") {
		if strings.Contains(l, `"id":"3c"`) {
			line3c = l
		}
	}
	name := filepath.Join(dir, "gate.jsonl")
	g, err := FromGate(context.Background(), name, []byte(line3c))
	if err != nil {
		t.Fatalf("the certificate beside the gate file: %v", err)
	}
	if ch := g.Checked[0][0]; ch.Cert == nil || ch.Found != filepath.Join(dir, "certs", "3c.json") {
		t.Fatalf("certificate found at %q (checked: %v)", ch.Found, ch.Cert != nil)
	}
	// a recorded verdict its certificate contradicts: 3c (outside the
	// claimed interval) recorded as proved, in the restating gate's line
	restated, err := os.ReadFile(filepath.Join("testdata", "gate-restated.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range strings.Split(string(restated), "\n") {
		if strings.Contains(l, `"id":"3c"`) {
			forged := strings.Replace(l, `"verdict":"refuted"`, `"verdict":"proved"`, 1)
			if _, err := FromGate(context.Background(), name, []byte(forged)); !IsRefused(err) || !strings.Contains(err.Error(), "recorded proved, but its certificates, re-checked, give λ ∈ [0.95584651, 0.95585542]; outside the claimed interval") {
				t.Errorf("a verdict its certificate contradicts: %v, want a refusal", err)
			}
		}
	}
	// another set: the certificate of 1324 named for 1342
	other := strings.NewReplacer(`"set":"1324"`, `"set":"1342"`, `{"patterns":["1324"],"path"`, `{"patterns":["1342"],"path"`).Replace(line3c)
	if other == line3c {
		t.Fatal("no certificate reference to alter")
	}
	if _, err := FromGate(context.Background(), name, []byte(other)); !IsRefused(err) || !strings.Contains(err.Error(), "checker refuses") {
		t.Errorf("a certificate named for another set: %v, want a refusal by the checker", err)
	}
	// other bytes at the recorded path
	path := filepath.Join(dir, "certs", "3c.json")
	cert, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, append(cert, '\n'), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := FromGate(context.Background(), name, []byte(line3c)); !IsRefused(err) || !strings.Contains(err.Error(), "not the certificate the gate recorded") {
		t.Errorf("a certificate with other bytes: %v, want a refusal naming the SHA-256", err)
	}
}

// A certificate the gate kept nowhere (no --certificates, no cache) is
// said to be so, with no command to check it.
func TestGateCertificateNotKept(t *testing.T) {
	g, err := FromGate(context.Background(), "g.jsonl", []byte(`{"format":"avoidcert-gate","version":1,"id":"g","kind":"growth","manifest":"m.toml","line":1,`+
		`"claim":{"patterns":["123"],"quantity":"lambda","statement":"lambda(123) = 0.827 (rounded)","claimed":{"lo":"0.8265","hi":"0.8275"}},`+
		`"verdict":"proved","evidence":"e","cached":false,"seconds":0,"certificates":[{"patterns":["123"],"sha256":"00"}]}`))
	if err != nil {
		t.Fatal(err)
	}
	r := g.rows()[0]
	if got := r.certified(); got != "not re-checked: the gate kept no certificate (run it with --certificates)" {
		t.Errorf("certified %q", got)
	}
	if got := r.recheck(); got != "" {
		t.Errorf("re-check %q for a certificate kept nowhere", got)
	}
}
