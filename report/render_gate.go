package report

import (
	"fmt"
	"html"
	"strings"

	"avoidcert/claims"
)

// gateNote says what the report did and did not do with a gate's output.
const gateNote = "The verdicts and the evidence are the gate's record, restated as they are in the file: " +
	"they are not this report's verdicts. What is shown as certified is this report's own: every certificate " +
	"a line names was looked for from the manifest's folder, the current one and the gate file's, taken only " +
	"with the SHA-256 the gate recorded, accepted by the independent checker for its set while this report " +
	"was made, and set against the claim as the line restates it (a recorded verdict it contradicts would " +
	"have stopped the report). Claims on exact counts rest on no certificate and are not recomputed here: " +
	"run the gate again to verify them."

// heading is the title of a gate's section, plain text.
func (g *Gate) heading() string {
	return fmt.Sprintf("Claims gate (%s): recorded verdicts %s", g.Name, g.tally())
}

// refutedLine lists the refuted claims, so that they stand out in a long
// table; "" when none is.
func (g *Gate) refutedLine() string {
	var ids []string
	for _, c := range g.Claims {
		if c.Verdict == claims.Refuted {
			ids = append(ids, c.ID)
		}
	}
	if len(ids) == 0 {
		return ""
	}
	return fmt.Sprintf("Refuted by the gate's record (marked ✗ below): %s.", strings.Join(ids, ", "))
}

// verdictMark marks a recorded verdict by a sign and by case, not by colour
// alone: ✓ proved, ✗ REFUTED, ? undecided, ! FAILED.
func verdictMark(v claims.Verdict) string {
	switch v {
	case claims.Proved:
		return "✓ proved"
	case claims.Refuted:
		return "✗ REFUTED"
	case claims.Undecided:
		return "? undecided"
	}
	return "! " + strings.ToUpper(string(v))
}

// gateRow is one claim as the page shows it: the gate's line, and what the
// report found of its certificates.
type gateRow struct {
	GateClaim
	checked []CheckedCertificate
	cmp     comparison
}

// rows are the page's rows, in the order of the lines.
func (g *Gate) rows() []gateRow {
	out := make([]gateRow, len(g.Claims))
	for i, c := range g.Claims {
		var checked []CheckedCertificate
		if i < len(g.Checked) {
			checked = g.Checked[i]
		}
		out[i] = gateRow{c, checked, compare(c, checked)}
	}
	return out
}

// where is the claim's place in its manifest, and its note.
func (r gateRow) where() string {
	w := fmt.Sprintf("manifest line %d", r.Line)
	if r.Manifest != "" {
		w = fmt.Sprintf("%s:%d", r.Manifest, r.Line)
	}
	if r.Claim.Note != "" {
		w += "; note: " + r.Claim.Note
	}
	return w
}

// claimed is the claim as the line restates it, with the interval a
// claimed decimal is read as.
func (r gateRow) claimed() string {
	st := r.Claim.Statement
	if e := r.Claim.Claimed; e != nil {
		st += fmt.Sprintf(", read as [%s, %s]", endText(e.Lo, "−∞"), endText(e.Hi, "∞"))
	}
	return st
}

func endText(s *string, none string) string {
	if s == nil {
		return none
	}
	return *s
}

// certified is the comparison in plain text.
func (r gateRow) certified() string {
	var out []string
	for _, p := range r.cmp.parts {
		out = append(out, fmt.Sprintf("%s ∈ [%s, %s]", p.symbol, p.lo, p.hi))
	}
	if r.cmp.words != "" {
		out = append(out, r.cmp.words)
	}
	return strings.Join(out, "; ")
}

// recheck is the commands that check the line's certificates again, with
// the paths where the report found them.
func (r gateRow) recheck() string {
	var parts []string
	for i, ref := range r.Certificates {
		if ref.Path == "" {
			continue // not kept: nothing to check
		}
		path := ref.Path
		if i < len(r.checked) && r.checked[i].Found != "" {
			path = r.checked[i].Found
		}
		parts = append(parts, fmt.Sprintf("avoidcert check %s --expect %s", shellQuote(path), shellQuote(strings.Join(ref.Patterns, ","))))
	}
	return strings.Join(parts, "; ")
}

// gateColumns head the gate's table in Markdown and HTML.
var gateColumns = []string{"", "claim", "claimed", "certified (re-checked by this report)", "recorded verdict", "recorded evidence", "check the certificates with"}

// cells are a claim's row, plain text, in the order of gateColumns.
func (r gateRow) cells() []string {
	mark, _, _ := strings.Cut(verdictMark(r.Verdict), " ")
	return []string{mark, r.ID + " (" + r.where() + ")", r.claimed(), r.certified(), verdictMark(r.Verdict), r.Evidence, r.recheck()}
}

func (g *Gate) markdown() string {
	var b strings.Builder
	fmt.Fprintf(&b, "## %s\n\n%s\n\n", g.heading(), gateNote)
	if r := g.refutedLine(); r != "" {
		fmt.Fprintf(&b, "**%s**\n\n", r)
	}
	b.WriteString("| " + strings.Join(gateColumns, " | ") + " |\n|" + strings.Repeat("---|", len(gateColumns)) + "\n")
	for _, r := range g.rows() {
		cells := r.cells()
		for i, s := range cells {
			s = strings.ReplaceAll(s, "|", `\|`)
			if r.Verdict == claims.Refuted && (i == 0 || i == 4) {
				s = "**" + s + "**"
			}
			cells[i] = s
		}
		b.WriteString("| " + strings.Join(cells, " | ") + " |\n")
	}
	b.WriteString("\n")
	return b.String()
}

// gateCSS marks refuted rows by a tint and a bar at the left, beside the
// sign and the capitals that mark them without colour.
const gateCSS = `tr.refuted td{background:#fbe4e0}tr.refuted td:first-child{border-left:5px solid #a4161a}td.mark{font-weight:bold;text-align:center}td.verdict{white-space:nowrap}`

func (g *Gate) html() string {
	var b strings.Builder
	fmt.Fprintf(&b, "<h2>%s</h2>\n<p>%s</p>\n", html.EscapeString(g.heading()), html.EscapeString(gateNote))
	if r := g.refutedLine(); r != "" {
		fmt.Fprintf(&b, "<p><strong>%s</strong></p>\n", html.EscapeString(r))
	}
	b.WriteString("<table class=\"gate\">\n<tr>")
	for _, h := range gateColumns {
		fmt.Fprintf(&b, "<th>%s</th>", html.EscapeString(h))
	}
	b.WriteString("</tr>\n")
	for _, r := range g.rows() {
		if r.Verdict == claims.Refuted {
			b.WriteString(`<tr class="refuted">`)
		} else {
			b.WriteString("<tr>")
		}
		for i, s := range r.cells() {
			v := html.EscapeString(s)
			switch {
			case i == 0:
				fmt.Fprintf(&b, `<td class="mark">%s</td>`, v)
			case i == 4 && r.Verdict != claims.Proved:
				fmt.Fprintf(&b, `<td class="verdict"><strong>%s</strong></td>`, v)
			case i == 4:
				fmt.Fprintf(&b, `<td class="verdict">%s</td>`, v)
			case i == 2 || i == 3 || i == 5:
				fmt.Fprintf(&b, `<td class="wrap">%s</td>`, v)
			case i == 6 && v != "":
				fmt.Fprintf(&b, "<td><code>%s</code></td>", v)
			default:
				fmt.Fprintf(&b, "<td>%s</td>", v)
			}
		}
		b.WriteString("</tr>\n")
	}
	b.WriteString("</table>\n")
	return b.String()
}

// tex sets the claims as a list, which may break across pages (a gate
// may judge thousands of claims), one item a claim, marked like the
// other pages.
func (g *Gate) tex() string {
	var b strings.Builder
	fmt.Fprintf(&b, "\n\\medskip{\\raggedright\\noindent %s. %s\\par}\n", texWords(g.heading()), texWords(gateNote))
	if r := g.refutedLine(); r != "" {
		fmt.Fprintf(&b, "\n\\noindent\\textbf{%s}\n", texWords(r))
	}
	b.WriteString("{\\raggedright\n\\begin{itemize}\n")
	for _, r := range g.rows() {
		verdict := texText(string(r.Verdict))
		if r.Verdict != claims.Proved {
			verdict = "\\textbf{" + texText(strings.ToUpper(string(r.Verdict))) + "}"
		}
		fmt.Fprintf(&b, "\\item[%s] \\textbf{%s} (%s). Claimed: %s. Certified (re-checked by this report): %s. Recorded verdict: %s.\n",
			texWords(strings.Fields(verdictMark(r.Verdict))[0]), texBreakable(r.ID), texWords(r.where()), texWords(r.claimed()), r.texCertified(), verdict)
	}
	b.WriteString("\\end{itemize}\n\\par}\n")
	return b.String()
}

// texCertified is the comparison in LaTeX, every number breakable.
func (r gateRow) texCertified() string {
	var out []string
	for _, p := range r.cmp.parts {
		out = append(out, fmt.Sprintf("$%s \\in [\\,%s,\\ %s\\,]$", p.tex, texNumber(p.lo), texNumber(p.hi)))
	}
	if r.cmp.words != "" {
		out = append(out, texWords(r.cmp.words))
	}
	return strings.Join(out, "; ")
}
