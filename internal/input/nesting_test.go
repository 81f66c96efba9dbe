package input

import (
	"bytes"
	"encoding/json"
	"errors"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"
)

func TestCheckTOML(t *testing.T) {
	deep := func(open, close string, n int) string {
		return "x = " + strings.Repeat(open, n) + "1" + strings.Repeat(close, n) + "\n"
	}
	for _, tc := range []struct {
		name, doc string
		line      int // 0: accepted
	}{
		{"a manifest", "title = \"t\"\n[run]\ntimeout = \"2m\"\n[[claim]]\nid = \"a\"\npatterns = [\"123\", \"321\"]\ninterval = [\"1.5\", \"1.6\"]\n", 0},
		{"arrays at the limit", deep("[", "]", TOMLMaxDepth), 0},
		{"arrays too deep", deep("[", "]", TOMLMaxDepth+1), 1},
		{"inline tables at the limit", deep("{a=", "}", TOMLMaxDepth), 0},
		{"inline tables too deep", deep("{a=", "}", TOMLMaxDepth+1), 1},
		{"ten million arrays", deep("[", "]", 10_000_000), 1},
		{"dotted key at the limit", "a.b.c = 1\n", 0},
		{"dotted key too long", "\n\na.b.c.d = 1\n", 3},
		{"table name too long", "[a.b.c.d]\n", 1},
		{"array of tables name too long", "[[a.b.c.d]]\n", 1},
		{"dotted key in an inline table", "x = {a = 1, b.c.d.e = 2}\n", 1},
		{"claims as inline tables", "claim = [{id = \"a\", patterns = [\"123\"]}]\n", 0},
		{"dots in values", "x = [1.5, 2.5, 3.5, 4.5, 5.5, 6.5]\ny = 1979-05-27T00:32:00.999999\n", 0},
		{"brackets in strings", "x = \"[[[[[[{{{{{\"\ny = '[[[[[[['\nz = \"\"\"\n[[[[[[\n\"\"\"\nw = '''[[[[[[[[\n'''\n", 0},
		{"dots in quoted keys", "\"a.b.c.d.e.f\" = 1\n'g.h.i.j.k' = 2\n", 0},
		{"brackets in comments", "# [[[[[[[[[[\nx = 1 # {{{{{{{\n", 0},
		{"escaped quote", "x = \"\\\"[[[[[[\"\n", 0},
		{"quotes before a closing delimiter", "x = \"\"\"a\"\"\"\"\"\ny = [[[[1]]]]\n", 2},
		{"multi-line array", "x = [\n [\n  [\n   [1]]]]\n", 4},
	} {
		err := CheckTOML([]byte(tc.doc))
		var ne *NestingError
		switch {
		case tc.line == 0 && err != nil:
			t.Errorf("%s: refused: %v", tc.name, err)
		case tc.line > 0 && (!errors.As(err, &ne) || ne.Line != tc.line):
			t.Errorf("%s: %v, want a refusal at line %d", tc.name, err, tc.line)
		}
	}
}

func TestCheckJSON(t *testing.T) {
	for _, tc := range []struct {
		doc  string
		line int
	}{
		{`{"a":[1,{"b":"[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[["}]}`, 0},
		{strings.Repeat("[", JSONMaxDepth) + strings.Repeat("]", JSONMaxDepth), 0},
		{"{}\n" + strings.Repeat("[", JSONMaxDepth+1), 2},
		{`"\"` + strings.Repeat("[", JSONMaxDepth+1) + `"`, 0},
	} {
		err := CheckJSON([]byte(tc.doc))
		var ne *NestingError
		switch {
		case tc.line == 0 && err != nil:
			t.Errorf("%.40s: refused: %v", tc.doc, err)
		case tc.line > 0 && (!errors.As(err, &ne) || ne.Line != tc.line):
			t.Errorf("%.40s: %v, want a refusal at line %d", tc.doc, err, tc.line)
		}
	}
}

// depthOf is the nesting of a decoded TOML value: tables and arrays.
func depthOf(v any) int {
	d := 0
	switch x := v.(type) {
	case map[string]any:
		for _, e := range x {
			d = max(d, depthOf(e))
		}
		return d + 1
	case []map[string]any:
		for _, e := range x {
			d = max(d, depthOf(e))
		}
		return d + 1
	case []any:
		for _, e := range x {
			d = max(d, depthOf(e))
		}
		return d + 1
	}
	return 0
}

// decodedLimit bounds the depth of what CheckTOML accepts: a table name of
// TOMLMaxKeyParts parts, then in each of TOMLMaxDepth arrays or inline
// tables a key of as many parts, plus the document's own table.
const decodedLimit = 1 + TOMLMaxKeyParts + TOMLMaxDepth*(1+TOMLMaxKeyParts)

// FuzzCheckTOML holds CheckTOML against the TOML library: what it accepts
// decodes to a bounded depth, and what it refuses for depth, when the
// library reads it, is at least that deep (a key of five parts is four
// tables and a value).
func FuzzCheckTOML(f *testing.F) {
	for _, s := range []string{
		"x = [[[[1]]]]\n", "a.b.c.d = 1\n", "[a.b]\n[[c.d]]\n", "x = {a = {b = 1}}\n",
		"x = \"\"\"\n[[\n\"\"\"\n", "x = '''[[[[['''\n", "# [[[[\n", "x = [\n[\n[1]]]\n",
		"x = {a.b.c = [[1]]}\n", "'a.b'.c = 1\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		err := CheckTOML(data)
		var v map[string]any
		if _, perr := toml.Decode(string(data), &v); perr != nil {
			return
		}
		d := depthOf(v)
		switch {
		case err == nil && d > decodedLimit:
			t.Fatalf("accepted a document of depth %d (limit %d)", d, decodedLimit)
		case err != nil && d <= min(TOMLMaxDepth, TOMLMaxKeyParts):
			t.Fatalf("refused a document of depth %d: %v", d, err)
		}
	})
}

// FuzzCheckJSON holds CheckJSON against encoding/json: on valid JSON it
// refuses exactly the documents nested deeper than JSONMaxDepth.
func FuzzCheckJSON(f *testing.F) {
	for _, s := range []string{`{"a":[1,2]}`, `"[[["`, `[[[[`, `{"\"":"["}`, strings.Repeat("[", 33) + strings.Repeat("]", 33)} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		err := CheckJSON(data)
		if !json.Valid(data) {
			return
		}
		dec := json.NewDecoder(bytes.NewReader(data))
		depth, deepest := 0, 0
		for {
			tok, terr := dec.Token()
			if terr != nil {
				break
			}
			switch tok {
			case json.Delim('['), json.Delim('{'):
				depth++
				deepest = max(deepest, depth)
			case json.Delim(']'), json.Delim('}'):
				depth--
			}
		}
		if (err != nil) != (deepest > JSONMaxDepth) {
			t.Fatalf("depth %d: CheckJSON says %v", deepest, err)
		}
	})
}
