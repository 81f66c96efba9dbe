package report

import (
	"context"
	"flag"
	"fmt"
	"math"
	"math/big"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/plot"

	"avoidcert/census"
)

var figuresDir = flag.String("figures", "", "write every figure of TestFigureLayout as SVG into this folder, to look at")

// unverifiedCensus reads a census.json for its figure's layout alone (its
// certificates are not in the repository, so census.Verify cannot run and
// nothing here is stated as certified).
func unverifiedCensus(t *testing.T, dir string) *Census {
	t.Helper()
	rep, err := census.ReadReport(context.Background(), dir)
	if err != nil {
		t.Fatal(err)
	}
	return &Census{Dir: dir, Report: rep}
}

// inventedCensus is a census with invented names, ranges and groups: data
// for the figure's layout only. Length 8 has 10,176 classes (Burnside:
// (8! + 2^4·4!)/4, reverse-complement fixing 2^4·4! permutations; our own
// count, the census of length 8 gives the same).
func inventedCensus(classes, digits, groupEvery int) *Census {
	rep := &census.Report{Params: census.Params{Length: 8, To: 20, Digits: digits}, Classes: classes}
	width := 1.0
	for range digits {
		width /= 10
	}
	for i := range classes {
		mid := 0.99999 - 2e-5*float64(i)/float64(classes)
		name := fmt.Sprintf("c%05d", i)
		rep.Rows = append(rep.Rows, census.Row{Representative: name, Members: []string{name},
			Lambda: census.Range{Lo: fmt.Sprintf("%.17f", mid-width/2), Hi: fmt.Sprintf("%.17f", mid+width/2)}})
		if groupEvery > 0 && i%groupEvery == 1 {
			g := &rep.Groups[len(rep.Groups)-1]
			g.Classes = append(g.Classes, name)
			continue
		}
		rep.Groups = append(rep.Groups, census.Group{ID: len(rep.Groups) + 1, Classes: []string{name}})
	}
	return &Census{Dir: "invented", Report: rep}
}

// Every figure keeps its legend in a strip below the plot, never over the
// data or an axis label, and no wider than the figure (a legend entry naming
// a group of 120 classes would run off the page); labelled y ticks are
// distinct (the λ of 1,272 classes of length 7 spans only 3e-5). Censuses of
// 8 and 32 classes (verified), 1,272 (docs/census-7, unverified: layout
// only), 32 and 10,176 (invented data) are drawn; the bars are drawn
// exactly when the widest certified range shows beyond its marker, and the
// census of length 7 gets its zoom on the middle 90% of its classes.
func TestFigureLayout(t *testing.T) {
	r := load(t, "cert-1342.json")[0]
	cen4, err := FromCensus(context.Background(), "testdata/census-4")
	if err != nil {
		t.Fatal(err)
	}
	// made with "avoidcert census --length 5 --to 16 --digits 8"
	cen5, err := FromCensus(context.Background(), "testdata/census-5")
	if err != nil {
		t.Fatal(err)
	}
	type fig struct {
		name  string
		plots func() ([]*plot.Plot, error)
	}
	one := func(name string, f func() (*plot.Plot, error)) fig {
		return fig{name, func() ([]*plot.Plot, error) {
			p, err := f()
			return []*plot.Plot{p}, err
		}}
	}
	// census figures, with the bars and the zoom (first rank) expected
	censusFig := func(name string, c *Census, bars, zoomBars bool, zoomFrom int) fig {
		return fig{name, func() ([]*plot.Plot, error) {
			ps, f, err := c.lambdaPlots()
			if err == nil && (f.Bars != bars || f.ZoomBars != zoomBars || f.ZoomFrom != zoomFrom) {
				t.Errorf("%s: bars %v, zoom bars %v, zoom from rank %d; want %v, %v, %d (widest range %s)",
					name, f.Bars, f.ZoomBars, f.ZoomFrom, bars, zoomBars, zoomFrom, f.Widest)
			}
			return ps, err
		}}
	}
	figs := []fig{
		one("width-1342", r.widthPlot),
		one("ratio-1342", r.ratioPlot),
		censusFig("census-4", cen4, false, false, 0),
		censusFig("census-5", cen5, false, false, 0),
		censusFig("census-7", unverifiedCensus(t, filepath.Join("..", "docs", "census-7")), false, false, 64),
		censusFig("invented-32-wide", inventedCensus(32, 6, 5), true, false, 0),
		censusFig("invented-10176", inventedCensus(10176, 10, 3), false, false, 0),
	}
	for _, s := range loadSeries(t, "series-levels-3.json") {
		figs = append(figs, one("series", s.figure))
	}
	for _, f := range figs {
		ps, err := f.plots()
		if err != nil || len(ps) == 0 || ps[0] == nil {
			t.Fatalf("%s: plots %v, error %v", f.name, ps, err)
		}
		l, _ := place(ps...)
		if l.legend.Size().Y <= 0 {
			t.Errorf("%s: no legend", f.name)
		}
		last := l.panels[len(l.panels)-1].plot
		if l.legend.Max.Y > last.Min.Y || l.legend.Min.Y < -1e-6 {
			t.Errorf("%s: legend %v not in its strip below the plots (the last %v)", f.name, l.legend, last)
		}
		if l.legend.Max.X > l.width {
			t.Errorf("%s: legend %.0f pt wide runs off the figure (%.0f pt)", f.name, l.legend.Max.X, l.width)
		}
		for i, pn := range l.panels {
			d, pl := pn.data, pn.plot
			if !(d.Min.X > pl.Min.X && d.Min.Y > pl.Min.Y && d.Max.X <= pl.Max.X && d.Max.Y < pl.Max.Y) {
				t.Errorf("%s: panel %d: data area %v not inside its plot %v with room for the axes", f.name, i, d, pl)
			}
			if i > 0 && pl.Max.Y > l.panels[i-1].plot.Min.Y {
				t.Errorf("%s: panel %d overlaps the one above", f.name, i)
			}
			p := ps[i]
			seen := map[string]bool{}
			for _, tk := range p.Y.Tick.Marker.Ticks(p.Y.Min, p.Y.Max) {
				if tk.Label != "" && seen[tk.Label] {
					t.Errorf("%s: panel %d: two y ticks labelled %s", f.name, i, tk.Label)
				}
				seen[tk.Label] = true
			}
		}
		ps, _ = f.plots() // place took the legend
		svg, err := svgOf(ps...)
		if err != nil {
			t.Fatal(err)
		}
		if !strings.HasPrefix(string(svg), "<svg") {
			t.Errorf("%s: not an SVG element: %.40s", f.name, svg)
		}
		if *figuresDir != "" {
			if err := os.WriteFile(filepath.Join(*figuresDir, f.name+".svg"), svg, 0o644); err != nil {
				t.Fatal(err)
			}
		}
	}
}

// The ratio figure covers the whole bracket run and meets the certificate:
// for 1342 to 50 digits (made with "avoidcert bound 1342 --digits 50") the
// ratios run to the bracket's n, the last of them lie inside the certified
// range, and the nearest ratio outside it is within a few decades of the
// range's half-width, so that the figure's reference line sits among the
// points (before, the ratios stopped at n = 60, 25 decades above it).
func TestRatioFigureMeetsCertificate(t *testing.T) {
	r := load(t, "cert-1342-50.json")[0]
	bracketN := r.Cert.Evidence.Brackets[0].N
	if last := r.Ratios[len(r.Ratios)-1].N; last < bracketN {
		t.Errorf("ratios stop at n = %d, the certificate's bracket at n = %d", last, bracketN)
	}
	if w := r.Widths[len(r.Widths)-1].N; w < bracketN {
		t.Errorf("the recomputed run ends at n = %d, before the certificate's bracket at n = %d", w, bracketN)
	}
	first := r.FirstInside()
	if first == 0 || first > bracketN {
		t.Errorf("the ratios settle inside the certified range from n = %d (0: never), want by n = %d", first, bracketN)
	}
	nearest := 0.0
	for _, q := range r.Ratios {
		if q.Inside {
			continue
		}
		if q.Log10 < r.HalfWidth {
			t.Errorf("n = %d: a ratio outside the range nearer to its midpoint (1e%.1f) than its half-width (1e%.1f)", q.N, q.Log10, r.HalfWidth)
		}
		nearest = q.Log10
	}
	if gap := nearest - r.HalfWidth; gap > 3 {
		t.Errorf("the nearest ratio outside the range is %.1f decades above the half-width line", gap)
	}
}

// Quantities far below the smallest float64 keep their place in a figure.
func TestLog10Rat(t *testing.T) {
	for _, tc := range []struct {
		x    *big.Rat
		want float64
	}{
		{new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Exp(big.NewInt(10), big.NewInt(995), nil)), -995},
		{big.NewRat(3, 1), math.Log10(3)},
		{new(big.Rat).SetFrac(big.NewInt(25), new(big.Int).Exp(big.NewInt(10), big.NewInt(400), nil)), math.Log10(25) - 400},
	} {
		if got := log10Rat(tc.x); math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("log10 %s = %v, want %v", tc.x.FloatString(3), got, tc.want)
		}
	}
	if got := decade(-51.585); got != "2.6e-52" {
		t.Errorf("decade(-51.585) = %s", got)
	}
}
