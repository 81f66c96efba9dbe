package report

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"html"
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"avoidcert/internal/input"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prob"
	"avoidcert/prove"
	"avoidcert/series"
)

// shown is a tail probability for a table: an exact one as its outward
// interval, an approximation marked ~.
func shownProbability(v series.Probability) string {
	if v.Approx != "" {
		return "~" + v.Approx
	}
	if v.Lo == v.Hi {
		return v.Lo
	}
	return "[" + v.Lo + ", " + v.Hi + "]"
}

// Series is a series run for a report: the run as recorded, its means and
// variances recomputed and found equal, and the avoidance probabilities of
// the patterns seen 0 times derived again in this run.
type Series struct {
	Name string
	Run  series.Run
	// Avoidance[i] is item i's avoidance probability derived here (exact,
	// or from a certificate the checker accepted while the report was
	// made), "" for items seen at least once; Derived[i] the same as data
	// (nil for those items).
	Avoidance []string
	Derived   []*series.Avoidance
}

// IsSeriesJSON reports whether data is the JSON of 'avoidcert series'.
func IsSeriesJSON(data []byte) bool {
	var probe struct {
		Format string `json:"format"`
	}
	return json.Unmarshal(bytes.TrimSpace(data), &probe) == nil && probe.Format == series.RunFormat
}

// seriesDigits are the significant digits of the avoidance probabilities a
// report derives.
const seriesDigits = 6

// FromSeries reads the JSON of 'avoidcert series --json', strictly. It
// recomputes every item's exact mean and variance from its patterns, the
// number of values and the delay, and refuses a run whose recorded ones
// differ (edited, or from another version). The avoidance probability of
// an item seen 0 times is derived again (prob.AvoidAll: exact, or from a
// certificate the checker accepts in this run), never taken from the file.
// The tails are restated as recorded, and the page says so.
func FromSeries(ctx context.Context, name string, data []byte) (*Series, error) {
	s := &Series{Name: name}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&s.Run); err != nil {
		return nil, fmt.Errorf("%s: not the JSON of 'avoidcert series': %s", name, input.JSONProblem(err))
	}
	r := &s.Run
	switch {
	case r.Version != series.RunVersion:
		return nil, fmt.Errorf("%s: series format version %d; this report reads version %d", name, r.Version, series.RunVersion)
	case r.Delay < 1 || r.Input.Values < 0 || len(r.Items) == 0:
		return nil, fmt.Errorf("%s: a series run without values, delay or patterns", name)
	}
	lengths := prob.Interleave(int(r.Input.Values), r.Delay)
	for _, it := range r.Items {
		set, err := pattern.ParseSet(it.Patterns)
		if err != nil {
			return nil, fmt.Errorf("%s: pattern %s: %v", name, it.Pattern, err)
		}
		m := prob.InterleavedMoments(set, lengths)
		if m.Mean.RatString() != it.Mean || m.Variance.RatString() != it.Variance {
			return nil, fmt.Errorf("%s: pattern %s: the recorded mean %s and variance %s are not those of %d values with delay %d (%s and %s): edited, or from another version",
				name, it.Pattern, it.Mean, it.Variance, r.Input.Values, r.Delay, m.Mean.RatString(), m.Variance.RatString())
		}
		var d *series.Avoidance
		av := ""
		if it.Observed == 0 && it.Avoidance != nil {
			a, err := prob.AvoidAll(ctx, set, lengths, prove.DefaultMaxMemory, 1e-6, prove.Options{})
			if err != nil {
				return nil, fmt.Errorf("%s: pattern %s: %v", name, it.Pattern, err)
			}
			if a.Exact != nil {
				d = &series.Avoidance{Method: "exact", Lo: interval.DecimalDown(a.Exact, seriesDigits), Hi: interval.DecimalUp(a.Exact, seriesDigits),
					Note: "counted by the engine and the checker, agreeing"}
			} else {
				d = &series.Avoidance{Method: "certified", Lo: a.Interval.Lo.Decimal(seriesDigits, false), Hi: a.Interval.Hi.Decimal(seriesDigits, true),
					Note: "from a certificate the checker accepted while this report was made"}
			}
			av = fmt.Sprintf("[%s, %s], %s (%s)", d.Lo, d.Hi, d.Method, d.Note)
		}
		s.Avoidance, s.Derived = append(s.Avoidance, av), append(s.Derived, d)
	}
	return s, nil
}

// seriesNote says what the report did with a series run.
const seriesNote = "Counts and tail probabilities as the series run recorded them; this report recomputed every " +
	"exact mean and variance (they agree) and derived the avoidance probabilities again, but did not re-read the data."

func (s *Series) title() string {
	r := s.Run
	src := r.Input.File
	if r.Input.Column != "" {
		src += ", column " + r.Input.Column
	}
	t := fmt.Sprintf("Data series %s: %d values, delay %d, ties: %d tied windows (policy %s", src, r.Input.Values, r.Delay, r.Ties.TiedWindows, r.Ties.Policy)
	if r.Ties.Seed != "" {
		t += ", seed " + r.Ties.Seed
	}
	return t + ")"
}

// rows are the table's cells, plain text.
func (s *Series) rows() [][]string {
	var out [][]string
	for _, it := range s.Run.Items {
		rng := "-"
		if c := it.Tails.Central95; c != nil {
			rng = fmt.Sprintf("%d..%d", c.Lo, c.Hi)
		}
		out = append(out, []string{it.Pattern, fmt.Sprint(it.Windows), fmt.Sprint(it.Observed), shortDecimal(it.MeanDecimal), it.SD,
			shownProbability(it.Tails.AtMost), shownProbability(it.Tails.AtLeast), it.Tails.Method, rng})
	}
	return out
}

var seriesHeader = []string{"pattern", "windows", "observed", "mean", "sd", "P(count ≤ observed)", "P(count ≥ observed)", "tails", "exact 95% range"}

func shortDecimal(s string) string {
	var x float64
	if _, err := fmt.Sscan(s, &x); err != nil {
		return s
	}
	return fmt.Sprintf("%.6g", x)
}

func (s *Series) avoidanceLines() []string {
	var out []string
	for i, a := range s.Avoidance {
		if a != "" {
			out = append(out, fmt.Sprintf("P(no window matches %s) in %s", s.Run.Items[i].Pattern, a))
		}
	}
	return out
}

func (s *Series) markdown() string {
	var b strings.Builder
	fmt.Fprintf(&b, "## %s\n\n%s\n\n| %s |\n|%s\n", s.title(), seriesNote, strings.Join(seriesHeader, " | "), strings.Repeat("---|", len(seriesHeader)))
	for _, row := range s.rows() {
		fmt.Fprintf(&b, "| %s |\n", strings.Join(row, " | "))
	}
	b.WriteString("\n")
	for _, l := range s.avoidanceLines() {
		fmt.Fprintf(&b, "- %s\n", l)
	}
	for _, n := range s.Run.Notes {
		fmt.Fprintf(&b, "- Note: %s\n", n)
	}
	b.WriteString("\n")
	return b.String()
}

func (s *Series) html() (string, error) {
	var b strings.Builder
	fmt.Fprintf(&b, "<h2>%s</h2>\n<p>%s</p>\n", html.EscapeString(s.title()), seriesNote)
	fig, err := s.Figure()
	if err != nil {
		return "", err
	}
	b.WriteString(figure(fig, "Observed count of each pattern (bars) against its exact mean under i.i.d. continuous draws (dots), with the exact central 95% range of the count (lines) where the exact law was computed; patterns with a normal approximation have no range drawn.",
		"No figure: no pattern to draw."))
	b.WriteString("<table>\n<tr>")
	for _, h := range seriesHeader {
		fmt.Fprintf(&b, "<th>%s</th>", html.EscapeString(h))
	}
	b.WriteString("</tr>\n")
	for _, row := range s.rows() {
		b.WriteString("<tr>")
		for _, c := range row {
			fmt.Fprintf(&b, "<td>%s</td>", html.EscapeString(c))
		}
		b.WriteString("</tr>\n")
	}
	b.WriteString("</table>\n<ul>\n")
	for _, l := range s.avoidanceLines() {
		fmt.Fprintf(&b, "<li>%s</li>\n", html.EscapeString(l))
	}
	for _, n := range s.Run.Notes {
		fmt.Fprintf(&b, "<li>Note: %s</li>\n", html.EscapeString(n))
	}
	b.WriteString("</ul>\n")
	return b.String(), nil
}

func (s *Series) tex() string {
	var b strings.Builder
	fmt.Fprintf(&b, "\n\\paragraph{%s.}\n%s\n", texText(s.title()), texText(seriesNote))
	// two tables of five columns each: nine side by side do not fit a page
	var counts, tails [][]string
	for _, row := range s.rows() {
		cells := make([]string, len(row))
		for i, c := range row {
			cells[i] = texWords(c)
		}
		counts = append(counts, cells[:5])
		tails = append(tails, append([]string{cells[0]}, cells[5:]...))
	}
	b.WriteString(texTable("lrrrr", []string{"pattern", "windows", "observed", "mean", "sd"}, counts, false))
	b.WriteString(texTable(`@{}p{0.12\linewidth}p{0.22\linewidth}p{0.22\linewidth}p{0.14\linewidth}p{0.16\linewidth}@{}`,
		[]string{"pattern", "$P(X \\le x)$", "$P(X \\ge x)$", "tails", "95\\% range"}, tails, true))
	for _, l := range s.avoidanceLines() {
		fmt.Fprintf(&b, "\\noindent %s.\n\n", texText(l))
	}
	for _, n := range s.Run.Notes {
		fmt.Fprintf(&b, "\\noindent Note: %s.\n\n", texText(n))
	}
	return b.String()
}

// Figure is the SVG of the observed count of each pattern against its
// exact mean, with the exact central 95% range where the run has it.
func (s *Series) Figure() ([]byte, error) {
	if len(s.Run.Items) == 0 {
		return nil, nil
	}
	p, err := s.figure()
	if err != nil {
		return nil, err
	}
	return svgOf(p)
}

func (s *Series) figure() (*plot.Plot, error) {
	items := s.Run.Items
	p := plot.New()
	p.Title.Text = "Observed counts against i.i.d. continuous draws"
	p.Y.Label.Text = "windows matching"
	p.X.Label.Text = "pattern"
	observed := make(plotter.Values, len(items))
	var means plotter.XYs
	var ranges plotter.XYs
	var errs plotter.YErrors
	names := make([]string, len(items))
	for i, it := range items {
		observed[i] = float64(it.Observed)
		names[i] = it.Pattern
		var mean float64
		fmt.Sscan(it.MeanDecimal, &mean)
		means = append(means, plotter.XY{X: float64(i), Y: mean})
		if c := it.Tails.Central95; c != nil {
			mid := (float64(c.Lo) + float64(c.Hi)) / 2
			ranges = append(ranges, plotter.XY{X: float64(i), Y: mid})
			errs = append(errs, struct{ Low, High float64 }{mid - float64(c.Lo), float64(c.Hi) - mid})
		}
	}
	width := vg.Length(math.Max(1, math.Min(12, 400/float64(len(items))))) * vg.Points(1)
	bars, err := plotter.NewBarChart(observed, width)
	if err != nil {
		return nil, err
	}
	bars.Color = color.RGBA{R: 150, G: 180, B: 220, A: 255}
	bars.LineStyle.Width = 0
	p.Add(bars)
	p.Legend.Add("observed", bars)
	if len(ranges) > 0 {
		eb, err := plotter.NewYErrorBars(struct {
			plotter.XYer
			plotter.YErrorer
		}{ranges, errs})
		if err != nil {
			return nil, err
		}
		eb.LineStyle.Color = color.RGBA{R: 200, G: 80, B: 30, A: 255}
		eb.LineStyle.Width = vg.Points(1.2)
		p.Add(eb)
		p.Legend.Add("exact central 95% range", rangeThumb{eb.LineStyle})
	}
	sc, err := plotter.NewScatter(means)
	if err != nil {
		return nil, err
	}
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	sc.GlyphStyle.Radius = vg.Points(math.Min(3, math.Max(1, 150/float64(len(items)))))
	sc.GlyphStyle.Color = color.RGBA{R: 20, G: 20, B: 20, A: 255}
	p.Add(sc)
	p.Legend.Add("exact mean", sc)
	if !nameAxis(p, names) {
		p.X.Label.Text = "pattern, by lexicographic rank (names in the table)"
	}
	top := 0.0
	for i, it := range items {
		top = math.Max(top, math.Max(observed[i], means[i].Y))
		if c := it.Tails.Central95; c != nil {
			top = math.Max(top, float64(c.Hi))
		}
	}
	p.Y.Min, p.Y.Max = 0, math.Max(1, top*1.05)
	p.Add(plotter.NewGrid())
	return p, nil
}

// rangeThumb is the legend's mark of a range: a vertical line.
type rangeThumb struct{ style draw.LineStyle }

func (r rangeThumb) Thumbnail(c *draw.Canvas) {
	x := (c.Min.X + c.Max.X) / 2
	c.StrokeLine2(r.style, x, c.Min.Y, x, c.Max.Y)
}
