package report

import (
	"bytes"
	"fmt"
	"image/color"
	"math"

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

// WidthFigure is the SVG of the width of the certified enclosure of lambda
// against n, on a logarithmic scale, with the fitted rate.
func (r *Certificate) WidthFigure() ([]byte, error) {
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
		return svgOf(p)
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
