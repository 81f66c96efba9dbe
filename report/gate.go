package report

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"slices"
	"strings"

	"avoidcert/claims"
	"avoidcert/internal/input"
)

// GateClaim is one line of 'avoidcert gate --json', as the gate writes it.
type GateClaim = claims.JSONLine

// Gate is a gate's JSON output: its verdicts as the gate recorded them.
// A report restates them as recorded and not re-checked (the lines hold
// no claimed values to judge again), never as verdicts of its own.
type Gate struct {
	Name   string
	Claims []GateClaim
}

// IsGateJSON reports whether data starts with a gate's JSON line (an
// object with "verdict" and "kind", as every version of the gate wrote),
// as opposed to a certificate.
func IsGateJSON(data []byte) bool {
	line, _, _ := bytes.Cut(bytes.TrimSpace(data), []byte("\n"))
	var probe map[string]json.RawMessage
	if json.Unmarshal(line, &probe) != nil {
		return false
	}
	_, v := probe["verdict"]
	_, k := probe["kind"]
	return v && k
}

// FromGate reads the JSON lines of 'avoidcert gate --json', strictly.
func FromGate(name string, data []byte) (*Gate, error) {
	g := &Gate{Name: name}
	if err := input.CheckJSON(data); err != nil {
		return nil, fmt.Errorf("%s: not the output of 'avoidcert gate --json': %v", name, err)
	}
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(nil, 1<<24)
	for n := 1; sc.Scan(); n++ {
		line := bytes.TrimSpace(sc.Bytes())
		if len(line) == 0 {
			continue
		}
		var c GateClaim
		dec := json.NewDecoder(bytes.NewReader(line))
		dec.DisallowUnknownFields()
		err := dec.Decode(&c)
		switch {
		case err == nil && c.Format == "":
			return nil, fmt.Errorf("%s:%d: a line of an earlier gate, which did not restate its claims; run the gate again with this version", name, n)
		case err != nil:
			return nil, fmt.Errorf("%s:%d: not a line of 'avoidcert gate --json': %s", name, n, input.JSONProblem(err))
		case c.Format != claims.JSONFormat || c.Version != claims.JSONVersion:
			return nil, fmt.Errorf("%s:%d: format %s version %d; this report reads %s version %d", name, n, quoteID(c.Format), c.Version, claims.JSONFormat, claims.JSONVersion)
		}
		if c.ID == "" || c.Verdict == "" {
			return nil, fmt.Errorf("%s:%d: a claim without id or verdict", name, n)
		}
		if !slices.Contains(gateVerdicts, c.Verdict) {
			return nil, fmt.Errorf("%s:%d: claim %s: %s is not a verdict the gate writes (%s); the file is not the gate's output as written",
				name, n, quoteID(c.ID), quoteID(string(c.Verdict)), verdictList())
		}
		if !slices.Contains(gateKinds, c.Kind) {
			return nil, fmt.Errorf("%s:%d: claim %s: %s is not a claim kind; the file is not the gate's output as written", name, n, quoteID(c.ID), quoteID(string(c.Kind)))
		}
		g.Claims = append(g.Claims, c)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %v", name, err)
	}
	if len(g.Claims) == 0 {
		return nil, fmt.Errorf("%s: no claims", name)
	}
	return g, nil
}

// What a gate's JSON lines can hold.
var (
	gateVerdicts = []claims.Verdict{claims.Proved, claims.Refuted, claims.Undecided, claims.Failed}
	gateKinds    = []claims.Kind{claims.KindCount, claims.KindGrowth, claims.KindForm, claims.KindOrder, claims.KindEqualCounts, claims.KindProbability}
)

func verdictList() string {
	var words []string
	for _, v := range gateVerdicts {
		words = append(words, string(v))
	}
	return strings.Join(words, ", ")
}

// quoteID quotes a value from a gate line, cut to a few dozen characters.
func quoteID(s string) string {
	if len(s) > 40 {
		s = s[:40] + "..."
	}
	return fmt.Sprintf("%q", s)
}

// tally counts the claims by recorded verdict.
func (g *Gate) tally() string {
	counts := map[claims.Verdict]int{}
	var order []claims.Verdict
	for _, c := range g.Claims {
		if counts[c.Verdict] == 0 {
			order = append(order, c.Verdict)
		}
		counts[c.Verdict]++
	}
	s := ""
	for i, v := range order {
		if i > 0 {
			s += ", "
		}
		s += fmt.Sprintf("%d %s", counts[v], v)
	}
	return s
}
