package report

import (
	"fmt"
	"html"
	"path/filepath"
	"strings"

	"avoidcert/census"
	"avoidcert/claims"
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
	fmt.Fprintf(&b, "<figure>%s<figcaption>λ of each class against its rank; the bars are the certified ranges (at %d digits narrower than the markers); classes of one count group (equal a_0..a_%d, candidate c-Wilf equivalence) share a colour.</figcaption></figure>\n", fig, r.Params.Digits, r.Params.To)
	b.WriteString("<table>\n<tr><th>rank</th><th>class (members)</th><th>count group</th><th>λ</th><th>1/λ</th><th>structure</th><th>certificate SHA-256</th></tr>\n")
	for i, row := range r.Rows {
		fmt.Fprintf(&b, "<tr><td>%d</td><td>%s</td><td>%d</td><td>[%s, %s]</td><td>[%s, %s]</td><td>%s</td><td><code>%s</code></td></tr>\n", i+1,
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

func (c *Census) tex() string {
	var b strings.Builder
	r := c.Report
	fmt.Fprintf(&b, "\n\\begin{theorem}[certified by avoidcert]\nFor each single consecutive pattern $\\sigma$ of length %d, up to reversal and complement, the growth rate $\\lambda(\\sigma) = \\lim_{n\\to\\infty}(a_n(\\sigma)/n!)^{1/n}$ lies in the range below. The %d classes fall into %d groups by their counts $a_0,\\dots,a_{%d}$, so there are at least %d c-Wilf classes.\n\\end{theorem}\n",
		r.Params.Length, r.Classes, len(r.Groups), r.Params.To, len(r.Groups))
	b.WriteString("\\begin{center}\n\\begin{tabular}{rllr}\nrank & class & $\\lambda$ & group\\\\\n\\hline\n")
	for i, row := range r.Rows {
		fmt.Fprintf(&b, "%d & %s & $[%s,\\ %s]$ & %d\\\\\n", i+1, strings.Join(row.Members, ", "), row.Lambda.Lo, row.Lambda.Hi, row.Group)
	}
	b.WriteString("\\end{tabular}\n\\end{center}\n")
	fmt.Fprintf(&b, "\\noindent Certificates in \\texttt{\\detokenize{%s/certificates}} (SHA-256 in \\texttt{census.json}); re-check one with \\texttt{\\detokenize{%s}}.\n", filepath.ToSlash(c.Dir), c.recheck(r.Rows[0].Representative))
	return b.String()
}

// gateNote says what the report did not do with a gate's output.
const gateNote = "Recorded, not re-checked: the gate's own record, restated as it is in the file. This report " +
	"did not judge these claims or check these certificates (the lines hold no claimed values), so nothing " +
	"here is a verdict of this report. To verify, run the gate on the manifest again, or check each " +
	"certificate with the command shown."

// heading is the title of a gate's section, plain text.
func (g *Gate) heading() string {
	return fmt.Sprintf("Claims gate (%s), recorded, not re-checked: %s", g.Name, g.tally())
}

func (g *Gate) certificates(c GateClaim) string {
	var parts []string
	for _, ref := range c.Certificates {
		parts = append(parts, fmt.Sprintf("avoidcert check %s --expect %s", shellQuote(ref.Path), shellQuote(strings.Join(ref.Patterns, ","))))
	}
	return strings.Join(parts, "; ")
}

func (g *Gate) markdown() string {
	var b strings.Builder
	fmt.Fprintf(&b, "## %s\n\n%s\n\n| claim | kind | line | recorded verdict | recorded evidence | check the certificates with |\n|---|---|---:|---|---|---|\n", g.heading(), gateNote)
	for _, c := range g.Claims {
		fmt.Fprintf(&b, "| %s | %s | %d | %s | %s | %s |\n", c.ID, c.Kind, c.Line, c.Verdict, strings.ReplaceAll(c.Evidence, "|", `\|`), strings.ReplaceAll(g.certificates(c), "|", `\|`))
	}
	b.WriteString("\n")
	return b.String()
}

func (g *Gate) html() string {
	var b strings.Builder
	fmt.Fprintf(&b, "<h2>%s</h2>\n<p>%s</p>\n<table>\n<tr><th>claim</th><th>kind</th><th>line</th><th>recorded verdict</th><th>recorded evidence</th><th>check the certificates with</th></tr>\n",
		html.EscapeString(g.heading()), html.EscapeString(gateNote))
	for _, c := range g.Claims {
		v := html.EscapeString(string(c.Verdict))
		if c.Verdict != claims.Proved {
			v = "<strong>" + v + "</strong>"
		}
		fmt.Fprintf(&b, "<tr><td>%s</td><td>%s</td><td>%d</td><td>%s</td><td>%s</td><td>%s</td></tr>\n", html.EscapeString(c.ID), html.EscapeString(string(c.Kind)), c.Line, v, html.EscapeString(c.Evidence), html.EscapeString(g.certificates(c)))
	}
	b.WriteString("</table>\n")
	return b.String()
}

func (g *Gate) tex() string {
	var b strings.Builder
	fmt.Fprintf(&b, "\n\\noindent %s. %s\n\\begin{center}\n\\begin{tabular}{lll}\nclaim & kind & recorded verdict\\\\\n\\hline\n", texText(g.heading()), texText(gateNote))
	for _, c := range g.Claims {
		fmt.Fprintf(&b, "%s & %s & %s\\\\\n", texText(c.ID), texText(string(c.Kind)), texText(string(c.Verdict)))
	}
	b.WriteString("\\end{tabular}\n\\end{center}\n")
	return b.String()
}
