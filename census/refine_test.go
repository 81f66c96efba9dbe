package census

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"avoidcert/pattern"
	"avoidcert/prove"
)

// refineValues are made-up growth rates for the length-4 classes (1342
// and 1432 have equal counts: OEIS A117156 %C), away from the boundaries
// of decimal digits: 1423 differs from the 1342 group in the 8th
// significant digit, so the census's 5 digits do not order them and a few
// more do; 2413 and 2143 differ in the 18th, beyond the cap of 12.
var refineValues = map[string]string{
	"1234": "0.9142857142857",
	"1243": "0.1428571428571",
	"1324": "0.5428571428571",
	"1342": "0.3571428571428",
	"1432": "0.3571428571428",
	"1423": "0.3571428694853",
	"2143": "0.7142857142857142857142857",
	"2413": "0.7142857142857142877142857",
}

func refineOptions(dir string, f *fakeCertifier) Options {
	f.value = refineValues
	opts := options(dir, 4, f)
	opts.Params.RefineDigits = 12
	return opts
}

// groupsOf returns the classes of each group, by id.
func groupsOf(rep *Report) [][]string {
	var out [][]string
	for _, g := range rep.Groups {
		out = append(out, g.Classes)
	}
	return out
}

// The order of the groups is refined where neighbours overlap: 1423 is
// separated from the 1342 group by a few more digits, 2413 and 2143 stay
// unresolved at the cap and are named; classes whose groups were ordered
// at the census's digits are never bracketed again; only the last
// refinement of each class is kept.
func TestRefineOrdersOverlappingGroups(t *testing.T) {
	dir := t.TempDir()
	f := &fakeCertifier{}
	rep, err := Run(context.Background(), refineOptions(dir, f))
	if err != nil {
		t.Fatal(err)
	}
	wantGroups := [][]string{{"1234"}, {"2413"}, {"2143"}, {"1324"}, {"1423"}, {"1342", "1432"}, {"1243"}}
	if got := groupsOf(rep); !slices.EqualFunc(got, wantGroups, slices.Equal) {
		t.Fatalf("groups %v, want %v (numbered by rank)", got, wantGroups)
	}
	var relations []string
	for _, s := range rep.GroupOrder {
		relations = append(relations, s.Relation)
	}
	want := []string{">", "unresolved", ">", ">", ">", ">"}
	if !slices.Equal(relations, want) {
		t.Errorf("group order %v, want %v", relations, want)
	}
	if s := rep.GroupOrder[1]; s.Digits < 12 {
		t.Errorf("2413 and 2143 left unresolved at %d digits, below the cap of 12", s.Digits)
	}
	if s := rep.GroupOrder[4]; s.Digits <= 5 || s.Digits > 12 {
		t.Errorf("1423 and the 1342 group ordered at %d digits, want between 6 and 12", s.Digits)
	}
	for _, c := range []string{"1234", "1243", "1324"} {
		if len(f.digits[c]) != 1 {
			t.Errorf("%s bracketed at %v digits; its neighbours were ordered at the census's digits", c, f.digits[c])
		}
	}
	for _, c := range []string{"2413", "2143"} {
		d := f.digits[c]
		if len(d) < 2 || d[len(d)-1] != 12 || !slices.IsSorted(d) {
			t.Errorf("%s bracketed at %v digits, want rising digits ending at the cap 12", c, d)
		}
	}
	entries, err := os.ReadDir(filepath.Join(dir, refinedDir))
	if err != nil {
		t.Fatal(err)
	}
	var files, named []string
	for _, e := range entries {
		files = append(files, refinedDir+"/"+e.Name())
	}
	for _, r := range rep.Rows {
		if r.Refined != nil {
			named = append(named, r.Refined.Certificate)
		}
	}
	slices.Sort(named)
	if !slices.Equal(files, named) || len(named) < 4 {
		t.Errorf("refined/ holds %v, the rows name %v: want the rows' own refinements only", files, named)
	}
	md, err := os.ReadFile(filepath.Join(dir, MarkdownFile))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(md), "- group 2 (2413) and group 3 (2143), ") || !strings.Contains(string(md), "5 of the 6 adjacent pairs of groups proved ordered") {
		t.Errorf("census.md does not name the unresolved pair:\n%s", md)
	}
	if _, err := Verify(context.Background(), dir, fakeCheck, 2); err != nil {
		t.Errorf("the refined census does not verify: %v", err)
	}
}

// A run that fails while refining continues on the next run from the
// refined certificates in the folder (none is made again), and ends with
// the bytes of a run that never failed.
func TestRefineResumes(t *testing.T) {
	whole := t.TempDir()
	if _, err := Run(context.Background(), refineOptions(whole, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	first := &fakeCertifier{failAt: map[string]int{"2413": 12}}
	if _, err := Run(context.Background(), refineOptions(dir, first)); err == nil || !strings.Contains(err.Error(), "class 2413: refining to 12 digits") {
		t.Fatalf("error %v, want the failure of 2413 at 12 digits", err)
	}
	second := &fakeCertifier{}
	if _, err := Run(context.Background(), refineOptions(dir, second)); err != nil {
		t.Fatal(err)
	}
	for c, ds := range second.digits {
		for _, d := range ds {
			if d != 5 && slices.Contains(first.digits[c], d) && !(c == "2413" && d == 12) {
				t.Errorf("%s was bracketed again at %d digits after it was written", c, d)
			}
		}
	}
	sameTree(t, whole, dir)
}

// The merge of shards refines as an unsharded run does and writes the
// same bytes.
func TestMergeRefinesAsTheWhole(t *testing.T) {
	whole := t.TempDir()
	if _, err := Run(context.Background(), refineOptions(whole, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	var dirs []string
	for i := 1; i <= 3; i++ {
		dir := t.TempDir()
		opts := refineOptions(dir, &fakeCertifier{})
		opts.Shard = Shard{Index: i, Of: 3}
		rep, err := Run(context.Background(), opts)
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range rep.Rows {
			if r.Refined != nil {
				t.Errorf("shard %d refined %s: only the merge sees every group", i, r.Representative)
			}
		}
		dirs = append(dirs, dir)
	}
	out := t.TempDir()
	f := &fakeCertifier{value: refineValues}
	if _, err := Merge(context.Background(), mergeOptions(out, dirs, f)); err != nil {
		t.Fatal(err)
	}
	sameTree(t, whole, out)
}

// A refinement is verified as a row is: its ranges against its own
// checked certificate, its file against its SHA-256, its name against
// the class.
func TestVerifyRefusesForgedRefinement(t *testing.T) {
	honest := t.TempDir()
	if _, err := Run(context.Background(), refineOptions(honest, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name   string
		change func(t *testing.T, dir string)
		want   string
	}{
		{"refined lambda", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1423").Refined.Lambda.Lo = "0.36" })
		}, "class 1423: refined.lambda.lo: \"0.36\", but its checked certificate states"},
		{"another class's refinement", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) {
				r, other := rowOf(t, rep, "1423"), rowOf(t, rep, "1342")
				r.Refined = other.Refined
			})
		}, "class 1423: refined.certificate: \"refined/1342-"},
		{"changed refinement", func(t *testing.T, dir string) {
			rep, err := ReadReport(context.Background(), dir)
			if err != nil {
				t.Fatal(err)
			}
			path := filepath.Join(dir, rowOf(t, rep, "1423").Refined.Certificate)
			if err := os.WriteFile(path, []byte("changed\n"), 0o644); err != nil {
				t.Fatal(err)
			}
		}, "class 1423: refined.certificate_sha256"},
		{"refinement dropped", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1423").Refined = nil })
		}, "rows: rank"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			if err := os.CopyFS(dir, os.DirFS(honest)); err != nil {
				t.Fatal(err)
			}
			tc.change(t, dir)
			_, err := Verify(context.Background(), dir, fakeCheck, 2)
			var refused *RefusedError
			if !errors.As(err, &refused) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %v, want a refusal containing %q", err, tc.want)
			}
		})
	}
}

func TestNextDigits(t *testing.T) {
	r := func(lo, hi string) Range { return Range{Lo: lo, Hi: hi} }
	for _, c := range []struct {
		have         int
		a, b         Range
		floor, limit int
		want         int
	}{
		// midpoints 1e-5 apart at lambda 0.3: ceil(log10(4 * 0.3 / 1e-5)) + 1 = 7
		{5, r("0.29999", "0.30001"), r("0.29998", "0.30000"), 5, 30, 7},
		// 1e-7 apart: ceil(log10(1.2e7)) + 1 = 9
		{5, r("0.3", "0.3000002"), r("0.2999999", "0.3000001"), 5, 30, 9},
		// equal midpoints: twice the digits, within the cap
		{5, r("0.2", "0.4"), r("0.1", "0.5"), 5, 30, 10},
		{5, r("0.2", "0.4"), r("0.1", "0.5"), 5, 7, 7},
		// ranges that share no digit (ends on either side of a digit's
		// boundary) start from the census's digits
		{0, r("0.2", "0.4"), r("0.1", "0.5"), 5, 30, 10},
		// a wide gap still asks for one more digit
		{5, r("0.5", "0.9"), r("0.1", "0.6"), 5, 30, 6},
	} {
		if got := nextDigits(c.have, c.a, c.b, c.floor, c.limit); got != c.want {
			t.Errorf("nextDigits(%d, %v, %v, %d, %d) = %d, want %d", c.have, c.a, c.b, c.floor, c.limit, got, c.want)
		}
	}
}

// A class whose refinement the budget refuses keeps its ranges; the census
// finishes, and its pair stays unresolved and named.
func TestRefineBudgetLeavesThePairUnresolved(t *testing.T) {
	dir := t.TempDir()
	f := &fakeCertifier{}
	opts := refineOptions(dir, f)
	certify := opts.Certify
	opts.Certify = func(ctx context.Context, set pattern.Set, digits int) (Certified, error) {
		if set.String() == "1423" && digits > 5 {
			return Certified{}, fmt.Errorf("%w: made up", prove.ErrBudget)
		}
		return certify(ctx, set, digits)
	}
	rep, err := Run(context.Background(), opts)
	if err != nil {
		t.Fatal(err)
	}
	if s := rep.GroupOrder[4]; s.Relation != "unresolved" || rowOf(t, rep, "1423").Refined != nil {
		t.Errorf("1423 refused a refinement, yet its step is %+v and its row %+v", s, rowOf(t, rep, "1423").Refined)
	}
	if _, err := Verify(context.Background(), dir, fakeCheck, 2); err != nil {
		t.Error(err)
	}
}
