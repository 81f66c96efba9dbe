package census

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math/big"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"

	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// fakeCertifier stands in for the certifying library call in tests of the
// bookkeeping: a made-up range per pattern (these tests check journals,
// shards and files, not mathematics) and a certificate naming the set. It
// counts its calls per set and fails for the sets in failOn.
type fakeCertifier struct {
	mu     sync.Mutex
	calls  map[string]int
	failOn map[string]bool
}

func (f *fakeCertifier) certify(ctx context.Context, set pattern.Set, digits int) (Certified, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.calls == nil {
		f.calls = map[string]int{}
	}
	f.calls[set.String()]++
	if f.failOn[set.String()] {
		return Certified{}, errors.New("made-up failure")
	}
	return Certified{Certificate: fakeFile(set.String()), Checked: fakeCertificate(set.String())}, nil
}

// fakeFile is the stand-in certificate file of a class, and
// fakeCertificate what a stand-in checker accepts it as: a made-up range
// from the digits of the pattern (distinct for distinct patterns,
// overlapping for some neighbours), a structure class with an exponent.
func fakeFile(rep string) []byte { return []byte("certificate of " + rep + "\n") }

func fakeCertificate(rep string) *certify.Certificate {
	v := 0
	for _, r := range rep {
		v = 10*v + int(r-'0')
	}
	return &certify.Certificate{
		Statement: certify.Statement{Given: []string{rep}, Patterns: []string{rep},
			Lambda: certify.Range{LoDecimal: fmt.Sprintf("0.%07d", v), HiDecimal: fmt.Sprintf("0.%07d", v+50)},
			Radius: certify.Range{LoDecimal: "1"}},
		Structure: &certify.Structure{Class: certify.ClassPrimitive, Exponent: len(rep)},
	}
}

// fakeCheck stands in for the checker: it accepts a stand-in file for its
// own class only.
func fakeCheck(ctx context.Context, data []byte, typed []string) (*certify.Certificate, error) {
	rep, ok := strings.CutPrefix(string(data), "certificate of ")
	rep = strings.TrimSuffix(rep, "\n")
	switch {
	case !ok || len(typed) != 1:
		return nil, errors.New("not a stand-in certificate")
	case rep != typed[0]:
		return nil, fmt.Errorf("the certificate is for the set %s, not for the expected set %s", rep, typed[0])
	}
	return fakeCertificate(rep), nil
}

func count(ctx context.Context, set pattern.Set, n int) ([]*big.Int, error) {
	return transfer.Counts(ctx, set, n, nil)
}

func options(dir string, length int, f *fakeCertifier) Options {
	return Options{Params: Params{Length: length, To: 9, Digits: 5}, Dir: dir, Jobs: 2, Tool: "test",
		Certify: f.certify, Count: count, Check: fakeCheck}
}

// readTree returns every file under dir except the journal, by path.
func readTree(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	files := map[string][]byte{}
	err := filepath.WalkDir(dir, func(path string, d os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, path)
		if d.IsDir() && rel == journalDir {
			return filepath.SkipDir
		}
		if !d.IsDir() {
			data, err := os.ReadFile(path)
			files[rel] = data
			return err
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return files
}

func sameTree(t *testing.T, a, b string) {
	t.Helper()
	ta, tb := readTree(t, a), readTree(t, b)
	for name, data := range ta {
		if !bytes.Equal(data, tb[name]) {
			t.Errorf("%s differs between %s and %s", name, a, b)
		}
	}
	if len(ta) != len(tb) {
		t.Errorf("%s has %d files, %s has %d", a, len(ta), b, len(tb))
	}
}

func TestRunWritesTablesAndCertificates(t *testing.T) {
	dir := t.TempDir()
	rep, err := Run(context.Background(), options(dir, 4, &fakeCertifier{}))
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Rows) != 8 || rep.Classes != 8 {
		t.Fatalf("%d rows of %d classes, want 8 of 8 (length 4)", len(rep.Rows), rep.Classes)
	}
	if !slices.IsSortedFunc(rep.Rows, byLambda) {
		t.Error("rows are not sorted by lambda, largest first")
	}
	for _, r := range rep.Rows {
		data, err := os.ReadFile(filepath.Join(dir, r.Certificate))
		if err != nil || string(data) != "certificate of "+r.Representative+"\n" {
			t.Errorf("%s: certificate %q, %v", r.Representative, data, err)
		}
	}
	for _, name := range []string{JSONFile, CSVFile, MarkdownFile} {
		if _, err := os.Stat(filepath.Join(dir, name)); err != nil {
			t.Error(err)
		}
	}
	back, err := ReadReport(context.Background(), dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(back.Rows) != 8 || back.Rows[0].CertificateSHA256 == "" {
		t.Errorf("census.json read back with %d rows, first digest %q", len(back.Rows), back.Rows[0].CertificateSHA256)
	}
}

// A failed class stops the run; the next run redoes only the classes
// that were not finished, and ends with the same bytes as a run that never
// failed.
func TestResumeRedoesNoFinishedClass(t *testing.T) {
	whole := t.TempDir()
	if _, err := Run(context.Background(), options(whole, 4, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	first := &fakeCertifier{failOn: map[string]bool{"1342": true}}
	opts := options(dir, 4, first)
	opts.Jobs = 1
	if _, err := Run(context.Background(), opts); err == nil || !strings.Contains(err.Error(), "class 1342") {
		t.Fatalf("error %v, want the failure of class 1342", err)
	}
	if _, err := os.Stat(filepath.Join(dir, JSONFile)); err == nil {
		t.Fatal("census.json written by a run that did not finish")
	}
	second := &fakeCertifier{}
	if _, err := Run(context.Background(), options(dir, 4, second)); err != nil {
		t.Fatal(err)
	}
	for set, n := range second.calls {
		if first.calls[set] > 0 && !first.failOn[set] {
			t.Errorf("class %s was certified again (%d times) after it was journalled", set, n)
		}
	}
	if len(first.calls)+len(second.calls)-1 != 8 {
		t.Errorf("first run certified %v, second %v: want every class of 8 once, 1342 twice", first.calls, second.calls)
	}
	sameTree(t, whole, dir)
}

func TestResumeRedoesAClassWhoseCertificateChanged(t *testing.T) {
	dir := t.TempDir()
	if _, err := Run(context.Background(), options(dir, 3, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, certificateDir, "123.json")
	if err := os.WriteFile(path, []byte("changed\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	again := &fakeCertifier{}
	if _, err := Run(context.Background(), options(dir, 3, again)); err != nil {
		t.Fatal(err)
	}
	if again.calls["123"] != 1 || again.calls["132"] != 0 {
		t.Errorf("calls %v, want 123 redone and 132 kept", again.calls)
	}
	if data, _ := os.ReadFile(path); string(data) != "certificate of 123\n" {
		t.Errorf("certificate not restored: %q", data)
	}
}

func TestRunRefusesAFolderOfAnotherCensus(t *testing.T) {
	dir := t.TempDir()
	if _, err := Run(context.Background(), options(dir, 3, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	opts := options(dir, 3, &fakeCertifier{})
	opts.Params.Digits = 7
	_, err := Run(context.Background(), opts)
	var in *InputError
	if !errors.As(err, &in) || !strings.Contains(err.Error(), "holds a census of length 3, counts to 9, 5 digits") {
		t.Fatalf("error %v, want a refusal naming the earlier parameters", err)
	}
	opts = options(dir, 3, &fakeCertifier{})
	opts.Shard = Shard{Index: 1, Of: 2}
	if _, err := Run(context.Background(), opts); !errors.As(err, &in) {
		t.Fatalf("a shard run in a whole census's folder: error %v, want a refusal", err)
	}
}

func TestRunRefusesASecondRunOnTheFolder(t *testing.T) {
	dir := t.TempDir()
	j, err := openJournal(context.Background(), dir, Params{Length: 3, To: 9, Digits: 5}, Shard{})
	if err != nil {
		t.Fatal(err)
	}
	defer j.close()
	_, err = Run(context.Background(), options(dir, 3, &fakeCertifier{}))
	if err == nil || !strings.Contains(err.Error(), "in use by another census run") {
		t.Fatalf("error %v, want the folder reported in use", err)
	}
}

// shards runs every shard of n into its own folder and returns the
// folders.
func shards(t *testing.T, length, n int) []string {
	t.Helper()
	var dirs []string
	for i := 1; i <= n; i++ {
		dir := t.TempDir()
		opts := options(dir, length, &fakeCertifier{})
		opts.Shard = Shard{Index: i, Of: n}
		if _, err := Run(context.Background(), opts); err != nil {
			t.Fatal(err)
		}
		dirs = append(dirs, dir)
	}
	return dirs
}

func TestMergeOfShardsEqualsTheWhole(t *testing.T) {
	whole := t.TempDir()
	if _, err := Run(context.Background(), options(whole, 5, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	out := t.TempDir()
	dirs := shards(t, 5, 3)
	slices.Reverse(dirs) // the order of the folders does not matter
	if _, err := Merge(context.Background(), out, dirs, fakeCheck, 2); err != nil {
		t.Fatal(err)
	}
	sameTree(t, whole, out)
}

func TestMergeRefusals(t *testing.T) {
	dirs := shards(t, 4, 3)
	other := t.TempDir()
	opts := options(other, 4, &fakeCertifier{})
	opts.Params.To = 8
	opts.Shard = Shard{Index: 3, Of: 3}
	if _, err := Run(context.Background(), opts); err != nil {
		t.Fatal(err)
	}
	unfinished := t.TempDir()
	dropped := shards(t, 4, 3)[0]
	rep, err := ReadReport(context.Background(), dropped)
	if err != nil {
		t.Fatal(err)
	}
	rep.Rows = rep.Rows[1:]
	if err := writeOutputs(dropped, rep); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		dirs []string
		want string
	}{
		{"missing shard", dirs[:2], "shard 3/3 is missing"},
		{"duplicated shard", []string{dirs[0], dirs[1], dirs[2], dirs[1]}, "shard 2/3 is given twice"},
		{"different parameters", []string{dirs[0], dirs[1], other}, "merge shards of one census only"},
		{"unfinished shard", []string{dirs[0], dirs[1], unfinished}, "the shard is not finished"},
		{"missing class", []string{dropped, dirs[1], dirs[2]}, "lacks class"},
		{"output is a shard", dirs, "holds the journal of a census run"},
	} {
		out := t.TempDir()
		if c.name == "output is a shard" {
			out = dirs[0]
		}
		_, err := Merge(context.Background(), out, c.dirs, fakeCheck, 2)
		var in *InputError
		if !errors.As(err, &in) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want an input error containing %q", c.name, err, c.want)
		}
	}
}

// Adjacent rows are strictly ordered only when the lower end of the one
// above exceeds the upper end of the one below.
func TestOrderIsStrictOnlyForDisjointRanges(t *testing.T) {
	row := func(rep, lo, hi string, counts ...string) Row {
		return Row{Representative: rep, Lambda: Range{Lo: lo, Hi: hi}, Counts: counts}
	}
	rep := summarize("test", Params{Length: 3, To: 1, Digits: 2}, Shard{}, []Row{
		row("c", "0.50", "0.60", "1", "3"),
		row("a", "0.90", "0.95", "1", "1"),
		row("b", "0.80", "0.90", "1", "2"), // touches a: not disjoint
		row("d", "0.40", "0.5", "1", "3"),  // touches c, same counts
	})
	var got []string
	for _, s := range rep.Order {
		got = append(got, fmt.Sprintf("%s %s %s %v", s.Above, s.Relation, s.Below, s.SameCounts))
	}
	want := []string{"a unresolved b false", "b > c false", "c unresolved d true"}
	if !slices.Equal(got, want) {
		t.Errorf("order %q, want %q", got, want)
	}
	if len(rep.Groups) != 3 || rep.Groups[0].DiffersFromPreviousAt != 0 || rep.Groups[1].DiffersFromPreviousAt != 1 {
		t.Errorf("groups %+v, want 3 groups (c d), (b), (a) apart at n = 1", rep.Groups)
	}
}
