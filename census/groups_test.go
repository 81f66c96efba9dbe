package census

import (
	"context"
	"testing"

	"avoidcert/pattern"
	"avoidcert/transfer"
)

// countRows returns one row per symmetry class of the length with its
// exact counts a_0..a_n from the engine.
func countRows(t *testing.T, length, n int) []Row {
	t.Helper()
	var rows []Row
	for _, c := range pattern.SymmetryClasses(length) {
		counts, err := transfer.Counts(context.Background(), pattern.NewSet(c.Representative), n, nil)
		if err != nil {
			t.Fatal(err)
		}
		// A range only for the groups' ranges: the number of groups does
		// not depend on it.
		row := Row{Representative: c.Representative.String(), Lambda: Range{Lo: "0", Hi: "1"}}
		for _, a := range counts {
			row.Counts = append(row.Counts, a.String())
		}
		rows = append(rows, row)
	}
	return rows
}

// The number of classes with distinct counts is the number of c-Wilf
// classes for lengths 3 to 6: 2, 7, 25, 92 (OEIS A262480, %C: "Up to 6,
// they are 1, 1, 2, 7, 25, 92"). Counts up to separatingN already give
// them all (found by this test: 4, 7, 12 and 15 for lengths 3 to 6); one n
// less gives fewer groups, so separatingN is the least such n.
var groupCases = []struct {
	length, classes, groups, separatingN int
}{
	// classes: OEIS A262480, the trivial (symmetry) classes: 2, 8, 32, 192
	{3, 2, 2, 4},
	{4, 8, 7, 7},
	{5, 32, 25, 12},
	{6, 192, 92, 15},
}

func TestCountGroupsMatchA262480(t *testing.T) {
	for _, c := range groupCases {
		checkGroups(t, c.length, c.classes, c.groups, c.separatingN)
	}
}

func checkGroups(t *testing.T, length, classes, groups, separatingN int) {
	t.Helper()
	rows := countRows(t, length, separatingN)
	if len(rows) != classes {
		t.Errorf("length %d: %d symmetry classes, OEIS A262480 has %d", length, len(rows), classes)
	}
	got, byN, sep := group(rows, separatingN)
	if len(got) != groups {
		t.Errorf("length %d: %d count groups up to n = %d, OEIS A262480 has %d c-Wilf classes", length, len(got), separatingN, groups)
	}
	if sep != separatingN || byN[separatingN-1] >= groups {
		t.Errorf("length %d: groups by n %v, separated at n = %d; want all %d first at n = %d", length, byN, sep, groups, separatingN)
	}
}
