package report

import (
	"bytes"
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"
)

// Figure sizes: wide enough for a page column, tall enough for tick
// labels; a second panel (a census's zoom) and the legend's strip below
// the plots add to the height.
const (
	figWidth    = 16 * vg.Centimeter
	figHeight   = 9 * vg.Centimeter
	panelHeight = 7 * vg.Centimeter // every panel after the first
	legendGap   = 6 * vg.Millimeter // between a plot's x-axis label and what follows
)

// layout is where a figure's parts go: its plots (title, axes, labels and
// data) stacked from the top, the legend in a strip of its own below them,
// so that no legend entry covers a point, a line or an axis label,
// whatever the data.
type layout struct {
	width, height vg.Length
	panels        []panel      // top to bottom
	legend        vg.Rectangle // the legend's entries (empty when it has none)
}

// panel is one plot's place: the whole plot and its data area.
type panel struct {
	plot vg.Rectangle // the plot, axes and labels included
	data vg.Rectangle // the data area, inside plot
}

// arrange lays out plots ps and legend lg (the plots' own legends must be
// empty: they would be drawn inside the axes).
func arrange(lg *plot.Legend, ps ...*plot.Plot) layout {
	l := layout{width: figWidth}
	heights := make([]vg.Length, len(ps))
	for i := range ps {
		heights[i] = panelHeight
		if i == 0 {
			heights[i] = figHeight
		}
		if i > 0 {
			l.height += legendGap
		}
		l.height += heights[i]
	}
	lsize := lg.Rectangle(draw.Canvas{}).Size()
	hasLegend := lsize.Y > 0
	if hasLegend {
		lsize.Y += lg.TextStyle.FontExtents().Descent
		l.height += legendGap + lsize.Y
	}
	top := l.height
	for i, p := range ps {
		r := vg.Rectangle{Min: vg.Point{Y: top - heights[i]}, Max: vg.Point{X: l.width, Y: top}}
		l.panels = append(l.panels, panel{plot: r, data: p.DataCanvas(draw.Canvas{Rectangle: r}).Rectangle})
		top = r.Min.Y - legendGap
	}
	if hasLegend {
		// aligned with the first data area's left edge, below the plots
		min := vg.Point{X: l.panels[0].data.Min.X, Y: top - lsize.Y}
		l.legend = vg.Rectangle{Min: min, Max: min.Add(lsize)}
	}
	return l
}

// place takes the first plot's legend out of it (to be drawn below the
// plots, in a smaller type) and lays them out.
func place(ps ...*plot.Plot) (layout, plot.Legend) {
	lg := ps[0].Legend
	ps[0].Legend = plot.NewLegend()
	lg.TextStyle.Font.Size = vg.Points(10)
	lg.Padding = vg.Points(2)
	lg.Top, lg.Left = true, true
	return arrange(&lg, ps...), lg
}

// svgOf draws plots ps, stacked, with the first one's legend below them
// (see layout) and returns the SVG element, the XML prologue dropped so
// that it can stand inside HTML. It empties the first plot's legend.
func svgOf(ps ...*plot.Plot) ([]byte, error) {
	l, lg := place(ps...)
	c := vgsvg.New(l.width, l.height)
	dc := draw.New(c)
	for i, p := range ps {
		p.Draw(draw.Canvas{Canvas: dc, Rectangle: l.panels[i].plot})
	}
	if l.legend.Size().Y > 0 {
		lg.Draw(draw.Canvas{Canvas: dc, Rectangle: l.legend})
	}
	var b bytes.Buffer
	if _, err := c.WriteTo(&b); err != nil {
		return nil, err
	}
	out := b.Bytes()
	if i := bytes.Index(out, []byte("<svg")); i > 0 {
		out = out[i:]
	}
	return out, nil
}

// nameAxis writes names under the x axis of p (item i at x = i): level up
// to 12, turned upright up to 60. It reports false, leaving the axis alone,
// for more: the caller then labels by rank.
func nameAxis(p *plot.Plot, names []string) bool {
	if len(names) > 60 {
		return false
	}
	p.NominalX(names...)
	if len(names) > 12 {
		p.X.Tick.Label.Rotation = math.Pi / 2
		p.X.Tick.Label.XAlign, p.X.Tick.Label.YAlign = draw.XRight, draw.YCenter
	}
	return true
}

// decadePlot is a plot whose y values are base-10 logarithms, drawn on a
// linear axis marked at the powers of ten they stand for ("1e-12"), so
// that values far below the smallest float64 still have a place.
func decadePlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text, p.X.Label.Text, p.Y.Label.Text = title, x, y
	p.Y.Tick.Marker = decadeTicks{}
	return p
}

// decadeTicks marks every integer of a log10 axis, labelling at most
// about eight of them.
type decadeTicks struct{}

func (decadeTicks) Ticks(min, max float64) []plot.Tick {
	if !(max >= min) || math.IsInf(max, 0) || math.IsInf(min, 0) {
		return nil // an empty figure: nothing to mark
	}
	lo, hi := int(math.Floor(min)), int(math.Ceil(max))
	step := (hi-lo)/8 + 1
	var ts []plot.Tick
	for e := lo; e <= hi; e++ {
		t := plot.Tick{Value: float64(e)}
		if e%step == 0 {
			t.Label = fmt.Sprintf("1e%d", e)
		}
		ts = append(ts, t)
	}
	return ts
}

// decade formats 10^x in the figures' style, "3.1e-15" (x any size).
func decade(x float64) string {
	e := math.Floor(x)
	m := math.Pow(10, x-e)
	if m >= 9.95 { // rounds to 10
		m, e = 1, e+1
	}
	return fmt.Sprintf("%.2ge%d", m, int(e))
}
