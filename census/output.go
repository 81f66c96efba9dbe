package census

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"path/filepath"
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
		"structure_class", "certificate", "certificate_sha256"}
	for n := 0; n <= rep.Params.To; n++ {
		head = append(head, "a"+strconv.Itoa(n))
	}
	w.Write(head)
	for i, r := range rep.Rows {
		line := []string{strconv.Itoa(i + 1), r.Representative, strings.Join(r.Members, " "), strconv.Itoa(r.Group),
			r.Lambda.Lo, r.Lambda.Hi, r.Radius.Lo, r.Radius.Hi, r.Class, r.Certificate, r.CertificateSHA256}
		w.Write(append(line, r.Counts...))
	}
	w.Flush() // writes to a buffer cannot fail
	return buf.Bytes()
}

// tableMarkdown is the census for reading: summary, classes, groups and
// the unresolved places of the order.
func tableMarkdown(rep *Report) []byte {
	var b strings.Builder
	p := rep.Params
	fmt.Fprintf(&b, "# Census of the consecutive patterns of length %d\n\n", p.Length)
	if rep.Shard != nil {
		fmt.Fprintf(&b, "**Shard %s: %d of the %d classes. Merge all shards (`avoidcert census merge`) for the census; groups and order below are of this shard only.**\n\n",
			rep.Shard, len(rep.Rows), rep.Classes)
	}
	strict, unresolved := 0, 0
	for _, s := range rep.Order {
		if s.Relation == ">" {
			strict++
		} else {
			unresolved++
		}
	}
	fmt.Fprintf(&b, "- tool: %s; counts a_n for n <= %d; lambda certified to %d significant digits\n", rep.Tool, p.To, p.Digits)
	fmt.Fprintf(&b, "- symmetry classes (reverse, complement, both): %d\n", len(rep.Rows))
	fmt.Fprintf(&b, "- groups with equal counts up to n = %d: %d, all separated by n = %d. A proved lower bound on the number of c-Wilf classes; the classes within a group are candidates for c-Wilf equivalence (evidence, not proof).\n",
		p.To, len(rep.Groups), rep.SeparatingN)
	fmt.Fprintf(&b, "- order by lambda: %d adjacent pairs strictly ordered (disjoint certified ranges), %d unresolved at these digits\n\n", strict, unresolved)

	fmt.Fprintf(&b, "## Classes, largest lambda first\n\n")
	fmt.Fprintf(&b, "| rank | representative | members | group | lambda | 1/lambda | structure | a_%d |\n", p.To)
	b.WriteString("|---|---|---|---|---|---|---|---|\n")
	for i, r := range rep.Rows {
		fmt.Fprintf(&b, "| %d | %s | %s | %d | %s | %s | %s | %s |\n", i+1, r.Representative, strings.Join(r.Members, " "),
			r.Group, rangeText(r.Lambda), rangeText(r.Radius), r.Class, r.Counts[len(r.Counts)-1])
	}
	b.WriteString("\nEvery range is rounded outward and rests on the certificate `certificates/REPRESENTATIVE.json`, accepted by the checker (`avoidcert check`). Asymptotic forms:\n\n")
	for _, r := range rep.Rows {
		fmt.Fprintf(&b, "- %s: %s\n", r.Representative, r.Form)
	}

	fmt.Fprintf(&b, "\n## Groups with equal counts up to n = %d\n\n", p.To)
	b.WriteString("Sorted by counts, largest first. Two groups first differ at the least \"differs from the previous at\" between them, which proves their classes are not c-Wilf equivalent.\n\n")
	b.WriteString("| group | classes | differs from the previous at n |\n|---|---|---|\n")
	for _, g := range rep.Groups {
		at := "–"
		if g.DiffersFromPreviousAt > 0 {
			at = strconv.Itoa(g.DiffersFromPreviousAt)
		}
		fmt.Fprintf(&b, "| %d | %s | %s |\n", g.ID, strings.Join(g.Classes, " "), at)
	}
	b.WriteString("\nGroups when counts are compared up to n:")
	for n, c := range rep.GroupsByN {
		fmt.Fprintf(&b, " %d:%d", n, c)
	}
	b.WriteString("\n")

	b.WriteString("\n## Unresolved places in the order\n\n")
	if unresolved == 0 {
		b.WriteString("None: every adjacent pair is strictly ordered.\n")
	}
	for _, s := range rep.Order {
		if s.Relation == ">" {
			continue
		}
		why := "ranges overlap at these digits"
		if s.SameCounts {
			why += "; same counts up to n = " + strconv.Itoa(p.To)
		}
		fmt.Fprintf(&b, "- %s and %s: %s\n", s.Above, s.Below, why)
	}
	return []byte(b.String())
}

func rangeText(r Range) string {
	hi := r.Hi
	if hi == "" {
		hi = "inf"
	}
	return "[" + r.Lo + ", " + hi + "]"
}
