package input

import "fmt"

// Limits of the nesting checks (README, "Input limits"). A claims manifest
// needs three levels (claim = [{patterns = ["123"]}]) and keys of two parts
// (run.timeout); every JSON file the tool writes nests fewer than ten
// levels. The TOML library's memory grows with the square of both; at
// these limits the worst manifest of input.Manifest's size stays within a
// few hundred megabytes.
const (
	TOMLMaxDepth    = 3  // arrays and inline tables inside one another
	TOMLMaxKeyParts = 3  // parts of a dotted key or a table name: a.b.c
	JSONMaxDepth    = 32 // arrays and objects inside one another
)

// NestingError is a document nested deeper than a limit allows.
type NestingError struct {
	Line int // 1-based
	Msg  string
}

func (e *NestingError) Error() string { return fmt.Sprintf("line %d: %s", e.Line, e.Msg) }

// CheckTOML refuses TOML text with arrays and inline tables nested deeper
// than TOMLMaxDepth, or a key or table name of more than TOMLMaxKeyParts
// dotted parts. It reads strings and comments as TOML does, so brackets
// and dots inside them do not count; it does not validate anything else
// (the parser does), and on malformed text it may refuse what the parser
// would also refuse, for another reason.
func CheckTOML(data []byte) error {
	s := tomlScan{data: data, line: 1, key: true, lineStart: true}
	for s.i < len(data) {
		if err := s.step(); err != nil {
			return err
		}
	}
	return nil
}

// tomlScan is CheckTOML's state: the open arrays and inline tables, and
// whether a key is being read (and how many parts it has so far).
type tomlScan struct {
	data      []byte
	i, line   int
	open      []byte // '[' and '{' not yet closed
	key       bool   // reading a key: at a line's start or after '{' or ',' in an inline table
	header    bool   // reading a table name: [a.b] or [[a.b]]
	parts     int    // dots seen in the current key
	lineStart bool   // nothing but blanks since the line began
}

func (s *tomlScan) fail(format string, args ...any) error {
	return &NestingError{Line: s.line, Msg: fmt.Sprintf(format, args...)}
}

func (s *tomlScan) step() error {
	c := s.data[s.i]
	start := s.lineStart
	if c != ' ' && c != '\t' && c != '\r' {
		s.lineStart = false
	}
	switch c {
	case '\n':
		s.line++
		s.i++
		if len(s.open) == 0 {
			s.key, s.header, s.parts, s.lineStart = true, false, 0, true
		}
		return nil
	case '#':
		for s.i < len(s.data) && s.data[s.i] != '\n' {
			s.i++
		}
		return nil
	case '"', '\'':
		s.skipString(c)
		return nil
	case '.':
		if s.key || s.header {
			s.parts++
			if s.parts >= TOMLMaxKeyParts {
				return s.fail("a key or table name of more than %d dotted parts; no claims manifest needs more", TOMLMaxKeyParts)
			}
		}
	case '=':
		s.key = false
	case '[':
		if start && len(s.open) == 0 && s.key {
			s.header, s.key = true, false
			if s.i+1 < len(s.data) && s.data[s.i+1] == '[' {
				s.i++
			}
			break
		}
		if err := s.push('['); err != nil {
			return err
		}
	case '{':
		if err := s.push('{'); err != nil {
			return err
		}
		s.key, s.parts = true, 0
	case ']':
		if s.header {
			s.header = false
			if s.i+1 < len(s.data) && s.data[s.i+1] == ']' {
				s.i++
			}
			break
		}
		s.pop('[')
	case '}':
		s.pop('{')
		s.key = false
	case ',':
		if n := len(s.open); n > 0 && s.open[n-1] == '{' {
			s.key, s.parts = true, 0
		}
	}
	s.i++
	return nil
}

func (s *tomlScan) push(c byte) error {
	s.open = append(s.open, c)
	if len(s.open) > TOMLMaxDepth {
		return s.fail("arrays and inline tables nested more than %d deep; no claims manifest needs more", TOMLMaxDepth)
	}
	return nil
}

// pop closes the innermost c; a stray closer is left for the parser.
func (s *tomlScan) pop(c byte) {
	if n := len(s.open); n > 0 && s.open[n-1] == c {
		s.open = s.open[:n-1]
	}
}

// skipString moves past a string that starts at s.i with quote q: basic
// ("...", with backslash escapes) or literal ('...'), on one line or, with
// a tripled quote, on several.
func (s *tomlScan) skipString(q byte) {
	d := s.data
	triple := s.i+2 < len(d) && d[s.i+1] == q && d[s.i+2] == q
	if triple {
		s.i += 3
	} else {
		s.i++
	}
	for s.i < len(d) {
		c := d[s.i]
		switch {
		case c == '\\' && q == '"':
			if s.i+1 < len(d) && d[s.i+1] == '\n' {
				s.line++
			}
			s.i += 2
			continue
		case c == '\n':
			if !triple {
				return // an unclosed string: the parser says so
			}
			s.line++
		case c == q && !triple:
			s.i++
			return
		case c == q && s.i+2 < len(d) && d[s.i+1] == q && d[s.i+2] == q:
			// up to two more quotes may end the text before the delimiter
			s.i += 3
			for k := 0; k < 2 && s.i < len(d) && d[s.i] == q; k++ {
				s.i++
			}
			return
		}
		s.i++
	}
}

// CheckJSON refuses JSON text with arrays and objects nested deeper than
// JSONMaxDepth. Brackets inside strings do not count; nothing else is
// validated (the parser does).
func CheckJSON(data []byte) error {
	depth, line := 0, 1
	for i := 0; i < len(data); i++ {
		switch data[i] {
		case '\n':
			line++
		case '"':
			for i++; i < len(data) && data[i] != '"'; i++ {
				switch data[i] {
				case '\\':
					i++
				case '\n':
					line++ // not valid JSON; keep the line count right for the parser's message
				}
			}
		case '[', '{':
			depth++
			if depth > JSONMaxDepth {
				return &NestingError{Line: line, Msg: fmt.Sprintf("arrays and objects nested more than %d deep; no file avoidcert writes nests so deep", JSONMaxDepth)}
			}
		case ']', '}':
			depth = max(depth-1, 0)
		}
	}
	return nil
}
