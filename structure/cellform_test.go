package structure

import (
	"bufio"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"avoidcert/pattern"
)

// The prefix-state test against the verdicts of the cell-form test it
// replaced (testdata/cellform-verdicts.txt, frozen from the cell-form code
// before it was removed; its header says how). Where both decide, they
// agree on primitive / not primitive, except where the cell form saw a
// transient start cell: lumping order cells into prefix states can only
// help (method note, section 9), so every disagreement must be a set the
// cell form called not primitive because of a start cell on no cycle or
// not reaching the others, and the prefix-state test primitive. Finite
// and subexponential (lambda = 0) are properties of the set, not of the
// state space, so both tests must agree on them exactly.
func TestAgreesWithFrozenCellForm(t *testing.T) {
	f, err := os.Open(filepath.Join("testdata", "cellform-verdicts.txt"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	sets, agree, transient := 0, 0, 0
	for line := 1; sc.Scan(); line++ {
		text := sc.Text()
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		fields := strings.Split(text, "\t")
		if len(fields) != 4 {
			t.Fatalf("cellform-verdicts.txt:%d: %d fields, want 4", line, len(fields))
		}
		s, err := pattern.ParseSet([]string{fields[0]})
		if err != nil {
			t.Fatalf("cellform-verdicts.txt:%d: %v", line, err)
		}
		cellClass := Class(fields[1])
		cellExponent, err := strconv.Atoi(fields[2])
		if err != nil {
			t.Fatalf("cellform-verdicts.txt:%d: %v", line, err)
		}
		cellTransient := strings.HasPrefix(fields[3], "transient ")
		rep := analyze(t, s, Options{})
		sets++
		if rep.Class == Undecided {
			t.Errorf("{%v}: undecided on prefix states: %v", s, rep.Explanation)
			continue
		}
		if (cellClass == Finite) != (rep.Class == Finite) || (cellClass == Subexponential) != (rep.Class == Subexponential) {
			t.Errorf("{%v}: cell form %s, prefix states %s: they must agree on finite and on lambda = 0", s, cellClass, rep.Class)
		}
		if cellClass == Undecided {
			continue
		}
		switch cellPrimitive, primitive := cellClass == Primitive, rep.Class == Primitive; {
		case cellPrimitive == primitive:
			agree++
		case cellPrimitive:
			t.Errorf("{%v}: primitive with exponent %d on order cells, %s on prefix states", s, cellExponent, rep.Class)
		case !cellTransient:
			t.Errorf("{%v}: %s on order cells with every start cell joined, but primitive on prefix states", s, cellClass)
		default:
			transient++
			t.Logf("{%v}: %s on order cells (%s), primitive with exponent %d on prefix states (recurrent %s, transient %s)",
				s, cellClass, fields[3], rep.Exponent, rep.stateList(rep.Recurrent), rep.stateList(rep.Transient))
		}
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	t.Logf("%d sets: %d agree on primitive / not primitive, %d primitive only on prefix states (transient start cells)", sets, agree, transient)
	if sets < 300 || transient == 0 {
		t.Errorf("%d sets and %d transient-cell cases: the frozen table is not what this test needs", sets, transient)
	}
}
