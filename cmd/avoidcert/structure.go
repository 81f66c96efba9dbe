package main

import (
	"context"
	"fmt"
	"io"
	"strings"

	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/prove"
	"avoidcert/structure"
)

func init() {
	commands["structure"] = command{
		summary: "decide whether a_n/n! ~ c lambda^n holds (primitive, periodic, ...)",
		usage: `Usage: avoidcert structure [--json] [--witnesses] PATTERN...

Classifies the transfer operator of the set, with the evidence:
  primitive       some power T^e has an a.e.-positive kernel (e = exponent):
                  a_n/n! = c lambda^n (1 + O(theta^n)) with c > 0, theta < 1
  periodic        irreducible with period d: no single constant c
  reducible       two order cells not joined by any walk: lambda is the
                  largest over the blocks
  finite          a_n = 0 from some n on
  subexponential  lambda = 0 proved, a_n > 0 for all n
  undecided       none of the above proved within the limits (window length 7)

The exact test runs for windows up to length 6; whether lambda > 0 is
decided exactly there, and shown by a cyclic avoider when it is.

Flags:
  --json        {"patterns":[...],"class":...,"period":d,"exponent":e,...};
                fields that do not apply are null
  --witnesses   list one witness permutation per joint pattern (primitive)
`,
		run: runStructure,
	}
}

func runStructure(ctx context.Context, e *env, args []string) int {
	fs := newFlags("structure")
	asJSON := fs.Bool("json", false, "")
	witnesses := fs.Bool("witnesses", false, "")
	pos, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	set, err := parsePatterns("structure", pos)
	if err != nil {
		return failure(e, err)
	}
	rep, err := structure.Analyze(ctx, set, structure.Options{Witnesses: *witnesses})
	if err != nil {
		return failure(e, err)
	}
	if *asJSON {
		writeStructureJSON(e, rep, *witnesses)
		return exitOK
	}
	fmt.Fprintf(e.stdout, "patterns: %s (window length %d)\n", set, set.Window())
	printWrapped(e.stdout, "class: "+classLine(rep), "  ")
	for _, line := range rep.Explanation {
		printWrapped(e.stdout, "  "+line, "    ")
	}
	if *witnesses && rep.Witnesses != nil {
		fmt.Fprintf(e.stdout, "witnesses (joint pattern of first %d and last %d entries: an avoiding permutation of length %d):\n",
			rep.M, rep.M, rep.Witnesses.Length())
		rep.Witnesses.Each(func(joint int, w pattern.Perm) bool {
			fmt.Fprintf(e.stdout, "  %s  %s\n", pattern.Unrank(2*rep.M, joint), w)
			return true
		})
	}
	return exitOK
}

// classLine is the one-line verdict of the structure pass.
func classLine(rep *structure.Report) string { return prove.FormOfReport(rep).Words() }

func writeStructureJSON(e *env, rep *structure.Report, withWitnesses bool) {
	type witness struct {
		Joint       string `json:"joint"`
		Permutation string `json:"permutation"`
	}
	out := struct {
		Patterns      []string  `json:"patterns"`
		Class         string    `json:"class"`
		Period        *int      `json:"period"`
		Exponent      *int      `json:"exponent"`
		LambdaPos     string    `json:"lambda_positive"`
		CyclicAvoider *string   `json:"cyclic_avoider"`
		N1            *int      `json:"finite_from"`
		Cells         int       `json:"cells"`
		Windows       int       `json:"windows"`
		Components    int       `json:"components"`
		Exact         bool      `json:"exact"`
		Explanation   []string  `json:"explanation"`
		Witnesses     []witness `json:"witnesses,omitempty"`
	}{
		Patterns: rep.Set.Strings(), Class: string(rep.Class), LambdaPos: string(rep.Lambda),
		Cells: rep.Cells, Windows: rep.Windows, Components: len(rep.Digraph.Components),
		Exact: rep.Exact, Explanation: rep.Explanation,
	}
	out.Period, out.Exponent = periodExponent(prove.FormOfReport(rep))
	if rep.Class == structure.Finite {
		out.N1 = &rep.N1
	}
	if rep.CyclicAvoider != nil {
		s := rep.CyclicAvoider.String()
		out.CyclicAvoider = &s
	}
	if withWitnesses && rep.Witnesses != nil {
		rep.Witnesses.Each(func(joint int, w pattern.Perm) bool {
			out.Witnesses = append(out.Witnesses, witness{Joint: pattern.Unrank(2*rep.M, joint).String(), Permutation: w.String()})
			return true
		})
	}
	writeJSON(e.stdout, out)
}

// periodExponent returns the period (1 for primitive sets) and the
// exponent of a form, nil where they do not apply.
func periodExponent(f prove.Form) (period, exponent *int) {
	switch f.Class {
	case certify.ClassPrimitive:
		one := 1
		return &one, &f.Exponent
	case certify.ClassPeriodic:
		return &f.Period, nil
	}
	return nil, nil
}

// lineWidth is the width text output is wrapped to.
const lineWidth = 100

// printWrapped prints text wrapped at spaces to lineWidth columns, the
// continuation lines indented by indent. A word longer than a line stays
// whole.
func printWrapped(w io.Writer, text, indent string) {
	line := ""
	for _, word := range strings.Fields(text) {
		switch {
		case line == "":
			line = leadingSpace(text) + word
		case len(line)+1+len(word) > lineWidth:
			fmt.Fprintln(w, line)
			line = indent + word
		default:
			line += " " + word
		}
	}
	fmt.Fprintln(w, line)
}

func leadingSpace(s string) string {
	return s[:len(s)-len(strings.TrimLeft(s, " "))]
}
