package report

import (
	"strings"
)

// The LaTeX fragment needs no package, so long numbers and tables are set
// with the kernel's means alone: numbers in groups of five digits (as
// tables of constants print them) with a permitted line break between
// groups, and tables in chunks that a page break may fall between.

// texText escapes the characters LaTeX treats specially.
func texText(s string) string {
	rep := strings.NewReplacer(`\`, `\textbackslash{}`, "_", `\_`, "%", `\%`, "&", `\&`, "#", `\#`, "$", `\$`, "{", `\{`, "}", `\}`, "^", `\^{}`, "~", `\~{}`)
	return rep.Replace(s)
}

// groupBreak separates groups of digits: a thin space, and a line break
// permitted before it (the space is then dropped at the line's start). It
// works in text and in math mode.
const groupBreak = `\allowbreak\,`

// texNumber sets a decimal for math mode: the digits after the point in
// groups of five, those before it in groups of three when there are more
// than six, a line break permitted between groups, so that a 1,000-digit
// end of a certified range breaks across lines of any width.
func texNumber(s string) string {
	intPart, frac, hasPoint := strings.Cut(s, ".")
	sign := ""
	if strings.HasPrefix(intPart, "-") {
		sign, intPart = "-", intPart[1:]
	}
	var b strings.Builder
	b.WriteString(sign)
	if len(intPart) > 6 {
		for i, c := range intPart {
			if i > 0 && (len(intPart)-i)%3 == 0 {
				b.WriteString(groupBreak)
			}
			b.WriteRune(c)
		}
	} else {
		b.WriteString(intPart)
	}
	if hasPoint {
		b.WriteByte('.')
		for i, c := range frac {
			if i > 0 && i%5 == 0 && len(frac) > 6 {
				b.WriteString(groupBreak)
			}
			b.WriteRune(c)
		}
	}
	return b.String()
}

// texBreakable escapes text for LaTeX and lets it break where a long
// token would otherwise run off the page: in every run of 12 or more
// digits (a decimal point may stand among them), as texNumber does, and
// after every slash of a path.
func texBreakable(s string) string {
	s = strings.ReplaceAll(texText(s), "/", `/\allowbreak{}`)
	var b strings.Builder
	for i := 0; i < len(s); {
		j := i
		for j < len(s) && (s[j] >= '0' && s[j] <= '9' || s[j] == '.' && j > i) {
			j++
		}
		if j-i >= 12 {
			b.WriteString(texNumber(strings.TrimSuffix(s[i:j], ".")))
			if strings.HasSuffix(s[i:j], ".") {
				b.WriteByte('.')
			}
			i = j
			continue
		}
		if j == i {
			j++
		}
		b.WriteString(s[i:j])
		i = j
	}
	return b.String()
}

// texWords is texBreakable with the few symbols the plain-text pages use
// set in math: λ, ∈, ≤ (<=), ≥ (>=), <, >, ~ (approximately), the marks of the
// verdicts (✓ ✗) and the ellipsis.
func texWords(s string) string {
	return strings.NewReplacer("λ", `$\lambda$`, "∈", `$\in$`, "≤", `$\le$`, "≥", `$\ge$`, "<=", `$\le$`, ">=", `$\ge$`, "<", `$<$`, ">", `$>$`,
		`\~{}`, `$\approx$`, "✓", `$\surd$`, "✗", `$\times$`, "…", `\dots{}`).Replace(texBreakable(s))
}

// texCommand is a command line in typewriter type, breakable at its
// spaces and after the slashes of its paths (the fragment is set ragged
// right where it holds one).
func texCommand(s string) string {
	return `\texttt{` + strings.ReplaceAll(texText(s), "/", `/\allowbreak{}`) + "}"
}

// texChunk is how many rows one tabular holds: a tabular never breaks
// across pages, so a long table is a run of short ones (of rows up to two
// lines high, 15 leave little of a page empty).
const texChunk = 15

// texTable sets rows (cells already in LaTeX) under header, in tabulars of
// texChunk rows with the header repeated. With ragged, every cell is set
// ragged right (for p columns, where a long number breaks), and rows end
// in \tabularnewline, which \raggedright leaves alone.
func texTable(spec string, header []string, rows [][]string, ragged bool) string {
	var b strings.Builder
	line := func(cells []string) {
		if ragged {
			for i, c := range cells {
				cells[i] = `\raggedright ` + c
			}
		}
		b.WriteString(strings.Join(cells, " & ") + "\\tabularnewline\n")
	}
	for start := 0; start < len(rows) || start == 0; start += texChunk {
		b.WriteString("\\begin{center}\n\\begin{tabular}{" + spec + "}\n")
		line(append([]string(nil), header...))
		b.WriteString("\\hline\n")
		for _, r := range rows[start:min(start+texChunk, len(rows))] {
			line(append([]string(nil), r...))
		}
		b.WriteString("\\end{tabular}\n\\end{center}\n")
	}
	return b.String()
}
