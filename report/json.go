package report

import (
	"encoding/json"
	"io"
	"math"

	"avoidcert/census"
	"avoidcert/certify"
	"avoidcert/series"
)

// The document as data: 'avoidcert report --json' (docs/json.md; schema
// docs/schema/report.schema.json). It holds what the pages state, with
// the same standing: certified values read from certificates the checker
// accepted while the report was made, census tables as census.Verify
// derived them, a gate's lines as recorded (not re-checked), a series
// run's records with its avoidance probabilities derived again.
const (
	JSONFormat  = "avoidcert-report"
	JSONVersion = 1
)

type jsonDocument struct {
	Format       string            `json:"format"`
	Version      int               `json:"version"`
	Certificates []jsonCertificate `json:"certificates"`
	Censuses     []jsonCensus      `json:"censuses"`
	Gates        []jsonGate        `json:"gates"`
	Series       []jsonSeries      `json:"series"`
}

type jsonEnds struct {
	Lo *string `json:"lo"`
	Hi *string `json:"hi"`
}

type jsonAllN struct {
	N0  int     `json:"n0"`
	AN0 string  `json:"a_n0"`
	Lo  *string `json:"lo"`
	Hi  *string `json:"hi"`
}

type jsonPoint struct {
	N     int     `json:"n"`
	Log10 float64 `json:"log10"`
}

type jsonRatio struct {
	N             int      `json:"n"`
	Inside        bool     `json:"inside"`
	Log10Distance *float64 `json:"log10_distance"`
}

type jsonCertificate struct {
	File                string   `json:"file"`
	SHA256              string   `json:"sha256"`
	Tool                string   `json:"tool"`
	Patterns            []string `json:"patterns"`
	PatternsGiven       []string `json:"patterns_given"`
	Lambda              jsonEnds `json:"lambda"`
	Radius              jsonEnds `json:"radius"`
	LambdaDigits        int      `json:"lambda_digits"`
	StructureClass      string   `json:"structure_class"`
	PrimitivityExponent *int     `json:"primitivity_exponent"`
	Period              *int     `json:"period"`
	AsymptoticForm      string   `json:"asymptotic_form"`
	AllN                jsonAllN `json:"all_n"`
	Recheck             string   `json:"recheck"`
	// The figures' data, recomputed with the engine while the report was
	// made; WidthRate is an estimate.
	Widths         []jsonPoint `json:"widths"`
	WidthRate      *float64    `json:"width_rate_estimate"`
	RatioStep      int         `json:"ratio_step"`
	Ratios         []jsonRatio `json:"ratio_distances"`
	HalfWidthLog10 *float64    `json:"half_width_log10"`
}

type jsonCensus struct {
	Folder string         `json:"folder"`
	Census *census.Report `json:"census"`
}

type jsonGate struct {
	File   string      `json:"file"`
	Note   string      `json:"note"`
	Claims []GateClaim `json:"claims"`
}

type jsonSeries struct {
	File      string              `json:"file"`
	Note      string              `json:"note"`
	Run       series.Run          `json:"run"`
	Avoidance []*series.Avoidance `json:"avoidance_derived"`
}

// JSON writes the document as one JSON object on one line.
func JSON(w io.Writer, d *Document) error {
	out := jsonDocument{Format: JSONFormat, Version: JSONVersion,
		Certificates: []jsonCertificate{}, Censuses: []jsonCensus{}, Gates: []jsonGate{}, Series: []jsonSeries{}}
	for _, r := range d.Certificates {
		out.Certificates = append(out.Certificates, r.json())
	}
	for _, c := range d.Censuses {
		out.Censuses = append(out.Censuses, jsonCensus{Folder: c.Dir, Census: c.Report})
	}
	for _, g := range d.Gates {
		out.Gates = append(out.Gates, jsonGate{File: g.Name, Note: gateNote, Claims: g.Claims})
	}
	for _, s := range d.Series {
		out.Series = append(out.Series, jsonSeries{File: s.Name, Note: seriesNote, Run: s.Run, Avoidance: s.Derived})
	}
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	return enc.Encode(out)
}

func (r *Certificate) json() jsonCertificate {
	st := r.Cert.Statement
	b := r.Bound()
	j := jsonCertificate{File: r.Name, SHA256: r.Digest(), Tool: r.Cert.Tool, Patterns: r.Patterns(), PatternsGiven: st.Given,
		Lambda: endsOf(r.Lambda()), Radius: endsOf(r.Radius()), LambdaDigits: r.Digits,
		StructureClass: string(r.Form.Class), AsymptoticForm: r.Asymptotics(),
		AllN:    jsonAllN{N0: b.N0, AN0: st.AllN.AN0.String(), Lo: present(b.MuLo), Hi: present(b.MuHi)},
		Recheck: r.Recheck(), Widths: points(r.Widths), RatioStep: r.RatioStep, Ratios: ratios(r.Ratios), HalfWidthLog10: finite(r.HalfWidth)}
	switch r.Form.Class {
	case certify.ClassPrimitive:
		j.PrimitivityExponent = &r.Form.Exponent
	case certify.ClassPeriodic:
		j.Period = &r.Form.Period
	}
	if r.Rate > 0 { // NaN when the fit has too few points
		j.WidthRate = finite(r.Rate)
	}
	return j
}

// finite is &x, or nil (JSON null) for a value JSON cannot hold.
func finite(x float64) *float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return nil
	}
	return &x
}

// endsOf turns the printed ends of a range into JSON: "inf" (no upper
// end) is null.
func endsOf(lo, hi string) jsonEnds {
	e := jsonEnds{Lo: present(lo), Hi: present(hi)}
	if hi == "inf" {
		e.Hi = nil
	}
	return e
}

// present is s, or nil (JSON null) for "".
func present(s string) *string {
	if s == "" {
		return nil
	}
	return &s
}

// points are the widths as base-10 logarithms, those JSON can hold.
func points(ps []Point) []jsonPoint {
	out := []jsonPoint{}
	for _, p := range ps {
		if finite(p.Log10) != nil {
			out = append(out, jsonPoint{N: p.N, Log10: p.Log10})
		}
	}
	return out
}

// ratios are the ratios' distances from lambda^d as base-10 logarithms,
// null for a ratio inside the certified range.
func ratios(rs []Ratio) []jsonRatio {
	out := []jsonRatio{}
	for _, r := range rs {
		j := jsonRatio{N: r.N, Inside: r.Inside}
		if !r.Inside {
			if j.Log10Distance = finite(r.Log10); j.Log10Distance == nil {
				continue
			}
		}
		out = append(out, j)
	}
	return out
}
