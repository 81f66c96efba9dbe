package structure

import (
	"context"
	"maps"
	"math/rand/v2"
	"slices"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/internal/settest"
	"avoidcert/pattern"
	"avoidcert/transfer"
)

// bruteSets are the small sets whose R_k are compared with enumeration:
// the cases of docs/prefix-states.md and random sets of mixed lengths.
func bruteSets(t *testing.T) []pattern.Set {
	sets := settest.List(t, "123", "132", "1342", "1324", "1234", "123,321", "12", "132,231",
		"123,231,312,321", "132,213,231,312", "1423,2413,3412,4123,4312", "132,1234,3421,4321", "21,1234",
		"321,1234,2143,3142,3241,4132,4231")
	rng := rand.New(rand.NewPCG(9, 14))
	for range 40 {
		sets = append(sets, settest.Random(rng, 4, 4))
	}
	return sets
}

// The recurrent states and R_0 .. R_5 (docs/prefix-states.md, "Joint
// configurations") against enumeration of the permutations themselves:
// for each recurrent s and each avoiding sequence x t_1 .. t_k whose
// states stay recurrent, its configuration. Beyond the last set the run
// computed, R_k is read from the recurring part (R_e = D, or the joint
// cycle), so the comparison also checks that the sequence does recur.
func TestConfigurationsAgainstEnumeration(t *testing.T) {
	const maxK = 5
	for _, s := range bruteSets(t) {
		b := newBruteSystem(s)
		d := newStateDigraph(transfer.NewStates(s))
		var recurrent []string
		for _, p := range marked(d.recurrent) {
			recurrent = append(recurrent, d.st.Perm(p).String())
		}
		if want := slices.Sorted(maps.Keys(b.recurrent)); !slices.Equal(sortedCopy(recurrent), want) {
			t.Fatalf("{%v}: recurrent states %q, by enumeration %q", s, recurrent, want)
		}
		if len(recurrent) == 0 {
			continue
		}
		sp := newSpace(d)
		ru, err := runJoint(context.Background(), sp, MaxSteps, false, Cost{}, 1<<62)
		if err != nil {
			t.Fatal(err)
		}
		if !ru.recurs() {
			t.Fatalf("{%v}: the sequence did not recur within %d steps", s, MaxSteps)
		}
		for k := 0; k <= maxK; k++ {
			got := map[string]bool{}
			each(ru.at(k), func(r int) { got[sp.describe(r)] = true })
			want := b.configurations(k)
			if !maps.Equal(got, want) {
				t.Errorf("{%v}: R_%d has %d configurations, enumeration %d: only in R_%d %v; only enumerated %v",
					s, k, len(got), len(want), k, onlyIn(got, want), onlyIn(want, got))
			}
		}
	}
}

func sortedCopy(xs []string) []string {
	out := slices.Clone(xs)
	slices.Sort(out)
	return out
}

func onlyIn(a, b map[string]bool) []string {
	var out []string
	for x := range a {
		if !b[x] {
			out = append(out, x)
		}
	}
	slices.Sort(out)
	return out[:min(len(out), 5)]
}

// The domain D is every interleaving of every ordered pair of recurrent
// states, counted here by binomials: C(|s|+|c|, |s|) per pair.
func TestDomainSize(t *testing.T) {
	for _, s := range bruteSets(t) {
		rep := analyze(t, s, Options{})
		want := 0
		for _, p := range rep.Recurrent {
			for _, q := range rep.Recurrent {
				a, b := rep.States.Length(p), rep.States.Length(q)
				want += binomial(a+b, a)
			}
		}
		if rep.Configurations != want {
			t.Errorf("{%v}: |D| = %d, want %d", s, rep.Configurations, want)
		}
	}
}

func binomial(n, k int) int {
	c := 1
	for i := 1; i <= k; i++ {
		c = c * (n - k + i) / i
	}
	return c
}

// lambda > 0 exactly when a cyclic avoider exists (method note, 5b):
// against a brute-force search over every permutation of length w..8 on
// random sets of lengths 2 to 4. A set with lambda = 0 must have none; a
// set with a cyclic avoider of length <= 8 must have lambda > 0; every
// reported avoider is checked here on its own.
func TestLambdaAgainstCyclicSearch(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 14))
	positive, zero := 0, 0
	for range 120 {
		s := pattern.NewSet(brute.RandomPatterns[pattern.Perm](rng, 5, 2, 4)...)
		rep := analyze(t, s, Options{})
		found := 0
		for L := max(s.Window(), 1); L <= 8 && found == 0; L++ {
			if cyclicAvoiders(s, L) > 0 {
				found = L
			}
		}
		switch rep.Lambda {
		case LambdaPositive:
			positive++
			if !isCyclicAvoider(s, rep.CyclicAvoider) {
				t.Errorf("{%v}: %v is not a cyclic avoider", s, rep.CyclicAvoider)
			}
		case LambdaZero:
			zero++
			if found > 0 {
				t.Errorf("{%v}: lambda = 0 stated, but a cyclic avoider of length %d exists", s, found)
			}
		default:
			t.Errorf("{%v}: lambda undecided", s)
		}
		if found > 0 && rep.Lambda != LambdaPositive {
			t.Errorf("{%v}: a cyclic avoider of length %d exists, lambda %s", s, found, rep.Lambda)
		}
	}
	t.Logf("%d sets with lambda > 0, %d with lambda = 0", positive, zero)
	if positive == 0 || zero == 0 {
		t.Errorf("the random sets do not test both cases: %d positive, %d zero", positive, zero)
	}
}

// The brute-force count of cyclic avoiders that the test above relies on,
// against a brute-force run recorded in the method note, section 5b:
// {123}: 3, 12, 45, 234, 1323 for L = 3..7; {123, 321}: 0, 8, 0, 96, 0,
// 2176 for L = 3..8 (only even lengths: period 2).
func TestCyclicAvoiderCounts(t *testing.T) {
	for _, tc := range []struct {
		set  string
		from int
		want []int
	}{
		{"123", 3, []int{3, 12, 45, 234, 1323}},
		{"123,321", 3, []int{0, 8, 0, 96, 0, 2176}},
	} {
		s, _ := pattern.ParseSet([]string{tc.set})
		for i, want := range tc.want {
			if got := cyclicAvoiders(s, tc.from+i); got != want {
				t.Errorf("{%s}: %d cyclic avoiders of length %d, method note 5b has %d", tc.set, got, tc.from+i, want)
			}
		}
	}
}

// Witnesses: each is an avoiding permutation of length |s| + e whose
// first |s| entries have the pattern s, whose states after each move are
// recurrent, and whose configuration (by enumeration's reading) is the
// one it stands for; one for every configuration of D.
func TestWitnesses(t *testing.T) {
	for _, arg := range []string{"123", "132", "1342", "1423,2413,3412,4123,4312", "132,1234,3421,4321", "12453"} {
		s, _ := pattern.ParseSet([]string{arg})
		rep := analyze(t, s, Options{Witnesses: true})
		if rep.Class != Primitive || rep.Witnesses == nil {
			t.Fatalf("{%s}: class %s, witnesses %v", arg, rep.Class, rep.Witnesses)
		}
		b := newBruteSystem(s)
		seen := map[string]bool{}
		rep.Witnesses.Each(func(w Witness) bool {
			p, ls := w.Permutation, rep.States.Length(w.Start)
			if len(p) != ls+rep.Exponent || !isPerm(p) || !brute.Avoids(p, members(s)) {
				t.Fatalf("{%s}: witness %v of %s is not an avoiding permutation of length %d", arg, p, w.Configuration, ls+rep.Exponent)
			}
			if pattern.Standardize(p[:ls]).String() != rep.States.Perm(w.Start).String() {
				t.Fatalf("{%s}: witness %v does not start in state %s", arg, p, StateName(rep.States, w.Start))
			}
			for n := ls + 1; n <= len(p); n++ {
				if !b.recurrent[b.stateOf(p[:n]).String()] {
					t.Fatalf("{%s}: witness %v leaves the recurrent states after %d entries", arg, p, n)
				}
			}
			c := b.stateOf(p)
			if c.String() != rep.States.Perm(w.Current).String() {
				t.Fatalf("{%s}: witness %v ends in state %v, not %s", arg, p, c, StateName(rep.States, w.Current))
			}
			if got := configString(p, ls, len(p)-len(c)); got != w.Configuration {
				t.Fatalf("{%s}: witness %v realises %s, not %s", arg, p, got, w.Configuration)
			}
			seen[w.Configuration] = true
			return true
		})
		if len(seen) != rep.Configurations || rep.Witnesses.Count() != rep.Configurations {
			t.Errorf("{%s}: %d distinct witnesses (count %d) for |D| = %d", arg, len(seen), rep.Witnesses.Count(), rep.Configurations)
		}
	}
}
