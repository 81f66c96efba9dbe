package report

import (
	"fmt"
	"html"
	"path/filepath"
	"strings"

	"avoidcert/census"
)

// censusChecked says what the report verified of a census.
const censusChecked = "Verified while this report was made: every row's certificate, read inside the census " +
	"folder and matching the SHA-256 recorded in census.json, was accepted by the independent checker for " +
	"the row's class; each row's ranges of λ and 1/λ and its structure class are that certificate's, its counts " +
	"the checker's own; the order of the rows and the count groups were derived again from them."

// summary is the census's headline, plain text.
func (c *Census) summary() string {
	r := c.Report
	return fmt.Sprintf("%d symmetry classes of single patterns of length %d; counts compared up to n = %d; "+
		"λ certified to %d digits. %d count groups (classes with equal a_0..a_%d), separated by n = %d: "+
		"a proved lower bound on the number of c-Wilf classes; classes within a group are candidate c-Wilf "+
		"equivalences, evidence and not proof.",
		r.Classes, r.Params.Length, r.Params.To, r.Params.Digits, len(r.Groups), r.Params.To, r.SeparatingN)
}

// orderText is one adjacent comparison, plain text.
func orderText(s census.Step, digits int) string {
	if s.Relation == ">" {
		return fmt.Sprintf("λ(%s) > λ(%s), proved (disjoint certified ranges)", s.Above, s.Below)
	}
	t := fmt.Sprintf("λ(%s) and λ(%s) not ordered at %d digits (the certified ranges overlap)", s.Above, s.Below, digits)
	if s.SameCounts {
		t += "; same counts up to the census's n, so possibly c-Wilf equivalent"
	}
	return t
}

func (c *Census) recheck(rep string) string {
	return fmt.Sprintf("avoidcert check %s --expect %s", shellQuote(filepath.ToSlash(filepath.Join(c.Dir, "certificates", rep+".json"))), rep)
}

func (c *Census) markdown() string {
	var b strings.Builder
	r := c.Report
	fmt.Fprintf(&b, "## Census of length %d (%s)\n\n%s\n\n%s\n\n", r.Params.Length, c.Dir, c.summary(), censusChecked)
	b.WriteString("| rank | class (members) | count group | λ | 1/λ | structure | certificate SHA-256 |\n|---:|---|---:|---|---|---|---|\n")
	for i, row := range r.Rows {
		fmt.Fprintf(&b, "| %d | %s | %d | [%s, %s] | [%s, %s] | %s | `%s` |\n", i+1, strings.Join(row.Members, ", "), row.Group,
			row.Lambda.Lo, row.Lambda.Hi, row.Radius.Lo, row.Radius.Hi, row.Class, row.CertificateSHA256)
	}
	b.WriteString("\nOrder of adjacent rows:\n\n")
	for _, s := range r.Order {
		fmt.Fprintf(&b, "- %s\n", orderText(s, r.Params.Digits))
	}
	if len(r.Rows) > 0 {
		fmt.Fprintf(&b, "\nRe-check a row: `%s` (likewise for every representative).\n\n", c.recheck(r.Rows[0].Representative))
	}
	return b.String()
}

func (c *Census) html() (string, error) {
	var b strings.Builder
	r := c.Report
	fig, err := c.LambdaFigure()
	if err != nil {
		return "", err
	}
	fmt.Fprintf(&b, "<h2>Census of length %d (%s)</h2>\n<p>%s</p>\n<p>%s</p>\n", r.Params.Length, html.EscapeString(c.Dir), html.EscapeString(c.summary()), censusChecked)
	if fig != nil {
		b.WriteString(figure(fig.SVG, c.figureCaption(fig), ""))
	}
	b.WriteString("<table>\n<tr><th>rank</th><th>class (members)</th><th>count group</th><th>λ</th><th>1/λ</th><th>structure</th><th>certificate SHA-256</th></tr>\n")
	for i, row := range r.Rows {
		fmt.Fprintf(&b, "<tr><td>%d</td><td>%s</td><td>%d</td><td class=\"wrap\">[%s, %s]</td><td class=\"wrap\">[%s, %s]</td><td>%s</td><td><code>%s</code></td></tr>\n", i+1,
			html.EscapeString(strings.Join(row.Members, ", ")), row.Group, row.Lambda.Lo, row.Lambda.Hi, row.Radius.Lo, row.Radius.Hi, html.EscapeString(row.Class), row.CertificateSHA256)
	}
	b.WriteString("</table>\n<ul>\n")
	for _, s := range r.Order {
		fmt.Fprintf(&b, "<li>%s</li>\n", html.EscapeString(orderText(s, r.Params.Digits)))
	}
	b.WriteString("</ul>\n")
	if len(r.Rows) > 0 {
		fmt.Fprintf(&b, "<p>Re-check a row: <code>%s</code> (likewise for every representative).</p>\n", html.EscapeString(c.recheck(r.Rows[0].Representative)))
	}
	return b.String(), nil
}

// figureCaption says what the census figure shows, bars included or not.
func (c *Census) figureCaption(f *CensusFigure) string {
	r := c.Report
	var bars string
	switch {
	case f.Widest == "":
		bars = "every certified range is a single value"
	case f.Bars:
		bars = fmt.Sprintf("the bars are the certified ranges (at most %s wide at %d digits)", f.Widest, r.Params.Digits)
	case f.ZoomBars:
		bars = fmt.Sprintf("the certified ranges (at most %s wide at %d digits) are narrower than the markers above, and drawn as bars in the zoom below", f.Widest, r.Params.Digits)
	default:
		bars = fmt.Sprintf("no bars are drawn: every certified range (at most %s wide at %d digits) is narrower than its marker, so the markers' size, not the ranges, limits what the eye can tell apart", f.Widest, r.Params.Digits)
	}
	zoom := ""
	if f.ZoomFrom > 0 {
		zoom = fmt.Sprintf(" The lower panel shows ranks %d to %d, the middle 90%% of the classes, on their own scale: above, a few extreme classes squeeze them flat.", f.ZoomFrom, f.ZoomTo)
	}
	return fmt.Sprintf("λ of each class against its rank; %s.%s Classes of one count group (equal a_0..a_%d, candidate c-Wilf equivalence) share a marker; the legend below the plot says which.", bars, zoom, r.Params.To)
}

func (c *Census) tex() string {
	var b strings.Builder
	r := c.Report
	fmt.Fprintf(&b, "\n\\begin{theorem}[certified by avoidcert]\nFor each single consecutive pattern $\\sigma$ of length %d, up to reversal and complement, the growth rate\n\\[ \\lambda(\\sigma) = \\lim_{n\\to\\infty}(a_n(\\sigma)/n!)^{1/n} \\]\nlies in the range below. The %d classes fall into %d groups by their counts $a_0$ to $a_{%d}$, so there are at least %d c-Wilf classes.\n\\end{theorem}\n",
		r.Params.Length, r.Classes, len(r.Groups), r.Params.To, len(r.Groups))
	var rows [][]string
	for i, row := range r.Rows {
		rows = append(rows, []string{fmt.Sprint(i + 1), texBreakable(strings.Join(row.Members, ", ")),
			fmt.Sprintf("$[\\,%s,\\ %s\\,]$", texNumber(row.Lambda.Lo), texNumber(row.Lambda.Hi)), fmt.Sprint(row.Group)})
	}
	b.WriteString(texTable(`@{}p{0.06\linewidth}p{0.28\linewidth}p{0.46\linewidth}p{0.08\linewidth}@{}`,
		[]string{"rank", "class", "$\\lambda$", "group"}, rows, true))
	fmt.Fprintf(&b, "{\\raggedright\\noindent Certificates in %s (SHA-256 in \\texttt{census.json}); re-check one with %s.\\par}\n", texCommand(filepath.ToSlash(c.Dir)+"/certificates"), texCommand(c.recheck(r.Rows[0].Representative)))
	return b.String()
}
