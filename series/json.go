package series

// The JSON of a run of 'avoidcert series --json' (docs/series.md; schema
// docs/schema/series.schema.json). The command writes it and the report
// reads it, both through these types.

// RunFormat and RunVersion name the JSON of a series run.
const (
	RunFormat  = "avoidcert-series"
	RunVersion = 2 // 2: an item's set is "patterns" (was "members")
)

// Run is one run: the input, the ties, one Item per pattern, the notes.
type Run struct {
	Format  string   `json:"format"`
	Version int      `json:"version"`
	Input   Input    `json:"input"`
	Delay   int      `json:"delay"`
	Length  int      `json:"length,omitempty"` // --length K; 0 for patterns given
	Ties    TieNotes `json:"ties"`
	Items   []Item   `json:"items"`
	Notes   []string `json:"notes"`
}

// Input says what was read.
type Input struct {
	File              string `json:"file"`
	Column            string `json:"column,omitempty"`
	Header            string `json:"header,omitempty"`
	Values            int64  `json:"values"`
	SkippedMissing    int64  `json:"skipped_missing"`
	SkippedNotNumbers int64  `json:"skipped_not_numbers"`
	FirstSkippedLine  int    `json:"first_skipped_line,omitempty"`
}

// TieNotes says how ties were treated.
type TieNotes struct {
	Policy      string     `json:"policy"`
	Seed        string     `json:"seed,omitempty"` // decimal, with policy random
	TiedWindows int64      `json:"tied_windows"`
	First       *TiedLines `json:"first,omitempty"`
}

// TiedLines is the first pair of equal values in one window.
type TiedLines struct {
	Lines [2]int `json:"lines"`
	Value string `json:"value"`
}

// Item is one pattern (or set) of a run.
type Item struct {
	Pattern     string     `json:"pattern"`
	Patterns    []string   `json:"patterns"` // the set's patterns
	Windows     int64      `json:"windows"`
	Observed    int64      `json:"observed"`
	Mean        string     `json:"mean"`     // exact fraction
	Variance    string     `json:"variance"` // exact fraction
	MeanDecimal string     `json:"mean_decimal"`
	SD          string     `json:"sd"`
	Tails       Tails      `json:"tails"`
	Avoidance   *Avoidance `json:"avoidance,omitempty"`
}

// Tails are P(count <= observed) and P(count >= observed).
type Tails struct {
	Method    string      `json:"method"` // "exact" or "normal approximation"
	AtMost    Probability `json:"at_most"`
	AtLeast   Probability `json:"at_least"`
	Central95 *Range      `json:"central_95,omitempty"`
	Note      string      `json:"note,omitempty"`
}

// Probability is exact (Lo, Hi: rounded outward) or approximate (Approx).
type Probability struct {
	Lo     string `json:"lo,omitempty"`
	Hi     string `json:"hi,omitempty"`
	Approx string `json:"approx,omitempty"`
}

// Range is a range of counts.
type Range struct {
	Lo int `json:"lo"`
	Hi int `json:"hi"`
}

// Avoidance is the probability that no window matches.
type Avoidance struct {
	Method string `json:"method"` // "exact" or "certified"
	Lo     string `json:"lo"`
	Hi     string `json:"hi"`
	Note   string `json:"note"`
}
