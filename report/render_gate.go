package report

import (
	"fmt"
	"html"
	"strings"

	"avoidcert/certify"
	"avoidcert/claims"
	"avoidcert/prove"
)

// gateNote says what the report did and did not do with a gate's output.
const gateNote = "The verdicts and the evidence are the gate's record, restated as they are in the file: " +
	"they are not this report's verdicts. What is shown as certified is this report's own: every certificate " +
	"a line names was looked for where the line says (and from the gate file's folder), taken only with the " +
	"SHA-256 the gate recorded, and accepted by the independent checker for its set while this report was " +
	"made. Claims on exact counts rest on no certificate and are not recomputed here: run the gate again to " +
	"verify them."

// heading is the title of a gate's section, plain text.
func (g *Gate) heading() string {
	return fmt.Sprintf("Claims gate (%s): recorded verdicts %s", g.Name, g.tally())
}

// refutedLine lists the refuted claims, so that they stand out in a long
// table; "" when none is.
func (g *Gate) refutedLine() string {
	var ids []string
	for _, c := range g.Claims {
		if c.Verdict == string(claims.Refuted) {
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
func verdictMark(v string) string {
	switch claims.Verdict(v) {
	case claims.Proved:
		return "✓ proved"
	case claims.Refuted:
		return "✗ REFUTED"
	case claims.Undecided:
		return "? undecided"
	}
	return "! " + strings.ToUpper(v)
}

// where is the claim's place in its manifest.
func (c GateClaim) where() string {
	if c.Manifest != "" {
		return fmt.Sprintf("%s:%d", c.Manifest, c.Line)
	}
	return fmt.Sprintf("manifest line %d", c.Line)
}

// claimed restates what the claim states, as far as the line says.
func (c GateClaim) claimed() string {
	if len(c.Set) == 0 && c.Quantity == "" && c.Claimed == "" {
		return "not restated by the gate's line"
	}
	var b strings.Builder
	if len(c.Set) > 0 {
		fmt.Fprintf(&b, "{%s}: ", strings.Join(c.Set, ", "))
	}
	b.WriteString(quantitySymbol(c.Quantity))
	if c.Quantity != "" && c.Claimed != "" {
		b.WriteString(" = ")
	}
	b.WriteString(c.Claimed)
	return b.String()
}

// quantitySymbol writes the usual quantities as symbols.
func quantitySymbol(q string) string {
	switch q {
	case "lambda":
		return "λ"
	case "radius":
		return "1/λ"
	}
	return q
}

// certifiedPart is one certified range a claim's row states: symbol ∈ [lo, hi].
type certifiedPart struct {
	symbol string // λ, 1/λ, λ(1324)
	tex    string // the symbol in LaTeX math
	lo, hi string // outward decimals
}

// certifiedOf is what the claim's re-checked certificates state: the
// ranges of its quantity, and for form and order claims the class or the
// order, in words; or why there is nothing.
func (c GateClaim) certifiedOf() (parts []certifiedPart, words string) {
	if len(c.Certificates) == 0 {
		return nil, "no certificate: exact counts, not recomputed here"
	}
	var checked []*certify.Certificate
	var missing []string
	for _, ref := range c.Certificates {
		if ref.Cert == nil {
			missing = append(missing, ref.Path)
			continue
		}
		checked = append(checked, ref.Cert)
	}
	if len(missing) > 0 {
		return nil, fmt.Sprintf("not re-checked: certificate not found (%s)", strings.Join(missing, ", "))
	}
	switch claims.Kind(c.Kind) {
	case claims.KindForm:
		return nil, formShort(prove.FormOf(checked[0]))
	case claims.KindOrder:
		for _, cert := range checked {
			set := strings.Join(cert.Statement.Patterns, ",")
			lo, hi := rangeOf(cert.Statement.Lambda)
			parts = append(parts, certifiedPart{"λ(" + set + ")", `\lambda(` + set + ")", lo, hi})
		}
		return parts, orderWords(checked)
	}
	st := checked[0].Statement
	lam, rad := rangePart("λ", `\lambda`, st.Lambda), rangePart("1/λ", `1/\lambda`, st.Radius)
	switch c.Quantity {
	case "lambda":
		return []certifiedPart{lam}, ""
	case "radius":
		return []certifiedPart{rad}, ""
	}
	return []certifiedPart{lam, rad}, ""
}

func rangePart(symbol, tex string, x certify.Range) certifiedPart {
	lo, hi := rangeOf(x)
	return certifiedPart{symbol, tex, lo, hi}
}

// orderWords compares the certified ranges of an order claim's two sets.
func orderWords(certs []*certify.Certificate) string {
	if len(certs) != 2 {
		return ""
	}
	a, b := certs[0].Statement, certs[1].Statement
	name := func(s certify.Statement) string { return "λ(" + strings.Join(s.Patterns, ",") + ")" }
	switch {
	case above(b.Lambda, a.Lambda):
		return fmt.Sprintf("disjoint: %s < %s", name(a), name(b))
	case above(a.Lambda, b.Lambda):
		return fmt.Sprintf("disjoint: %s > %s", name(a), name(b))
	}
	return "the ranges overlap: not ordered at these digits"
}

// above reports that range x lies wholly above range y.
func above(x, y certify.Range) bool {
	return x.Lo != nil && y.Hi != nil && x.Lo.Cmp(y.Hi) > 0
}

// formShort is a structure class in a few words.
func formShort(f prove.Form) string {
	switch f.Class {
	case certify.ClassPrimitive:
		return fmt.Sprintf("primitive (primitivity exponent %d)", f.Exponent)
	case certify.ClassPeriodic:
		return fmt.Sprintf("periodic, period %d", f.Period)
	case certify.ClassReducible:
		return fmt.Sprintf("reducible (%d blocks)", f.Blocks)
	}
	return string(f.Class)
}

// certified is certifiedOf in plain text.
func (c GateClaim) certified() string {
	parts, words := c.certifiedOf()
	var out []string
	for _, p := range parts {
		out = append(out, fmt.Sprintf("%s ∈ [%s, %s]", p.symbol, p.lo, p.hi))
	}
	if words != "" {
		out = append(out, words)
	}
	return strings.Join(out, "; ")
}

// recheck is the commands that check the line's certificates again.
func (c GateClaim) recheck() string {
	var parts []string
	for _, ref := range c.Certificates {
		path := ref.Path
		if ref.Found != "" {
			path = ref.Found
		}
		parts = append(parts, fmt.Sprintf("avoidcert check %s --expect %s", shellQuote(path), shellQuote(ref.Set)))
	}
	return strings.Join(parts, "; ")
}

// gateColumns head the gate's table in Markdown and HTML.
var gateColumns = []string{"", "claim", "claimed", "certified (re-checked by this report)", "recorded verdict", "recorded evidence", "check the certificates with"}

// cells are a claim's row, plain text, in the order of gateColumns.
func (c GateClaim) cells() []string {
	id := c.ID + " (" + c.where() + ")"
	if c.Note != "" {
		id += "; note: " + c.Note
	}
	mark, _, _ := strings.Cut(verdictMark(c.Verdict), " ")
	return []string{mark, id, c.claimed(), c.certified(), verdictMark(c.Verdict), c.Evidence, c.recheck()}
}

func (g *Gate) markdown() string {
	var b strings.Builder
	fmt.Fprintf(&b, "## %s\n\n%s\n\n", g.heading(), gateNote)
	if r := g.refutedLine(); r != "" {
		fmt.Fprintf(&b, "**%s**\n\n", r)
	}
	b.WriteString("| " + strings.Join(gateColumns, " | ") + " |\n|" + strings.Repeat("---|", len(gateColumns)) + "\n")
	for _, c := range g.Claims {
		cells := c.cells()
		for i, s := range cells {
			s = strings.ReplaceAll(s, "|", `\|`)
			if c.Verdict == string(claims.Refuted) && (i == 0 || i == 4) {
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
	for _, c := range g.Claims {
		cells := c.cells()
		if c.Verdict == string(claims.Refuted) {
			b.WriteString(`<tr class="refuted">`)
		} else {
			b.WriteString("<tr>")
		}
		for i, s := range cells {
			v := html.EscapeString(s)
			switch {
			case i == 0:
				fmt.Fprintf(&b, `<td class="mark">%s</td>`, v)
				continue
			case i == 4:
				if c.Verdict != string(claims.Proved) {
					v = "<strong>" + v + "</strong>"
				}
				fmt.Fprintf(&b, `<td class="verdict">%s</td>`, v)
				continue
			case i == 2 || i == 3 || i == 5:
				fmt.Fprintf(&b, `<td class="wrap">%s</td>`, v)
				continue
			case i == 6 && v != "":
				v = "<code>" + v + "</code>"
			}
			fmt.Fprintf(&b, "<td>%s</td>", v)
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
	for _, c := range g.Claims {
		verdict := texText(c.Verdict)
		if c.Verdict != string(claims.Proved) {
			verdict = "\\textbf{" + texText(strings.ToUpper(c.Verdict)) + "}"
		}
		where := c.where()
		if c.Note != "" {
			where += "; note: " + c.Note
		}
		fmt.Fprintf(&b, "\\item[%s] \\textbf{%s} (%s). Claimed: %s. Certified (re-checked by this report): %s. Recorded verdict: %s.\n",
			texWords(strings.Fields(verdictMark(c.Verdict))[0]), texBreakable(c.ID), texWords(where), texWords(c.claimed()), c.texCertified(), verdict)
	}
	b.WriteString("\\end{itemize}\n\\par}\n")
	return b.String()
}

// texCertified is certifiedOf in LaTeX, every number breakable.
func (c GateClaim) texCertified() string {
	parts, words := c.certifiedOf()
	var out []string
	for _, p := range parts {
		out = append(out, fmt.Sprintf("$%s \\in [\\,%s,\\ %s\\,]$", p.tex, texNumber(p.lo), texNumber(p.hi)))
	}
	if words != "" {
		out = append(out, texWords(words))
	}
	return strings.Join(out, "; ")
}
