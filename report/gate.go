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

// GateClaim is one line of 'avoidcert gate --json'.
type GateClaim struct {
	ID           string            `json:"id"`
	Kind         string            `json:"kind"`
	Line         int               `json:"line"`
	Verdict      string            `json:"verdict"`
	Evidence     string            `json:"evidence"`
	Cached       bool              `json:"cached"`
	Seconds      float64           `json:"seconds"`
	Certificates []GateCertificate `json:"certificates"`
	// The claim restated, in the lines of a gate that writes it (all
	// optional): the manifest file, the pattern set as the manifest writes
	// it, the quantity claimed ("lambda", "radius", ...), the claimed value
	// or interval as written, and the claim's note.
	Manifest string   `json:"manifest,omitempty"`
	Set      []string `json:"set,omitempty"`
	Quantity string   `json:"quantity,omitempty"`
	Claimed  string   `json:"claimed,omitempty"`
	Note     string   `json:"note,omitempty"`
}

// GateCertificate is a certificate a gate's line names, and what the
// report found of it.
type GateCertificate struct {
	Set    string `json:"set"` // the pattern set it is for, as recorded
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
	// Found is the file read: the recorded path, or the same path taken
	// from the gate file's folder or the manifest's; "" when none exists.
	Found string `json:"-"`
	// Cert is the certificate at Found, whose SHA-256 is the recorded one,
	// as the checker accepted it for Set while the report was made; nil
	// when no file was found.
	Cert *certify.Certificate `json:"-"`
}

// Gate is a gate's JSON output: its verdicts as the gate recorded them,
// restated as recorded and never as verdicts of the report; and the
// certificates its lines name, where they were found, checked again.
type Gate struct {
	Name   string
	Claims []GateClaim
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

// Check reads each certificate the lines name, looking for it at its
// recorded path, and at that path from the gate file's folder and from
// the manifest's (a relative path means the folder the gate ran in, which
// may not be the report's); a file counts only with the SHA-256 the gate
// recorded, and is then re-checked by the independent checker for the
// set recorded beside it.
func (g *Gate) Check(ctx context.Context) error {
	for i := range g.Claims {
		c := &g.Claims[i]
		for j := range c.Certificates {
			ref := &c.Certificates[j]
			if ref.Path == "" {
				continue // neither kept nor cached
			}
			data, found, err := g.find(ctx, c, ref.Path)
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
			cert, err := prove.CheckBytes(ctx, data, []string{ref.Set}, prove.Options{})
			switch {
			case err == nil:
			case ctx.Err() != nil:
				return ctx.Err()
			case errors.Is(err, prove.ErrBudget):
				return fmt.Errorf("%s: claim %s: %s: %w", g.Name, quoteID(c.ID), found, err)
			default:
				return refused{fmt.Errorf("%s: claim %s: the checker refuses %s for the set %s: %v", g.Name, quoteID(c.ID), found, quoteID(ref.Set), err)}
			}
			ref.Found, ref.Cert = found, cert
		}
	}
	return nil
}

// find reads the first of the places a recorded path may mean that holds a
// file: ("", nil, nil) when none does.
func (g *Gate) find(ctx context.Context, c *GateClaim, path string) ([]byte, string, error) {
	places := []string{path}
	if !filepath.IsAbs(path) {
		bases := []string{filepath.Dir(g.Name)}
		if c.Manifest != "" {
			bases = append(bases, filepath.Dir(c.Manifest), filepath.Join(filepath.Dir(g.Name), filepath.Dir(c.Manifest)))
		}
		for _, b := range bases {
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
// object with "verdict" and "kind"), as opposed to a certificate.
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
		if err := dec.Decode(&c); err != nil {
			return nil, fmt.Errorf("%s:%d: not a line of 'avoidcert gate --json': %v", name, n, err)
		}
		if c.ID == "" || c.Verdict == "" {
			return nil, fmt.Errorf("%s:%d: a claim without id or verdict", name, n)
		}
		if !slices.Contains(gateVerdicts, claims.Verdict(c.Verdict)) {
			return nil, fmt.Errorf("%s:%d: claim %s: %s is not a verdict the gate writes (%s); the file is not the gate's output as written",
				name, n, quoteID(c.ID), quoteID(c.Verdict), verdictList())
		}
		if !slices.Contains(gateKinds, claims.Kind(c.Kind)) {
			return nil, fmt.Errorf("%s:%d: claim %s: %s is not a claim kind; the file is not the gate's output as written", name, n, quoteID(c.ID), quoteID(c.Kind))
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
	counts := map[string]int{}
	var order []string
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
