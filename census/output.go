package census

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"avoidcert/internal/atomicfile"
)

// The tables a census writes into its folder, beside certificates/.
const (
	JSONFile     = "census.json"
	CSVFile      = "census.csv"
	MarkdownFile = "census.md"
)

// writeOutputs writes the three tables of rep atomically, the JSON last:
// its presence means the census (or shard) is complete.
func writeOutputs(dir string, rep *Report) error {
	js, err := marshal(rep)
	if err != nil {
		return err
	}
	for _, f := range []struct {
		name string
		data []byte
	}{{CSVFile, tableCSV(rep)}, {MarkdownFile, tableMarkdown(rep)}, {JSONFile, js}} {
		if err := atomicfile.WriteFile(filepath.Join(dir, f.name), f.data, 0o644); err != nil {
			return fmt.Errorf("writing %s: %w", f.name, err)
		}
	}
	return nil
}

// tableCSV has one line per row, sorted by lambda, with every count.
func tableCSV(rep *Report) []byte {
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	head := []string{"rank", "representative", "members", "group", "lambda_lo", "lambda_hi", "radius_lo", "radius_hi",
		"structure_class", "primitivity_exponent", "certificate", "certificate_sha256",
		"refined_lambda_lo", "refined_lambda_hi", "refined_radius_lo", "refined_radius_hi", "refined_certificate", "refined_certificate_sha256",
		"lambda_digits"}
	for n := 0; n <= rep.Params.To; n++ {
		head = append(head, "a"+strconv.Itoa(n))
	}
	w.Write(head)
	for i, r := range rep.Rows {
		exponent := ""
		if r.Exponent != nil {
			exponent = strconv.Itoa(*r.Exponent)
		}
		line := []string{strconv.Itoa(i + 1), r.Representative, strings.Join(r.Members, " "), strconv.Itoa(r.Group),
			r.Lambda.Lo, r.Lambda.Hi, r.Radius.Lo, r.Radius.Hi, r.Class, exponent, r.Certificate, r.CertificateSHA256}
		if f := r.Refined; f != nil {
			line = append(line, f.Lambda.Lo, f.Lambda.Hi, f.Radius.Lo, f.Radius.Hi, f.Certificate, f.CertificateSHA256)
		} else {
			line = append(line, "", "", "", "", "", "")
		}
		line = append(line, strconv.Itoa(r.Digits()))
		w.Write(append(line, r.Counts...))
	}
	w.Flush() // writes to a buffer cannot fail
	return buf.Bytes()
}

// shortForm names a row's structure class in a table cell.
func shortForm(r Row) string {
	if r.Exponent != nil {
		return fmt.Sprintf("%s, k = %d", r.Class, *r.Exponent)
	}
	return r.Class
}

// tableMarkdown is the census for reading: summary, classes, forms,
// groups and the order of the groups.
func tableMarkdown(rep *Report) []byte {
	var b strings.Builder
	p := rep.Params
	fmt.Fprintf(&b, "# Census of the consecutive patterns of length %d\n\n", p.Length)
	if rep.Shard != nil {
		fmt.Fprintf(&b, "**Shard %s: %d of the %d classes. Merge all shards (`avoidcert census merge`) for the census; groups and order below are of this shard only, and its groups are not refined.**\n\n",
			rep.Shard, len(rep.Rows), rep.Classes)
	}
	o := summarizeOrder(rep)
	if p.Digits == 0 {
		fmt.Fprintf(&b, "- tool: %s; counts a_n for n <= %d; counts, groups and forms only: each class's certificate is its structure test's, with a coarse lambda range (no bracket aimed at digits, no refinement)\n", rep.Tool, p.To)
	} else {
		fmt.Fprintf(&b, "- tool: %s; counts a_n for n <= %d; lambda certified to %d significant digits, classes of overlapping neighbouring groups refined up to %d\n", rep.Tool, p.To, p.Digits, p.RefineDigits)
	}
	fmt.Fprintf(&b, "- symmetry classes (reverse, complement, both): %d\n", len(rep.Rows))
	fmt.Fprintf(&b, "- groups with equal counts up to n = %d: %d, all separated by n = %d. A proved lower bound on the number of c-Wilf classes; the classes within a group are candidates for c-Wilf equivalence (evidence, not proof).\n",
		p.To, len(rep.Groups), rep.SeparatingN)
	fmt.Fprintf(&b, "- order of the groups by lambda: %s\n", o.sentence())
	fmt.Fprintf(&b, "- asymptotic form: %s\n\n", formsSentence(rep.Rows))

	fmt.Fprintf(&b, "## Classes, largest lambda first\n\n")
	b.WriteString("Each class's lambda and 1/lambda are those of its most precise certificate: `certificates/REPRESENTATIVE.json`, or `refined/REPRESENTATIVE-R.json` (marked *) where the class was bracketed again, aiming at R digits, to order its group. \"digits\" is the number of leading significant digits the two ends share. The structure is the certificate's class with its primitivity exponent k (the least k with T^k positive).\n\n")
	fmt.Fprintf(&b, "| rank | representative | members | group | lambda | 1/lambda | digits | structure | a_%d |\n", p.To)
	b.WriteString("|---|---|---|---|---|---|---|---|---|\n")
	for i, r := range rep.Rows {
		mark := ""
		if r.Refined != nil {
			mark = "*"
		}
		fmt.Fprintf(&b, "| %d | %s | %s | %d | %s%s | %s | %d | %s | %s |\n", i+1, r.Representative, strings.Join(r.Members, " "),
			r.Group, rangeText(r.Best()), mark, rangeText(r.BestRadius()), r.Digits(), shortForm(r), r.Counts[len(r.Counts)-1])
	}
	b.WriteString("\nEvery range is rounded outward and rests on a certificate accepted by the checker (`avoidcert check FILE --expect REPRESENTATIVE`).\n")

	b.WriteString("\n## Asymptotic forms\n\n")
	for _, f := range forms(rep.Rows) {
		fmt.Fprintf(&b, "- %s: %s", classCount(len(f.classes)), f.words)
		if len(f.classes) <= 12 {
			fmt.Fprintf(&b, " (%s)", strings.Join(f.classes, ", "))
		}
		b.WriteString("\n")
	}

	fmt.Fprintf(&b, "\n## Groups with equal counts up to n = %d\n\n", p.To)
	b.WriteString("Numbered by rank: group 1 holds the class of largest lambda, and each next group is the next one met going down the classes table. lambda is the smallest range holding the ranges of all the group's classes. Two groups differ in their counts at some n <= N, which proves their classes are not c-Wilf equivalent; \"differs from the previous at n\" is the first such n for the group numbered one less.\n\n")
	b.WriteString("| group | classes | lambda | differs from the previous at n |\n|---|---|---|---|\n")
	for _, g := range rep.Groups {
		at := "–"
		if g.ID > 1 {
			at = strconv.Itoa(g.DiffersFromPreviousAt)
		}
		fmt.Fprintf(&b, "| %d | %s | %s | %s |\n", g.ID, strings.Join(g.Classes, " "), rangeText(g.Lambda), at)
	}
	b.WriteString("\nGroups when counts are compared up to n:")
	for n, c := range rep.GroupsByN {
		fmt.Fprintf(&b, " %d:%d", n, c)
	}
	b.WriteString("\n")

	b.WriteString("\n## Order of the groups\n\n")
	b.WriteString("Group g > group g+1 is proved when the lambda of every class of g is above that of every class of g+1 (their ranges in the groups table are disjoint). \"digits\" is the most digits certified among the classes of the two groups.\n\n")
	b.WriteString("| above | below | relation | digits |\n|---|---|---|---|\n")
	for _, s := range rep.GroupOrder {
		rel := "> (proved)"
		if s.Relation != ">" {
			rel = "unresolved"
		}
		fmt.Fprintf(&b, "| %d | %d | %s | %d |\n", s.Above, s.Below, rel, s.Digits)
	}
	if len(o.unresolved) > 0 {
		fmt.Fprintf(&b, "\nUnresolved (ranges overlap with certificates of up to the digits shown; the cap is %d):\n\n", p.RefineDigits)
		for _, s := range o.unresolved {
			fmt.Fprintf(&b, "- group %d (%s) and group %d (%s), %d digits\n", s.Above, rep.Groups[s.Above-1].Classes[0], s.Below, rep.Groups[s.Below-1].Classes[0], s.Digits)
		}
	}
	return []byte(b.String())
}

// orderSummary counts the order statements of a report's groups.
type orderSummary struct {
	proved     int
	lastDigits int // the most digits a proved step needed
	unresolved []GroupStep
}

func summarizeOrder(rep *Report) orderSummary {
	var o orderSummary
	for _, s := range rep.GroupOrder {
		if s.Relation == ">" {
			o.proved++
			o.lastDigits = max(o.lastDigits, s.Digits)
		} else {
			o.unresolved = append(o.unresolved, s)
		}
	}
	return o
}

func (o orderSummary) sentence() string {
	total := o.proved + len(o.unresolved)
	if total == 0 {
		return "a single group"
	}
	t := fmt.Sprintf("%d of the %d adjacent pairs of groups proved ordered", o.proved, total)
	if o.proved > 0 {
		t += fmt.Sprintf(", with certificates of at most %d digits", o.lastDigits)
	}
	if n := len(o.unresolved); n > 0 {
		t += fmt.Sprintf("; %d pairs unresolved (listed under \"Order of the groups\")", n)
	}
	return t
}

// form is one asymptotic form and the classes that have it.
type form struct {
	words   string
	classes []string
}

// forms groups the rows by their asymptotic form, the most common first.
func forms(rows []Row) []form {
	var out []form
	at := map[string]int{}
	for _, r := range rows {
		i, ok := at[r.Form]
		if !ok {
			i = len(out)
			at[r.Form] = i
			out = append(out, form{words: r.Form})
		}
		out[i].classes = append(out[i].classes, r.Representative)
	}
	slices.SortStableFunc(out, func(a, b form) int { return len(b.classes) - len(a.classes) })
	return out
}

// formsSentence counts the classes by structure class and exponent.
func formsSentence(rows []Row) string {
	var kinds []string
	count := map[string]int{}
	example := map[string]string{}
	for _, r := range rows {
		k := shortForm(r)
		if count[k] == 0 {
			kinds = append(kinds, k)
			example[k] = r.Representative
		}
		count[k]++
	}
	slices.SortStableFunc(kinds, func(a, b string) int { return count[b] - count[a] })
	var parts []string
	for _, k := range kinds {
		if count[k] == 1 {
			parts = append(parts, fmt.Sprintf("%s: 1 class (%s)", k, example[k]))
		} else {
			parts = append(parts, fmt.Sprintf("%s: %s", k, classCount(count[k])))
		}
	}
	return strings.Join(parts, "; ") + " (k is the primitivity exponent; forms below)"
}

func classCount(n int) string {
	if n == 1 {
		return "1 class"
	}
	return fmt.Sprintf("%d classes", n)
}

func rangeText(r Range) string {
	hi := r.Hi
	if hi == "" {
		hi = "inf"
	}
	return "[" + r.Lo + ", " + hi + "]"
}
