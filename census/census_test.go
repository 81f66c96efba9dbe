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
	"strconv"
	"strings"
	"sync"
	"testing"

	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// fakeCertifier stands in for the certifying library call in tests of the
// bookkeeping: a made-up growth rate per pattern (these tests check
// journals, shards, files and the refinement's bookkeeping, not
// mathematics) and a certificate naming the set, the digits and that
// rate. It counts its calls per set and digits and fails for the sets in
// failOn (and failAt, at those digits); value replaces the made-up rate
// of some sets.
type fakeCertifier struct {
	mu     sync.Mutex
	calls  map[string]int // by set
	digits map[string][]int
	failOn map[string]bool
	failAt map[string]int // fail for the set at these digits only
	value  map[string]string
}

func (f *fakeCertifier) certify(ctx context.Context, set pattern.Set, digits int) (Certified, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.calls == nil {
		f.calls, f.digits = map[string]int{}, map[string][]int{}
	}
	rep := set.String()
	f.calls[rep]++
	f.digits[rep] = append(f.digits[rep], digits)
	if f.failOn[rep] || f.failAt[rep] == digits {
		return Certified{}, errors.New("made-up failure")
	}
	value, ok := f.value[rep]
	if !ok {
		value = defaultValue(rep)
	}
	return Certified{Certificate: fakeFile(rep, digits, value), Checked: fakeCertificate(rep, digits, value)}, nil
}

// defaultValue is the made-up growth rate of a pattern: 1/2 + its digits
// read as an integer times 10^-6 (distinct for distinct patterns).
func defaultValue(rep string) string {
	v, _ := strconv.Atoi(rep)
	return new(big.Rat).Add(big.NewRat(1, 2), big.NewRat(int64(v), 1_000_000)).FloatString(6)
}

// fakeFile is the stand-in certificate file of a class at some digits,
// and fakeCertificate what a stand-in checker accepts it as: a range of
// width 8·10^-(digits+2) about the made-up value (so that its ends share
// the digits asked for, as a real certificate's do, unless the value sits
// near a digit's boundary), a structure class with an exponent.
func fakeFile(rep string, digits int, value string) []byte {
	return []byte(fmt.Sprintf("certificate of %s at %d digits: %s\n", rep, digits, value))
}

func fakeCertificate(rep string, digits int, value string) *certify.Certificate {
	t, ok := new(big.Rat).SetString(value)
	if !ok {
		panic("not a value: " + value)
	}
	half := new(big.Rat).SetFrac(big.NewInt(4), new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(digits+2)), nil))
	lo, hi := new(big.Rat).Sub(t, half), new(big.Rat).Add(t, half)
	text := func(r *big.Rat) string {
		s := strings.TrimRight(r.FloatString(digits+30), "0")
		return strings.TrimSuffix(s, ".")
	}
	return &certify.Certificate{
		Statement: certify.Statement{Given: []string{rep}, Patterns: []string{rep},
			Lambda: certify.Range{Lo: lo, Hi: hi, LoDecimal: text(lo), HiDecimal: text(hi)},
			Radius: certify.Range{LoDecimal: "1"}},
		Structure: &certify.Structure{Class: certify.ClassPrimitive, Exponent: len(rep)},
	}
}

// fakeCheck stands in for the checker: it accepts a stand-in file for its
// own class only.
func fakeCheck(ctx context.Context, data []byte, typed []string) (*certify.Certificate, error) {
	var rep, value string
	var digits int
	_, err := fmt.Sscanf(string(data), "certificate of %s at %d digits: %s\n", &rep, &digits, &value)
	switch {
	case err != nil || len(typed) != 1 || !bytes.Equal(data, fakeFile(rep, digits, value)):
		return nil, errors.New("not a stand-in certificate")
	case rep != typed[0]:
		return nil, fmt.Errorf("the certificate is for the set %s, not for the expected set %s", rep, typed[0])
	}
	return fakeCertificate(rep, digits, value), nil
}

func count(ctx context.Context, set pattern.Set, n int) ([]*big.Int, error) {
	return transfer.Counts(ctx, set, n, nil)
}

func options(dir string, length int, f *fakeCertifier) Options {
	return Options{Params: Params{Length: length, To: 9, Digits: 5, RefineDigits: 5}, Dir: dir, Jobs: 2, Tool: "test",
		Certify: f.certify, Count: count, Check: fakeCheck}
}

func mergeOptions(out string, dirs []string, f *fakeCertifier) MergeOptions {
	return MergeOptions{Out: out, Dirs: dirs, Jobs: 2, Check: fakeCheck, Certify: f.certify}
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
		if err != nil || !bytes.Equal(data, fakeFile(r.Representative, 5, defaultValue(r.Representative))) {
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
	if data, _ := os.ReadFile(path); !bytes.Equal(data, fakeFile("123", 5, defaultValue("123"))) {
		t.Errorf("certificate not restored: %q", data)
	}
}

func TestRunRefusesAFolderOfAnotherCensus(t *testing.T) {
	dir := t.TempDir()
	if _, err := Run(context.Background(), options(dir, 3, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	opts := options(dir, 3, &fakeCertifier{})
	opts.Params.Digits, opts.Params.RefineDigits = 7, 7
	_, err := Run(context.Background(), opts)
	var in *InputError
	if !errors.As(err, &in) || !strings.Contains(err.Error(), "holds a census of length 3, counts to 9, 5 digits (groups refined up to 5)") {
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
	if _, err := Merge(context.Background(), mergeOptions(out, dirs, &fakeCertifier{})); err != nil {
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
		_, err := Merge(context.Background(), mergeOptions(out, c.dirs, &fakeCertifier{}))
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
