package census

import (
	"math/big"
	"slices"
	"strings"
)

// Row is one symmetry class in the census.
type Row struct {
	Representative string   `json:"representative"` // the least member
	Members        []string `json:"members"`        // sorted
	// Group numbers the classes with the same counts a_0..a_N (see
	// Report.Groups); 0 in journal records.
	Group  int      `json:"group,omitempty"`
	Counts []string `json:"counts"` // a_0..a_N, decimal
	Lambda Range    `json:"lambda"`
	Radius Range    `json:"radius"` // 1/lambda
	Class  string   `json:"structure_class"`
	Form   string   `json:"asymptotic_form"`
	// Certificate is the certificate's path inside the census folder.
	Certificate       string `json:"certificate"`
	CertificateSHA256 string `json:"certificate_sha256"`
}

// Group is a set of classes with identical counts a_0..a_N: candidate
// c-Wilf equivalences.
type Group struct {
	ID      int      `json:"id"`
	Classes []string `json:"classes"` // representatives, in row order
	// DiffersFromPreviousAt is the least n where this group's counts differ
	// from the previous group's (0 for the first group). Groups are sorted
	// by their counts, largest first (compared at the first n where they
	// differ), so the first difference of groups i < j is the least
	// DiffersFromPreviousAt of groups i+1..j.
	DiffersFromPreviousAt int `json:"differs_from_previous_at,omitempty"`
}

// Step compares two classes adjacent in the order by lambda.
type Step struct {
	Above string `json:"above"`
	Below string `json:"below"`
	// Relation is ">" when the certified ranges are disjoint (lambda of
	// Above is larger, proved) and "unresolved" when they overlap at the
	// census's digits.
	Relation string `json:"relation"`
	// SameCounts tells that the two are in one group (their counts agree
	// up to N): no number of digits can order them if they are c-Wilf
	// equivalent.
	SameCounts bool `json:"same_counts,omitempty"`
}

// Report is the census: the content of census.json.
type Report struct {
	Format  string `json:"format"`
	Version int    `json:"version"`
	Tool    string `json:"tool"`
	Params  Params `json:"parameters"`
	// Shard is set on a shard's partial report; merge them for the whole.
	Shard *Shard `json:"shard,omitempty"`
	// Classes is the number of symmetry classes of the length; Rows holds
	// those of the shard, sorted by lambda, largest first.
	Classes int   `json:"classes"`
	Rows    []Row `json:"rows"`
	// Groups sorted by counts, largest first. Their number is a proved
	// lower bound on the number of c-Wilf classes (of a whole census).
	Groups []Group `json:"groups"`
	// GroupsByN[n] is the number of groups when counts are compared up to
	// a_n only; SeparatingN is the least n where it reaches len(Groups).
	GroupsByN   []int  `json:"groups_by_n"`
	SeparatingN int    `json:"separating_n"`
	Order       []Step `json:"order"`
}

// Format and version of census.json.
const (
	ReportFormat  = "avoidcert-census"
	ReportVersion = 1
)

// summarize builds the report from the rows of a shard (in any order):
// rows sorted by lambda, groups, separations, order.
func summarize(tool string, params Params, shard Shard, rows []Row) *Report {
	r := &Report{Format: ReportFormat, Version: ReportVersion, Tool: tool, Params: params,
		Classes: len(Shard{}.Classes(params.Length))}
	if !shard.Whole() {
		r.Shard = &shard
	}
	r.Rows = slices.Clone(rows)
	slices.SortFunc(r.Rows, byLambda)
	r.Groups, r.GroupsByN, r.SeparatingN = group(r.Rows, params.To)
	for i := 1; i < len(r.Rows); i++ {
		above, below := r.Rows[i-1], r.Rows[i]
		s := Step{Above: above.Representative, Below: below.Representative, Relation: "unresolved",
			SameCounts: above.Group == below.Group}
		if lo, hi := decimal(above.Lambda.Lo), decimal(below.Lambda.Hi); lo != nil && hi != nil && lo.Cmp(hi) > 0 {
			s.Relation = ">"
		}
		r.Order = append(r.Order, s)
	}
	return r
}

// byLambda orders rows by lambda, largest first: by the lower end, then
// the upper end (a missing upper end is infinite), then the
// representative, so that the order is total and the same on every run.
func byLambda(a, b Row) int {
	if c := decimal(b.Lambda.Lo).Cmp(decimal(a.Lambda.Lo)); c != 0 {
		return c
	}
	ah, bh := decimal(a.Lambda.Hi), decimal(b.Lambda.Hi)
	switch {
	case ah == nil && bh != nil:
		return -1
	case ah != nil && bh == nil:
		return 1
	case ah != nil && bh != nil:
		if c := bh.Cmp(ah); c != 0 {
			return c
		}
	}
	return strings.Compare(a.Representative, b.Representative)
}

// decimal parses a decimal written by the Certifier; "" (an infinite end)
// gives nil. Rows come from the Certifier or from files this package
// validated, so a malformed number is a programming error.
func decimal(s string) *big.Rat {
	if s == "" {
		return nil
	}
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		panic("census: not a decimal: " + s)
	}
	return r
}

// group sets rows[i].Group and returns the groups (sorted by counts,
// largest first), the number of groups at each n, and the least n that
// separates them all.
func group(rows []Row, to int) ([]Group, []int, int) {
	counts := make([][]*big.Int, len(rows))
	for i, r := range rows {
		for _, a := range r.Counts {
			v, ok := new(big.Int).SetString(a, 10)
			if !ok {
				panic("census: not a count: " + a)
			}
			counts[i] = append(counts[i], v)
		}
	}
	order := make([]int, len(rows))
	for i := range order {
		order[i] = i
	}
	// Largest counts first, row order among equals.
	slices.SortStableFunc(order, func(i, j int) int { return -compareCounts(counts[i], counts[j]) })
	var groups []Group
	byN := make([]int, to+1)
	for _, i := range order {
		g := len(groups)
		if g > 0 {
			prev := groups[g-1]
			first := firstDifference(counts[rowIndex(rows, prev.Classes[0])], counts[i])
			if first < 0 {
				groups[g-1].Classes = append(groups[g-1].Classes, rows[i].Representative)
				rows[i].Group = prev.ID
				continue
			}
			for n := first; n <= to; n++ {
				byN[n]++
			}
			groups = append(groups, Group{ID: g + 1, Classes: []string{rows[i].Representative}, DiffersFromPreviousAt: first})
		} else {
			groups = append(groups, Group{ID: 1, Classes: []string{rows[i].Representative}})
		}
		rows[i].Group = g + 1
	}
	separating := 0
	for n := range byN {
		byN[n]++ // the first group
		if n > 0 && byN[n] > byN[n-1] {
			separating = n
		}
	}
	for _, g := range groups {
		slices.SortFunc(g.Classes, func(a, b string) int { return rowIndex(rows, a) - rowIndex(rows, b) })
	}
	return groups, byN, separating
}

func rowIndex(rows []Row, rep string) int {
	return slices.IndexFunc(rows, func(r Row) bool { return r.Representative == rep })
}

// compareCounts compares two count sequences at the first n where they
// differ.
func compareCounts(a, b []*big.Int) int {
	if n := firstDifference(a, b); n >= 0 {
		return a[n].Cmp(b[n])
	}
	return 0
}

// firstDifference returns the least n with a[n] != b[n], or -1.
func firstDifference(a, b []*big.Int) int {
	for n := range min(len(a), len(b)) {
		if a[n].Cmp(b[n]) != 0 {
			return n
		}
	}
	return -1
}
