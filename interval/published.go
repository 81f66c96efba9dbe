package interval

import (
	_ "embed"
	"encoding/json"
	"fmt"
	"sort"
	"strings"
)

// publishedJSON holds growth constants as printed in OEIS entries, each with
// the entry line it was copied from. These digits are published, not
// computed here; the tests compare the computed enclosures with them.
//
//go:embed published_growth.json
var publishedJSON []byte

// PublishedConstant is a growth constant as printed in an OEIS entry.
type PublishedConstant struct {
	Pattern  string `json:"pattern"`  // the consecutive pattern, e.g. "1342"
	OEIS     string `json:"oeis"`     // the entry's A-number
	Quantity string `json:"quantity"` // "lambda" or "1/lambda": what Digits stand for
	Digits   string `json:"digits"`   // the printed decimal, without the trailing "..."
	Line     string `json:"line"`     // the entry line read, verbatim
	Note     string `json:"note,omitempty"`
}

var published = func() map[string]PublishedConstant {
	var list []PublishedConstant
	if err := json.Unmarshal(publishedJSON, &list); err != nil {
		panic("interval: embedded published_growth.json is malformed: " + err.Error())
	}
	m := map[string]PublishedConstant{}
	for _, c := range list {
		m[c.Pattern] = c
	}
	return m
}()

// PublishedGrowth returns the growth constant printed in the OEIS for a
// single consecutive pattern ("132", "1234", "1243", "1342", "1423", "1324",
// "2143", "12345", "123456"), and false when none is recorded here (for
// example 12354: its entry A202213 prints no constant).
func PublishedGrowth(pattern string) (PublishedConstant, bool) {
	c, ok := published[pattern]
	return c, ok
}

// PublishedPatterns returns the patterns PublishedGrowth knows, sorted.
func PublishedPatterns() []string {
	var ps []string
	for p := range published {
		ps = append(ps, p)
	}
	sort.Strings(ps)
	return ps
}

// Source returns a citation such as "OEIS A117156".
func (c PublishedConstant) Source() string { return "OEIS " + c.OEIS }

// LambdaRange returns the closed interval of growth rates lambda that the
// printed digits allow. An entry does not say whether its digits are cut or
// rounded, so the range is the union of both readings, [X - u/2, X + u] for
// the printed X > 0 with last-digit unit u, inverted when the entry prints
// 1/lambda.
func (c PublishedConstant) LambdaRange() Interval {
	rLo, rHi, err := ClaimRange(c.Digits, false)
	if err != nil {
		panic(fmt.Sprintf("interval: published digits for %s unreadable: %v", c.Pattern, err))
	}
	_, tHi, _ := ClaimRange(c.Digits, true)
	if tHi.Cmp(rHi) > 0 {
		rHi = tHi
	}
	x := Interval{Lo: rLo, Hi: rHi}
	if strings.HasPrefix(c.Quantity, "1/") {
		return x.Inverse()
	}
	return x
}
