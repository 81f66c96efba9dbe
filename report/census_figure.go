package report

import (
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

	"avoidcert/census"
)

// groupStyles mark the count groups of several classes, each by colour and
// shape (so that print in grey still tells them apart), when a census has
// at most this many; beyond, one style marks every class that shares its
// counts, and the table names the groups.
var groupStyles = []draw.GlyphStyle{
	{Color: orange, Shape: draw.PyramidGlyph{}},
	{Color: color.RGBA{R: 40, G: 140, B: 60, A: 255}, Shape: draw.BoxGlyph{}},
	{Color: color.RGBA{R: 140, G: 60, B: 160, A: 255}, Shape: draw.CrossGlyph{}},
	{Color: color.RGBA{R: 20, G: 150, B: 170, A: 255}, Shape: draw.PlusGlyph{}},
	{Color: color.RGBA{R: 170, G: 130, B: 0, A: 255}, Shape: draw.TriangleGlyph{}},
	{Color: color.RGBA{R: 200, G: 40, B: 110, A: 255}, Shape: draw.SquareGlyph{}},
}

// legendClasses is how many classes a legend entry names before "…".
const legendClasses = 6

// CensusFigure is the census's figure of lambda by class and what its
// caption must say about it.
type CensusFigure struct {
	SVG []byte
	// Bars reports that the certified ranges are drawn as bars in the
	// panel of all classes, ZoomBars in the zoom: a panel leaves them out
	// when even the widest would not show beyond its marker.
	Bars, ZoomBars bool
	// Widest is the largest width of a certified range of lambda, rounded
	// up to a power of ten ("1e-9"): every range is at most this wide. ""
	// when every range is a single value.
	Widest string
	// ZoomFrom and ZoomTo are the ranks (from 1) of the zoom panel, which
	// is drawn when the middle 90% of the classes take less than a tenth
	// of the full panel's height (a few extreme classes squeeze the rest
	// flat); both 0 without a zoom.
	ZoomFrom, ZoomTo int
}

// LambdaFigure draws lambda of each class against its rank, in the
// census's order, with the certified ranges as bars where they would be
// seen; the classes of one count group (equal a_0..a_N) share a colour and
// a shape when there are few groups, and one style marks every class that
// shares its counts when there are many. Markers shrink as classes grow in
// number (to 10,176 classes at length 8); names label the x axis up to 60
// classes, ranks beyond. When a few extreme classes squeeze the others
// flat, a second panel shows the middle 90% on their own scale.
func (c *Census) LambdaFigure() (*CensusFigure, error) {
	ps, f, err := c.lambdaPlots()
	if ps == nil || err != nil {
		return nil, err
	}
	if f.SVG, err = svgOf(ps...); err != nil {
		return nil, err
	}
	return f, nil
}

// classPoint is one class as drawn.
type classPoint struct {
	lo, hi float64
	style  styleKey
}

// lambdaPlots are LambdaFigure's panels, and the figure without its SVG.
func (c *Census) lambdaPlots() ([]*plot.Plot, *CensusFigure, error) {
	rows := c.Report.Rows
	if len(rows) == 0 {
		return nil, nil, nil
	}
	styleOf, legend := c.groupStyles()
	pts := make([]classPoint, len(rows))
	names := make([]string, len(rows))
	widest := new(big.Rat)
	for i, row := range rows {
		lo, hi, w, err := rangeOfRow(row)
		if err != nil {
			return nil, nil, err
		}
		if w.Cmp(widest) > 0 {
			widest = w
		}
		pts[i] = classPoint{lo, hi, styleOf(row.Representative)}
		names[i] = row.Representative
	}
	f := &CensusFigure{}
	if widest.Sign() > 0 {
		f.Widest = fmt.Sprintf("1e%d", int(math.Ceil(log10Rat(widest))))
	}
	wf, _ := widest.Float64()
	all := plot.New()
	all.Title.Text = fmt.Sprintf("Growth rate λ by class, length %d", c.Report.Params.Length)
	nameAxis(all, names) // beyond 60 classes, drawClasses labels by rank
	ps := []*plot.Plot{all}
	from, to := 0, len(rows)-1
	if z0, z1, ok := zoomOf(pts); ok {
		zoom := plot.New()
		zoom.Title.Text = fmt.Sprintf("Zoom: ranks %d to %d, the middle 90%% of the classes, on their own scale", z0+1, z1+1)
		ps = append(ps, zoom)
		f.ZoomFrom, f.ZoomTo = z0+1, z1+1
	}
	for i, p := range ps {
		if i == 1 {
			from, to = f.ZoomFrom-1, f.ZoomTo-1
		}
		bars, err := drawClasses(p, pts, from, to, wf, i > 0)
		if err != nil {
			return nil, nil, err
		}
		if i == 0 {
			f.Bars = bars
		} else {
			f.ZoomBars = bars
		}
	}
	radius := markerRadius(len(rows))
	for _, e := range legend {
		for _, q := range pts {
			if q.style.name == e.name {
				st := q.style.style
				st.Radius = max(radius, vg.Points(3)) // legible in the legend
				all.Legend.Add(e.text, thumb{st})
				break
			}
		}
	}
	return ps, f, nil
}

// zoomOf is the middle 90% of the classes (indices from, to) when they
// take less than a tenth of the span of all, for censuses of 40 classes
// or more.
func zoomOf(pts []classPoint) (from, to int, ok bool) {
	n := len(pts)
	if n < 40 {
		return 0, 0, false
	}
	from, to = n/20, n-1-n/20
	mid := func(q classPoint) float64 { return (q.lo + q.hi) / 2 }
	whole := pts[0].hi - pts[n-1].lo
	return from, to, mid(pts[from])-mid(pts[to]) < whole/10
}

// drawClasses adds the classes from..to of pts to p, ranks on the x axis
// (ranks from 1, as in the tables, when byRank or beyond 60 classes; else
// the names p was given), with bars when the widest range
// (widest, as a float) would show beyond a marker in p's data area.
// Classes that would land on one spot of the figure, in one style, are
// drawn once: a census of 10,176 classes gives a few thousand marks, not
// ten thousand, the same picture.
func drawClasses(p *plot.Plot, pts []classPoint, from, to int, widest float64, byRank bool) (bool, error) {
	p.Y.Label.Text = "λ"
	p.X.Label.Text = "class, ordered by λ (largest first)"
	if to-from+1 > 60 || byRank {
		p.X.Label.Text = "rank of the class, ordered by λ (largest first; names in the table)"
		p.X.Tick.Marker = rankTicks{}
	}
	p.Y.Tick.Marker = spanTicks{}
	p.Add(plotter.NewGrid())
	yMin, yMax := math.Inf(1), math.Inf(-1)
	for _, q := range pts[from : to+1] {
		yMin, yMax = math.Min(yMin, q.lo), math.Max(yMax, q.hi)
	}
	pad := (yMax - yMin) * 0.05
	if pad == 0 {
		pad = math.Max(math.Abs(yMax)*1e-3, 1e-3)
	}
	p.Y.Min, p.Y.Max = yMin-pad, yMax+pad
	p.X.Min, p.X.Max = float64(from)-0.5, float64(to)+0.5
	empty := plot.NewLegend()
	data := arrange(&empty, p).panels[0].data.Size()
	radius := markerRadius(len(pts))
	bars := widest/(p.Y.Max-p.Y.Min)*float64(data.Y) > 2*float64(radius)+1
	type series struct {
		style draw.GlyphStyle
		pts   plotter.XYs
		errs  plotter.YErrors
	}
	var order []string
	byStyle := map[string]*series{}
	type spot struct {
		x, y  int
		style string
	}
	seen := map[spot]bool{}
	cellX := float64(data.X) / (p.X.Max - p.X.Min) * 2 // half points
	cellY := float64(data.Y) / (p.Y.Max - p.Y.Min) * 2
	for i := from; i <= to; i++ {
		q := pts[i]
		mid := (q.lo + q.hi) / 2
		sp := spot{int(float64(i) * cellX), int((mid - p.Y.Min) * cellY), q.style.name}
		if seen[sp] && !bars {
			continue
		}
		seen[sp] = true
		s := byStyle[q.style.name]
		if s == nil {
			s = &series{style: q.style.style}
			s.style.Radius = radius
			byStyle[q.style.name] = s
			order = append(order, q.style.name)
		}
		s.pts = append(s.pts, plotter.XY{X: float64(i), Y: mid}) // NominalX puts name i at x = i
		s.errs = append(s.errs, struct{ Low, High float64 }{mid - q.lo, q.hi - mid})
	}
	// classes alone first, so that the marks of shared counts stay on top
	sort.SliceStable(order, func(i, j int) bool { return order[i] == "alone" && order[j] != "alone" })
	for _, name := range order {
		s := byStyle[name]
		if bars {
			eb, err := plotter.NewYErrorBars(struct {
				plotter.XYer
				plotter.YErrorer
			}{s.pts, s.errs})
			if err != nil {
				return false, err
			}
			eb.LineStyle.Color = s.style.Color
			p.Add(eb)
		}
		sc, err := plotter.NewScatter(s.pts)
		if err != nil {
			return false, err
		}
		sc.GlyphStyle = s.style
		p.Add(sc)
	}
	return bars, nil
}

// rankTicks labels an axis of row indices (from 0) with ranks (from 1).
type rankTicks struct{}

func (rankTicks) Ticks(lo, hi float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(lo+1, hi+1)
	for i := range ts {
		if ts[i].Label != "" {
			ts[i].Label = fmt.Sprintf("%.0f", ts[i].Value)
		}
		ts[i].Value--
	}
	return ts
}

// markerRadius shrinks the markers as the classes grow in number, so that
// neighbours stay apart up to a few hundred classes and the whole census
// reads as a curve beyond.
func markerRadius(classes int) vg.Length {
	switch {
	case classes <= 60:
		return vg.Points(3)
	case classes <= 400:
		return vg.Points(2)
	case classes <= 2000:
		return vg.Points(1.2)
	}
	return vg.Points(0.7)
}

// styleKey names a class's marker style and the style.
type styleKey struct {
	name  string
	style draw.GlyphStyle
}

// legendEntry is one line of the census figure's legend.
type legendEntry struct{ name, text string }

// groupStyles gives each class its marker style, and the legend in order.
func (c *Census) groupStyles() (func(rep string) styleKey, []legendEntry) {
	alone := styleKey{"alone", draw.GlyphStyle{Color: blue, Shape: draw.CircleGlyph{}}}
	group := c.groupOf()
	shared := c.sharedGroups()
	styles := map[int]styleKey{}
	legend := []legendEntry{{alone.name, "class alone in its count group"}}
	N := c.Report.Params.To
	if len(shared) <= len(groupStyles) {
		for i, g := range shared {
			k := styleKey{fmt.Sprintf("group %d", g.ID), groupStyles[i]}
			styles[g.ID] = k
			legend = append(legend, legendEntry{k.name, fmt.Sprintf("count group %d (equal a_0..a_%d): %s", g.ID, N, shortList(g.Classes))})
		}
	} else {
		k := styleKey{"shared", groupStyles[0]}
		for _, g := range shared {
			styles[g.ID] = k
		}
		legend = append(legend, legendEntry{k.name, fmt.Sprintf("class sharing a_0..a_%d with others: %d such count groups (the table names them)", N, len(shared))})
	}
	return func(rep string) styleKey {
		if k, ok := styles[group[rep]]; ok {
			return k
		}
		return alone
	}, legend
}

// shortList names a group's classes, the first few and how many.
func shortList(classes []string) string {
	if len(classes) <= legendClasses {
		return strings.Join(classes, ", ")
	}
	return fmt.Sprintf("%s, … (%d classes)", strings.Join(classes[:legendClasses-1], ", "), len(classes))
}

// rangeOfRow reads a census row's certified range of lambda for drawing:
// its ends as float64 and its exact width.
func rangeOfRow(row census.Row) (lo, hi float64, width *big.Rat, err error) {
	l, ok1 := new(big.Rat).SetString(row.Lambda.Lo)
	h, ok2 := new(big.Rat).SetString(row.Lambda.Hi)
	if !ok1 || !ok2 {
		return 0, 0, nil, fmt.Errorf("census row %s: lambda [%s, %s] is not a pair of decimals", row.Representative, row.Lambda.Lo, row.Lambda.Hi)
	}
	lo, _ = l.Float64()
	hi, _ = h.Float64()
	return lo, hi, h.Sub(h, l), nil
}

// thumb is a legend's mark of a marker style (a scatter's own thumbnail
// needs the scatter).
type thumb struct{ style draw.GlyphStyle }

func (t thumb) Thumbnail(c *draw.Canvas) {
	c.DrawGlyph(t.style, c.Center())
}

// spanTicks marks a linear axis with labels that show as many digits as
// the span needs, so that ticks 0.99981 and 0.99982 do not both read
// 0.9998.
type spanTicks struct{}

func (spanTicks) Ticks(lo, hi float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(lo, hi)
	if len(ts) == 0 || !(hi > lo) {
		return ts
	}
	var labelled []float64
	for _, t := range ts {
		if t.Label != "" {
			labelled = append(labelled, t.Value)
		}
	}
	step := hi - lo
	for i := 1; i < len(labelled); i++ {
		step = math.Min(step, labelled[i]-labelled[i-1])
	}
	digits := max(0, int(math.Ceil(-math.Log10(step)+1e-9)))
	for i := range ts {
		if ts[i].Label != "" {
			ts[i].Label = fmt.Sprintf("%.*f", digits, ts[i].Value)
		}
	}
	return ts
}
