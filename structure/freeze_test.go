package structure

import (
	"context"
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"avoidcert/pattern"
)

var freeze = flag.Bool("freeze", false, "write testdata/cellform-verdicts.txt from the cell-form structure pass")

// TestFreezeCellVerdicts records the verdicts of the cell-form structure
// pass on random sets of lengths 3 to 5, so that the prefix-state test can
// be compared with them after the cell form is gone. It writes only with
// -freeze.
func TestFreezeCellVerdicts(t *testing.T) {
	if !*freeze {
		t.Skip("writes the frozen table only with -freeze")
	}
	rng := rand.New(rand.NewPCG(14, 2024))
	var sets []pattern.Set
	seen := map[string]bool{}
	add := func(s pattern.Set) {
		if !seen[s.String()] {
			seen[s.String()] = true
			sets = append(sets, s)
		}
	}
	// Sets named in docs/prefix-states.md first, then single length: 100 sets each of lengths 3, 4 and 5, one to four
	// patterns; mixed lengths: 200 sets of two to seven patterns of
	// lengths 3 to 5.
	for _, arg := range []string{"123,321", "1423,2413,3412,4123,4312", "132,1234,3421,4321", "1324", "12", "12,21"} {
		s, err := pattern.ParseSet([]string{arg})
		if err != nil {
			t.Fatal(err)
		}
		add(s)
	}
	for _, k := range []int{3, 4, 5} {
		for range 100 {
			var ps []pattern.Perm
			for range 1 + rng.IntN(4) {
				ps = append(ps, randomPerm(rng, k))
			}
			add(pattern.NewSet(ps...))
		}
	}
	for range 200 {
		var ps []pattern.Perm
		for range 2 + rng.IntN(6) {
			ps = append(ps, randomPerm(rng, 3+rng.IntN(3)))
		}
		add(pattern.NewSet(ps...))
	}
	var b strings.Builder
	b.WriteString(`# Verdicts of the cell-form structure pass (order cells and joint patterns
# over S_2m, structure/analyze.go as of commit 6d90aeb), frozen before that
# code was removed. Made by: go test ./structure/ -run TestFreezeCellVerdicts -freeze
# (structure/freeze_test.go in the commit that added this file): six sets
# named in docs/prefix-states.md first, then random sets from
# math/rand/v2 PCG(14, 2024): 100 single-length sets each of lengths 3, 4
# and 5 (one to four patterns) and 200 mixed sets (two to seven patterns of
# lengths 3 to 5), duplicates (after the set drops redundant members) kept once.
#
# Columns: set, class, exponent (primitive only, else 0), and the start cells
# of the window digraph: "joined" when every start cell reaches every start
# cell by one or more windows, else "transient FROM>TO", the least pair of
# start cells (pattern.Rank order) with no walk from FROM to TO (TO = FROM:
# FROM lies on no cycle).
`)
	for _, s := range sets {
		rep, err := Analyze(context.Background(), s, Options{})
		if err != nil {
			t.Fatal(err)
		}
		cells := "joined"
		if from, to, ok := rep.Digraph.Unreachable(); ok {
			cells = fmt.Sprintf("transient %v>%v", cellPerm(rep.M, from), cellPerm(rep.M, to))
		}
		fmt.Fprintf(&b, "%s\t%s\t%d\t%s\n", s, rep.Class, rep.Exponent, cells)
	}
	if err := os.WriteFile(filepath.Join("testdata", "cellform-verdicts.txt"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

func randomPerm(rng *rand.Rand, k int) pattern.Perm {
	p := make(pattern.Perm, k)
	for i, v := range rng.Perm(k) {
		p[i] = v + 1
	}
	return p
}
