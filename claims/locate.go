package claims

import (
	"regexp"
	"strings"

	"github.com/BurntSushi/toml"
)

// locator finds the lines of tables and keys in a manifest's text, for
// error messages: the TOML decoder reports lines for syntax errors only.
// It reads the text line by line: headers "[name]" and "[[claim]]", and
// keys "name = ...". It does not parse TOML, so it only locates; a key it
// cannot find gives line 0 ("line unknown").
type locator struct {
	claims []map[string]int // per [[claim]], key -> first line; "" -> header line
	tables map[string]map[string]int
}

var (
	headerLine = regexp.MustCompile(`^\[\s*([A-Za-z0-9_."-]+)\s*\]\s*(#.*)?$`)
	arrayLine  = regexp.MustCompile(`^\[\[\s*([A-Za-z0-9_."-]+)\s*\]\]\s*(#.*)?$`)
	keyLine    = regexp.MustCompile(`^("?[A-Za-z0-9_-]+"?)\s*=`)
)

func locate(data []byte) *locator {
	cur := map[string]int{} // the top level, before any header
	loc := &locator{tables: map[string]map[string]int{"": cur}}
	for i, line := range strings.Split(string(data), "\n") {
		n := i + 1
		t := strings.TrimSpace(line)
		if m := arrayLine.FindStringSubmatch(t); m != nil {
			cur = map[string]int{"": n}
			if m[1] == "claim" {
				loc.claims = append(loc.claims, cur)
			}
			continue
		}
		if m := headerLine.FindStringSubmatch(t); m != nil {
			cur = map[string]int{"": n}
			loc.tables[m[1]] = cur
			continue
		}
		if m := keyLine.FindStringSubmatch(t); m != nil {
			k := strings.Trim(m[1], `"`)
			if _, ok := cur[k]; !ok {
				cur[k] = n
			}
		}
	}
	return loc
}

// claimStart is the line of the i-th [[claim]] header.
func (l *locator) claimStart(i int) int {
	if i < len(l.claims) {
		return l.claims[i][""]
	}
	return 0
}

// claimField is the line of a field of the i-th claim, or of its header
// when the field is missing.
func (l *locator) claimField(i int, field string) int {
	if i >= len(l.claims) {
		return 0
	}
	if n, ok := l.claims[i][field]; ok {
		return n
	}
	return l.claims[i][""]
}

// table is the line of a key of a table, or of its header.
func (l *locator) table(name, field string) int {
	t := l.tables[name]
	if n, ok := t[field]; ok {
		return n
	}
	return t[""]
}

// anyLine locates a key the decoder did not know: the first claim (or
// table) that has it.
func (l *locator) anyLine(k toml.Key) int {
	if len(k) == 0 {
		return 0
	}
	last := k[len(k)-1]
	if len(k) == 1 {
		if n, ok := l.tables[""][last]; ok {
			return n
		}
		return l.tables[last][""]
	}
	if k[0] == "claim" {
		for _, c := range l.claims {
			if n, ok := c[last]; ok {
				return n
			}
		}
	}
	if t, ok := l.tables[k[0]]; ok {
		if n, ok := t[last]; ok {
			return n
		}
	}
	return 0
}
