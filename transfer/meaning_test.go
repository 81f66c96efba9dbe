package transfer_test

import (
	"fmt"
	"math/rand/v2"
	"runtime"
	"slices"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/internal/settest"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// prefixKeys lists the proper prefixes of the set's members, standardised
// by the test's own code (brute's pattern test, not pattern.Standardize).
func prefixKeys(s pattern.Set) map[string]bool {
	keys := map[string]bool{"": true}
	for _, m := range s.Patterns() {
		for l := 1; l < len(m); l++ {
			keys[fmt.Sprint(rankOrder(m[:l]))] = true
		}
	}
	return keys
}

// rankOrder returns the pattern of a sequence: entry i becomes 1 + the
// number of entries smaller than it.
func rankOrder(seq []int) []int {
	out := make([]int, len(seq))
	for i, x := range seq {
		out[i] = 1
		for _, y := range seq {
			if y < x {
				out[i]++
			}
		}
	}
	return out
}

// stateOf returns, per the contract, the pattern of the longest suffix of
// x whose pattern is a prefix pattern, and the gaps of the other values
// between that suffix's values.
func stateOf(x []int, keys map[string]bool) (string, []int) {
	for l := len(x); l >= 0; l-- {
		suf := x[len(x)-l:]
		if l > 0 && !keys[fmt.Sprint(rankOrder(suf))] {
			continue
		}
		if l == 0 && !keys[""] {
			continue
		}
		gaps := make([]int, l+1)
		for _, v := range x[:len(x)-l] {
			below := 0
			for _, y := range suf {
				if y < v {
					below++
				}
			}
			gaps[below]++
		}
		if l == 0 {
			return "", gaps
		}
		return fmt.Sprint(rankOrder(suf)), gaps
	}
	panic("unreachable")
}

// enumerated counts, by enumeration, the avoiding permutations of 1..n by
// state and gaps; keep filters them further (nil keeps all).
func enumerated(s pattern.Set, n int, keep func(x []int) bool) map[string]int64 {
	keys := prefixKeys(s)
	out := map[string]int64{}
	brute.Permutations(n, func(x []int) {
		if !brute.Avoids(x, s.Patterns()) || (keep != nil && !keep(x)) {
			return
		}
		st, gaps := stateOf(x, keys)
		out[fmt.Sprint(st, gaps)]++
	})
	return out
}

// compare checks every coefficient of g against the enumerated counts.
func compare(t *testing.T, what string, g *transfer.Iterate, want map[string]int64) {
	t.Helper()
	st := g.States()
	seen := int64(0)
	for p := range st.Len() {
		L := st.Length(p)
		if L > g.N {
			continue
		}
		key := ""
		if L > 0 {
			key = fmt.Sprint([]int(st.Perm(p)))
		}
		a := make([]int, L+1)
		var walk func(i, rest int)
		walk = func(i, rest int) {
			if i == L {
				a[i] = rest
				w := want[fmt.Sprint(key, a)]
				seen += w
				if got := g.At(p, a); !got.IsInt64() || got.Int64() != w {
					t.Fatalf("%s: G_%d[%s][%v] = %v, enumeration counts %d", what, g.N, st.String(p), a, got, w)
				}
				return
			}
			for v := 0; v <= rest; v++ {
				a[i] = v
				walk(i+1, rest-v)
			}
		}
		walk(0, g.N-L)
	}
	var total int64
	for _, w := range want {
		total += w
	}
	if seen != total {
		t.Fatalf("%s: enumeration found states outside the prefix states (%d of %d counted)", what, seen, total)
	}
}

// G_n[p][a] is the number of avoiding permutations of length n in state p
// with gaps a (docs/prefix-states.md), checked by enumeration for random
// mixed-length sets (lengths 2..6) at n = 0..8.
func TestIterateCountsStatesAndGaps(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 1))
	sets := []pattern.Set{settest.Must(t, "1342"), settest.Must(t, "123,321"), settest.Must(t, "21,1432")}
	for range 12 {
		sets = append(sets, settest.Random(rng, 4, 6))
	}
	for _, s := range sets {
		st := transfer.NewStates(s)
		for n := 0; n <= 8; n++ {
			compare(t, s.String(), iterate(t, transfer.Whole(st), n), enumerated(s, n, nil))
		}
	}
}

// A restricted system started from the whole iterate counts the avoiding
// permutations whose states at every length from n_s on lie in the
// system (checked by enumeration): the moves it keeps are exactly those.
func TestRestrictedWholeStartCountsPathsInside(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 2))
	for range 10 {
		s := settest.Random(rng, 3, 5)
		st := transfer.NewStates(s)
		if st.Len() < 2 {
			continue
		}
		members := []int{}
		for p := range st.Len() {
			if rng.IntN(3) > 0 {
				members = append(members, p)
			}
		}
		if len(members) == 0 || len(members) == st.Len() {
			continue
		}
		sys, err := st.Restrict(members, transfer.StartWhole)
		if err != nil {
			t.Fatal(err)
		}
		keys := prefixKeys(s)
		inside := map[string]bool{}
		for _, p := range members {
			key := ""
			if st.Length(p) > 0 {
				key = fmt.Sprint([]int(st.Perm(p)))
			}
			inside[key] = true
		}
		ns := sys.StartN()
		for n := ns; n <= 8; n++ {
			keep := func(x []int) bool {
				for m := ns; m <= len(x); m++ {
					std := rankOrder(x[:m])
					if !brute.Avoids(std, s.Patterns()) {
						return false
					}
					key, _ := stateOf(std, keys)
					if !inside[key] {
						return false
					}
				}
				return true
			}
			compare(t, fmt.Sprint(s, " on ", members), iterate(t, sys, n), enumerated(s, n, keep))
		}
	}
}

// The ones start puts 1 on every coefficient of the system's states at
// n_s, and 0 elsewhere.
func TestRestrictedOnesStart(t *testing.T) {
	s := settest.Must(t, "1342")
	st := transfer.NewStates(s)
	sys, err := st.Restrict([]int{2, 3}, transfer.StartOnes) // states 12 and 123
	if err != nil {
		t.Fatal(err)
	}
	g := iterate(t, sys, sys.StartN())
	if g.N != 3 {
		t.Fatalf("n_s = %d, want 3 (the longest member, 123)", g.N)
	}
	// compositions of 1 into 3 parts (state 12) and of 0 into 4 (state 123)
	if g.Count(2) != 3 || g.Count(3) != 1 || g.Count(0) != 0 || g.Count(1) != 0 {
		t.Fatalf("coefficient counts %d %d %d %d, want 0 0 3 1", g.Count(0), g.Count(1), g.Count(2), g.Count(3))
	}
	if g.Sum().Int64() != 4 {
		t.Fatalf("sum %v, want 4", g.Sum())
	}
	if _, err := st.Restrict([]int{1}, transfer.StartEmpty); err == nil {
		t.Fatal("a proper subset with start empty was accepted")
	}
}

// The state set and order of docs/prefix-states.md, "Small cases".
func TestStatesSmallCases(t *testing.T) {
	for _, tc := range []struct {
		set  string
		want []string
	}{
		{"12", []string{"()", "1"}},
		{"1", []string{"()"}},
		{"1342", []string{"()", "1", "12", "123"}},
		{"132,213", []string{"()", "1", "12", "21"}},
	} {
		st := transfer.NewStates(settest.Must(t, tc.set))
		var got []string
		for p := range st.Len() {
			got = append(got, st.String(p))
		}
		if !slices.Equal(got, tc.want) {
			t.Errorf("{%s}: states %v, want %v", tc.set, got, tc.want)
		}
	}
}

// {1342}: 1 + C(n,1) + C(n,2) + C(n,3) coefficients at n >= 3, 7176 at
// n = 35 (docs/prefix-states.md, "Small cases").
func TestCoefficientCount1342(t *testing.T) {
	g := iterate(t, transfer.Whole(transfer.NewStates(settest.Must(t, "1342"))), 35)
	total := 0
	for p := range 4 {
		total += g.Count(p)
	}
	if total != 7176 {
		t.Fatalf("%d coefficients at n = 35, want 7176", total)
	}
}

// The digest of {12} at n = 2, byte stream written out by hand: the only
// avoider is 21, in state 1 with gaps (0, 1).
func TestDigestHandComputed(t *testing.T) {
	g := iterate(t, transfer.Whole(transfer.NewStates(settest.Must(t, "12"))), 2)
	stream := []byte("avoidcert-iterate-v3\n")
	stream = append(stream,
		0x02,       // two states
		0x02,       // n = 2
		0x00,       // state (), gaps (2): 0
		0x01, 0x01, // state 1, gaps (0, 1): 1
		0x00, // state 1, gaps (1, 0): 0
	)
	if got, want := g.Digest(), sha256Of(stream); got != want {
		t.Fatalf("digest %x, want %x", got, want)
	}
}

// Counts and iterates do not depend on GOMAXPROCS (1 and 2).
func TestDeterministicUnderGOMAXPROCS(t *testing.T) {
	s := settest.Must(t, "13452,2143")
	sys := transfer.Whole(transfer.NewStates(s))
	var digests [][32]byte
	for _, procs := range []int{1, 2} {
		old := runtime.GOMAXPROCS(procs)
		digests = append(digests, iterate(t, sys, 24).Digest())
		runtime.GOMAXPROCS(old)
	}
	if digests[0] != digests[1] {
		t.Fatalf("digests differ: %x with GOMAXPROCS 1, %x with 2", digests[0], digests[1])
	}
}
