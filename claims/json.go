package claims

import (
	"encoding/json"
	"io"
	"path/filepath"
	"strings"

	"avoidcert/bounds"
	"avoidcert/interval"
)

// The JSON lines of 'avoidcert gate --json' (docs/claims.md; schema
// docs/schema/gate.schema.json): one object a claim, which restates the
// claim as the manifest states it, where it stands in the manifest, the
// verdict and what it rests on.
const (
	JSONFormat  = "avoidcert-gate"
	JSONVersion = 1
)

// JSONLine is one line of the gate's JSON output. Report reads it back
// through the same type.
type JSONLine struct {
	Format   string    `json:"format"`
	Version  int       `json:"version"`
	ID       string    `json:"id"`
	Kind     Kind      `json:"kind"`
	Manifest string    `json:"manifest"` // the manifest's file as given to the gate
	Line     int       `json:"line"`     // of the claim's [[claim]] header
	Claim    JSONClaim `json:"claim"`
	Verdict  Verdict   `json:"verdict"`
	Evidence string    `json:"evidence"`
	// Certified are the checked enclosures the verdict was read from:
	// a growth claim's quantity, lambda of both sets of an order claim.
	Certified    []JSONEnclosure `json:"certified,omitempty"`
	Cached       bool            `json:"cached"`
	Seconds      float64         `json:"seconds"`
	Certificates []JSONCertRef   `json:"certificates"`
}

// JSONClaim restates a claim; which members are present depends on its
// kind (docs/claims.md).
type JSONClaim struct {
	Patterns  []string  `json:"patterns"`
	Quantity  string    `json:"quantity"`
	Statement string    `json:"statement"`
	N         *int      `json:"n,omitempty"`         // count (one count), probability
	From      *int      `json:"from,omitempty"`      // count
	Counts    []string  `json:"counts,omitempty"`    // count: a_from, a_from+1, ...
	Claimed   *JSONEnds `json:"claimed,omitempty"`   // growth, probability as a decimal: the closed interval claimed
	Exact     string    `json:"exact,omitempty"`     // probability as a fraction
	Form      string    `json:"form,omitempty"`      // form
	Period    int       `json:"period,omitempty"`    // form, periodic with a given period
	LessThan  []string  `json:"less_than,omitempty"` // order
	Other     []string  `json:"other,omitempty"`     // equal-counts
	To        *int      `json:"to,omitempty"`        // equal-counts
	Note      string    `json:"note,omitempty"`      // the manifest's note
}

// JSONEnds is a closed interval; a missing end is unbounded.
type JSONEnds struct {
	Lo *string `json:"lo"`
	Hi *string `json:"hi"`
}

// JSONEnclosure is a checked enclosure of a quantity of a set, its ends
// rounded outward.
type JSONEnclosure struct {
	Patterns []string `json:"patterns"`
	Quantity string   `json:"quantity"`
	JSONEnds
}

// JSONCertRef names a certificate: its path relative to the manifest's
// folder (absolute when it lies outside that folder) and its SHA-256.
type JSONCertRef struct {
	Patterns []string `json:"patterns"`
	Path     string   `json:"path,omitempty"`
	SHA256   string   `json:"sha256"`
}

// JSON is the JSON line of a result.
func (r Result) JSON() JSONLine {
	l := JSONLine{Format: JSONFormat, Version: JSONVersion, ID: r.ID, Kind: r.Kind, Manifest: r.Manifest, Line: r.Line,
		Claim: restated(r.Claim), Verdict: r.Verdict, Evidence: r.Evidence, Cached: r.Cached,
		Seconds: r.Elapsed.Seconds(), Certificates: []JSONCertRef{}}
	sets := [][]string{r.Claim.Set.Strings(), r.Claim.Other.Strings()}
	for i, q := range r.Certified {
		l.Certified = append(l.Certified, JSONEnclosure{Patterns: sets[min(i, 1)], Quantity: r.Claim.Quantity(), JSONEnds: endsOf(q)})
	}
	for _, c := range r.Certificates {
		l.Certificates = append(l.Certificates, JSONCertRef{Patterns: c.Patterns, Path: shownPath(r.Manifest, c.Path), SHA256: c.SHA256})
	}
	return l
}

// restated is the claim as the manifest states it.
func restated(c Claim) JSONClaim {
	j := JSONClaim{Patterns: c.Set.Strings(), Quantity: c.Quantity(), Statement: c.Statement(), Note: c.Note}
	switch c.Kind {
	case KindCount:
		if len(c.Counts) == 1 {
			j.N = &c.From
		} else {
			j.From = &c.From
		}
		for _, v := range c.Counts {
			j.Counts = append(j.Counts, v.String())
		}
	case KindForm:
		j.Form, j.Period = c.Form, c.Period
	case KindOrder:
		j.LessThan = c.Other.Strings()
	case KindEqualCounts:
		j.Other, j.To = c.Other.Strings(), &c.To
	case KindProbability:
		j.N = &c.N
		if c.Exact != nil {
			j.Exact = c.Stated
		}
	}
	if lo, hi, ok := c.claimedEnds(); ok {
		j.Claimed = &JSONEnds{Lo: &lo, Hi: &hi}
	}
	return j
}

// endsOf writes an enclosure outward, with a few digits more than its
// ends share (8 at least, 60 at most).
func endsOf(q bounds.Enclosure) JSONEnds {
	digits := 8
	if q.Finite() && q.Lo.Sign() > 0 {
		digits = min(max(interval.CommonDigits(q.Lo, q.Hi)+3, 8), 60)
	}
	var e JSONEnds
	e.Lo, e.Hi = interval.DecimalEnds(q.Lo, q.Hi, digits)
	return e
}

// shownPath is a certificate's path relative to the manifest's folder, or
// absolute when it lies outside that folder (or the folder is unknown):
// never relative to wherever the gate ran.
func shownPath(manifest, path string) string {
	if path == "" {
		return ""
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return path
	}
	base, err := filepath.Abs(filepath.Dir(manifest))
	if err != nil {
		return abs
	}
	rel, err := filepath.Rel(base, abs)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return abs
	}
	return filepath.ToSlash(rel)
}

// WriteJSON writes one JSON object per claim, one per line.
func WriteJSON(w io.Writer, results []Result) error {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	for _, r := range results {
		if err := enc.Encode(r.JSON()); err != nil {
			return err
		}
	}
	return nil
}
