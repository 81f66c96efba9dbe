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

	"avoidcert/certify"
	"avoidcert/prove"
)

// tamper rewrites the tables of the census in dir after change has edited
// its report, as a hand (or a forger) would.
func tamper(t *testing.T, dir string, change func(rep *Report)) {
	t.Helper()
	rep, err := ReadReport(context.Background(), dir)
	if err != nil {
		t.Fatal(err)
	}
	change(rep)
	if err := writeOutputs(dir, rep); err != nil {
		t.Fatal(err)
	}
}

// rowOf returns the row of a class.
func rowOf(t *testing.T, rep *Report, class string) *Row {
	t.Helper()
	i := slices.IndexFunc(rep.Rows, func(r Row) bool { return r.Representative == class })
	if i < 0 {
		t.Fatalf("no row %s", class)
	}
	return &rep.Rows[i]
}

// wholeCensus makes an honest census of length 4 (stand-in certificates)
// in a fresh folder.
func wholeCensus(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	if _, err := Run(context.Background(), options(dir, 4, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	return dir
}

// A census file is untrusted: every certified field, count, path and
// table of a row is compared with the row's own checked certificate, the
// checker's own counts and what the checked rows give. Each forgery below
// is refused with the row and the field named.
func TestVerifyRefusesForgedCensus(t *testing.T) {
	outside, honest := t.TempDir(), wholeCensus(t)
	for _, tc := range []struct {
		name   string
		change func(t *testing.T, dir string)
		want   string
	}{
		{"forged lambda", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1342").Lambda = Range{Lo: "0.5", Hi: "0.6"} })
		}, "class 1342: lambda.lo: \"0.5\", but its checked certificate states \"0.5013416\""},
		{"forged radius", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1234").Radius.Hi = "2" })
		}, "class 1234: radius.hi"},
		{"forged class", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1342").Class = "periodic" })
		}, "class 1342: structure_class"},
		{"forged form", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1342").Form = "anything" })
		}, "class 1342: asymptotic_form"},
		{"forged count", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1342").Counts[9] = "1" })
		}, "class 1342: counts (a_9): \"1\", but the checker counts"},
		{"another class's certificate, its true SHA-256", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) {
				r, other := rowOf(t, rep, "1342"), rowOf(t, rep, "1234")
				r.Certificate, r.CertificateSHA256 = other.Certificate, other.CertificateSHA256
			})
		}, "class 1342: certificate: \"certificates/1234.json\" is not the class's certificate"},
		{"another class's certificate in the class's file", func(t *testing.T, dir string) {
			data, err := os.ReadFile(filepath.Join(dir, "certificates", "1234.json"))
			if err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(filepath.Join(dir, "certificates", "1342.json"), data, 0o644); err != nil {
				t.Fatal(err)
			}
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1342").CertificateSHA256 = rowOf(t, rep, "1234").CertificateSHA256 })
		}, "class 1342: certificate: the checker refuses"},
		{"changed certificate", func(t *testing.T, dir string) {
			if err := os.WriteFile(filepath.Join(dir, "certificates", "1243.json"), []byte("changed\n"), 0o644); err != nil {
				t.Fatal(err)
			}
		}, "class 1243: certificate_sha256"},
		{"a path up and out", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1342").Certificate = "../../../../etc/passwd" })
		}, "class 1342: certificate: the path \"../../../../etc/passwd\", which leads out of the census folder"},
		{"an absolute path", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rowOf(t, rep, "1342").Certificate = "/etc/passwd" })
		}, "class 1342: certificate: the absolute path \"/etc/passwd\""},
		{"a link out", func(t *testing.T, dir string) {
			path := filepath.Join(dir, "certificates", "1342.json")
			moved := filepath.Join(outside, filepath.Base(dir)+"-1342.json")
			if err := os.Rename(path, moved); err != nil {
				t.Fatal(err)
			}
			if err := os.Symlink(moved, path); err != nil {
				t.Skip("no symbolic links here:", err)
			}
		}, "class 1342: certificate: the path \"certificates/1342.json\", where a symbolic link leads out of the census folder"},
		{"a folder of certificates linked out", func(t *testing.T, dir string) {
			moved := filepath.Join(outside, filepath.Base(dir)+"-certificates")
			if err := os.Rename(filepath.Join(dir, "certificates"), moved); err != nil {
				t.Fatal(err)
			}
			if err := os.Symlink(moved, filepath.Join(dir, "certificates")); err != nil {
				t.Skip("no symbolic links here:", err)
			}
		}, "where a symbolic link leads out of the census folder"},
		{"census.json linked out", func(t *testing.T, dir string) {
			moved := filepath.Join(outside, filepath.Base(dir)+"-census.json")
			if err := os.Rename(filepath.Join(dir, JSONFile), moved); err != nil {
				t.Fatal(err)
			}
			if err := os.Symlink(moved, filepath.Join(dir, JSONFile)); err != nil {
				t.Skip("no symbolic links here:", err)
			}
		}, "names the path \"census.json\", where a symbolic link leads out"},
		{"rows swapped", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rep.Rows[0], rep.Rows[1] = rep.Rows[1], rep.Rows[0] })
		}, "rows: rank 1 holds"},
		{"group moved", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rep.Rows[0].Group = 7 })
		}, ": group: 7, but its counts put it in group"},
		{"groups merged", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) {
				rep.Groups[0].Classes = append(rep.Groups[0].Classes, rep.Groups[1].Classes...)
				rep.Groups = slices.Delete(rep.Groups, 1, 2)
			})
		}, "groups: "},
		{"order stated otherwise", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) {
				if rep.Order[0].Relation == ">" {
					rep.Order[0].Relation = "unresolved"
				} else {
					rep.Order[0].Relation = ">"
				}
			})
		}, "order (step 1)"},
		{"group order stated otherwise", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rep.GroupOrder[0].Relation = "unresolved" })
		}, "group_order (step 1)"},
		{"group order digits", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rep.GroupOrder[0].Digits = 40 })
		}, "group_order (step 1)"},
		{"group range", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rep.Groups[1].Lambda.Hi = "0.99" })
		}, "groups: "},
		{"primitivity exponent", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { k := 9; rowOf(t, rep, "1342").Exponent = &k })
		}, "class 1342: primitivity_exponent: \"9\", but its checked certificate states \"4\""},
		{"class count", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rep.Classes = 9 })
		}, "classes: 9, but length 4 has 8"},
		{"a row that is no class", func(t *testing.T, dir string) {
			tamper(t, dir, func(rep *Report) { rep.Rows[0].Representative = "4321" })
		}, "a row names \"4321\", which is not a symmetry class"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			if err := os.CopyFS(dir, os.DirFS(honest)); err != nil {
				t.Fatal(err)
			}
			if _, err := Verify(context.Background(), dir, fakeCheck, 2); err != nil {
				t.Fatalf("the honest census is refused: %v", err)
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

// A forged shard (lambda and a count edited) is refused by the merge
// before anything is written.
func TestMergeRefusesForgedShard(t *testing.T) {
	for _, tc := range []struct {
		name   string
		change func(rep *Report)
		want   string
	}{
		{"lambda", func(rep *Report) { rep.Rows[0].Lambda.Hi = "0.9" }, ": lambda.hi: \"0.9\", but its checked certificate states"},
		{"count", func(rep *Report) { rep.Rows[0].Counts[9] = "1" }, ": counts (a_9): \"1\", but the checker counts"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dirs := shards(t, 4, 3)
			tamper(t, dirs[1], tc.change)
			out := filepath.Join(t.TempDir(), "merged")
			_, err := Merge(context.Background(), mergeOptions(out, dirs, &fakeCertifier{}))
			var refused *RefusedError
			if !errors.As(err, &refused) || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), dirs[1]) {
				t.Errorf("error %v, want a refusal naming %s and containing %q", err, dirs[1], tc.want)
			}
			if _, err := os.Stat(out); err == nil {
				t.Error("the refused merge wrote its output folder")
			}
		})
	}
}

// A journal is untrusted too: a record whose fields its certificate does
// not support is done again, and the run ends with the honest tables.
func TestResumeRedoesAForgedJournalRecord(t *testing.T) {
	whole := wholeCensus(t)
	dir := t.TempDir()
	if _, err := Run(context.Background(), options(dir, 4, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	record := filepath.Join(dir, journalDir, "1342.json")
	data, err := os.ReadFile(record)
	if err != nil {
		t.Fatal(err)
	}
	forged := strings.Replace(string(data), `"lo": "0.5013416"`, `"lo": "0.9"`, 1)
	if forged == string(data) {
		t.Fatal("the record has no lambda to forge")
	}
	if err := os.WriteFile(record, []byte(forged), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{JSONFile, CSVFile, MarkdownFile} {
		os.Remove(filepath.Join(dir, name))
	}
	again := &fakeCertifier{}
	if _, err := Run(context.Background(), options(dir, 4, again)); err != nil {
		t.Fatal(err)
	}
	if again.calls["1342"] != 1 || len(again.calls) != 1 {
		t.Errorf("calls %v, want the forged class 1342 alone done again", again.calls)
	}
	sameTree(t, whole, dir)
}

// A census writes only inside its folder: a journal or certificates
// folder that is a link leading out is refused before any work.
func TestRunRefusesALinkedOutFolder(t *testing.T) {
	dir, elsewhere := t.TempDir(), t.TempDir()
	if err := os.Symlink(elsewhere, filepath.Join(dir, certificateDir)); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	f := &fakeCertifier{}
	_, err := Run(context.Background(), options(dir, 3, f))
	var in *InputError
	if !errors.As(err, &in) || !strings.Contains(err.Error(), "symbolic link that leads out") || len(f.calls) > 0 {
		t.Errorf("error %v after %d classes, want a refusal before any work", err, len(f.calls))
	}
}

// A journal record that is a link leading out of the folder is never
// followed: the run stops with an input error naming it.
func TestRunRefusesAJournalRecordLinkedOut(t *testing.T) {
	dir := t.TempDir()
	if _, err := Run(context.Background(), options(dir, 3, &fakeCertifier{})); err != nil {
		t.Fatal(err)
	}
	record := filepath.Join(dir, journalDir, "123.json")
	moved := filepath.Join(t.TempDir(), "123.json")
	if err := os.Rename(record, moved); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(moved, record); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	_, err := Run(context.Background(), options(dir, 3, &fakeCertifier{}))
	var in *InputError
	if !errors.As(err, &in) || !strings.Contains(err.Error(), "symbolic link leads out of the census folder") {
		t.Errorf("error %v, want an input error naming the link", err)
	}
}

// A certificate over the checker's budget is not a refusal of its row: a
// larger budget would decide it.
func TestVerifyBudgetIsNoRefusal(t *testing.T) {
	dir := wholeCensus(t)
	overBudget := func(ctx context.Context, data []byte, typed []string) (*certify.Certificate, error) {
		return nil, fmt.Errorf("%w: made up", prove.ErrBudget)
	}
	_, err := Verify(context.Background(), dir, overBudget, 2)
	var refused *RefusedError
	if errors.As(err, &refused) || !errors.Is(err, prove.ErrBudget) {
		t.Errorf("error %v, want a budget error and no refusal", err)
	}
}
