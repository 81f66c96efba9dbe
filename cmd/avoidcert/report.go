package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"avoidcert/census"
	"avoidcert/internal/input"
	"avoidcert/prove"
	"avoidcert/report"
)

func init() {
	commands["report"] = command{
		summary: "a page for readers from certificates: Markdown, HTML or LaTeX",
		usage: `Usage: avoidcert report [--format md|html|tex | --json] [--out FILE] INPUT...

Each INPUT is a certificate (format version 4), the output of
'avoidcert gate --json' (one JSON object per line), the output of
'avoidcert series --json', or a census folder (census.json and its
certificates). Everything stated as certified or proved is read from
certificates the independent checker accepted while the report is made,
never from the input files' own numbers.

For a census: every row is verified against its own certificate (read inside
the folder, matching its SHA-256, accepted by the checker for the row's
class): its lambda and 1/lambda ranges, structure class and form must be the
certificate's, its counts the checker's own, and the order and count groups
are derived again; then the classes by lambda, the groups and the order, and
a figure of lambda by class with the ranges as bars. A row that differs, a
certificate of another class, or a path that leaves the folder stops the
report (exit 1, naming the row and the field). For a gate: each claim as
its line restates it, against what the certificates the line names certify
(looked for from the manifest's folder, the current one and the gate
file's, taken only with the recorded SHA-256 and re-checked; one that
differs, one the checker refuses, or a recorded verdict they contradict
stops the report, exit 1), and the gate's verdicts and evidence as
recorded, refuted claims marked; a line with a verdict or kind the gate
never writes is refused (exit 2). For a series
run: the observed count of each pattern against its exact mean, tails as
recorded, the exact means and variances recomputed (a run whose recorded ones
differ is refused), avoidance probabilities derived again, and in HTML a
figure of observed against expected with the exact 95% ranges. For a
certificate: the pattern set, the certified range of lambda and 1/lambda,
the explicit bound for every n >= n0, the asymptotic form, the certificate's
SHA-256 and the command that re-checks it; one the checker refuses stops
the report (exit 1).

  md    Markdown, with the figures' data as tables
  html  a standalone page (inline SVG figures, nothing fetched from the
        network): the width of the certified bracket against n (log scale)
        with the observed rate, and the distance of a_(n+1)/((n+1) a_n)
        from lambda against n, to the bracket's last n, with half the
        width of the certified range
  tex   a LaTeX fragment to \input: one theorem per certificate; long
        numbers in groups of five digits that break across lines

The figures are recomputed with the engine (a certificate keeps only its
final brackets) and the page says so.

Flags:
  --format F   md (default), html or tex
  --json       the same content as data instead, one JSON object
               (docs/json.md): the certified values, the verified census
               tables, the gate's lines as recorded, the series runs with
               their avoidance derived again, the figures' data
  --out FILE   write there (atomically, in an existing folder; a folder,
               device or FIFO is refused) instead of standard output

Exit codes: 0 success, 1 a certificate the checker refuses (also one that
does not read as a certificate, as for 'check') or a census row it does not
support, 2 bad input (a file that cannot be read, a census folder or gate
output that is not one; only regular files within the limits of the
README's "Input limits" are read), 3 a certificate over the checker's
memory or work limit (undecided), 4 interrupted (Ctrl-C or SIGTERM) or out of
space.
`,
		run: runReport,
	}
}

func runReport(ctx context.Context, e *env, args []string) int {
	fs := newFlags("report")
	format := fs.String("format", "md", "")
	asJSON := fs.Bool("json", false, "")
	outPath := fs.String("out", "-", "")
	files, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	formatGiven := false
	fs.Visit(func(f *flag.Flag) { formatGiven = formatGiven || f.Name == "format" })
	if *asJSON {
		if formatGiven {
			return failure(e, usagef("report: give --json or --format %s, not both", quote(*format)))
		}
		*format = "json"
	}
	render := map[string]func(io.Writer, *report.Document) error{"md": report.Markdown, "html": report.HTML, "tex": report.TeX, "json": report.JSON}[*format]
	switch {
	case render == nil:
		return failure(e, usagef("report: --format %s is not one of md, html, tex (or --json)", quote(*format)))
	case len(files) == 0:
		return failure(e, usagef("report: give at least one certificate file"))
	}
	out, err := openOut("report", "--out", *outPath, false)
	if err != nil {
		return failure(e, err)
	}
	var doc report.Document
	for _, f := range files {
		err := addInput(ctx, &doc, f)
		switch {
		case err == nil:
		case ctx.Err() != nil:
			return interrupted(e)
		case report.IsRefused(err):
			fmt.Fprintf(e.stderr, "avoidcert: report: %s\n", ownWords(err.Error()))
			return exitFailed
		case errors.Is(err, prove.ErrBudget):
			return failure(e, fmt.Errorf("report: %w", err))
		default:
			return failure(e, usagef("report: %v", err))
		}
	}
	var b bytes.Buffer
	if err := render(&b, &doc); err != nil {
		return failure(e, err)
	}
	if err := out.write(e.stdout, b.Bytes()); err != nil {
		return failure(e, err)
	}
	return exitOK
}

// addInput reads one input: a census folder, the JSON of a series run, a
// gate's JSON lines or a certificate.
func addInput(ctx context.Context, doc *report.Document, path string) error {
	if st, err := os.Stat(path); err == nil && st.IsDir() {
		c, err := report.FromCensus(ctx, path)
		if err != nil {
			return err
		}
		doc.Censuses = append(doc.Censuses, c)
		return nil
	}
	data, err := input.ReadFile(ctx, path, input.ReportInput)
	if err != nil {
		return err
	}
	if report.IsSeriesJSON(data) {
		s, err := report.FromSeries(ctx, path, data)
		if err != nil {
			return err
		}
		doc.Series = append(doc.Series, s)
		return nil
	}
	if report.IsGateJSON(data) {
		g, err := report.FromGate(ctx, path, data)
		if err != nil {
			return err
		}
		doc.Gates = append(doc.Gates, g)
		return nil
	}
	if err := looksLikeCertificate(path, data); err != nil {
		return err
	}
	r, err := report.FromCertificate(ctx, path, data)
	if err != nil {
		return err
	}
	doc.Certificates = append(doc.Certificates, r)
	return nil
}

// looksLikeCertificate refuses, with what to do instead, a file that is
// none of report's inputs, before it is read as a certificate (whose
// reader would only say what a certificate lacks).
func looksLikeCertificate(path string, data []byte) error {
	var probe struct {
		Content *struct {
			Format string `json:"format"`
		} `json:"content"`
		Format string `json:"format"`
	}
	trimmed := bytes.TrimSpace(data)
	switch {
	case len(trimmed) == 0 || trimmed[0] != '{':
		return fmt.Errorf("%s is not JSON: report reads certificates, census folders and the JSON of 'gate --json' and 'series --json' (a claims manifest goes to 'avoidcert gate FILE --json', whose output report reads)", quote(path))
	case json.Unmarshal(trimmed, &probe) != nil:
		return nil // damaged: the certificate reader says where
	case probe.Format == census.ReportFormat:
		return fmt.Errorf("%s is a census table: give report the census folder, %s, so that every row is checked against its certificate", quote(path), quote(filepath.Dir(path)))
	case probe.Content == nil:
		return fmt.Errorf("%s is JSON but none of report's inputs (a certificate, the JSON of 'gate --json' or 'series --json', a census folder)", quote(path))
	}
	return nil
}
