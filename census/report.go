package census

import (
	"math/big"
	"slices"
	"strings"

	"avoidcert/interval"
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
	// Exponent is the primitivity exponent (the least k with T^k
	// positive) of a primitive class, nil for any other class.
	Exponent *int   `json:"primitivity_exponent"`
	Form     string `json:"asymptotic_form"`
	// Certificate is the certificate's path inside the census folder.
	Certificate       string `json:"certificate"`
	CertificateSHA256 string `json:"certificate_sha256"`
	// Refined is the class bracketed again at more digits to order its
	// count group against a neighbour (see Report.GroupOrder), or nil.
	Refined *Refined `json:"refined,omitempty"`
}

// Refined is a second certificate of a row's class, at more digits than
// the census's: its ranges replace the row's in the order.
type Refined struct {
	Lambda            Range  `json:"lambda"`
	Radius            Range  `json:"radius"`
	Certificate       string `json:"certificate"` // refined/REPRESENTATIVE-DIGITS.json
	CertificateSHA256 string `json:"certificate_sha256"`
}

// Best returns the narrowest certified range of lambda the row holds: the
// refined one when there is one.
func (r Row) Best() Range {
	if r.Refined != nil {
		return r.Refined.Lambda
	}
	return r.Lambda
}

// BestRadius returns the range of 1/lambda of the same certificate as
// Best.
func (r Row) BestRadius() Range {
	if r.Refined != nil {
		return r.Refined.Radius
	}
	return r.Radius
}

// Digits returns the number of leading significant digits in which the
// ends of Best agree (both truncated): the digits of lambda certified for
// the row.
func (r Row) Digits() int { return commonDigits(r.Best()) }

// Group is a set of classes with identical counts a_0..a_N: candidate
// c-Wilf equivalences.
type Group struct {
	// ID numbers the groups by rank: group 1 holds the class of largest
	// lambda (the first row), and each next group is the next one met
	// going down the rows.
	ID      int      `json:"id"`
	Classes []string `json:"classes"` // representatives, in row order
	// Lambda is the smallest range holding every class's best range.
	Lambda Range `json:"lambda"`
	// DiffersFromPreviousAt is the least n where this group's counts
	// differ from those of the group numbered one less (0 for group 1).
	DiffersFromPreviousAt int `json:"differs_from_previous_at,omitempty"`
}

// Step compares two classes adjacent in the order by lambda.
type Step struct {
	Above string `json:"above"`
	Below string `json:"below"`
	// Relation is ">" when the certified ranges (each row's best) are
	// disjoint (lambda of Above is larger, proved) and "unresolved" when
	// they overlap.
	Relation string `json:"relation"`
	// SameCounts tells that the two are in one group (their counts agree
	// up to N): no number of digits can order them if they are c-Wilf
	// equivalent.
	SameCounts bool `json:"same_counts,omitempty"`
}

// GroupStep compares two groups adjacent in the numbering.
type GroupStep struct {
	Above int `json:"above"` // group id
	Below int `json:"below"` // group id, Above + 1
	// Relation is ">" when the lambda of every class of Above is proved
	// larger than that of every class of Below (the groups' ranges are
	// disjoint), "unresolved" when the ranges overlap.
	Relation string `json:"relation"`
	// Digits is the most digits certified (Row.Digits) among the classes
	// of the two groups: the certificates that order them, or fail to,
	// certify lambda to at most this many digits.
	Digits int `json:"digits"`
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
	// those of the shard, sorted by lambda (each row's best range),
	// largest first.
	Classes int   `json:"classes"`
	Rows    []Row `json:"rows"`
	// Groups numbered by rank (Group.ID). Their number is a proved lower
	// bound on the number of c-Wilf classes (of a whole census).
	Groups []Group `json:"groups"`
	// GroupsByN[n] is the number of groups when counts are compared up to
	// a_n only; SeparatingN is the least n where it reaches len(Groups).
	GroupsByN   []int  `json:"groups_by_n"`
	SeparatingN int    `json:"separating_n"`
	Order       []Step `json:"order"`
	// GroupOrder compares each group with the next one (a whole census
	// refines the classes of overlapping neighbours first, up to
	// Params.RefineDigits; a shard's holds its own rows only).
	GroupOrder []GroupStep `json:"group_order"`
}

// Format and version of census.json.
const (
	ReportFormat  = "avoidcert-census"
	ReportVersion = 2
)

// summarize builds the report from the rows of a shard (in any order):
// rows sorted by lambda, groups, separations, the order of the rows and
// of the groups.
func summarize(tool string, params Params, shard Shard, rows []Row) *Report {
	r := &Report{Format: ReportFormat, Version: ReportVersion, Tool: tool, Params: params,
		Classes: len(Shard{}.Classes(params.Length))}
	if !shard.Whole() {
		r.Shard = &shard
	}
	r.Rows = slices.Clone(rows)
	slices.SortFunc(r.Rows, byLambda)
	r.Groups, r.GroupsByN, r.SeparatingN = group(r.Rows, params.To)
	r.Order = rowOrder(r.Rows)
	r.GroupOrder = groupOrder(r.Rows, r.Groups)
	return r
}

// rowOrder compares adjacent rows by their best ranges.
func rowOrder(rows []Row) []Step {
	var steps []Step
	for i := 1; i < len(rows); i++ {
		above, below := rows[i-1], rows[i]
		s := Step{Above: above.Representative, Below: below.Representative, Relation: "unresolved",
			SameCounts: above.Group == below.Group}
		if wholeAbove(above.Best(), below.Best()) {
			s.Relation = ">"
		}
		steps = append(steps, s)
	}
	return steps
}

// groupOrder compares each group with the next by their ranges.
func groupOrder(rows []Row, groups []Group) []GroupStep {
	digits := make(map[int]int, len(groups))
	for _, r := range rows {
		digits[r.Group] = max(digits[r.Group], r.Digits())
	}
	var steps []GroupStep
	for i := 1; i < len(groups); i++ {
		a, b := groups[i-1], groups[i]
		s := GroupStep{Above: a.ID, Below: b.ID, Relation: "unresolved", Digits: max(digits[a.ID], digits[b.ID])}
		if wholeAbove(a.Lambda, b.Lambda) {
			s.Relation = ">"
		}
		steps = append(steps, s)
	}
	return steps
}

// wholeAbove reports whether every value of range a is above every value of
// b: a's lower end above b's upper end (an infinite upper end is above
// everything).
func wholeAbove(a, b Range) bool {
	lo, hi := decimal(a.Lo), decimal(b.Hi)
	return lo != nil && hi != nil && lo.Cmp(hi) > 0
}

// byLambda orders rows by their best range of lambda, largest first: by
// the lower end, then the upper end (a missing upper end is infinite),
// then the representative, so that the order is total and the same on
// every run.
func byLambda(a, b Row) int {
	ar, br := a.Best(), b.Best()
	if c := decimal(br.Lo).Cmp(decimal(ar.Lo)); c != 0 {
		return c
	}
	ah, bh := decimal(ar.Hi), decimal(br.Hi)
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

// commonDigits is interval.CommonDigits of a range's decimals (0 for an
// infinite upper end).
func commonDigits(r Range) int {
	lo, hi := decimal(r.Lo), decimal(r.Hi)
	if lo == nil || hi == nil {
		return 0
	}
	return interval.CommonDigits(lo, hi)
}

// group sets rows[i].Group for rows sorted by lambda and returns the
// groups numbered by rank, the number of groups at each n, and the least n
// that separates them all.
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
	var (
		groups   []Group
		firstRow []int              // the index of each group's first row
		byCounts = map[string]int{} // counts -> group id
	)
	for i, r := range rows {
		key := strings.Join(r.Counts, ",")
		id, ok := byCounts[key]
		if !ok {
			id = len(groups) + 1
			byCounts[key] = id
			grp := Group{ID: id, Lambda: r.Best()}
			if id > 1 {
				grp.DiffersFromPreviousAt = firstDifference(counts[firstRow[id-2]], counts[i])
			}
			groups = append(groups, grp)
			firstRow = append(firstRow, i)
		} else {
			groups[id-1].Lambda = hull(groups[id-1].Lambda, r.Best())
		}
		groups[id-1].Classes = append(groups[id-1].Classes, r.Representative)
		rows[i].Group = id
	}
	byN := distinctPrefixes(counts, to)
	separating := 0
	for n := range byN {
		if n > 0 && byN[n] > byN[n-1] {
			separating = n
		}
	}
	return groups, byN, separating
}

// hull returns the smallest range holding a and b.
func hull(a, b Range) Range {
	h := a
	if decimal(b.Lo).Cmp(decimal(a.Lo)) < 0 {
		h.Lo = b.Lo
	}
	switch ah, bh := decimal(a.Hi), decimal(b.Hi); {
	case ah == nil || bh == nil:
		h.Hi = ""
	case bh.Cmp(ah) > 0:
		h.Hi = b.Hi
	}
	return h
}

// distinctPrefixes returns, for n = 0..to, the number of distinct
// sequences a_0..a_n among counts.
func distinctPrefixes(counts [][]*big.Int, to int) []int {
	byN := make([]int, to+1)
	type prefix struct {
		before int // the class of a_0..a_(n-1)
		a      string
	}
	class := make([]int, len(counts)) // the class of each row's prefix so far
	for n := 0; n <= to; n++ {
		next := map[prefix]int{}
		for i, c := range counts {
			key := prefix{class[i], c[n].String()}
			id, ok := next[key]
			if !ok {
				id = len(next)
				next[key] = id
			}
			class[i] = id
		}
		byN[n] = len(next)
	}
	return byN
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
