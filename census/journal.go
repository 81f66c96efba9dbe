package census

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"

	"avoidcert/internal/atomicfile"
	"avoidcert/internal/filelock"
	"avoidcert/internal/input"
	"avoidcert/pattern"
)

// The folder layout. The journal holds params.json and one record per
// finished class; the certificates sit beside the tables.
const (
	journalDir     = "journal"
	certificateDir = "certificates"
	paramsFile     = "params.json"
	lockFile       = "lock"
)

// InputError marks a refusal caused by what the user asked for (a folder
// holding another census, shards that do not fit together): the message
// names the problem and what to do. Err is the system's error behind it,
// if any, so that a caller can tell a full disk from a wrong --out.
type InputError struct {
	Msg string
	Err error
}

func (e *InputError) Error() string { return e.Msg }

func (e *InputError) Unwrap() error { return e.Err }

// folderError refuses a folder that could not be created, keeping the
// system's error.
func folderError(what, dir string, err error) error {
	return &InputError{Msg: fmt.Sprintf("cannot create the %s %s: %v; choose another --out", what, dir, err), Err: err}
}

func inputErrorf(format string, args ...any) error {
	return &InputError{Msg: fmt.Sprintf(format, args...)}
}

// journalHeader binds a folder to one census: a run with other
// parameters or another shard is refused rather than mixed in.
type journalHeader struct {
	Format string `json:"format"`
	Params Params `json:"parameters"`
	Shard  *Shard `json:"shard,omitempty"`
}

const journalFormat = "avoidcert-census-journal-1"

// journal is an open census folder, locked against a second run.
type journal struct {
	dir    string
	folder *folder
	params Params
	unlock func()
}

func openJournal(ctx context.Context, dir string, params Params, shard Shard) (*journal, error) {
	for _, d := range []string{dir, filepath.Join(dir, journalDir), filepath.Join(dir, certificateDir)} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			return nil, folderError("census folder", d, err)
		}
	}
	f, err := openFolder(dir)
	if err != nil {
		return nil, err
	}
	for _, sub := range []string{journalDir, certificateDir} {
		if err := f.within(sub); err != nil {
			f.close()
			return nil, err
		}
	}
	unlock, err := filelock.Lock(filepath.Join(dir, journalDir, lockFile))
	switch {
	case errors.Is(err, filelock.ErrHeld):
		f.close()
		return nil, inputErrorf("%s is in use by another census run; wait for it or choose another --out", dir)
	case err != nil:
		f.close()
		return nil, inputErrorf("cannot lock %s: %v; choose another --out", dir, err)
	}
	j := &journal{dir: dir, folder: f, params: params, unlock: func() { unlock(); f.close() }}
	ok := false
	defer func() {
		if !ok {
			j.unlock()
		}
	}()
	// With the lock held no other writer is active: temporary files are
	// leftovers of a killed run.
	for _, d := range []string{dir, filepath.Join(dir, journalDir), filepath.Join(dir, certificateDir)} {
		if err := atomicfile.RemoveStale(d); err != nil {
			return nil, err
		}
	}
	want := journalHeader{Format: journalFormat, Params: params}
	if !shard.Whole() {
		want.Shard = &shard
	}
	wantBytes, err := marshal(want)
	if err != nil {
		return nil, err
	}
	path := filepath.Join(dir, journalDir, paramsFile)
	have, err := f.read(ctx, journalDir+"/"+paramsFile, input.JournalEntry)
	switch {
	case ctx.Err() != nil:
		return nil, ctx.Err()
	case errors.Is(err, fs.ErrNotExist):
		if err := atomicfile.WriteFile(path, wantBytes, 0o644); err != nil {
			return nil, err
		}
	case err != nil:
		return nil, inputErrorf("%v; remove %s to start the census again", err, path)
	case !bytes.Equal(have, wantBytes):
		var h journalHeader
		if json.Unmarshal(have, &h) != nil || h.Format != journalFormat {
			return nil, inputErrorf("%s holds a journal this version cannot read (%s); choose another --out", dir, path)
		}
		return nil, inputErrorf("%s holds a census of %s; this run asks for %s: choose another --out, or repeat the earlier parameters to continue it",
			dir, describe(h.Params, h.Shard), describe(params, want.Shard))
	}
	ok = true
	return j, nil
}

func describe(p Params, s *Shard) string {
	d := fmt.Sprintf("length %d, counts to %d, %d digits (groups refined up to %d)", p.Length, p.To, p.Digits, p.RefineDigits)
	if s != nil {
		d += ", shard " + s.String()
	}
	return d
}

func (j *journal) close() { j.unlock() }

func (j *journal) recordPath(rep string) string {
	return filepath.Join(j.dir, journalDir, rep+".json")
}

// record is a journal entry: the row, and the wall time its class took
// (working state for benchmarks: it never reaches the tables, which must
// not depend on the machine).
type record struct {
	Row
	Seconds float64 `json:"seconds"`
}

// record journals a finished row: the certificate first, then the record
// that names its digest, each written atomically. A record therefore
// never exists without its certificate. It returns the row with the
// certificate's path and digest.
func (j *journal) record(row Row, certificate []byte, seconds float64) (Row, error) {
	sum := sha256.Sum256(certificate)
	row.Certificate = certificateDir + "/" + row.Representative + ".json"
	row.CertificateSHA256 = hex.EncodeToString(sum[:])
	if err := atomicfile.WriteFile(j.folder.path(row.Certificate), certificate, 0o644); err != nil {
		return Row{}, fmt.Errorf("writing the certificate: %w", err)
	}
	data, err := marshal(record{Row: row, Seconds: seconds})
	if err != nil {
		return Row{}, err
	}
	if err := atomicfile.WriteFile(j.recordPath(row.Representative), data, 0o644); err != nil {
		return Row{}, fmt.Errorf("writing the journal: %w", err)
	}
	return row, nil
}

// finished returns the journalled rows of the given classes, by
// representative. A journal is untrusted: a record is counted only when
// its certificate is there, has the digest the record names, is accepted
// by check for the class, and supports every certified field and count
// of the record (verifyRow); any other record's class is done again.
func (j *journal) finished(ctx context.Context, classes []pattern.Class, check Checker, jobs int) (map[string]Row, error) {
	var rows []Row
	for _, c := range classes {
		rep := c.Representative.String()
		data, err := j.folder.read(ctx, journalDir+"/"+rep+".json", input.JournalEntry)
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if ctx.Err() != nil {
			return nil, ctx.Err()
		}
		if err != nil {
			return nil, inputErrorf("journal record %s: %v; remove it to redo the class", j.recordPath(rep), err)
		}
		var rec record
		if err := decodeJSON(data, &rec); err != nil {
			return nil, inputErrorf("journal record %s is not readable (%v): it was changed by hand; remove it to redo the class", j.recordPath(rep), err)
		}
		row := rec.Row
		row.Refined = nil // a record is of the class's own certificate only
		if err := row.fits(c, j.params); err != nil {
			return nil, inputErrorf("journal record %s: %v; remove it to redo the class", j.recordPath(rep), err)
		}
		rows = append(rows, row)
	}
	ok := make([]bool, len(rows))
	inParallel(len(rows), jobs, func(i int) {
		_, _, err := verifyRow(ctx, j.folder, j.recordPath(rows[i].Representative), rows[i], j.params, check)
		ok[i] = err == nil
	})
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	byRep := make(map[string]Row)
	for i, r := range rows {
		if ok[i] {
			byRep[r.Representative] = r
		}
	}
	return byRep, nil
}

// fits reports whether a row is the census row of class c under params
// (verifyRow checks its certificate).
func (r Row) fits(c pattern.Class, params Params) error {
	var members []string
	for _, m := range c.Members {
		members = append(members, m.String())
	}
	switch {
	case r.Representative != c.Representative.String():
		return fmt.Errorf("the row is about %s, not %s", r.Representative, c.Representative)
	case !slices.Equal(r.Members, members):
		return fmt.Errorf("members %v, want %v", r.Members, members)
	case len(r.Counts) != params.To+1:
		return fmt.Errorf("%d counts, want a_0..a_%d", len(r.Counts), params.To)
	}
	return nil
}

// decodeJSON reads a JSON file the census wrote into v, refusing nesting
// deeper than any such file has before the decoder sees it.
func decodeJSON(data []byte, v any) error {
	if err := input.CheckJSON(data); err != nil {
		return err
	}
	if err := json.Unmarshal(data, v); err != nil {
		return errors.New(input.JSONProblem(err))
	}
	return nil
}

// marshal is the one JSON layout of every file the census writes:
// indented, no HTML escaping, a final newline.
func marshal(v any) ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}
