package report

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// The figures' colours.
var (
	blue   = color.RGBA{R: 31, G: 90, B: 160, A: 255}
	orange = color.RGBA{R: 200, G: 80, B: 30, A: 255}
	grey   = color.RGBA{R: 90, G: 90, B: 90, A: 255}
)

// WidthFigure (and RatioFigure) return nil without error when there is
// nothing to draw (lambda exact or 0, a_n = 0 from some n on).

// WidthFigure is the SVG of the width of the certified enclosure of lambda
// against n, on a logarithmic scale, with the fitted rate.
func (r *Certificate) WidthFigure() ([]byte, error) { return svgOfPlot(r.widthPlot()) }

// RatioFigure is the SVG of the ratios of exact counts against the
// certificate, on one logarithmic axis against n: the distance of each
// ratio from lambda (from lambda^d for step d) while it lies outside the
// certified range, the ratios inside it marked on the line of the range's
// half-width (the certificate's resolution), and half the width of the
// recomputed bracket after each bracket, so that at every n the naive
// estimate and the certified bracket can be compared.
func (r *Certificate) RatioFigure() ([]byte, error) { return svgOfPlot(r.ratioPlot()) }

// svgOfPlot is svgOf for a plot that may be nil (nothing to draw).
func svgOfPlot(p *plot.Plot, err error) ([]byte, error) {
	if p == nil || err != nil {
		return nil, err
	}
	return svgOf(p)
}

func (r *Certificate) widthPlot() (*plot.Plot, error) {
	if len(r.Widths) == 0 {
		return nil, nil // no bracket of positive width to draw
	}
	p := decadePlot("Width of the certified bracket of λ (recomputed)", "n (length of the iterate G_n)", "hi − lo (log scale)")
	pts := xys(r.Widths)
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return nil, err
	}
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	sc.GlyphStyle.Radius = vg.Points(2.5)
	sc.GlyphStyle.Color = blue
	p.Add(plotter.NewGrid(), sc)
	p.Legend.Add("width after each bracket", sc)
	if !math.IsNaN(r.Rate) && len(pts) > 1 {
		last := pts[len(pts)-1]
		fit := make(plotter.XYs, len(pts))
		for i, q := range pts {
			fit[i] = plotter.XY{X: q.X, Y: last.Y + math.Log10(r.Rate)*(q.X-last.X)}
		}
		l, err := plotter.NewLine(fit)
		if err != nil {
			return nil, err
		}
		l.Color = orange
		l.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		p.Add(l)
		p.Legend.Add(fmt.Sprintf("fitted rate %.3g per step of n (estimate)", r.Rate), l)
	}
	return p, nil
}

func (r *Certificate) ratioPlot() (*plot.Plot, error) {
	if len(r.Ratios) == 0 {
		return nil, nil // no ratio to draw
	}
	target := "λ"
	if r.RatioStep > 1 {
		target = fmt.Sprintf("λ^%d", r.RatioStep)
	}
	p := decadePlot("Ratios of exact counts approaching "+target+", against the certificate", "n", "distance from "+target+" (log scale)")
	p.Add(plotter.NewGrid())
	var outside, inside plotter.XYs
	for _, q := range r.Ratios {
		switch {
		case !q.Inside:
			outside = append(outside, plotter.XY{X: float64(q.N), Y: q.Log10})
		case !math.IsNaN(r.HalfWidth):
			inside = append(inside, plotter.XY{X: float64(q.N), Y: r.HalfWidth})
		}
	}
	if !math.IsNaN(r.HalfWidth) {
		first, last := float64(r.Ratios[0].N), float64(r.Ratios[len(r.Ratios)-1].N)
		hl, err := plotter.NewLine(plotter.XYs{{X: first, Y: r.HalfWidth}, {X: last, Y: r.HalfWidth}})
		if err != nil {
			return nil, err
		}
		hl.Color, hl.Width = orange, vg.Points(1.5)
		hl.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		p.Add(hl)
		p.Legend.Add(fmt.Sprintf("half the width of the certified range of %s (%s)", target, decade(r.HalfWidth)), hl)
	}
	if len(r.Widths) > 0 && r.RatioStep == 1 {
		half := make(plotter.XYs, len(r.Widths))
		for i, w := range r.Widths {
			half[i] = plotter.XY{X: float64(w.N), Y: w.Log10 - math.Log10(2)}
		}
		sc, err := plotter.NewScatter(half)
		if err != nil {
			return nil, err
		}
		sc.GlyphStyle = draw.GlyphStyle{Shape: draw.BoxGlyph{}, Radius: vg.Points(2.5), Color: blue}
		p.Add(sc)
		p.Legend.Add("half the width of the bracket after each bracket at n (recomputed run)", sc)
	}
	if len(outside) > 0 {
		l, sc, err := plotter.NewLinePoints(outside)
		if err != nil {
			return nil, err
		}
		l.Color = grey
		sc.GlyphStyle = draw.GlyphStyle{Shape: draw.CircleGlyph{}, Radius: vg.Points(2), Color: color.Black}
		p.Add(l, sc)
		p.Legend.Add(fmt.Sprintf("distance of the ratio from %s, outside the certified range", target), l, sc)
	}
	if len(inside) > 0 {
		sc, err := plotter.NewScatter(inside)
		if err != nil {
			return nil, err
		}
		sc.GlyphStyle = draw.GlyphStyle{Shape: draw.RingGlyph{}, Radius: vg.Points(2.5), Color: color.Black}
		p.Add(sc)
		p.Legend.Add("ratio inside the certified range (closer than it resolves)", sc)
	}
	return p, nil
}

func xys(ps []Point) plotter.XYs {
	out := make(plotter.XYs, len(ps))
	for i, q := range ps {
		out[i] = plotter.XY{X: float64(q.N), Y: q.Log10}
	}
	return out
}
