package report

import (
	"avoidcert/certify"
	"fmt"
	"html"
	"io"
	"strings"
)

// recomputedNote says where the figures' data come from.
const recomputedNote = "The certificate holds only its final brackets. The widths and ratios below are " +
	"recomputed by this report with the engine: a bracket run to the certificate's digits (the width " +
	"after each bracket) and exact counts a_n. They illustrate; the certificate proves."

// statement lines shared by Markdown and HTML, plain text.
func (r *Certificate) lines() [][2]string {
	lo, hi := r.Lambda()
	rlo, rhi := r.Radius()
	b := r.Bound()
	upper := "no upper bound for every n is stated"
	if b.MuHi != "" {
		upper = fmt.Sprintf("a_n/n! ≤ %s · %s^(n−%d)", b.AHi, b.MuHi, b.N0)
	}
	return [][2]string{
		{"pattern set", strings.Join(r.Patterns(), ", ") + " (consecutive patterns)"},
		{"growth rate λ", fmt.Sprintf("[%s, %s]", lo, hi)},
		{"radius 1/λ", fmt.Sprintf("[%s, %s]", rlo, rhi)},
		{"digits the ends share", fmt.Sprint(r.Digits)},
		{"bound for every n ≥ " + fmt.Sprint(b.N0), b.lower() + "; " + upper},
		{"asymptotic form", r.Asymptotics()},
		{"certificate", r.Name},
		{"SHA-256", r.Digest()},
		{"produced by", r.Cert.Tool},
		{"checked", "valid: the independent checker re-verified it while this report was made"},
		{"re-check", r.Recheck()},
	}
}

// Document is what one report covers, in the order of each kind.
type Document struct {
	Certificates []*Certificate
	Censuses     []*Census
	Gates        []*Gate
	Series       []*Series
}

// lower is the lower half of the bound for every n, plain text.
func (b AllN) lower() string {
	if b.MuLo == "0" {
		return "no exponential lower bound (the certified rate μ_lo is 0)"
	}
	return fmt.Sprintf("%s · %s^(n−%d) ≤ a_n/n!", b.ALo, b.MuLo, b.N0)
}

// Markdown writes the report as Markdown. Figures are in the HTML page;
// Markdown lists their data as tables.
func Markdown(w io.Writer, d *Document) error {
	var b strings.Builder
	b.WriteString("# avoidcert report\n\n")
	for _, c := range d.Censuses {
		b.WriteString(c.markdown())
	}
	for _, g := range d.Gates {
		b.WriteString(g.markdown())
	}
	for _, s := range d.Series {
		b.WriteString(s.markdown())
	}
	for _, r := range d.Certificates {
		fmt.Fprintf(&b, "## %s\n\n| | |\n|---|---|\n", strings.Join(r.Patterns(), ", "))
		for _, l := range r.lines() {
			fmt.Fprintf(&b, "| %s | %s |\n", l[0], strings.ReplaceAll(l[1], "|", `\|`))
		}
		fmt.Fprintf(&b, "\n%s\n\n", recomputedNote)
		b.WriteString("| n | width of the λ bracket |\n|---:|---:|\n")
		for _, p := range r.Widths {
			fmt.Fprintf(&b, "| %d | %s |\n", p.N, decade(p.Log10))
		}
		fmt.Fprintf(&b, "\nObserved rate of the width per step of n: %.3g (estimate, not certified).\n\n%s\n\n", r.Rate, r.ratioSummary())
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// HTML writes a standalone page: inline CSS and SVG, nothing fetched.
func HTML(w io.Writer, d *Document) error {
	var b strings.Builder
	// Long numbers (a claimed count of 80 digits, a range to 50) wrap
	// inside their cells (class wrap) instead of widening the table past
	// the page; words elsewhere break only between words.
	b.WriteString(`<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>avoidcert report</title>
<style>body{font-family:sans-serif;max-width:60em;margin:2em auto;color:#222}
table{border-collapse:collapse}td,th{border:1px solid #bbb;padding:.3em .6em;text-align:left;vertical-align:top}
td.wrap{overflow-wrap:anywhere}td code{word-break:break-all}figure{margin:1.5em 0}figcaption{font-size:.9em;color:#444}
figure svg{max-width:100%;height:auto}
` + gateCSS + `</style>
</head><body>
<h1>avoidcert report</h1>
`)
	for _, c := range d.Censuses {
		h, err := c.html()
		if err != nil {
			return err
		}
		b.WriteString(h)
	}
	for _, g := range d.Gates {
		b.WriteString(g.html())
	}
	for _, s := range d.Series {
		h, err := s.html()
		if err != nil {
			return err
		}
		b.WriteString(h)
	}
	for _, r := range d.Certificates {
		fmt.Fprintf(&b, "<h2>%s</h2>\n<table>\n", html.EscapeString(strings.Join(r.Patterns(), ", ")))
		for _, l := range r.lines() {
			v := html.EscapeString(l[1])
			if l[0] == "SHA-256" || l[0] == "re-check" {
				v = "<code>" + v + "</code>"
			}
			fmt.Fprintf(&b, "<tr><th>%s</th><td class=\"wrap\">%s</td></tr>\n", html.EscapeString(l[0]), v)
		}
		b.WriteString("</table>\n<p>" + html.EscapeString(recomputedNote) + "</p>\n")
		width, err := r.WidthFigure()
		if err != nil {
			return err
		}
		ratio, err := r.RatioFigure()
		if err != nil {
			return err
		}
		b.WriteString(figure(width, fmt.Sprintf("Width hi − lo of the certified enclosure of λ after each bracket of a recomputed run, against n (log scale); dashed: the fitted geometric rate %.3g per step of n, an estimate, not certified.", r.Rate),
			"No width figure: no bracket of positive width (λ exact, 0, or a_n = 0 from some n on)."))
		b.WriteString(figure(ratio, r.ratioCaption(),
			"No ratio figure: the counts give no ratio (a_n = 0 from some n on, or λ not bounded)."))
	}
	b.WriteString("</body></html>\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// ratioCaption says what the ratio figure shows.
func (r *Certificate) ratioCaption() string {
	d := r.RatioStep
	what := "the ratio a_(n+1)/((n+1)·a_n) of exact counts from λ"
	if d > 1 {
		what = fmt.Sprintf("the ratio a_(n+%d)·n!/((n+%d)!·a_n) of exact counts (a step of the period %d) from λ^%d", d, d, d, d)
	}
	bracket := " Squares: half the width of the bracket the recomputed run took at n, so at each n the ratio, an estimate, stands beside what is certified."
	if d > 1 {
		bracket = ""
	}
	return fmt.Sprintf("Distance of %s (the midpoint of the certified range), against n on one log scale. Dots: ratios outside the certified range, exact differences rounded for drawing. Dashed: half the width of the certified range; rings on it: ratios inside the range, nearer than the certificate resolves.%s %s",
		what, bracket, r.ratioSummary())
}

// ratioSummary says where the ratios meet the certified range.
func (r *Certificate) ratioSummary() string {
	if len(r.Ratios) == 0 {
		return "No ratio of exact counts to compare."
	}
	last := r.Ratios[len(r.Ratios)-1].N
	if first := r.FirstInside(); first > 0 {
		return fmt.Sprintf("From n = %d to n = %d every ratio of exact counts lies inside the certified range (an observation, not part of the certificate).", first, last)
	}
	return fmt.Sprintf("Up to n = %d the ratios of exact counts have not settled inside the certified range (an observation, not part of the certificate).", last)
}

// TeX writes a LaTeX fragment to \input: one theorem per certificate. It
// defines the theorem environment only when the document has none.
func TeX(w io.Writer, d *Document) error {
	var b strings.Builder
	b.WriteString("% avoidcert report: a fragment to \\input into a LaTeX document; it needs no package.\n")
	b.WriteString("\\ifdefined\\theorem\\else\\newtheorem{theorem}{Theorem}\\fi\n")
	for _, c := range d.Censuses {
		b.WriteString(c.tex())
	}
	for _, g := range d.Gates {
		b.WriteString(g.tex())
	}
	for _, s := range d.Series {
		b.WriteString(s.tex())
	}
	for _, r := range d.Certificates {
		b.WriteString(r.tex())
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// tex is the certificate's theorem: the statement with symbols, so that it
// fits a line, then the numbers each on a ragged line of its own, in
// groups of five digits that may break across lines (a 1,000-digit end of
// a range still fits the page), then the certificate's name, SHA-256 and
// the command that re-checks it.
func (r *Certificate) tex() string {
	var b strings.Builder
	lo, hi := r.Lambda()
	bd := r.Bound()
	set := "\\{" + strings.Join(r.Patterns(), ",\\allowbreak\\,") + "\\}"
	fmt.Fprintf(&b, "\n\\begin{theorem}[certified by avoidcert]\nLet $a_n$ be the number of permutations of $\\{1,\\dots,n\\}$ that avoid every pattern of $S = %s$ consecutively. Then the growth rate $\\lambda = \\lim_{n\\to\\infty} (a_n/n!)^{1/n}$ satisfies", set)
	// values: symbol and decimal, in the order they are listed
	values := [][2]string{{`\lambda_{-}`, lo}}
	if hi == "inf" {
		b.WriteString(" $\\lambda \\ge \\lambda_{-}$")
	} else {
		b.WriteString(" $\\lambda_{-} \\le \\lambda \\le \\lambda_{+}$")
		values = append(values, [2]string{`\lambda_{+}`, hi})
	}
	fmt.Fprintf(&b, ", and for every $n \\ge %d$\n", bd.N0)
	// The rates are printed outward like lambda's ends; when they print as
	// the same decimals, the bound is written with lambda's symbols.
	muLo, muHi := `\mu_{-}`, `\mu_{+}`
	if bd.MuLo == lo {
		muLo = `\lambda_{-}`
	}
	if bd.MuHi == hi {
		muHi = `\lambda_{+}`
	}
	if bd.MuHi != "" {
		fmt.Fprintf(&b, "\\[ A_{-}\\,%s^{\\,n-%d} \\le \\frac{a_n}{n!} \\le A_{+}\\,%s^{\\,n-%d}, \\]\n", muLo, bd.N0, muHi, bd.N0)
	} else {
		fmt.Fprintf(&b, "\\[ A_{-}\\,%s^{\\,n-%d} \\le \\frac{a_n}{n!}, \\]\n", muLo, bd.N0)
	}
	values = append(values, [2]string{`A_{-}`, bd.ALo})
	if bd.MuHi != "" {
		values = append(values, [2]string{`A_{+}`, bd.AHi})
	}
	if muLo != `\lambda_{-}` {
		values = append(values, [2]string{`\mu_{-}`, bd.MuLo})
	}
	if bd.MuHi != "" && muHi != `\lambda_{+}` {
		values = append(values, [2]string{`\mu_{+}`, bd.MuHi})
	}
	fmt.Fprintf(&b, "where (the ends of the range of $\\lambda$ share %d significant digits)\n{\\raggedright\n", r.Digits)
	for _, v := range values {
		fmt.Fprintf(&b, "\\par\\noindent\\hangindent=2em\\hangafter=1 $%s = %s$\n", v[0], texNumber(v[1]))
	}
	fmt.Fprintf(&b, "\\par}\n%s\n\\end{theorem}\n", r.texAsymptotics())
	digest := r.Digest()
	fmt.Fprintf(&b, "{\\raggedright\\noindent Certificate %s, SHA-256 \\texttt{%s\\allowbreak %s\\allowbreak %s\\allowbreak %s}; re-check with %s.\\par}\n",
		texCommand(r.Name), digest[:16], digest[16:32], digest[32:48], digest[48:], texCommand(r.Recheck()))
	return b.String()
}

// texAsymptotics is Asymptotics as a sentence of LaTeX.
func (r *Certificate) texAsymptotics() string {
	switch r.Form.Class {
	case certify.ClassPrimitive:
		return "The transfer operator of $S$ is primitive, so $a_n/n! = c\\,\\lambda^n\\,(1 + O(\\theta^n))$ with constants $c > 0$ and $0 \\le \\theta < 1$."
	case certify.ClassPeriodic:
		d := r.Form.Period
		return fmt.Sprintf("The transfer operator of $S$ is irreducible with period %d, so $a_n/n! = \\lambda^n\\,(c_{n \\bmod %d} + o(1))$ with constants $c_r \\ge 0$.", d, d)
	case certify.ClassReducible:
		return "The transfer operator of $S$ is reducible; $\\lambda$ is the largest growth rate of its strongly connected blocks."
	case certify.ClassFinite:
		return "Moreover $a_n = 0$ for every large $n$."
	case certify.ClassSubexponential:
		return "Moreover $\\lambda = 0$ and $a_n > 0$ for every $n$."
	}
	return "(The certificate states no structure class.)"
}

// figure is an HTML figure with its caption, or the note when svg is nil.
func figure(svg []byte, caption, none string) string {
	if svg == nil {
		return "<p>" + html.EscapeString(none) + "</p>\n"
	}
	return "<figure>" + string(svg) + "<figcaption>" + html.EscapeString(caption) + "</figcaption></figure>\n"
}
