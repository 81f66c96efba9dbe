package certify_test

import (
	"bytes"
	"errors"
	"slices"
	"testing"

	"avoidcert/certify"
	"avoidcert/internal/brute"
)

// The structure sections of these tests are written by hand or derived by
// the brute force of internal/brute (avoiders, their joint patterns, cyclic
// windows), never by the checker or the engine's structure pass; the
// engine's sections are checked in internal/conformance.

// jointCycle returns where the sets R_k of joint patterns (of the avoiders
// of length m+k, enumerated) first repeat: R_start = R_(start+length).
func jointCycle(t testing.TB, given []string, m int) (start, length int) {
	t.Helper()
	pats := parsePats(given)
	seen := map[string]int{}
	for k := m; m+k <= 10; k++ {
		set := map[int]bool{}
		brute.Permutations(m+k, func(q []int) {
			if brute.Avoids(q, pats) {
				set[lexRank(append(append([]int(nil), q[:m]...), q[len(q)-m:]...))] = true
			}
		})
		var members []int
		for r := range set {
			members = append(members, r)
		}
		slices.Sort(members)
		key := string(bytesOf(members))
		if j, ok := seen[key]; ok {
			return j, k - j
		}
		seen[key] = k
	}
	t.Fatalf("%v: no repetition of R_k up to length 10", given)
	return 0, 0
}

func bytesOf(xs []int) []byte {
	var b []byte
	for _, x := range xs {
		b = append(b, byte(x>>16), byte(x>>8), byte(x))
	}
	return b
}

// cyclicAvoider returns the least permutation (by length, then
// lexicographically) of length m+1..8 whose cyclic windows of length m+1
// all avoid the set, or nil.
func cyclicAvoider(given []string, m int) []int {
	pats := parsePats(given)
	for L := m + 1; L <= 8; L++ {
		var found []int
		brute.Permutations(L, func(q []int) {
			if found != nil {
				return
			}
			for i := range q {
				w := make([]int, m+1)
				for j := range w {
					w[j] = q[(i+j)%L]
				}
				if !brute.Avoids(w, pats) {
					return
				}
			}
			found = slices.Clone(q)
		})
		if found != nil {
			return found
		}
	}
	return nil
}

type structureCase struct {
	name    string
	given   []string
	specs   []spec
	section func(t testing.TB) *certify.Structure
}

func structureCases() []structureCase {
	return []structureCase{
		// the structure package's golden exponent of 123 and 1342 is 4 (the
		// checker recomputes R_m..R_(e-1) and refuses another value)
		{"123 primitive", []string{"123"}, []spec{wholeSpec(6, 1, true)}, func(testing.TB) *certify.Structure { return structure123() }},
		{"1342 primitive", []string{"1342"}, []spec{wholeSpec(6, 1, true)}, func(testing.TB) *certify.Structure {
			return &certify.Structure{Class: certify.ClassPrimitive, Exponent: 4, Lambda: certify.LambdaPositive,
				Mode: certify.ModeWitnesses, Witnesses: witnesses([]string{"1342"}, 3, 4), CyclicAvoider: cyclicAvoider([]string{"1342"}, 3)}
		}},
		// Andre (1879): the avoiders of {123, 321} alternate, so R_k
		// alternates: periodic with period 2; the upper bracket is of T'^2
		{"alternating periodic", []string{"123", "321"}, []spec{wholeSpec(10, 1, false), wholeSpec(10, 2, true)}, func(t testing.TB) *certify.Structure {
			s, p := jointCycle(t, []string{"123", "321"}, 2)
			return &certify.Structure{Class: certify.ClassPeriodic, Period: p, CycleStart: s, CycleLength: p,
				Lambda: certify.LambdaPositive, CyclicAvoider: cyclicAvoider([]string{"123", "321"}, 2)}
		}},
		// no interior peak: the avoiders fall to 1 and rise, a_n = 2^(n-1)
		// (by hand); lambda = 0, and every cycle of the window digraph is a
		// loop. States (), 1, 12: the blocks {(), 1} and {12} carry the
		// upper bound
		{"V-shaped subexponential", []string{"132", "231"}, []spec{wholeSpec(8, 1, false),
			{states: []int{0, 1}, start: certify.StartOnes, step: 1, n: 8, upper: true},
			{states: []int{2}, start: certify.StartOnes, step: 1, n: 8, upper: true}}, func(testing.TB) *certify.Structure {
			return &certify.Structure{Class: certify.ClassSubexponential, Lambda: certify.LambdaZero}
		}},
		// method.md 5b: no cyclic avoiders up to length 9; decided on the
		// joint patterns (the two cells form one cycle)
		{"four of S_3", []string{"123", "231", "312", "321"}, []spec{wholeSpec(8, 1, true)}, func(t testing.TB) *certify.Structure {
			s, p := jointCycle(t, []string{"123", "231", "312", "321"}, 2)
			return &certify.Structure{Class: certify.ClassSubexponential, Lambda: certify.LambdaZero, CycleStart: s, CycleLength: p}
		}},
		// every window of length 3 is forbidden: a_2 = 2, a_n = 0 from 3 on
		{"all of S_3 finite", []string{"123", "132", "213", "231", "312", "321"}, []spec{wholeSpec(2, 1, true)}, func(testing.TB) *certify.Structure {
			return &certify.Structure{Class: certify.ClassFinite, N1: 3, Lambda: certify.LambdaZero}
		}},
		// only increasing permutations avoid 21, and from length 7 on they
		// contain 1234567 (m = 6, where the digraph still decides)
		{"finite at m = 6", []string{"21", "1234567"}, []spec{wholeSpec(6, 1, true)}, func(testing.TB) *certify.Structure {
			return &certify.Structure{Class: certify.ClassFinite, N1: 7, Lambda: certify.LambdaZero}
		}},
		// 123 never reaches 132: the windows from 123 keep rising (by hand:
		// a window after 123 that is not 1243 and has no 231 ends rising)
		{"reducible", []string{"231", "1243"}, []spec{wholeSpec(6, 1, true)}, func(testing.TB) *certify.Structure {
			return &certify.Structure{Class: certify.ClassReducible, Unreached: &certify.CellPair{From: []int{1, 2, 3}, To: []int{1, 3, 2}},
				Lambda: certify.LambdaPositive, CyclicAvoider: cyclicAvoider([]string{"231", "1243"}, 3)}
		}},
		// at m = 6 a cyclic avoider still shows lambda > 0: the cyclic
		// windows of 7654321 each have a descent
		{"m = 6 undecided class", []string{"1234567"}, []spec{wholeSpec(6, 1, true)}, func(testing.TB) *certify.Structure {
			return &certify.Structure{Class: certify.ClassUndecided, Lambda: certify.LambdaPositive, CyclicAvoider: []int{7, 6, 5, 4, 3, 2, 1}}
		}},
	}
}

func TestPublishedStructures(t *testing.T) {
	for _, tc := range structureCases() {
		t.Run(tc.name, func(t *testing.T) {
			c := assemble(t, tc.given, tc.specs, tc.section(t))
			data, err := certify.Marshal(c)
			if err != nil {
				t.Fatal(err)
			}
			back, err := certify.Read(bytes.NewReader(data))
			if err != nil {
				t.Fatal(err)
			}
			if err := certify.Check(bg, back, certify.CheckOptions{Expect: tc.given}); err != nil {
				t.Fatal(err)
			}
		})
	}
}

// TestRecomputeMode checks primitive certificates without witnesses: for
// m = 2 against the witness form, and for m = 5 (exponent 7, the structure
// package's golden value), where the witnesses would not fit a file.
func TestRecomputeMode(t *testing.T) {
	for _, tc := range []struct {
		set      string
		exponent int
	}{{"123", 4}, {"123456", 7}} {
		if tc.set == "123456" && testing.Short() {
			continue
		}
		st := &certify.Structure{Class: certify.ClassPrimitive, Exponent: tc.exponent, Mode: certify.ModeRecompute, Lambda: certify.LambdaUndecided}
		c := assemble(t, []string{tc.set}, []spec{wholeSpec(len(tc.set)-1, 1, true)}, st)
		if tc.set == "123456" { // refused before the work under small limits
			for _, opts := range []certify.CheckOptions{{MaxWork: 1e6}, {MaxMemory: 1 << 20}} {
				if err := certify.Check(bg, c, opts); !errors.Is(err, certify.ErrLimit) {
					t.Fatalf("%s under %+v: %v, want a limit refusal", tc.set, opts, err)
				}
			}
		}
		if err := certify.Check(bg, c, certify.CheckOptions{Expect: []string{tc.set}}); err != nil {
			t.Fatalf("%s: %v", tc.set, err)
		}
	}
}

func TestStructureTampersRejected(t *testing.T) {
	base := map[string][]byte{}
	names := map[string]string{"123": "123 primitive", "123,321": "alternating periodic", "132,231": "V-shaped subexponential",
		"123,231,312,321": "four of S_3", "123,132,213,231,312,321": "all of S_3 finite", "231,1243": "reducible", "1234567": "m = 6 undecided class"}
	for _, tc := range structureCases() {
		for set, name := range names {
			if name == tc.name {
				data, err := certify.Marshal(assemble(t, tc.given, tc.specs, tc.section(t)))
				if err != nil {
					t.Fatal(err)
				}
				base[set] = data
			}
		}
	}
	fresh := func(set string) *certify.Certificate {
		c, err := certify.Read(bytes.NewReader(base[set]))
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	c123 := fresh("123")
	w := c123.Structure.Witnesses
	joint := func(p []int) string {
		q := append(append([]int(nil), p[:2]...), p[len(p)-2:]...)
		return jointString(q)
	}
	avoids123 := func(p []int) bool { return brute.Avoids(p, [][]int{{1, 2, 3}}) }
	// a swap of two entries of witness 5 that makes it contain 123
	containing := slices.Clone(w[5])
	for i := range containing {
		for j := i + 1; j < len(containing) && avoids123(containing); j++ {
			containing = slices.Clone(w[5])
			containing[i], containing[j] = containing[j], containing[i]
		}
		if !avoids123(containing) {
			break
		}
	}
	recompute := func(st *certify.Structure) { st.Mode, st.Witnesses = certify.ModeRecompute, nil }
	onlyClass := func(class certify.StructureClass, lambda certify.LambdaStatus) func(st *certify.Structure) {
		return func(st *certify.Structure) {
			*st = certify.Structure{Class: class, Lambda: lambda}
		}
	}
	for _, tc := range []struct {
		name, set string
		change    func(st *certify.Structure)
		reason    string
	}{
		{"witness with a wrong entry", "123", func(st *certify.Structure) { st.Witnesses[5] = []int{7, 3, 2, 5, 4, 6} },
			"witnesses[5]: \"732546\" is not a permutation: entry 7 is outside 1..6"},
		{"witness not a permutation", "123", func(st *certify.Structure) { st.Witnesses[5] = []int{1, 3, 3, 5, 4, 6} },
			"witnesses[5]: \"133546\" is not a permutation: value 3 repeats"},
		{"witness containing the pattern", "123", func(st *certify.Structure) { st.Witnesses[5] = containing },
			"witnesses[5]: " + digits(containing) + " contains the pattern 123 at positions"},
		{"missing joint pattern", "123", func(st *certify.Structure) { st.Witnesses = slices.Delete(st.Witnesses, 7, 8) },
			"the joint pattern " + joint(w[7]) + " of the domain has no witness (23 witnesses for 24 joint patterns)"},
		{"wrong joint pattern", "123", func(st *certify.Structure) { st.Witnesses[7] = st.Witnesses[8] },
			"witnesses[8]: its joint pattern " + joint(w[8]) + " (first and last 2 entries) does not come after " + joint(w[8])},
		{"witnesses out of order", "123", func(st *certify.Structure) { st.Witnesses[3], st.Witnesses[4] = st.Witnesses[4], st.Witnesses[3] },
			"witnesses[4]: its joint pattern " + joint(w[3]) + " (first and last 2 entries) does not come after " + joint(w[4])},
		{"exponent too large", "123", func(st *certify.Structure) { st.Exponent = 5 },
			"the exponent 5 needs witnesses of length m+e = 7"},
		{"exponent too small", "123", func(st *certify.Structure) { st.Exponent = 3 },
			"the exponent 3 needs witnesses of length m+e = 5"},
		{"exponent too large, recomputed", "123", func(st *certify.Structure) { recompute(st); st.Exponent = 5 },
			"statement.structure.exponent: 5 is not least: R_4 already holds all 24 joint patterns of the domain"},
		{"exponent too small, recomputed", "123", func(st *certify.Structure) { recompute(st); st.Exponent = 3 },
			"statement.structure.exponent: R_3 lacks the joint pattern"},
		{"exponent below m", "123", func(st *certify.Structure) { st.Exponent = 1 }, "outside m..m+1000"},
		{"class finite", "123", func(st *certify.Structure) { onlyClass(certify.ClassFinite, certify.LambdaZero)(st); st.N1 = 5 },
			"finite is false: the window digraph has a cycle"},
		{"class periodic", "123", func(st *certify.Structure) {
			onlyClass(certify.ClassPeriodic, certify.LambdaPositive)(st)
			st.Period, st.CycleStart, st.CycleLength, st.CyclicAvoider = 2, 4, 2, []int{3, 2, 1}
		}, "joint_cycle: R_5 = R_4 already (recomputed), so the R_k first repeat from k = 4 with period 1"},
		{"class reducible", "123", func(st *certify.Structure) {
			onlyClass(certify.ClassReducible, certify.LambdaUndecided)(st)
			st.Unreached = &certify.CellPair{From: []int{1, 2}, To: []int{2, 1}}
		}, "reducible is false: every start cell reaches every start cell"},
		{"class subexponential", "123", func(st *certify.Structure) {
			onlyClass(certify.ClassSubexponential, certify.LambdaZero)(st)
			st.CycleStart, st.CycleLength = 4, 1
		}, "lambda_status: zero is false: 132 is a cyclic avoider of length 3"},
		{"class primitive", "123,321", func(st *certify.Structure) {
			st.Class, st.Period, st.CycleStart, st.CycleLength = certify.ClassPrimitive, 0, 0, 0
			st.Exponent, st.Mode = 4, certify.ModeRecompute
		}, "R_4 lacks the joint pattern"},
		{"cyclic avoider containing the pattern", "123", func(st *certify.Structure) { st.CyclicAvoider = []int{1, 2, 3} },
			"cyclic_avoider: 123 is not a cyclic avoider: its cyclic window at positions 1..3 (wrapping around) contains the pattern 123"},
		{"cyclic avoider wrapping into the pattern", "123", func(st *certify.Structure) { st.CyclicAvoider = []int{2, 4, 3, 1} },
			"its cyclic window at positions 4..2 (wrapping around) contains the pattern 123"},
		{"cyclic avoider not a permutation", "123", func(st *certify.Structure) { st.CyclicAvoider = []int{3, 2, 1, 3} },
			"cyclic_avoider: \"3213\" is not a permutation: value 3 repeats"},
		{"cyclic avoider too short", "123", func(st *certify.Structure) { st.CyclicAvoider = []int{2, 1} },
			"a cyclic avoider has at least m+1 = 3 entries"},
		{"cyclic avoider missing", "123", func(st *certify.Structure) { st.CyclicAvoider = nil },
			"evidence.structure.cyclic_avoider: missing"},
		{"false lambda = 0", "123,321", func(st *certify.Structure) { st.Lambda, st.CyclicAvoider = certify.LambdaZero, nil },
			"lambda_status: zero is false: the joint pattern"},
		{"lambda undecided for a finite set", "123,132,213,231,312,321", func(st *certify.Structure) { st.Lambda = certify.LambdaUndecided },
			"lambda_status: undecided, but class finite states lambda = 0"},
		{"wrong finite_from", "123,132,213,231,312,321", func(st *certify.Structure) { st.N1 = 4 },
			"finite_from: 4, but the longest walk of the window digraph has 0 windows, so a_n = 0 exactly from n = m+0+1 = 3"},
		{"wrong unreached pair", "231,1243", func(st *certify.Structure) {
			st.Unreached = &certify.CellPair{From: []int{1, 3, 2}, To: []int{1, 2, 3}}
		}, "unreached: (132, 123) is not the least pair of start cells without a walk, which is (123, 132)"},
		{"period not the cycle length", "123,321", func(st *certify.Structure) { st.Period = 3 },
			"period: 3 is not the length 2"},
		{"joint cycle not least", "123,321", func(st *certify.Structure) { st.CycleStart = 4 },
			"R_5 = R_3 already (recomputed), so the R_k first repeat from k = 3 with period 2, not from 4 with period 2"},
		{"joint cycle not a repetition", "123,321", func(st *certify.Structure) { st.CycleStart = 2 },
			"joint_cycle: R_4 differs from R_2"},
		{"joint cycle missing", "123,231,312,321", func(st *certify.Structure) { st.CycleStart, st.CycleLength = 0, 0 },
			"evidence.structure.joint_cycle: missing"},
		{"joint cycle not needed", "132,231", func(st *certify.Structure) { st.CycleStart, st.CycleLength = 2, 1 },
			"evidence.structure.joint_cycle: present, but it belongs only to class periodic"},
		{"exponent of another class", "123,321", func(st *certify.Structure) { st.Exponent = 4 },
			"statement.structure.exponent: present, but it belongs only to class primitive"},
		{"unknown class", "123", func(st *certify.Structure) { st.Class = "aperiodic" },
			"statement.structure.class: \"aperiodic\" is not one of"},
		{"unknown mode", "123", func(st *certify.Structure) { st.Mode = "witness" },
			"evidence.structure.mode: \"witness\" is not witnesses or recompute"},
		{"primitive at m = 6", "1234567", func(st *certify.Structure) {
			st.Class, st.Exponent, st.Mode = certify.ClassPrimitive, 8, certify.ModeRecompute
		}, "runs for m <= 5 only (here m = 6)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := fresh(tc.set)
			tc.change(c.Structure)
			wantRefusal(t, certify.Check(bg, c, certify.CheckOptions{Expect: []string{tc.set}}), tc.reason)
		})
	}
	// claiming nothing is always allowed
	c := fresh("123")
	*c.Structure = certify.Structure{Class: certify.ClassUndecided, Lambda: certify.LambdaUndecided}
	if err := certify.Check(bg, c, certify.CheckOptions{}); err != nil {
		t.Fatalf("undecided rejected: %v", err)
	}
}

// jointString writes the pattern of a sequence as digits.
func jointString(q []int) string {
	var out []int
	for _, v := range q {
		r := 1
		for _, u := range q {
			if u < v {
				r++
			}
		}
		out = append(out, r)
	}
	return digits(out)
}

func digits(p []int) string {
	b := make([]byte, len(p))
	for i, v := range p {
		b[i] = byte('0' + v)
	}
	return string(b)
}
