package claims

import (
	"errors"
	"fmt"
	"math/big"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/BurntSushi/toml"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/internal/brief"
	"avoidcert/internal/bytesize"
	"avoidcert/internal/input"
	"avoidcert/interval"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// Kind names what a claim states.
type Kind string

// The claim kinds (docs/claims.md).
const (
	KindCount       Kind = "count"        // a_n = X, or a_from.. = a list
	KindGrowth      Kind = "growth"       // lambda or 1/lambda: a decimal or an interval
	KindForm        Kind = "form"         // the structure class
	KindOrder       Kind = "order"        // lambda(patterns) < lambda(less_than)
	KindEqualCounts Kind = "equal-counts" // a_n of two sets equal for n <= to
	KindProbability Kind = "probability"  // a_n/n!, exact or a decimal
)

var kinds = []Kind{KindCount, KindGrowth, KindForm, KindOrder, KindEqualCounts, KindProbability}

// Forms are the values of a form claim.
var Forms = []string{"primitive", "periodic", "reducible", "finite", "subexponential"}

// Budget bounds the work on one claim, or on the whole run.
type Budget struct {
	Timeout   time.Duration // 0: none
	MaxK      int           // largest bracket degree k
	MaxN      int           // largest n of a count
	MaxMemory int64         // bytes, for the engine and the checker each
}

// MaxClaims is the most claims a manifest may state (README, "Input
// limits"); the manifest's size and nesting are bounded by internal/input.
const MaxClaims = 10000

// DefaultBudget is a claim's budget when the manifest sets none.
var DefaultBudget = Budget{MaxK: certify.MaxN, MaxN: 100, MaxMemory: prove.DefaultMaxMemory}

// Manifest is a parsed claims file.
type Manifest struct {
	File  string
	Title string // what the claims are from, e.g. "Table 2 of ..." (optional)
	// Timeout is the whole run's (0: none), from [run].
	Timeout time.Duration
	// MaxMemory caps every claim's MaxMemory (0: no cap), from [run].
	MaxMemory int64
	Claims    []Claim
}

// Claim is one claim, validated. Which fields are set depends on Kind.
type Claim struct {
	ID   string
	Kind Kind
	Line int // of its [[claim]] header
	Note string
	Set  pattern.Set // patterns
	// Other is the second set: less_than (order) or other (equal-counts).
	Other pattern.Set
	// Typed and OtherTyped are the two sets' patterns as the manifest
	// writes them: the checker reads these itself (prove.Options.Typed).
	Typed, OtherTyped []string
	// From and Counts: count claims, a_From, a_From+1, ... = Counts.
	From   int
	Counts []*big.Int
	// N: probability claims, the n of a_n/n!.
	N int
	// To: equal-counts claims, the largest n compared.
	To int
	// Of and Claimed: growth claims (Claimed is also a probability
	// claim's decimal read as an interval). Stated is the claim as written.
	Of      bounds.Quantity
	Claimed interval.Interval
	Stated  string
	// Exact: a probability claim's exact fraction.
	Exact *big.Rat
	// Form and Period: form claims (Period 0: any period).
	Form   string
	Period int
	Budget Budget
}

// Error is a fault in a manifest: the file, the line and the field.
type Error struct {
	File  string
	Line  int    // 0: unknown
	Claim string // the claim's id, when known
	Field string
	Msg   string
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Claim != "" {
		fmt.Fprintf(&b, "claim %s: ", brief.Quote(e.Claim))
	}
	if e.Field != "" {
		fmt.Fprintf(&b, "field %s: ", brief.Quote(e.Field))
	}
	b.WriteString(e.Msg)
	return b.String()
}

// text is a TOML string; numbers are refused with a message, since a
// float loses digits and an integer stops at 2^63.
type text struct {
	s   string
	set bool
}

func (t *text) UnmarshalTOML(v any) error {
	switch x := v.(type) {
	case string:
		t.s, t.set = x, true
		return nil
	case int64:
		t.s, t.set = fmt.Sprint(x), true
		return nil
	}
	return fmt.Errorf("write it as a string in quotes, e.g. \"0.9546\": a TOML float loses digits")
}

type rawBudget struct {
	Timeout   *string `toml:"timeout"`
	MaxK      *int    `toml:"max_k"`
	MaxN      *int    `toml:"max_n"`
	MaxMemory *text   `toml:"max_memory"`
}

type rawClaim struct {
	ID       *string  `toml:"id"`
	Kind     *string  `toml:"kind"`
	Note     *string  `toml:"note"`
	Patterns []string `toml:"patterns"`
	N        *int     `toml:"n"`
	Count    *text    `toml:"count"`
	From     *int     `toml:"from"`
	Counts   []text   `toml:"counts"`
	Of       *string  `toml:"of"`
	Value    *text    `toml:"value"`
	Reading  *string  `toml:"reading"`
	Interval []text   `toml:"interval"`
	Form     *string  `toml:"form"`
	Period   *int     `toml:"period"`
	LessThan []string `toml:"less_than"`
	Other    []string `toml:"other"`
	To       *int     `toml:"to"`
	Exact    *text    `toml:"exact"`
	rawBudget
}

type rawManifest struct {
	Title *string `toml:"title"`
	Run   struct {
		Timeout   *string `toml:"timeout"`
		MaxMemory *text   `toml:"max_memory"`
	} `toml:"run"`
	Defaults rawBudget  `toml:"defaults"`
	Claim    []rawClaim `toml:"claim"`
}

// fields lists, per kind, the fields a claim may have besides id, kind,
// note, patterns and the budget keys.
var fields = map[Kind][]string{
	KindCount:       {"n", "count", "from", "counts"},
	KindGrowth:      {"of", "value", "reading", "interval"},
	KindForm:        {"form", "period"},
	KindOrder:       {"less_than"},
	KindEqualCounts: {"other", "to"},
	KindProbability: {"n", "exact", "value", "reading"},
}

var idPattern = regexp.MustCompile(`^[A-Za-z0-9._-]+$`)

// Parse reads a manifest; file names it in errors. Every fault is an
// *Error naming the file, the line and the field. Before the TOML library
// sees the text, its size (input.Manifest) and nesting (input.CheckTOML)
// are checked; after it, the number of claims (MaxClaims).
func Parse(file string, data []byte) (*Manifest, error) {
	if int64(len(data)) > input.Manifest.Limit {
		return nil, &Error{File: file, Msg: fmt.Sprintf("%d bytes, over the limit of %s for a claims manifest; split it into several", len(data), bytesize.Format(input.Manifest.Limit))}
	}
	if err := input.CheckTOML(data); err != nil {
		var ne *input.NestingError
		if errors.As(err, &ne) {
			return nil, &Error{File: file, Line: ne.Line, Msg: ne.Msg}
		}
		return nil, &Error{File: file, Msg: err.Error()}
	}
	var raw rawManifest
	md, err := toml.Decode(string(data), &raw)
	if err != nil {
		e := &Error{File: file, Msg: "not a TOML file this version can read; see docs/claims.md for the form of a manifest"}
		if pe, ok := err.(toml.ParseError); ok {
			e.Line, e.Field, e.Msg = pe.Position.Line, pe.LastKey, tomlProblem(pe.Message, pe.Position.Col)
		} else if sub := tomlDecodeError.FindStringSubmatch(err.Error()); sub != nil {
			e.Line, _ = strconv.Atoi(sub[1])
			e.Field, e.Msg = sub[2], tomlProblem(sub[3], 0)
		}
		return nil, e
	}
	if len(raw.Claim) > MaxClaims {
		return nil, &Error{File: file, Field: "claim", Msg: fmt.Sprintf("%d claims, over the limit of %d; split the manifest into several", len(raw.Claim), MaxClaims)}
	}
	loc := locate(data)
	if und := md.Undecoded(); len(und) > 0 {
		k := und[0]
		line := loc.anyLine(k)
		return nil, &Error{File: file, Line: line, Field: k.String(),
			Msg: "unknown field; see docs/claims.md for the fields of each kind"}
	}
	m := &Manifest{File: file}
	if raw.Title != nil {
		m.Title = *raw.Title
	}
	runErr := func(field, msg string) error {
		return &Error{File: file, Line: loc.table("run", field), Field: "run." + field, Msg: msg}
	}
	if raw.Run.Timeout != nil {
		if m.Timeout, err = parseTimeout(*raw.Run.Timeout); err != nil {
			return nil, runErr("timeout", err.Error())
		}
	}
	if raw.Run.MaxMemory != nil {
		if m.MaxMemory, err = bytesize.Parse(raw.Run.MaxMemory.s); err != nil {
			return nil, runErr("max_memory", err.Error())
		}
	}
	defaults, fe := applyBudget(DefaultBudget, raw.Defaults)
	if fe != nil {
		return nil, &Error{File: file, Line: loc.table("defaults", fe.field), Field: "defaults." + fe.field, Msg: fe.msg}
	}
	if len(raw.Claim) == 0 {
		return nil, &Error{File: file, Field: "claim", Msg: "no [[claim]] tables; a manifest states at least one claim"}
	}
	seen := map[string]int{}
	for i, rc := range raw.Claim {
		c, fe := parseClaim(rc, defaults)
		if fe != nil {
			line := loc.claimField(i, fe.field)
			return nil, &Error{File: file, Line: line, Claim: c.ID, Field: fe.field, Msg: fe.msg}
		}
		if first, dup := seen[c.ID]; dup {
			return nil, &Error{File: file, Line: loc.claimField(i, "id"), Claim: c.ID, Field: "id",
				Msg: fmt.Sprintf("duplicate claim id (first used by the claim at line %d); give every claim its own id", first)}
		}
		c.Line = loc.claimStart(i)
		seen[c.ID] = c.Line
		m.Claims = append(m.Claims, c)
	}
	return m, nil
}

// tomlFaults says in our words what the TOML library's messages mean,
// by the words they contain (first match wins); the library's own wording
// never reaches the user.
var tomlFaults = []struct{ has, says string }{
	{"already been defined", "given twice: keep one (a second claim starts with its own [[claim]] line)"},
	{"already created", "given twice, once as a table and once as a value: keep one"},
	{"is not a table", "used both as a value and as a table: keep one"},
	{"newlines", "a string is not closed on its line: end it with a double quote"},
	{"NULL bytes", "not UTF-8 text (saved as UTF-16?): save the manifest as UTF-8"},
	{"out of range", "a number too large for TOML: write counts as strings in quotes, e.g. \"74207209\""},
	{"delimiter", "a table name TOML cannot read: write [run], [defaults] or [[claim]]"},
	{"incompatible types", "a value of the wrong type: counts and decimals go in quotes, n, from and to are whole numbers, patterns a list of strings"},
	{"nteger", "not a number TOML reads: write whole numbers without leading zeros, and counts and decimals as strings in quotes"},
	{"loat", "not a number TOML reads: write decimals as strings in quotes, e.g. \"0.9546\""},
	{"escape", "a backslash TOML cannot read inside a string"},
	{"UTF-8", "a character that is not UTF-8 text"},
	{"end of file", "the file ends inside a value or a table name: close it"},
	{"EOF", "the file ends inside a value or a table name: close it"},
	{"expected value", "a value is missing or not written as TOML: strings in double quotes, lists in [ ]"},
	{"table name", "a table name TOML cannot read: write [run], [defaults] or [[claim]]"},
	{"key", "a key TOML cannot read: write name = value, one a line"},
}

// tomlDecodeError is how the TOML library reports a value of the wrong
// type: not a ParseError, but the line and key in its text.
var tomlDecodeError = regexp.MustCompile(`^toml: line ([0-9]+) \(last key "([^"]*)"\): (.*)$`)

// tomlProblem states a TOML fault (the library's message, and the column
// where known, else 0) in our own words.
func tomlProblem(msg string, col int) string {
	for _, f := range tomlFaults {
		if strings.Contains(msg, f.has) {
			return f.says
		}
	}
	if col > 0 {
		return fmt.Sprintf("not valid TOML at column %d; see docs/claims.md for the form of a manifest", col)
	}
	return "not valid TOML here; see docs/claims.md for the form of a manifest"
}

// fieldError is a fault in one field, located by Parse.
type fieldError struct{ field, msg string }

func faultf(field, format string, args ...any) *fieldError {
	return &fieldError{field: field, msg: fmt.Sprintf(format, args...)}
}

func parseTimeout(s string) (time.Duration, error) {
	d, err := time.ParseDuration(s)
	if err != nil || d <= 0 {
		return 0, fmt.Errorf("%s is not a positive duration; write e.g. \"90s\" or \"10m\"", brief.Quote(s))
	}
	return d, nil
}

func applyBudget(b Budget, r rawBudget) (Budget, *fieldError) {
	var err error
	if r.Timeout != nil {
		if b.Timeout, err = parseTimeout(*r.Timeout); err != nil {
			return b, faultf("timeout", "%v", err)
		}
	}
	if r.MaxK != nil {
		if *r.MaxK < 1 || *r.MaxK > certify.MaxN {
			return b, faultf("max_k", "%d is not between 1 and %d (the checker's limit)", *r.MaxK, certify.MaxN)
		}
		b.MaxK = *r.MaxK
	}
	if r.MaxN != nil {
		if *r.MaxN < 0 {
			return b, faultf("max_n", "must not be negative")
		}
		b.MaxN = *r.MaxN
	}
	if r.MaxMemory != nil {
		if b.MaxMemory, err = bytesize.Parse(r.MaxMemory.s); err != nil {
			return b, faultf("max_memory", "%v", err)
		}
	}
	return b, nil
}

func parseSet(field string, given []string) (pattern.Set, *fieldError) {
	if len(given) == 0 {
		return pattern.Set{}, faultf(field, "missing: name at least one pattern, e.g. %s = [\"1342\"]", field)
	}
	s, err := pattern.ParseSet(given)
	if err != nil {
		return pattern.Set{}, faultf(field, "%v", err)
	}
	return s, nil
}

func parseClaim(rc rawClaim, defaults Budget) (Claim, *fieldError) {
	var c Claim
	if rc.ID == nil || *rc.ID == "" {
		return c, faultf("id", "missing: every claim needs an id (letters, digits, '.', '_', '-'), e.g. id = \"table2-row3\"")
	}
	c.ID = *rc.ID
	if !idPattern.MatchString(c.ID) {
		return c, faultf("id", "%s: use letters, digits, '.', '_' and '-' only (the id names the certificate files)", brief.Quote(c.ID))
	}
	if rc.Kind == nil {
		return c, faultf("kind", "missing: say what is claimed, one of %s", kindList())
	}
	c.Kind = Kind(*rc.Kind)
	if !slices.Contains(kinds, c.Kind) {
		return c, faultf("kind", "unknown kind %s; use one of %s", brief.Quote(*rc.Kind), kindList())
	}
	if rc.Note != nil {
		c.Note = *rc.Note
	}
	var fe *fieldError
	if c.Set, fe = parseSet("patterns", rc.Patterns); fe != nil {
		return c, fe
	}
	c.Typed = rc.Patterns
	if c.Budget, fe = applyBudget(defaults, rc.rawBudget); fe != nil {
		return c, fe
	}
	for _, f := range rc.present() {
		if !slices.Contains(fields[c.Kind], f) {
			return c, faultf(f, "does not apply to a %s claim, whose fields are %s", c.Kind, strings.Join(fields[c.Kind], ", "))
		}
	}
	switch c.Kind {
	case KindCount:
		fe = c.parseCount(rc)
	case KindGrowth:
		fe = c.parseGrowth(rc)
	case KindForm:
		fe = c.parseForm(rc)
	case KindOrder:
		c.Other, fe = parseSet("less_than", rc.LessThan)
		c.OtherTyped = rc.LessThan
	case KindEqualCounts:
		c.OtherTyped = rc.Other
		if c.Other, fe = parseSet("other", rc.Other); fe == nil {
			fe = nonNegative("to", rc.To, &c.To)
		}
	case KindProbability:
		fe = c.parseProbability(rc)
	}
	return c, fe
}

func kindList() string {
	s := make([]string, len(kinds))
	for i, k := range kinds {
		s[i] = string(k)
	}
	return strings.Join(s, ", ")
}

// present lists the kind-specific fields the claim sets.
func (rc rawClaim) present() []string {
	var out []string
	for _, f := range []struct {
		name string
		set  bool
	}{
		{"n", rc.N != nil}, {"count", rc.Count != nil}, {"from", rc.From != nil}, {"counts", rc.Counts != nil},
		{"of", rc.Of != nil}, {"value", rc.Value != nil}, {"reading", rc.Reading != nil}, {"interval", rc.Interval != nil},
		{"form", rc.Form != nil}, {"period", rc.Period != nil}, {"less_than", rc.LessThan != nil},
		{"other", rc.Other != nil}, {"to", rc.To != nil}, {"exact", rc.Exact != nil},
	} {
		if f.set {
			out = append(out, f.name)
		}
	}
	return out
}

func nonNegative(field string, v *int, dst *int) *fieldError {
	if v == nil {
		return faultf(field, "missing")
	}
	if *v < 0 {
		return faultf(field, "%d: must not be negative", *v)
	}
	*dst = *v
	return nil
}

func parseCount(field string, t text) (*big.Int, *fieldError) {
	v, ok := new(big.Int).SetString(strings.TrimSpace(t.s), 10)
	if !ok || v.Sign() < 0 {
		return nil, faultf(field, "%s is not a non-negative integer", brief.Quote(t.s))
	}
	return v, nil
}

func (c *Claim) parseCount(rc rawClaim) *fieldError {
	switch {
	case rc.Count != nil && rc.Counts != nil:
		return faultf("counts", "give count (with n) or counts (with from), not both")
	case rc.Count != nil:
		if rc.From != nil {
			return faultf("from", "goes with counts; a single count takes n")
		}
		if fe := nonNegative("n", rc.N, &c.From); fe != nil {
			return fe
		}
		v, fe := parseCount("count", *rc.Count)
		c.Counts = []*big.Int{v}
		return fe
	case rc.Counts != nil:
		if rc.N != nil {
			return faultf("n", "goes with count; a list of counts starts at from")
		}
		if rc.From != nil {
			if fe := nonNegative("from", rc.From, &c.From); fe != nil {
				return fe
			}
		}
		if len(rc.Counts) == 0 {
			return faultf("counts", "empty: list a_from, a_from+1, ...")
		}
		for _, t := range rc.Counts {
			v, fe := parseCount("counts", t)
			if fe != nil {
				return fe
			}
			c.Counts = append(c.Counts, v)
		}
		return nil
	}
	return faultf("count", "missing: give n and count = \"X\" (a_n = X), or from and counts = [...]")
}

// decimalClaim reads value and reading as a closed interval.
func (c *Claim) decimalClaim(rc rawClaim) *fieldError {
	truncated := false
	if rc.Reading != nil {
		switch *rc.Reading {
		case "rounded":
		case "truncated":
			truncated = true
		default:
			return faultf("reading", "%s: say \"rounded\" (the default) or \"truncated\"", brief.Quote(*rc.Reading))
		}
	}
	lo, hi, err := interval.ClaimRange(rc.Value.s, truncated)
	if err != nil {
		return faultf("value", "%v", err)
	}
	c.Claimed, c.Stated = interval.Interval{Lo: lo, Hi: hi}, rc.Value.s
	if truncated {
		c.Stated += " (truncated)"
	}
	return nil
}

func (c *Claim) parseGrowth(rc rawClaim) *fieldError {
	c.Of = bounds.QuantityLambda
	if rc.Of != nil {
		q, err := bounds.ParseQuantity(*rc.Of)
		if err != nil {
			return faultf("of", "%s: say \"lambda\" (the default) or \"radius\"", brief.Quote(*rc.Of))
		}
		c.Of = q
	}
	switch {
	case rc.Value != nil && rc.Interval != nil:
		return faultf("interval", "give value or interval, not both")
	case rc.Value != nil:
		return c.decimalClaim(rc)
	case rc.Interval != nil:
		if rc.Reading != nil {
			return faultf("reading", "goes with value, not with interval")
		}
		if len(rc.Interval) != 2 {
			return faultf("interval", "write two decimals [\"LO\", \"HI\"]")
		}
		lo, err := interval.ParseDecimal(rc.Interval[0].s)
		if err != nil {
			return faultf("interval", "%v", err)
		}
		hi, err := interval.ParseDecimal(rc.Interval[1].s)
		if err != nil {
			return faultf("interval", "%v", err)
		}
		if lo.Cmp(hi) > 0 {
			return faultf("interval", "LO is above HI")
		}
		c.Claimed = interval.Interval{Lo: lo, Hi: hi}
		c.Stated = "[" + rc.Interval[0].s + ", " + rc.Interval[1].s + "]"
		return nil
	}
	return faultf("value", "missing: give value = \"0.9546\" or interval = [\"0.95\", \"0.96\"]")
}

func (c *Claim) parseForm(rc rawClaim) *fieldError {
	if rc.Form == nil {
		return faultf("form", "missing: one of %s", strings.Join(Forms, ", "))
	}
	if !slices.Contains(Forms, *rc.Form) {
		return faultf("form", "unknown form %s; use one of %s", brief.Quote(*rc.Form), strings.Join(Forms, ", "))
	}
	c.Form = *rc.Form
	if rc.Period != nil {
		if c.Form != "periodic" {
			return faultf("period", "goes with form = \"periodic\" only")
		}
		if *rc.Period < 2 {
			return faultf("period", "%d: a period is at least 2", *rc.Period)
		}
		c.Period = *rc.Period
	}
	return nil
}

func (c *Claim) parseProbability(rc rawClaim) *fieldError {
	if fe := nonNegative("n", rc.N, &c.N); fe != nil {
		return fe
	}
	switch {
	case rc.Exact != nil && rc.Value != nil:
		return faultf("exact", "give exact or value, not both")
	case rc.Exact != nil:
		if rc.Reading != nil {
			return faultf("reading", "goes with value, not with exact")
		}
		r, ok := new(big.Rat).SetString(strings.TrimSpace(rc.Exact.s))
		if !ok || r.Sign() < 0 || !strings.Contains(rc.Exact.s, "/") && strings.ContainsAny(rc.Exact.s, ".eE") {
			return faultf("exact", "%s is not a fraction p/q", brief.Quote(rc.Exact.s))
		}
		c.Exact, c.Stated = r, rc.Exact.s
		return nil
	case rc.Value != nil:
		return c.decimalClaim(rc)
	}
	return faultf("exact", "missing: give exact = \"p/q\" or value = \"0.0204\" (with reading)")
}
