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
		usage: `Usage: avoidcert structure [--json] [--witnesses] [--max-memory B] PATTERN...

Classifies the transfer operator of the set on its prefix states (the
recurrent ones: those on a cycle of the state digraph, reachable from the
empty state), with the evidence:
  primitive       some power T^k has an a.e.-positive kernel; the least
                  such k is the primitivity exponent:
                  a_n/n! = c lambda^n (1 + O(theta^n)) with c > 0, theta < 1
  periodic        irreducible with period p: a_n/n! = lambda^n (c_(n mod p)
                  + O(theta^n)); no single constant c is proved
  reducible       several blocks of recurrent states (or one whose joint
                  sets miss a configuration): lambda is the largest over
                  the blocks
  finite          a_n = 0 from some n on
  subexponential  lambda = 0 proved, a_n > 0 for all n
  undecided       none of the above proved (the step limit of 1000)
Whether lambda > 0 is shown by a cyclic avoider, or lambda = 0 proved.
Nothing is printed until the independent checker has recomputed the
structure section of a certificate built for the set and accepted it.

Flags:
  --json          {"format":"avoidcert-structure","version":1,"patterns":[...],
                  "structure_class":...,"primitivity_exponent":k,"period":p,
                  "finite_from":N1,"blocks":[[...]],"lambda_status":...,...};
                  what does not apply is null (docs/json.md)
  --witnesses     for a primitive set, one permutation per configuration of
                  the joint test: it avoids the set, starts in the start
                  state and ends, k moves later, in the current state with
                  the configuration's joint order
  --max-memory B  refuse a test estimated to need more memory (default 4G)

Exit codes: 0 a class decided, 3 undecided (the step limit of 1000, or over
--max-memory: nothing printed then), 2 bad input, 4 interrupted or a
certificate the checker refused.
`,
		run: runStructure,
	}
}

func runStructure(ctx context.Context, e *env, args []string) int {
	fs := newFlags("structure")
	asJSON := fs.Bool("json", false, "")
	witnesses := fs.Bool("witnesses", false, "")
	maxMem := byteSize(defaultMemory)
	fs.Var(&maxMem, "max-memory", "")
	pos, err := parseArgs(fs, args)
	if err != nil {
		return failure(e, err)
	}
	set, err := parsePatterns("structure", pos)
	if err != nil {
		return failure(e, err)
	}
	limitMemory(int64(maxMem))
	r, err := prove.Classify(ctx, set, prove.Options{MaxMemory: int64(maxMem), Witnesses: *witnesses, Tool: toolName()})
	if err != nil {
		return failure(e, err)
	}
	if *asJSON {
		writeStructureJSON(e.stdout, r, *witnesses)
	} else {
		writeStructureText(e.stdout, r, *witnesses)
	}
	return structureCode(r.Certificate.Structure)
}

// structureCode is the exit code of a checked structure section: 3 when
// it decides no class (the step limit, a budget like any other), else 0.
func structureCode(cs *certify.Structure) int {
	if cs.Class == certify.ClassUndecided {
		return exitUndecided
	}
	return exitOK
}

// writeStructureText prints the checked class and lambda status, the
// structure test's explanation and, if asked, the witnesses.
func writeStructureText(w io.Writer, r *prove.Result, witnesses bool) {
	cs, rep := r.Certificate.Structure, r.Report
	fmt.Fprintf(w, "patterns: %s (window length %d)\n", r.Set, r.Set.Window())
	printWrapped(w, "class: "+classLine(r.Certificate), "  ")
	printWrapped(w, "lambda: "+lambdaLine(cs), "  ")
	for _, line := range rep.Explanation {
		printWrapped(w, "  "+line, "    ")
	}
	printWrapped(w, "checked: "+checkedLine(cs), "  ")
	if witnesses {
		if rep.Witnesses == nil {
			fmt.Fprintln(w, "witnesses: none (only a primitive set has one per configuration)")
			return
		}
		printWrapped(w, fmt.Sprintf("witnesses (%d, one per configuration x|y of D: a permutation that avoids the set, whose first entries x are in the start state and whose last entries y, %d moves later, are in the current state, with the joint order shown):",
			rep.Witnesses.Count(), rep.Exponent), "  ")
		rep.Witnesses.Each(func(wt structure.Witness) bool {
			fmt.Fprintf(w, "  %s  %s\n", wt.Configuration, wt.Permutation)
			return true
		})
	}
}

// classLine is the one-line verdict that structure, bound and the census
// print, from a certificate the checker accepted.
func classLine(c *certify.Certificate) string { return prove.FormOf(c).Words() }

// lambdaLine says what the checked section proves about lambda > 0.
func lambdaLine(cs *certify.Structure) string {
	switch cs.Lambda {
	case certify.LambdaPositive:
		return fmt.Sprintf("> 0 proved: %s is a cyclic avoider (length %d)", pattern.Perm(cs.CyclicAvoider).String(), len(cs.CyclicAvoider))
	case certify.LambdaZero:
		return "= 0 proved: no cyclic avoider of any length"
	default:
		return "> 0 undecided"
	}
}

// checkedLine says what the checker recomputed and verified.
func checkedLine(cs *certify.Structure) string {
	var parts []string
	if cs.Recurrent != nil {
		parts = append(parts, fmt.Sprintf("the recurrent states (%d) and |D| = %d", len(cs.Recurrent), cs.Configurations))
	}
	switch cs.Class {
	case certify.ClassPrimitive:
		parts = append(parts, fmt.Sprintf("R_0 .. R_%d", cs.Exponent))
	case certify.ClassFinite:
		parts = append(parts, "the longest walk from ()")
	case certify.ClassReducible:
		parts = append(parts, "the blocks")
	}
	if cs.CycleLength > 0 {
		parts = append(parts, fmt.Sprintf("R_0 .. R_%d and the joint cycle (start %d, length %d)", cs.CycleStart+cs.CycleLength, cs.CycleStart, cs.CycleLength))
	}
	var did []string
	if len(parts) > 0 {
		did = append(did, "recomputed "+strings.Join(parts, ", ")+" with its own code")
	}
	if cs.CyclicAvoider != nil {
		did = append(did, "checked the cyclic avoider window by window")
	}
	did = append(did, "accepted the certificate built for the set")
	if len(did) == 1 {
		return "the independent checker " + did[0]
	}
	return "the independent checker " + strings.Join(did[:len(did)-1], ", ") + ", and " + did[len(did)-1]
}

func countWord(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

// structureJSON is the --json output of structure: the checked section's
// class, numbers and lambda status, the states by number (names in
// "states"), and the test's explanation.
type structureJSON struct {
	jsonHead
	Patterns            []string        `json:"patterns"`
	Class               string          `json:"structure_class"`
	PrimitivityExponent *int            `json:"primitivity_exponent"`
	Period              *int            `json:"period"`
	FiniteFrom          *int            `json:"finite_from"`
	Blocks              [][]int         `json:"blocks"`
	LambdaStatus        string          `json:"lambda_status"`
	CyclicAvoider       *string         `json:"cyclic_avoider"`
	States              []string        `json:"states"`
	RecurrentStates     []int           `json:"recurrent_states"`
	TransientStates     []int           `json:"transient_states"`
	Configurations      *int            `json:"configurations"`
	JointCycle          *jointCycleJSON `json:"joint_cycle"`
	JointSetSizes       []int           `json:"joint_set_sizes"`
	Explanation         []string        `json:"explanation"`
	Witnesses           []witnessJSON   `json:"witnesses,omitempty"`
}

type jointCycleJSON struct {
	Start  int `json:"start"`
	Length int `json:"length"`
}

type witnessJSON struct {
	Configuration string `json:"configuration"`
	Permutation   string `json:"permutation"`
}

func writeStructureJSON(w io.Writer, r *prove.Result, witnesses bool) {
	cs, rep := r.Certificate.Structure, r.Report
	out := structureJSON{jsonHead: headOf("structure"), Patterns: r.Set.Strings(), Class: string(cs.Class), LambdaStatus: string(cs.Lambda),
		Blocks: nonNil(rep.Blocks), RecurrentStates: nonNil(rep.Recurrent), TransientStates: nonNil(rep.Transient),
		JointSetSizes: nonNil(rep.Sizes), Explanation: rep.Explanation}
	out.PrimitivityExponent, out.Period, out.FiniteFrom = classNumbers(cs)
	for p := range rep.States.Len() {
		out.States = append(out.States, structure.StateName(rep.States, p))
	}
	if cs.Class != certify.ClassFinite {
		out.Configurations = &rep.Configurations
	}
	if cs.CycleLength > 0 {
		out.JointCycle = &jointCycleJSON{cs.CycleStart, cs.CycleLength}
	}
	if cs.CyclicAvoider != nil {
		s := pattern.Perm(cs.CyclicAvoider).String()
		out.CyclicAvoider = &s
	}
	if witnesses && rep.Witnesses != nil {
		rep.Witnesses.Each(func(wt structure.Witness) bool {
			out.Witnesses = append(out.Witnesses, witnessJSON{wt.Configuration, wt.Permutation.String()})
			return true
		})
	}
	writeJSON(w, out)
}

// classNumbers returns the primitivity exponent, the period and N1 of a
// checked structure section, each nil where its class does not have it.
func classNumbers(cs *certify.Structure) (exponent, period, finiteFrom *int) {
	switch cs.Class {
	case certify.ClassPrimitive:
		return &cs.Exponent, nil, nil
	case certify.ClassPeriodic:
		return nil, &cs.Period, nil
	case certify.ClassFinite:
		return nil, nil, &cs.N1
	}
	return nil, nil, nil
}

// nonNil returns s, or an empty slice for nil (JSON [] rather than null).
func nonNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
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
