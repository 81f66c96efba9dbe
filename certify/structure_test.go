package certify_test

import (
	"bufio"
	"bytes"
	"errors"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"avoidcert/certify"
	"avoidcert/internal/brute"
	"avoidcert/pattern"
	"avoidcert/prove"
)

func TestRankOfMatchesPattern(t *testing.T) {
	for n := 0; n <= 7; n++ {
		for r, p := range pattern.All(n) {
			if got := certify.RankOf(p); got != r {
				t.Fatalf("RankOf(%v) = %d, want %d", p, got, r)
			}
		}
	}
	rng := rand.New(rand.NewPCG(3, 4))
	for range 500 { // distinct values, not standardised
		seq := rng.Perm(30)[:1+rng.IntN(10)]
		if got, want := certify.RankOf(seq), pattern.Rank(pattern.Standardize(seq)); got != want {
			t.Fatalf("RankOf(%v) = %d, want %d", seq, got, want)
		}
	}
}

// avoidersOf calls visit with every permutation of length n that avoids s,
// by brute-force enumeration (internal/brute shares no code with certify).
func avoidersOf(s pattern.Set, n int, visit func(p []int)) {
	var pats [][]int
	for _, p := range s.Patterns() {
		pats = append(pats, p)
	}
	brute.Permutations(n, func(p []int) {
		if brute.Avoids(p, pats) {
			visit(p)
		}
	})
}

// TestJointSetsMatchEnumeration compares the checker's R_k with the joint
// patterns of the avoiders of length m+k, enumerated, and its domain with
// the definition (both halves avoid the shorter members).
func TestJointSetsMatchEnumeration(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 5))
	sets := []pattern.Set{mustParse(t, "123"), mustParse(t, "123,321"), mustParse(t, "132,231"), mustParse(t, "21,123")}
	for range 12 {
		sets = append(sets, pattern.NewSet(brute.RandomPatterns[pattern.Perm](rng, 3, 2, 3)...))
	}
	sets = append(sets, mustParse(t, "1342"), mustParse(t, "321,1243"))
	for _, s := range sets {
		m := s.Window() - 1
		if m == 0 {
			continue
		}
		top := 8 - m // lengths m+k up to 8
		got, domain := certify.JointSets(s, top)
		var want []int
		brute.Permutations(2*m, func(p []int) {
			if s.Avoids(p[:m]) && s.Avoids(p[m:]) {
				want = append(want, pattern.Rank(p))
			}
		})
		if !slices.Equal(domain, want) {
			t.Fatalf("%s: domain of %d joint patterns, definition gives %d", s, len(domain), len(want))
		}
		for k := m; k <= top; k++ {
			seen := map[int]bool{}
			avoidersOf(s, m+k, func(p []int) {
				joint := append(append([]int(nil), p[:m]...), p[len(p)-m:]...)
				seen[pattern.Rank(pattern.Standardize(joint))] = true
			})
			want := make([]int, 0, len(seen))
			for r := range seen {
				want = append(want, r)
			}
			slices.Sort(want)
			if !slices.Equal(got[k-m], want) {
				t.Fatalf("%s: R_%d has %d members, enumeration of length %d gives %d", s, k, len(got[k-m]), m+k, len(want))
			}
		}
	}
}

func mustParse(t testing.TB, list string) pattern.Set {
	t.Helper()
	s, err := pattern.ParseSet([]string{list})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// goldenExponents reads the exponents of the single patterns of length
// 3..5 from the structure package's golden file.
func goldenExponents(t *testing.T) map[string]int {
	f, err := os.Open(filepath.Join("..", "structure", "testdata", "exponents.golden"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	out := map[string]int{}
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		fields := strings.Fields(sc.Text())
		if len(fields) != 2 || strings.HasPrefix(fields[0], "#") {
			continue
		}
		e, err := strconv.Atoi(fields[1])
		if err != nil {
			t.Fatal(err)
		}
		out[fields[0]] = e
	}
	if len(out) != 6+24+120 {
		t.Fatalf("golden file has %d exponents, want 150", len(out))
	}
	return out
}

// upperBracket returns a whole-system step-1 bracket with a finite upper
// end at the least k of a short list, for certificates whose point is the
// structure section.
func upperBracket(t testing.TB, s pattern.Set) engineBracket {
	t.Helper()
	for _, k := range []int{1, 2, 3, 4, 6} {
		if b := bracketFromEngine(t, s, nil, k, 1, true); b.Hi != nil {
			return b
		}
	}
	t.Fatalf("%s: no finite upper bracket up to k = 6", s)
	return engineBracket{}
}

// TestStructureConformance builds, for every single pattern of length 3..5
// and random sets with m <= 3, the structure section from
// structure.Analyze (witnesses included) and checks it: the checker
// accepts it, its own R_k agree with the report's sizes, and the exponents
// are those of the structure package's golden file.
func TestStructureConformance(t *testing.T) {
	exponents := goldenExponents(t)
	var sets []pattern.Set
	for n := 3; n <= 5; n++ {
		for _, p := range pattern.All(n) {
			sets = append(sets, pattern.NewSet(p))
		}
	}
	rng := rand.New(rand.NewPCG(2011, 3))
	for range 80 {
		sets = append(sets, pattern.NewSet(brute.RandomPatterns[pattern.Perm](rng, 4, 2, 4)...))
	}
	classes := map[certify.StructureClass]int{}
	largest := 0
	for i, s := range sets {
		rep := analyze(t, s)
		st := prove.Structure(rep)
		c := assembleWith(t, s.Given(), []engineBracket{upperBracket(t, s)}, st)
		if err := certify.Check(c, certify.CheckOptions{Expect: s}); err != nil {
			t.Fatalf("%s (%s): %v", s, rep.Class, err)
		}
		classes[st.Class]++
		if i < len(exponents) {
			if st.Class != certify.ClassPrimitive || st.Exponent != exponents[s.String()] {
				t.Fatalf("%s: class %s exponent %d, the golden file has primitive %d", s, st.Class, st.Exponent, exponents[s.String()])
			}
		}
		if rep.M >= 1 && len(rep.Sizes) > 0 {
			got, domain := certify.JointSets(s, rep.M+len(rep.Sizes)-1)
			if len(domain) != rep.Domain {
				t.Fatalf("%s: checker's domain %d, structure's %d", s, len(domain), rep.Domain)
			}
			for j, r := range got {
				if len(r) != rep.Sizes[j] {
					t.Fatalf("%s: |R_%d| = %d by the checker, %d by structure", s, rep.M+j, len(r), rep.Sizes[j])
				}
			}
		}
		if rep.M == 4 && i%10 == 0 { // file size with 40320 witnesses
			data, err := certify.Marshal(c)
			if err != nil {
				t.Fatal(err)
			}
			largest = max(largest, len(data))
			back, err := certify.Read(bytes.NewReader(data))
			if err != nil {
				t.Fatalf("%s: %v", s, err)
			}
			if len(back.Structure.Witnesses) != 40320 {
				t.Fatalf("%s: %d witnesses read back", s, len(back.Structure.Witnesses))
			}
		}
	}
	t.Logf("classes %v; largest file with 40320 witnesses: %d bytes", classes, largest)
	if classes[certify.ClassFinite] == 0 || classes[certify.ClassSubexponential] == 0 {
		t.Fatalf("classes %v: the random sets should reach finite and subexponential", classes)
	}
	if largest > certify.MaxFileSize/2 {
		t.Fatalf("a certificate with 40320 witnesses has %d bytes, not well under the limit", largest)
	}
}

// TestPublishedStructures checks certificates of sets whose structure is
// known from the literature or by hand.
func TestPublishedStructures(t *testing.T) {
	for _, tc := range []struct {
		name, set string
		class     certify.StructureClass
		lambda    certify.LambdaStatus
		brackets  func(t testing.TB, s pattern.Set) []engineBracket
		check     func(t *testing.T, s pattern.Set, st *certify.Structure)
	}{
		{
			// Andre (1879): the avoiders of {123, 321} are the alternating
			// permutations, up-down or down-up, so the window digraph
			// alternates between the cells 12 and 21: period 2. The upper
			// bracket is of T^2.
			name: "alternating", set: "123,321", class: certify.ClassPeriodic, lambda: certify.LambdaPositive,
			brackets: func(t testing.TB, s pattern.Set) []engineBracket {
				return []engineBracket{bracketFromEngine(t, s, nil, 10, 1, false), bracketFromEngine(t, s, nil, 10, 2, true)}
			},
			check: func(t *testing.T, s pattern.Set, st *certify.Structure) {
				if st.Period != 2 {
					t.Fatalf("period %d, want 2", st.Period)
				}
			},
		},
		{
			// No interior peak: the permutations decrease to 1 and then
			// increase, a_n = 2^(n-1) (derived by hand: each of 2..n sits
			// left or right of 1). lambda = 0; the increasing cell has no
			// way back to the decreasing one, so the blocks carry the upper
			// bound.
			name: "V-shaped", set: "132,231", class: certify.ClassSubexponential, lambda: certify.LambdaZero,
			brackets: func(t testing.TB, s pattern.Set) []engineBracket {
				return []engineBracket{bracketFromEngine(t, s, nil, 6, 1, false),
					bracketFromEngine(t, s, []int{0}, 6, 1, true), bracketFromEngine(t, s, []int{1}, 6, 1, true)}
			},
			check: func(t *testing.T, s pattern.Set, st *certify.Structure) {
				for k := 0; k <= 10; k++ {
					if _, sum := certify.IterateDigest(s, nil, k); sum.Cmp(new(big.Int).Lsh(big.NewInt(1), uint(k+1))) != 0 {
						t.Fatalf("a_%d = %s, want 2^%d", k+2, sum, k+1)
					}
				}
			},
		},
		{
			// method.md 5b: no cyclic avoiders up to length 9 by brute
			// force; here lambda = 0 is decided on the joint patterns (the
			// two cells form one cycle, so the cheap criterion fails).
			name: "four of S_3", set: "123,231,312,321", class: certify.ClassSubexponential, lambda: certify.LambdaZero,
			brackets: whole(8, 1, true),
			check: func(t *testing.T, s pattern.Set, st *certify.Structure) {
				if st.CycleLength == 0 {
					t.Fatal("no joint cycle: lambda = 0 was not decided on the joint patterns")
				}
			},
		},
		{
			// Every window of length 3 is forbidden: a_2 = 2, a_n = 0 for
			// n >= 3.
			name: "all of S_3", set: "123,132,213,231,312,321", class: certify.ClassFinite, lambda: certify.LambdaZero,
			brackets: whole(0, 1, true),
			check: func(t *testing.T, s pattern.Set, st *certify.Structure) {
				if st.N1 != 3 {
					t.Fatalf("N1 = %d, want 3", st.N1)
				}
			},
		},
		{
			// The structure package's golden file: 1342 has exponent 4.
			name: "1342", set: "1342", class: certify.ClassPrimitive, lambda: certify.LambdaPositive,
			brackets: whole(6, 1, true),
			check: func(t *testing.T, s pattern.Set, st *certify.Structure) {
				if st.Exponent != 4 || st.Mode != certify.ModeWitnesses || len(st.Witnesses) != 720 {
					t.Fatalf("exponent %d, mode %s, %d witnesses; want 4, witnesses, 720", st.Exponent, st.Mode, len(st.Witnesses))
				}
			},
		},
		{
			// Only increasing permutations avoid 21, and from length 7 on
			// they contain 1234567: a_n = 0 exactly for n >= 7 (m = 6, where
			// the digraph still decides).
			name: "finite at m = 6", set: "21,1234567", class: certify.ClassFinite, lambda: certify.LambdaZero,
			brackets: whole(0, 1, true),
			check: func(t *testing.T, s pattern.Set, st *certify.Structure) {
				if st.N1 != 7 {
					t.Fatalf("N1 = %d, want 7", st.N1)
				}
			},
		},
		{
			// Found by the structure pass and checked here: 123 never
			// reaches 132 (the windows from 123 keep rising).
			name: "reducible", set: "231,1243", class: certify.ClassReducible, lambda: certify.LambdaPositive,
			brackets: whole(6, 1, true),
			check: func(t *testing.T, s pattern.Set, st *certify.Structure) {
				if st.Unreached.From.String() != "123" || st.Unreached.To.String() != "132" {
					t.Fatalf("unreached %v", st.Unreached)
				}
			},
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := mustParse(t, tc.set)
			c := assemble(t, s.Given(), tc.brackets(t, s))
			st := c.Structure
			if st.Class != tc.class || st.Lambda != tc.lambda {
				t.Fatalf("class %s lambda %s, want %s %s", st.Class, st.Lambda, tc.class, tc.lambda)
			}
			tc.check(t, s, st)
			data, err := certify.Marshal(c)
			if err != nil {
				t.Fatal(err)
			}
			back, err := certify.Read(bytes.NewReader(data))
			if err != nil {
				t.Fatal(err)
			}
			if err := certify.Check(back, certify.CheckOptions{Expect: s}); err != nil {
				t.Fatal(err)
			}
		})
	}
}

// TestRecomputeMode checks primitive certificates without witnesses: for
// m = 2 against the witness form, and for m = 5, where the witnesses would
// not fit a file.
func TestRecomputeMode(t *testing.T) {
	for _, set := range []string{"123", "123456"} {
		s := mustParse(t, set)
		c := assemble(t, s.Given(), []engineBracket{upperBracket(t, s)})
		st := c.Structure
		st.Mode, st.Witnesses = certify.ModeRecompute, nil
		if set == "123456" { // refused before the work under small limits
			for _, opts := range []certify.CheckOptions{{MaxWork: 1e6}, {MaxMemory: 1 << 20}} {
				if err := certify.Check(c, opts); !errors.Is(err, certify.ErrLimit) {
					t.Fatalf("%s under %+v: %v, want a limit refusal", set, opts, err)
				}
			}
		}
		if err := certify.Check(c, certify.CheckOptions{Expect: s}); err != nil {
			t.Fatalf("%s: %v", set, err)
		}
		t.Logf("%s: primitive, exponent %d, recomputed", set, st.Exponent)
	}
}

// TestVersion1StillChecks reads the format version 1 file of the first
// release: no structure section, the same bytes back.
func TestVersion1StillChecks(t *testing.T) {
	data, err := os.ReadFile("testdata/cert-123-k6-v1.json")
	if err != nil {
		t.Fatal(err)
	}
	c, err := certify.Read(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	if c.Structure != nil {
		t.Fatal("a version 1 file read with a structure section")
	}
	if err := certify.Check(c, certify.CheckOptions{Expect: mustParse(t, "123")}); err != nil {
		t.Fatal(err)
	}
	again, err := certify.Marshal(c)
	if err != nil || !bytes.Equal(again, data) {
		t.Fatalf("version 1 file not written back byte for byte: %v", err)
	}
	if !bytes.Contains(data, []byte(`"version": 1,`)) {
		t.Fatal("the file is not version 1")
	}
}

// TestStructureTampersRejected changes one claim or one piece of evidence
// of a valid structure section at a time; each change must be refused for
// the stated reason, on one line.
func TestStructureTampersRejected(t *testing.T) {
	base := map[string][]byte{}
	for _, set := range []string{"123", "123,321", "132,231", "123,231,312,321", "123,132,213,231,312,321", "231,1243"} {
		s := mustParse(t, set)
		data, err := certify.Marshal(assemble(t, s.Given(), []engineBracket{upperBracket(t, s)}))
		if err != nil {
			t.Fatal(err)
		}
		base[set] = data
	}
	// 1234567 (m = 6): the structure section is written by hand
	long := mustParse(t, "1234567")
	data, err := certify.Marshal(assembleWith(t, long.Given(), []engineBracket{bracketFromEngine(t, long, nil, 1, 1, true)},
		&certify.Structure{Class: certify.ClassUndecided, Lambda: certify.LambdaUndecided}))
	if err != nil {
		t.Fatal(err)
	}
	base["1234567"] = data
	fresh := func(set string) *certify.Certificate {
		c, err := certify.Read(bytes.NewReader(base[set]))
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	c123 := fresh("123")
	w := c123.Structure.Witnesses
	joint := func(p pattern.Perm) string {
		return pattern.Standardize(append(append([]int(nil), p[:2]...), p[len(p)-2:]...)).String()
	}
	// a swap of two entries of witness 5 that makes it contain 123
	containing := slices.Clone(w[5])
	for i := range containing {
		for j := i + 1; j < len(containing) && mustParse(t, "123").Avoids(containing); j++ {
			containing = slices.Clone(w[5])
			containing[i], containing[j] = containing[j], containing[i]
		}
		if !mustParse(t, "123").Avoids(containing) {
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
		{"witness with a wrong entry", "123", func(st *certify.Structure) { st.Witnesses[5] = pattern.Perm{7, 3, 2, 5, 4, 6} },
			"witnesses[5]: \"732546\" is not a permutation: entry 7 is outside 1..6"},
		{"witness not a permutation", "123", func(st *certify.Structure) { st.Witnesses[5] = pattern.Perm{1, 3, 3, 5, 4, 6} },
			"witnesses[5]: \"133546\" is not a permutation: value 3 repeats"},
		{"witness containing the pattern", "123", func(st *certify.Structure) { st.Witnesses[5] = containing },
			"witnesses[5]: " + containing.String() + " contains the pattern 123 at positions"},
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
			st.Period, st.CycleStart, st.CycleLength, st.CyclicAvoider = 2, 4, 2, pattern.Perm{3, 2, 1}
		}, "joint_cycle: R_5 = R_4 already (recomputed), so the R_k first repeat from k = 4 with period 1"},
		{"class reducible", "123", func(st *certify.Structure) {
			onlyClass(certify.ClassReducible, certify.LambdaUndecided)(st)
			st.Unreached = &certify.CellPair{From: pattern.Perm{1, 2}, To: pattern.Perm{2, 1}}
		}, "reducible is false: every start cell reaches every start cell"},
		{"class subexponential", "123", func(st *certify.Structure) {
			onlyClass(certify.ClassSubexponential, certify.LambdaZero)(st)
			st.CycleStart, st.CycleLength = 4, 1
		}, "lambda_status: zero is false: 132 is a cyclic avoider of length 3"},
		{"class primitive", "123,321", func(st *certify.Structure) {
			st.Class, st.Period, st.CycleStart, st.CycleLength = certify.ClassPrimitive, 0, 0, 0
			st.Exponent, st.Mode = 4, certify.ModeRecompute
		}, "R_4 lacks the joint pattern"},
		{"cyclic avoider containing the pattern", "123", func(st *certify.Structure) { st.CyclicAvoider = pattern.Perm{1, 2, 3} },
			"cyclic_avoider: 123 is not a cyclic avoider: its cyclic window at positions 1..3 (wrapping around) contains the pattern 123"},
		{"cyclic avoider wrapping into the pattern", "123", func(st *certify.Structure) { st.CyclicAvoider = pattern.Perm{2, 4, 3, 1} },
			"its cyclic window at positions 4..2 (wrapping around) contains the pattern 123"},
		{"cyclic avoider not a permutation", "123", func(st *certify.Structure) { st.CyclicAvoider = pattern.Perm{3, 2, 1, 3} },
			"cyclic_avoider: \"3213\" is not a permutation: value 3 repeats"},
		{"cyclic avoider too short", "123", func(st *certify.Structure) { st.CyclicAvoider = pattern.Perm{2, 1} },
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
			st.Unreached = &certify.CellPair{From: pattern.Perm{1, 3, 2}, To: pattern.Perm{1, 2, 3}}
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
			wantRefusal(t, certify.Check(c, certify.CheckOptions{Expect: mustParse(t, tc.set)}), tc.reason)
		})
	}
	// claiming nothing is always allowed
	c := fresh("123")
	*c.Structure = certify.Structure{Class: certify.ClassUndecided, Lambda: certify.LambdaUndecided}
	if err := certify.Check(c, certify.CheckOptions{}); err != nil {
		t.Fatalf("undecided rejected: %v", err)
	}
	// at m = 6 a cyclic avoider still shows lambda > 0: the cyclic windows
	// of 7654321 each have a descent, so none is 1234567
	c = fresh("1234567")
	c.Structure.Lambda, c.Structure.CyclicAvoider = certify.LambdaPositive, pattern.Perm{7, 6, 5, 4, 3, 2, 1}
	if err := certify.Check(c, certify.CheckOptions{}); err != nil {
		t.Fatalf("cyclic avoider at m = 6 rejected: %v", err)
	}
}

// BenchmarkCheckStructure times the checker on structure sections alone
// (the brackets are one small whole-system bracket): 12345 with its 40320
// witnesses, and 123456 recomputed (m = 5, exponent 7). Run briefly:
// go test ./certify/ -run X -bench CheckStructure -benchtime 1x
func BenchmarkCheckStructure(b *testing.B) {
	for _, tc := range []struct {
		set  string
		mode certify.EvidenceMode
	}{{"12345", certify.ModeWitnesses}, {"123456", certify.ModeRecompute}} {
		s := mustParse(b, tc.set)
		c := assemble(b, s.Given(), []engineBracket{bracketFromEngine(b, s, nil, 1, 1, true)})
		if tc.mode == certify.ModeRecompute {
			c.Structure.Mode, c.Structure.Witnesses = certify.ModeRecompute, nil
		}
		b.Run(tc.set, func(b *testing.B) {
			b.Log(certify.Check(c, certify.CheckOptions{MaxWork: 1}))
			b.ResetTimer()
			for range b.N {
				if err := certify.Check(c, certify.CheckOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
