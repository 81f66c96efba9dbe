package report

import (
	"avoidcert/census"
	"bytes"
	"fmt"
	"image/color"
	"math"
	"math/big"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Figure sizes: wide enough for a page column, tall enough for tick labels.
const (
	figWidth  = 16 * vg.Centimeter
	figHeight = 9 * vg.Centimeter
)

// WidthFigure (and RatioFigure) return nil without error when there is
// nothing to draw (lambda exact or 0, a_n = 0 from some n on).

// WidthFigure is the SVG of the width of the certified enclosure of lambda
// against n, on a logarithmic scale, with the fitted rate.
func (r *Certificate) WidthFigure() ([]byte, error) {
	if len(r.Widths) == 0 {
		return nil, nil // no bracket of positive width to draw
	}
	p := logPlot("Width of the certified bracket of λ (recomputed)", "n (length of the iterate G_n)", "hi − lo (log scale)")
	pts := xys(r.Widths)
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return nil, err
	}
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	sc.GlyphStyle.Radius = vg.Points(2.5)
	sc.GlyphStyle.Color = color.RGBA{R: 31, G: 90, B: 160, A: 255}
	p.Add(sc, plotter.NewGrid())
	p.Legend.Add("width after each bracket", sc)
	if !math.IsNaN(r.Rate) && len(pts) > 1 {
		last := pts[len(pts)-1]
		fit := make(plotter.XYs, len(pts))
		for i, q := range pts {
			fit[i] = plotter.XY{X: q.X, Y: last.Y * math.Pow(r.Rate, q.X-last.X)}
		}
		l, err := plotter.NewLine(fit)
		if err != nil {
			return nil, err
		}
		l.Color = color.RGBA{R: 200, G: 80, B: 30, A: 255}
		l.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		p.Add(l)
		p.Legend.Add(fmt.Sprintf("fitted rate %.3g per step of n (estimate)", r.Rate), l)
	}
	p.Legend.Top = true
	return svgOf(p)
}

// RatioFigure is the SVG of |a_(n+1)/((n+1) a_n) - lambda| against n (log
// scale), lambda the midpoint of the certified range, with the range's
// half-width: points below that line lie inside the certified range.
func (r *Certificate) RatioFigure() ([]byte, error) {
	p := logPlot("Ratio a_(n+1)/((n+1)·a_n) of exact counts approaching λ", "n", "|ratio − λ| (log scale)")
	pts := xys(r.Ratios)
	if len(pts) == 0 {
		return nil, nil // no ratio to draw
	}
	l, sc, err := plotter.NewLinePoints(pts)
	if err != nil {
		return nil, err
	}
	sc.Shape = draw.CircleGlyph{}
	sc.Radius = vg.Points(2)
	p.Add(l, sc, plotter.NewGrid())
	p.Legend.Add("distance of the ratio from λ", l, sc)
	if r.HalfWidth > 0 {
		bl, err := plotter.NewLine(plotter.XYs{{X: pts[0].X, Y: r.HalfWidth}, {X: pts[len(pts)-1].X, Y: r.HalfWidth}})
		if err != nil {
			return nil, err
		}
		bl.Color = color.RGBA{R: 200, G: 80, B: 30, A: 255}
		bl.Width = vg.Points(1.5)
		bl.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		p.Add(bl)
		p.Legend.Add("half-width of the certified range of λ", bl)
	}
	p.Legend.Top = true
	return svgOf(p)
}

// logPlot is a plot with a logarithmic y axis marked at powers of ten.
func logPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text, p.X.Label.Text, p.Y.Label.Text = title, x, y
	p.Y.Scale = plot.LogScale{}
	p.Y.Tick.Marker = powerTicks{}
	return p
}

// powerTicks marks the powers of ten of a logarithmic axis, labelling at
// most about eight of them ("1e-12").
type powerTicks struct{}

func (powerTicks) Ticks(min, max float64) []plot.Tick {
	if !(min > 0 && max >= min) || math.IsInf(max, 0) {
		return nil // an empty figure: nothing to mark
	}
	lo, hi := int(math.Floor(math.Log10(min))), int(math.Ceil(math.Log10(max)))
	step := (hi-lo)/8 + 1
	var ts []plot.Tick
	for e := lo; e <= hi; e++ {
		t := plot.Tick{Value: math.Pow(10, float64(e))}
		if e%step == 0 {
			t.Label = fmt.Sprintf("1e%d", e)
		}
		ts = append(ts, t)
	}
	return ts
}

func xys(ps []Point) plotter.XYs {
	out := make(plotter.XYs, len(ps))
	for i, q := range ps {
		out[i] = plotter.XY{X: float64(q.N), Y: q.Value}
	}
	return out
}

// svgOf renders p as an SVG element (the XML prologue dropped, so it can
// stand inside HTML).
func svgOf(p *plot.Plot) ([]byte, error) {
	w, err := p.WriterTo(figWidth, figHeight, "svg")
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	if _, err := w.WriteTo(&b); err != nil {
		return nil, err
	}
	out := b.Bytes()
	if i := bytes.Index(out, []byte("<svg")); i > 0 {
		out = out[i:]
	}
	return out, nil
}

// groupColors mark the count groups with more than one class.
var groupColors = []color.RGBA{{R: 200, G: 80, B: 30, A: 255}, {R: 40, G: 140, B: 60, A: 255}, {R: 140, G: 60, B: 160, A: 255}, {R: 20, G: 150, B: 170, A: 255}}

// LambdaFigure is the SVG of lambda by class, in the census's order, with
// the certified ranges as bars; classes of one count group (equal counts
// up to N) share a colour.
func (c *Census) LambdaFigure() ([]byte, error) {
	p := plot.New()
	p.Title.Text = fmt.Sprintf("Growth rate λ by class, length %d (certified ranges as bars)", c.Report.Params.Length)
	p.X.Label.Text = "class, ordered by λ (largest first)"
	p.Y.Label.Text = "λ"
	p.Add(plotter.NewGrid())
	group := c.groupOf()
	shared := map[int]census.Group{} // the groups of several classes, by id
	colour := map[int]color.RGBA{}
	for i, g := range c.sharedGroups() {
		shared[g.ID], colour[g.ID] = g, groupColors[i%len(groupColors)]
	}
	var names []string
	type series struct {
		pts  plotter.XYs
		errs plotter.YErrors
	}
	yMin, yMax := math.Inf(1), math.Inf(-1)
	bySeries := map[int]*series{} // by shared group id, -1 for classes alone in their group
	keys := []int{}
	for i, row := range c.Report.Rows {
		lo, _ := ratOf(row.Lambda.Lo)
		hi, _ := ratOf(row.Lambda.Hi)
		mid := (lo + hi) / 2
		k := -1
		if _, ok := shared[group[row.Representative]]; ok {
			k = group[row.Representative]
		}
		s := bySeries[k]
		if s == nil {
			s = &series{}
			bySeries[k] = s
			keys = append(keys, k)
		}
		s.pts = append(s.pts, plotter.XY{X: float64(i), Y: mid}) // NominalX puts name i at x = i
		yMin, yMax = math.Min(yMin, lo), math.Max(yMax, hi)
		s.errs = append(s.errs, struct{ Low, High float64 }{mid - lo, hi - mid})
		names = append(names, row.Representative)
	}
	sort.Ints(keys)
	legendGroups := 0
	for _, k := range keys {
		s := bySeries[k]
		sc, err := plotter.NewScatter(s.pts)
		if err != nil {
			return nil, err
		}
		sc.GlyphStyle.Shape = draw.CircleGlyph{}
		sc.GlyphStyle.Radius = vg.Points(3)
		eb, err := plotter.NewYErrorBars(struct {
			plotter.XYer
			plotter.YErrorer
		}{s.pts, s.errs})
		if err != nil {
			return nil, err
		}
		if k >= 0 {
			sc.GlyphStyle.Color, eb.LineStyle.Color = colour[k], colour[k]
			g := shared[k]
			if legendGroups++; legendGroups <= len(groupColors) {
				p.Legend.Add(fmt.Sprintf("count group %d: %s (equal a_0..a_%d)", g.ID, strings.Join(g.Classes, ", "), c.Report.Params.To), sc)
			}
		} else {
			sc.GlyphStyle.Color = color.RGBA{R: 31, G: 90, B: 160, A: 255}
			p.Legend.Add("class alone in its count group", sc)
		}
		p.Add(eb, sc)
	}
	entries := min(legendGroups, len(groupColors))
	if bySeries[-1] != nil {
		entries++
	}
	if more := legendGroups - len(groupColors); more > 0 {
		entries++
		p.Legend.Add(fmt.Sprintf("and %d more count groups of several classes (colours repeat; see the table)", more))
	}
	switch {
	case len(names) <= 12:
		p.NominalX(names...)
	case len(names) <= 60:
		p.NominalX(names...)
		p.X.Tick.Label.Rotation = math.Pi / 2
		p.X.Tick.Label.XAlign, p.X.Tick.Label.YAlign = draw.XRight, draw.YCenter
	default:
		p.X.Label.Text = "rank of the class, ordered by λ (largest first; names in the table)"
	}
	p.X.Min, p.X.Max = -0.5, float64(len(names))-0.5
	// room above the points for the legend, one line per entry
	if pad := (yMax - yMin) * 0.12 * float64(entries+1); pad > 0 {
		p.Y.Min, p.Y.Max = yMin-(yMax-yMin)*0.05, yMax+pad
	}
	p.Legend.Top = true
	p.Legend.Left = false
	return svgOf(p)
}

// ratOf reads a decimal end of a census range for drawing.
func ratOf(s string) (float64, bool) {
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		return math.NaN(), false
	}
	f, _ := r.Float64()
	return f, true
}
