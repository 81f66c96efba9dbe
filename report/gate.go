package report

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"slices"
	"strings"

	"avoidcert/certify"
	"avoidcert/claims"
	"avoidcert/internal/input"
	"avoidcert/prove"
)

// GateClaim is one line of 'avoidcert gate --json', as the gate writes it.
type GateClaim = claims.JSONLine

// CheckedCertificate is what the report found of a certificate a line
// names.
type CheckedCertificate struct {
	// Found is the file read (see Gate.Check); "" when none exists.
	Found string
	// Cert is the certificate at Found, whose SHA-256 is the recorded one,
	// as the checker accepted it for the recorded patterns while the report
	// was made; nil when no file was found.
	Cert *certify.Certificate
}

// Gate is a gate's JSON output: its verdicts as the gate recorded them,
// restated as recorded and never as verdicts of the report; and the
// certificates its lines name, where they were found, checked again.
type Gate struct {
	Name   string
	Claims []GateClaim
	// Checked[i][j] is what Check found of certificate j of claim i.
	Checked [][]CheckedCertificate
}

// FromGate reads the JSON lines of 'avoidcert gate --json' strictly and
// re-checks every certificate they name that it finds (Check). A file
// found with another SHA-256 than recorded, or one the checker refuses,
// is a refusal (IsRefused); a missing one leaves its claim not re-checked.
func FromGate(ctx context.Context, name string, data []byte) (*Gate, error) {
	g, err := parseGate(name, data)
	if err != nil {
		return nil, err
	}
	if err := g.Check(ctx); err != nil {
		return nil, err
	}
	return g, nil
}

// Check reads each certificate the lines name and fills Checked. A path
// is relative to the manifest's folder (an earlier gate's, to the folder
// it ran in), which the report may not run in: it is looked for from the
// manifest's folder, from the current folder and from the gate file's
// folder, and a file counts only with the SHA-256 the gate recorded. It is
// then re-checked by the independent checker for the patterns recorded
// beside it. A recorded verdict that says the opposite of what the
// certificates prove of the claim as its line restates it is a refusal.
func (g *Gate) Check(ctx context.Context) error {
	g.Checked = make([][]CheckedCertificate, len(g.Claims))
	for i, c := range g.Claims {
		g.Checked[i] = make([]CheckedCertificate, len(c.Certificates))
		for j, ref := range c.Certificates {
			if ref.Path == "" {
				continue // neither kept nor cached
			}
			data, found, err := g.find(ctx, c.Manifest, ref.Path)
			if err != nil {
				return fmt.Errorf("%s: claim %s: %w", g.Name, quoteID(c.ID), err)
			}
			if found == "" {
				continue
			}
			sum := sha256.Sum256(data)
			if got := hex.EncodeToString(sum[:]); got != ref.SHA256 {
				return refused{fmt.Errorf("%s: claim %s: %s is not the certificate the gate recorded (SHA-256 %s, recorded %s): run the gate again, or report on its current output",
					g.Name, quoteID(c.ID), found, got[:12]+"...", quoteID(ref.SHA256))}
			}
			pats := ref.Patterns
			cert, err := prove.CheckBytes(ctx, data, pats, prove.Options{})
			switch {
			case err == nil:
			case ctx.Err() != nil:
				return ctx.Err()
			case errors.Is(err, prove.ErrBudget):
				return fmt.Errorf("%s: claim %s: %s: %w", g.Name, quoteID(c.ID), found, err)
			default:
				return refused{fmt.Errorf("%s: claim %s: the checker refuses %s for the set %s: %v", g.Name, quoteID(c.ID), found, quoteID(strings.Join(pats, ",")), err)}
			}
			g.Checked[i][j] = CheckedCertificate{Found: found, Cert: cert}
		}
		if cmp := compare(c, g.Checked[i]); cmp.contradicts(c.Verdict) {
			return refused{fmt.Errorf("%s: claim %s: recorded %s, but its certificates, re-checked, give %s: the file is not the gate's output as written",
				g.Name, quoteID(c.ID), c.Verdict, gateRow{c, g.Checked[i], cmp}.certified())}
		}
	}
	return nil
}

// find reads the first of the places a recorded path may mean that holds a
// file: ("", nil, nil) when none does.
func (g *Gate) find(ctx context.Context, manifest, path string) ([]byte, string, error) {
	places := []string{path}
	if !filepath.IsAbs(path) {
		places = nil
		gateDir := filepath.Dir(g.Name)
		for _, b := range []string{filepath.Dir(manifest), ".", gateDir, filepath.Join(gateDir, filepath.Dir(manifest))} {
			if p := filepath.Join(b, path); !slices.Contains(places, p) {
				places = append(places, p)
			}
		}
	}
	for _, p := range places {
		data, err := input.ReadFile(ctx, p, input.Certificate)
		switch {
		case err == nil:
			return data, p, nil
		case !errors.Is(err, fs.ErrNotExist):
			return nil, "", err
		}
	}
	return nil, "", nil
}

// IsGateJSON reports whether data starts with a gate's JSON line (an
// object with "verdict" and "kind", as every version of the gate wrote),
// as opposed to a certificate.
func IsGateJSON(data []byte) bool {
	line, _, _ := bytes.Cut(bytes.TrimSpace(data), []byte("\n"))
	var probe map[string]json.RawMessage
	if json.Unmarshal(line, &probe) != nil {
		return false
	}
	_, v := probe["verdict"]
	_, k := probe["kind"]
	return v && k
}

// parseGate reads the JSON lines of 'avoidcert gate --json', strictly.
func parseGate(name string, data []byte) (*Gate, error) {
	g := &Gate{Name: name}
	if err := input.CheckJSON(data); err != nil {
		return nil, fmt.Errorf("%s: not the output of 'avoidcert gate --json': %v", name, err)
	}
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(nil, 1<<24)
	for n := 1; sc.Scan(); n++ {
		line := bytes.TrimSpace(sc.Bytes())
		if len(line) == 0 {
			continue
		}
		var c GateClaim
		dec := json.NewDecoder(bytes.NewReader(line))
		dec.DisallowUnknownFields()
		err := dec.Decode(&c)
		switch {
		case err == nil && c.Format == "":
			return nil, fmt.Errorf("%s:%d: a line of an earlier gate, which did not restate its claims; run the gate again with this version", name, n)
		case err != nil:
			return nil, fmt.Errorf("%s:%d: not a line of 'avoidcert gate --json': %s", name, n, input.JSONProblem(err))
		case c.Format != claims.JSONFormat || c.Version != claims.JSONVersion:
			return nil, fmt.Errorf("%s:%d: format %s version %d; this report reads %s version %d", name, n, quoteID(c.Format), c.Version, claims.JSONFormat, claims.JSONVersion)
		}
		if c.ID == "" || c.Verdict == "" {
			return nil, fmt.Errorf("%s:%d: a claim without id or verdict", name, n)
		}
		if !slices.Contains(gateVerdicts, c.Verdict) {
			return nil, fmt.Errorf("%s:%d: claim %s: %s is not a verdict the gate writes (%s); the file is not the gate's output as written",
				name, n, quoteID(c.ID), quoteID(string(c.Verdict)), verdictList())
		}
		if !slices.Contains(gateKinds, c.Kind) {
			return nil, fmt.Errorf("%s:%d: claim %s: %s is not a claim kind; the file is not the gate's output as written", name, n, quoteID(c.ID), quoteID(string(c.Kind)))
		}
		g.Claims = append(g.Claims, c)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %v", name, err)
	}
	if len(g.Claims) == 0 {
		return nil, fmt.Errorf("%s: no claims", name)
	}
	return g, nil
}

// What a gate's JSON lines can hold.
var (
	gateVerdicts = []claims.Verdict{claims.Proved, claims.Refuted, claims.Undecided, claims.Failed}
	gateKinds    = []claims.Kind{claims.KindCount, claims.KindGrowth, claims.KindForm, claims.KindOrder, claims.KindEqualCounts, claims.KindProbability}
)

func verdictList() string {
	var words []string
	for _, v := range gateVerdicts {
		words = append(words, string(v))
	}
	return strings.Join(words, ", ")
}

// quoteID quotes a value from a gate line, cut to a few dozen characters.
func quoteID(s string) string {
	if len(s) > 40 {
		s = s[:40] + "..."
	}
	return fmt.Sprintf("%q", s)
}

// tally counts the claims by recorded verdict.
func (g *Gate) tally() string {
	counts := map[claims.Verdict]int{}
	var order []claims.Verdict
	for _, c := range g.Claims {
		if counts[c.Verdict] == 0 {
			order = append(order, c.Verdict)
		}
		counts[c.Verdict]++
	}
	s := ""
	for i, v := range order {
		if i > 0 {
			s += ", "
		}
		s += fmt.Sprintf("%d %s", counts[v], v)
	}
	return s
}
