package series

import (
	"bufio"
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"avoidcert/internal/input"
)

// MaxLine is the longest line a series file may have (1 MiB): a bound on
// the memory one value may take, far above any real line of numbers.
const MaxLine = 1 << 20

// Error is a fault in the input, at a line when Line > 0.
type Error struct {
	Name string // the file as the user named it
	Line int
	Msg  string
}

func (e *Error) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s, line %d: %s", e.Name, e.Line, e.Msg)
	}
	return e.Name + ": " + e.Msg
}

// Open opens a series: "-" is standard input, anything else must be a
// regular file (a folder, device, FIFO or socket is refused before it is
// opened, so a FIFO cannot block). The caller closes it.
func Open(path string) (io.ReadCloser, error) {
	if path == "-" {
		return io.NopCloser(os.Stdin), nil
	}
	f, err := input.Open(path, input.Series)
	if err != nil {
		var ie *input.Error
		if errors.As(err, &ie) {
			return nil, &Error{Name: path, Msg: ie.Problem}
		}
		return nil, err
	}
	return f, nil
}

// reason is the operating system's part of a file error, without Go's
// wording around it.
func reason(err error) string {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// Format says how to read a series.
type Format struct {
	// Column is empty for one value a line; otherwise the column of a
	// delimited file: a name from its first line (the header), or a
	// number, 1 for the first column. With a number, a first line whose
	// field there is not a number is read as a header.
	Column string
	// Delimiter separates the columns; 0 picks tab when the first line has
	// one, comma otherwise.
	Delimiter rune
	// SkipMissing skips missing values and fields that are not finite
	// numbers (counting them) instead of refusing the first one.
	SkipMissing bool
}

// Value is one number of the series and the line it came from.
type Value struct {
	X    float64
	Line int
}

// Skipped tallies what SkipMissing left out.
type Skipped struct {
	Missing    int64 // empty, NA, N/A, NaN, null
	NotNumbers int64 // anything else that is not a finite number
	FirstLine  int   // the first skipped line, 0 if none
}

// Reader streams the values of a series.
type Reader struct {
	name    string
	format  Format
	lines   *bufio.Scanner // one value a line
	fields  *csv.Reader    // a column
	column  int            // 0-based, once known
	line    int
	Skipped Skipped
	// Header is the header line's field of the column ("" when none).
	Header  string
	pending []string // the first record, when it holds a value rather than a header
	bound   *lineBound
	ctx     context.Context
	reads   int
}

// NewReader reads a series from r; name is the file as the user named it,
// for messages. With a column it reads the first line to find it. ctx
// cancels a long read (checked every few thousand lines).
func NewReader(ctx context.Context, name string, r io.Reader, f Format) (*Reader, error) {
	rd := &Reader{name: name, format: f, ctx: ctx}
	if f.Column == "" {
		rd.lines = bufio.NewScanner(r)
		rd.lines.Buffer(make([]byte, 0, 64<<10), MaxLine)
		return rd, nil
	}
	rd.bound = &lineBound{r: r}
	br := bufio.NewReaderSize(rd.bound, 64<<10)
	delim := f.Delimiter
	if delim == 0 {
		first, err := br.Peek(min(br.Size(), MaxLine))
		if err != nil && !errors.Is(err, io.EOF) && !errors.Is(err, bufio.ErrBufferFull) {
			return nil, rd.fault(0, err)
		}
		line, _, _ := bytes.Cut(first, []byte("\n"))
		delim = ','
		if bytes.ContainsRune(line, '\t') {
			delim = '\t'
		}
	}
	rd.fields = csv.NewReader(br)
	rd.fields.Comma = delim
	rd.fields.FieldsPerRecord = -1
	rd.fields.ReuseRecord = true
	if err := rd.findColumn(); err != nil {
		return nil, err
	}
	return rd, nil
}

// findColumn reads the first line and resolves the column.
func (rd *Reader) findColumn() error {
	rec, err := rd.fields.Read()
	if errors.Is(err, io.EOF) {
		return &Error{Name: rd.name, Msg: "is empty: no values to read"}
	}
	if err != nil {
		return rd.fault(1, err)
	}
	rd.line = 1
	want := rd.format.Column
	if n, err := strconv.Atoi(want); err == nil && isDigits(want) {
		if n < 1 {
			return &Error{Name: rd.name, Msg: fmt.Sprintf("column %s does not exist: columns are numbered from 1", want)}
		}
		rd.column = n - 1
		if rd.column < len(rec) {
			if _, ok := number(rec[rd.column]); !ok && !missing(rec[rd.column]) {
				rd.Header = rec[rd.column]
				return nil
			}
		}
		rd.pending = append([]string(nil), rec...)
		return nil
	}
	for i, h := range rec {
		if strings.TrimSpace(h) == want {
			if rd.Header != "" {
				return &Error{Name: rd.name, Line: 1, Msg: fmt.Sprintf("two columns are named %s; choose one by its number", quoted(want))}
			}
			rd.column, rd.Header = i, want
		}
	}
	if rd.Header == "" {
		return &Error{Name: rd.name, Line: 1, Msg: fmt.Sprintf("no column named %s in the header (%s); give a name from it or a column number", quoted(want), quoted(strings.Join(rec, string(rd.fields.Comma))))}
	}
	return nil
}

// Next returns the next value, or io.EOF after the last one.
func (rd *Reader) Next() (Value, error) {
	for {
		if rd.reads++; rd.reads%4096 == 0 {
			if err := rd.ctx.Err(); err != nil {
				return Value{}, err
			}
		}
		var field string
		var line int
		if rd.lines != nil {
			// one value a line: parse the scanner's bytes in place (a
			// short conversion in the call does not allocate)
			b, n, err := rd.nextLine()
			if err != nil {
				return Value{}, err
			}
			x, err := strconv.ParseFloat(string(b), 64)
			if err == nil && !math.IsInf(x, 0) && !math.IsNaN(x) {
				return Value{X: x, Line: n}, nil
			}
			field, line = string(b), n
		} else {
			f, n, err := rd.nextField()
			if err != nil {
				return Value{}, err
			}
			if x, ok := number(f); ok {
				return Value{X: x, Line: n}, nil
			}
			field, line = f, n
		}
		isMissing := missing(field)
		if !rd.format.SkipMissing {
			what := fmt.Sprintf("%s is not a finite number", quoted(field))
			hint := "; fix it, or skip such fields with --skip-missing"
			if isMissing {
				what = fmt.Sprintf("a missing value (%s)", quoted(field))
			}
			if line == 1 && rd.format.Column == "" && !isMissing {
				hint += " (if it is a header, read the file with --column 1)"
			}
			return Value{}, &Error{Name: rd.name, Line: line, Msg: what + hint}
		}
		if isMissing {
			rd.Skipped.Missing++
		} else {
			rd.Skipped.NotNumbers++
		}
		if rd.Skipped.FirstLine == 0 {
			rd.Skipped.FirstLine = line
		}
	}
}

// nextLine returns the next line of a series of one value a line, without
// its surrounding space, and its number. The bytes are the scanner's, valid
// until the next call.
func (rd *Reader) nextLine() ([]byte, int, error) {
	if !rd.lines.Scan() {
		err := rd.lines.Err()
		if err == nil {
			return nil, 0, io.EOF
		}
		return nil, 0, rd.fault(rd.line+1, err)
	}
	rd.line++
	return bytes.TrimSpace(rd.lines.Bytes()), rd.line, nil
}

// nextField returns the column's next field and its line.
func (rd *Reader) nextField() (string, int, error) {
	if rd.pending != nil {
		rec := rd.pending
		rd.pending = nil
		return rd.pick(rec, 1)
	}
	rec, err := rd.fields.Read()
	if rd.bound.tripped {
		// the CSV reader may hand out a long line whole before the
		// refusal reaches it
		err = errLineTooLong
	}
	if errors.Is(err, io.EOF) {
		return "", 0, io.EOF
	}
	if err != nil {
		return "", 0, rd.fault(rd.line+1, err)
	}
	line, _ := rd.fields.FieldPos(0)
	rd.line = line
	return rd.pick(rec, line)
}

// pick returns the column's field of a record.
func (rd *Reader) pick(rec []string, line int) (string, int, error) {
	if rd.column >= len(rec) {
		return "", 0, &Error{Name: rd.name, Line: line, Msg: fmt.Sprintf("has %d columns, not the %d needed for column %d", len(rec), rd.column+1, rd.column+1)}
	}
	return strings.TrimSpace(rec[rd.column]), line, nil
}

// fault turns a read error into our own message.
func (rd *Reader) fault(line int, err error) error {
	var pe *csv.ParseError
	switch {
	case errors.Is(err, context.Canceled), errors.Is(err, context.DeadlineExceeded):
		return err
	case errors.Is(err, bufio.ErrTooLong), errors.Is(err, errLineTooLong):
		return &Error{Name: rd.name, Line: line, Msg: fmt.Sprintf("a line longer than %d bytes; is this a series of numbers?", MaxLine)}
	case errors.As(err, &pe):
		return &Error{Name: rd.name, Line: pe.Line, Msg: "a quote is not closed or stands inside a field; check the quoting of this line"}
	default:
		return &Error{Name: rd.name, Line: line, Msg: "cannot be read (" + reason(err) + ")"}
	}
}

// number parses a finite decimal number.
func number(s string) (float64, bool) {
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
		return 0, false
	}
	return x, true
}

// missing reports whether a field marks a missing value.
func missing(s string) bool {
	switch strings.ToLower(s) {
	case "", "na", "n/a", "nan", "null":
		return true
	}
	return false
}

func isDigits(s string) bool {
	for _, c := range s {
		if c < '0' || c > '9' {
			return false
		}
	}
	return s != ""
}

// quoted cuts a field from the user's file to a few dozen characters for a
// message.
func quoted(s string) string {
	if len(s) > 40 {
		s = s[:40] + "..."
	}
	return strconv.Quote(s)
}

// errLineTooLong is lineBound's refusal.
var errLineTooLong = errors.New("line too long")

// lineBound passes bytes through and fails when a line grows past MaxLine,
// so that the CSV reader never buffers more than that.
type lineBound struct {
	r       io.Reader
	run     int // bytes since the last newline
	tripped bool
}

func (b *lineBound) Read(p []byte) (int, error) {
	n, err := b.r.Read(p)
	rest := p[:n]
	for {
		i := bytes.IndexByte(rest, '\n')
		if i < 0 {
			b.run += len(rest)
			break
		}
		if b.run+i > MaxLine {
			b.tripped = true
			return n, errLineTooLong
		}
		b.run = 0
		rest = rest[i+1:]
	}
	if b.run > MaxLine {
		b.tripped = true
		return n, errLineTooLong
	}
	return n, err
}
