package certify_test

import (
	"bytes"
	"context"
	"errors"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"avoidcert/certify"
	"avoidcert/internal/brute"
)

// The structure sections of these tests state the class and exponent of
// a published or documented source, and their derived fields come from
// the brute force of brute_structure_test.go (recurrent states, blocks,
// joint cycle, D, cyclic avoiders), never from the checker or the engine;
// the engine's sections are checked in internal/conformance.

// bruteLength is the longest permutation the brute force enumerates.
const bruteLength = 8

func TestJointSetsAgainstBruteForce(t *testing.T) {
	sets := []string{"123", "132", "1342", "2413", "1234", "123,321", "12", "132,231", "12,231",
		"1423,2413,3412,4123,4312", "132,1234,3421,4321", "123,231,312,321", "21,123", "231,1243"}
	rng := rand.New(rand.NewPCG(14, 9))
	for range 12 { // random sets of mixed lengths 2 to 4
		var given []string
		for _, p := range brute.RandomPatterns[[]int](rng, 4, 2, 4) {
			given = append(given, name(p))
		}
		sets = append(sets, strings.Join(given, ","))
	}
	for _, set := range sets {
		given := strings.Split(set, ",")
		b := newBruteSet(given)
		recurrent, sets := certify.JointSets(given, 6)
		if want := b.recurrent(bruteLength); !slices.Equal(recurrent, want) {
			t.Errorf("%s: recurrent states %v, brute force %v", set, recurrent, want)
			continue
		}
		longest := 0
		for _, r := range recurrent {
			longest = max(longest, len(r))
		}
		for k := 0; longest+k <= bruteLength && k < len(sets); k++ {
			if want := b.jointSet(recurrent, k); !slices.Equal(sets[k], want) {
				t.Errorf("%s: R_%d has %d configurations, brute force %d (first of the checker %.3q, of brute force %.3q)", set, k, len(sets[k]), len(want), sets[k], want)
				break
			}
		}
	}
}

type structureCase struct {
	name  string
	given []string
	specs []spec
	class certify.StructureClass
	// exponent (primitive) or finite_from (finite), and their source
	number int
	source string
	lambda certify.LambdaStatus
}

func structureCases() []structureCase {
	whole := func(n int) []spec { return []spec{wholeSpec(n, 1, true)} }
	const contract = "docs/prefix-states.md, small cases (structure)"
	const note = "method note, section 9 (prototype values)"
	return []structureCase{
		{"123 primitive", []string{"123"}, whole(8), certify.ClassPrimitive, 4, contract, certify.LambdaPositive},
		{"132 primitive", []string{"132"}, whole(8), certify.ClassPrimitive, 3, contract, certify.LambdaPositive},
		{"1342 primitive", []string{"1342"}, whole(8), certify.ClassPrimitive, 4, contract, certify.LambdaPositive},
		{"1324 primitive", []string{"1324"}, whole(8), certify.ClassPrimitive, 4, contract, certify.LambdaPositive},
		{"1234 primitive", []string{"1234"}, whole(8), certify.ClassPrimitive, 5, contract, certify.LambdaPositive},
		{"transient cells primitive", []string{"1423", "2413", "3412", "4123", "4312"}, whole(8), certify.ClassPrimitive, 4, contract, certify.LambdaPositive},
		{"mixed lengths primitive", []string{"132", "1234", "3421", "4321"}, whole(8), certify.ClassPrimitive, 8, contract, certify.LambdaUndecided},
		// Andre (1879): the avoiders of {123, 321} alternate; the upper
		// bracket is of T'^2
		{"alternating periodic", []string{"123", "321"}, []spec{wholeSpec(10, 1, false), wholeSpec(10, 2, true)},
			certify.ClassPeriodic, 0, contract, certify.LambdaPositive},
		{"12 subexponential", []string{"12"}, whole(4), certify.ClassSubexponential, 0, contract, certify.LambdaZero},
		// no interior peak: the avoiders fall to 1 and rise, a_n = 2^(n-1);
		// the blocks {(), 1} and {12} carry the upper bound
		{"V-shaped subexponential", []string{"132", "231"}, []spec{wholeSpec(8, 1, false),
			{states: []int{0, 1}, start: certify.StartOnes, step: 1, n: 8, upper: true},
			{states: []int{2}, start: certify.StartOnes, step: 1, n: 8, upper: true}},
			certify.ClassSubexponential, 0, "method note, 5b", certify.LambdaZero},
		{"V-shaped reducible", []string{"132", "231"}, []spec{wholeSpec(8, 1, false),
			{states: []int{0, 1}, start: certify.StartOnes, step: 1, n: 8, upper: true},
			{states: []int{2}, start: certify.StartOnes, step: 1, n: 8, upper: true}},
			certify.ClassReducible, 0, "its two blocks (brute force)", certify.LambdaZero},
		{"four of S_3 subexponential", []string{"123", "231", "312", "321"}, whole(8), certify.ClassSubexponential, 0, "method note, 5b", certify.LambdaZero},
		{"123,132,213,231 subexponential", []string{"123", "132", "213", "231"}, whole(8), certify.ClassSubexponential, 0, "method note, 5b", certify.LambdaZero},
		{"reducible with lambda > 0", []string{"231", "1243"}, whole(6), certify.ClassReducible, 0, "its two blocks (brute force)", certify.LambdaPositive},
		{"12,21 finite", []string{"12", "21"}, whole(1), certify.ClassFinite, 2, contract, certify.LambdaZero},
		{"1 finite", []string{"1"}, whole(3), certify.ClassFinite, 1, contract, certify.LambdaZero},
		// every window of length 3 is forbidden: a_2 = 2, a_n = 0 from 3 on
		{"all of S_3 finite", []string{"123", "132", "213", "231", "312", "321"}, whole(2), certify.ClassFinite, 3, "by hand", certify.LambdaZero},
		{"1234567 primitive", []string{"1234567"}, whole(6), certify.ClassPrimitive, 8, note, certify.LambdaPositive},
		{"1234576 primitive", []string{"1234576"}, whole(6), certify.ClassPrimitive, 7, note, certify.LambdaPositive},
		{"undecided claims nothing", []string{"1342"}, whole(8), certify.ClassUndecided, 0, "", certify.LambdaUndecided},
	}
}

// increasingRunStates is the structure of one pattern of length 7 that
// starts with an increasing run of 6: its prefix states are the runs 1,
// 12, .., 123456 (numbers 1..6), all recurrent (a descent returns to 1,
// each ascent climbs), and |D| = sum over a, b in 1..6 of C(a+b, a) = 3418
// (docs/prefix-states.md). The brute force cannot reach length 7.
func increasingRunStates() (recurrent []int, configurations int) {
	return []int{1, 2, 3, 4, 5, 6}, 3418
}

// section builds a case's structure section: class and number from the
// case, the derived fields and the cyclic avoider from the brute force.
func (tc structureCase) section(t testing.TB) *certify.Structure {
	t.Helper()
	st := &certify.Structure{Class: tc.class, Lambda: tc.lambda}
	b := newBruteSet(tc.given)
	switch tc.class {
	case certify.ClassUndecided:
	case certify.ClassFinite:
		st.N1 = tc.number
	default:
		if b.longest >= 7 {
			st.Recurrent, st.Configurations = increasingRunStates()
			break
		}
		number := b.stateNumbers()
		rec := b.recurrent(bruteLength)
		for _, r := range rec {
			st.Recurrent = append(st.Recurrent, number[r])
		}
		st.Configurations = len(domain(rec))
	}
	switch tc.class {
	case certify.ClassPrimitive:
		st.Exponent = tc.number
	case certify.ClassPeriodic, certify.ClassReducible, certify.ClassSubexponential:
		s0, p, ok := b.jointCycle(bruteLength)
		if !ok {
			t.Fatalf("%s: no repetition of R_k within length %d", tc.name, bruteLength)
		}
		st.CycleStart, st.CycleLength = s0, p
	}
	switch tc.class {
	case certify.ClassPeriodic:
		st.Period = st.CycleLength
	case certify.ClassReducible:
		st.Blocks = b.blocks(b.recurrent(bruteLength), bruteLength)
	}
	if tc.lambda == certify.LambdaPositive {
		if b.longest == 7 {
			st.CyclicAvoider = []int{7, 6, 5, 4, 3, 2, 1} // by hand: every cyclic window has a descent
		} else if st.CyclicAvoider = b.cyclicAvoider(bruteLength); st.CyclicAvoider == nil {
			t.Fatalf("%s: no cyclic avoider within length %d", tc.name, bruteLength)
		}
	}
	return st
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
				t.Fatalf("%v (class and number from %s)", err, tc.source)
			}
		})
	}
}

// TestDocumentedStructureFacts compares the brute force with the values
// that docs/prefix-states.md states for the small cases, so that the
// sections above rest on both.
func TestDocumentedStructureFacts(t *testing.T) {
	for _, tc := range []struct {
		set            string
		recurrent      []string
		configurations int
		s0, p          int // joint cycle, 0 0 for none stated
	}{
		{"123", []string{"1", "12"}, 14, 0, 0},
		{"123,321", []string{"12", "21"}, 24, 3, 2},
		{"12", []string{"1"}, 2, 1, 1},
	} {
		b := newBruteSet(strings.Split(tc.set, ","))
		rec := b.recurrent(bruteLength)
		if !slices.Equal(rec, tc.recurrent) || len(domain(rec)) != tc.configurations {
			t.Errorf("%s: brute force gives recurrent %v and |D| = %d, the contract %v and %d", tc.set, rec, len(domain(rec)), tc.recurrent, tc.configurations)
		}
		if tc.p > 0 {
			if s0, p, _ := b.jointCycle(bruteLength); s0 != tc.s0 || p != tc.p {
				t.Errorf("%s: brute force joint cycle (%d, %d), the contract (%d, %d)", tc.set, s0, p, tc.s0, tc.p)
			}
		}
	}
	// {123, 231, 312, 321}: the contract's closable configuration of R_0 at
	// (12) has period 2 < w = 3, and no cyclic avoider exists (method
	// note 5b: none up to length 9)
	four := newBruteSet([]string{"123", "231", "312", "321"})
	if p := four.cyclicAvoider(bruteLength); p != nil {
		t.Errorf("{123,231,312,321}: cyclic avoider %v", p)
	}
	// that configuration: start values 1 < 2, then copies just above them,
	// 1 2 1.5 2.5, whose pattern 1324 avoids the set and ends in (12) again
	if q := []int{1, 3, 2, 4}; !brute.Avoids(q, four.pats) || name(four.stateOf(q)) != "12" {
		t.Errorf("{123,231,312,321}: the closable configuration of R_0 at (12) does not close")
	}
}

// TestLambdaAgainstCyclicAvoiders compares the checker's lambda > 0 / = 0
// (its closable configurations with the period condition) with a
// brute-force search for cyclic avoiders up to length 8 on random sets,
// and has the checker accept each verdict and refuse the other.
func TestLambdaAgainstCyclicAvoiders(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 2011))
	checked := map[certify.LambdaStatus]int{}
	for trial := range 150 {
		var given []string
		for _, p := range brute.RandomPatterns[[]int](rng, 5, 2, 4) {
			given = append(given, name(p))
		}
		b := newBruteSet(given)
		avoider := b.cyclicAvoider(bruteLength)
		own := certify.OwnStructure(given)
		if (avoider != nil) != (own.Lambda == certify.LambdaPositive) {
			t.Fatalf("%v: the checker decides lambda %s, brute force finds the cyclic avoider %v (nil: none up to length %d)", given, own.Lambda, avoider, bruteLength)
		}
		checked[own.Lambda]++
		if trial%5 != 0 {
			continue // the certificates below for every fifth set
		}
		bracket, _ := certify.MakeBracket(given, nil, certify.StartEmpty, 1, 8, true)
		if bracket.Hi == nil {
			continue
		}
		right := *own
		right.CyclicAvoider = avoider
		if err := certify.Check(bg, assemble(t, given, []spec{wholeSpec(8, 1, true)}, &right), certify.CheckOptions{}); err != nil {
			t.Fatalf("%v: %v", given, err)
		}
		wrong := *own
		switch own.Lambda {
		case certify.LambdaZero:
			// a false lambda > 0 needs a cyclic avoider, and none exists up
			// to length 8: offer the increasing permutation of length w
			wrong = certify.Structure{Class: certify.ClassUndecided, Lambda: certify.LambdaPositive, CyclicAvoider: make([]int, b.longest)}
			for i := range wrong.CyclicAvoider {
				wrong.CyclicAvoider[i] = i + 1
			}
		case certify.LambdaPositive:
			if own.Class != certify.ClassReducible {
				continue
			}
			wrong.Lambda = certify.LambdaZero
		}
		err := certify.Check(bg, assemble(t, given, []spec{wholeSpec(8, 1, true)}, &wrong), certify.CheckOptions{})
		if err == nil {
			t.Fatalf("%v: a false lambda status %s accepted", given, wrong.Lambda)
		}
	}
	t.Logf("lambda decided on 150 random sets: %d positive, %d zero", checked[certify.LambdaPositive], checked[certify.LambdaZero])
	if checked[certify.LambdaPositive] < 20 || checked[certify.LambdaZero] < 20 {
		t.Fatalf("too few of each kind: %v", checked)
	}
}

func TestStructureTampersRejected(t *testing.T) {
	base := map[string][]byte{}
	for _, tc := range structureCases() {
		data, err := certify.Marshal(assemble(t, tc.given, tc.specs, tc.section(t)))
		if err != nil {
			t.Fatal(err)
		}
		base[tc.name] = data
	}
	fresh := func(name string) *certify.Certificate {
		c, err := certify.Read(bytes.NewReader(base[name]))
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	for _, tc := range []struct {
		name, base string
		change     func(st *certify.Structure)
		reason     string
	}{
		{"exponent too large", "123 primitive", func(st *certify.Structure) { st.Exponent = 5 },
			"statement.structure.primitivity_exponent: 5 is not least: R_4 already equals D (all 14 configurations"},
		{"exponent too small", "123 primitive", func(st *certify.Structure) { st.Exponent = 3 },
			"statement.structure.primitivity_exponent: R_3 lacks the configuration"},
		{"exponent too small at length 7", "1234567 primitive", func(st *certify.Structure) { st.Exponent = 7 },
			"statement.structure.primitivity_exponent: R_7 lacks the configuration"},
		{"exponent over the limit", "123 primitive", func(st *certify.Structure) { st.Exponent = certify.MaxJointSteps + 1 },
			"statement.structure.primitivity_exponent: 1001 out of range"},
		{"class periodic", "123 primitive", func(st *certify.Structure) {
			st.Class, st.Exponent, st.Period, st.CycleStart, st.CycleLength = certify.ClassPeriodic, 0, 2, 3, 2
		}, "statement.structure.class: periodic is false: R_4 equals D (recomputed), so the set is primitive with exponent 4"},
		{"class subexponential", "123 primitive", func(st *certify.Structure) {
			st.Class, st.Exponent, st.CycleStart, st.CycleLength = certify.ClassSubexponential, 0, 3, 2
			st.Lambda, st.CyclicAvoider = certify.LambdaZero, nil
		}, "statement.structure.class: subexponential is false: R_4 equals D"},
		{"class finite", "123 primitive", func(st *certify.Structure) {
			*st = certify.Structure{Class: certify.ClassFinite, N1: 5, Lambda: certify.LambdaZero}
		}, "statement.structure.class: finite is false: the state 1 is recurrent"},
		{"class primitive", "alternating periodic", func(st *certify.Structure) {
			st.Class, st.Period, st.CycleStart, st.CycleLength, st.Exponent = certify.ClassPrimitive, 0, 0, 0, 4
		}, "statement.structure.primitivity_exponent: R_4 lacks the configuration"},
		{"class periodic of a reducible set", "reducible with lambda > 0", func(st *certify.Structure) {
			st.Class, st.Blocks, st.Period = certify.ClassPeriodic, nil, st.CycleLength
		}, "statement.structure.period: 1; a periodic class has period at least 2"},
		{"class reducible of a periodic set", "alternating periodic", func(st *certify.Structure) {
			st.Class, st.Period, st.Blocks = certify.ClassReducible, 0, [][]int{{2, 3}}
		}, "statement.structure.class: reducible is false: the recurrent states form one block and the sets R_3 .. R_4 of the joint cycle cover D"},
		{"class primitive of a subexponential set", "12 subexponential", func(st *certify.Structure) {
			st.Class, st.CycleStart, st.CycleLength, st.Exponent = certify.ClassPrimitive, 0, 0, 3
			st.Lambda = certify.LambdaUndecided
		}, "statement.structure.primitivity_exponent: R_3 lacks the configuration (start 1, current 1, overlap 0, order 12)"},
		{"class periodic of a subexponential set", "four of S_3 subexponential", func(st *certify.Structure) {
			st.Class, st.Period, st.Lambda = certify.ClassPeriodic, st.CycleLength, certify.LambdaUndecided
		}, "statement.structure.class: periodic is false: R_3 holds 2 of the 6 configurations of the pair (start 12, current 21), not all or none (recomputed)"},
		{"period changed", "alternating periodic", func(st *certify.Structure) { st.Period = 3 },
			"statement.structure.period: 3 is not the length 2"},
		{"period and cycle changed", "alternating periodic", func(st *certify.Structure) { st.Period, st.CycleLength = 4, 4 },
			"evidence.structure.joint_cycle: R_5 = R_3 already (recomputed), so the sequence first repeats from 3 with length 2, not from 3 with length 4"},
		{"joint cycle later", "alternating periodic", func(st *certify.Structure) { st.CycleStart = 4 },
			"evidence.structure.joint_cycle: R_5 = R_3 already"},
		{"joint cycle earlier", "alternating periodic", func(st *certify.Structure) { st.CycleStart = 2 },
			"evidence.structure.joint_cycle: R_4 differs from R_2 (recomputed)"},
		{"joint cycle missing", "four of S_3 subexponential", func(st *certify.Structure) { st.CycleStart, st.CycleLength = 0, 0 },
			"evidence.structure.joint_cycle: missing"},
		{"joint cycle of a primitive set", "123 primitive", func(st *certify.Structure) { st.CycleStart, st.CycleLength = 3, 1 },
			"evidence.structure.joint_cycle: present, but it belongs only to classes periodic, reducible and subexponential"},
		{"blocks changed", "reducible with lambda > 0", func(st *certify.Structure) { st.Blocks = [][]int{{1, 2, 3}} },
			"statement.structure.blocks: [[1 2 3]], but the blocks of the recurrent states are [[1 2] [3]]"},
		{"blocks of a primitive set", "123 primitive", func(st *certify.Structure) { st.Blocks = [][]int{{1, 2}} },
			"statement.structure.blocks: present, but it belongs only to class reducible"},
		{"recurrent states changed", "123 primitive", func(st *certify.Structure) { st.Recurrent = []int{0, 1, 2} },
			"evidence.structure.recurrent_states: [0 1 2], but the recurrent states are [1 2]"},
		{"recurrent state out of range", "123 primitive", func(st *certify.Structure) { st.Recurrent = []int{1, 5} },
			"evidence.structure.recurrent_states: [1 5], but the recurrent states are [1 2]"},
		{"recurrent states of a finite set", "12,21 finite", func(st *certify.Structure) { st.Recurrent = []int{1} },
			"evidence.structure.recurrent_states: present, but it belongs only to classes primitive"},
		{"configurations changed", "123 primitive", func(st *certify.Structure) { st.Configurations = 24 },
			"evidence.structure.configurations: 24, but D has 14 configurations"},
		{"configurations missing", "alternating periodic", func(st *certify.Structure) { st.Configurations = 0 },
			"evidence.structure.configurations: missing"},
		{"finite_from changed", "12,21 finite", func(st *certify.Structure) { st.N1 = 3 },
			"statement.structure.finite_from: 3, but the longest walk from the empty state has 1 moves, so a_n = 0 exactly from n = 2"},
		{"lambda zero of a reducible set with lambda > 0", "reducible with lambda > 0", func(st *certify.Structure) {
			st.Lambda, st.CyclicAvoider = certify.LambdaZero, nil
		}, "statement.structure.lambda_status: zero is false: the configuration"},
		{"lambda zero of a periodic set", "alternating periodic", func(st *certify.Structure) { st.Lambda, st.CyclicAvoider = certify.LambdaZero, nil },
			"statement.structure.lambda_status: zero goes only with class finite, subexponential or reducible, not periodic"},
		{"lambda positive of a subexponential set", "12 subexponential", func(st *certify.Structure) {
			st.Lambda, st.CyclicAvoider = certify.LambdaPositive, []int{2, 1}
		}, "statement.structure.lambda_status: positive, but class subexponential states lambda = 0: write zero"},
		{"lambda positive of a reducible subexponential set", "V-shaped reducible", func(st *certify.Structure) {
			st.Lambda, st.CyclicAvoider = certify.LambdaPositive, []int{1, 3, 2}
		}, "evidence.structure.cyclic_avoider: 132 is not a cyclic avoider: its cyclic window at positions 1..3 (wrapping around) has the pattern 132 of the set"},
		{"lambda undecided of a finite set", "12,21 finite", func(st *certify.Structure) { st.Lambda = certify.LambdaUndecided },
			"statement.structure.lambda_status: undecided, but class finite states lambda = 0"},
		{"cyclic avoider wrapping into the pattern", "123 primitive", func(st *certify.Structure) { st.CyclicAvoider = []int{2, 4, 3, 1} },
			"its cyclic window at positions 4..2 (wrapping around) has the pattern 123 of the set"},
		{"cyclic avoider too short", "123 primitive", func(st *certify.Structure) { st.CyclicAvoider = []int{2, 1} },
			"evidence.structure.cyclic_avoider: 21 has length 2; a cyclic avoider has at least w = 3 entries"},
		{"cyclic avoider not a permutation", "123 primitive", func(st *certify.Structure) { st.CyclicAvoider = []int{3, 2, 1, 3} },
			"evidence.structure.cyclic_avoider: \"3213\" is not a permutation: value 3 repeats"},
		{"cyclic avoider missing", "123 primitive", func(st *certify.Structure) { st.CyclicAvoider = nil },
			"evidence.structure.cyclic_avoider: missing"},
		{"cyclic avoider of a shorter member", "mixed lengths primitive", func(st *certify.Structure) {
			st.Lambda, st.CyclicAvoider = certify.LambdaPositive, []int{1, 2, 4, 3}
		}, "its cyclic window at positions 2..4 (wrapping around) has the pattern 132 of the set"},
		{"unknown class", "123 primitive", func(st *certify.Structure) { st.Class = "aperiodic" },
			"statement.structure.class: \"aperiodic\" is not one of"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := fresh(tc.base)
			tc.change(c.Structure)
			// the digest recomputed: written and read back as a forger would
			if data, err := certify.Marshal(c); err == nil {
				if c, err = certify.Read(bytes.NewReader(data)); err != nil {
					t.Fatal(err)
				}
			}
			wantRefusal(t, certify.Check(bg, c, certify.CheckOptions{}), tc.reason)
		})
	}
}

// TestStructureLimits: the structure section's work and memory are
// estimated before it runs and refused as limit errors.
func TestStructureLimits(t *testing.T) {
	var c *certify.Certificate
	for _, tc := range structureCases() {
		if tc.name == "1234567 primitive" {
			c = assemble(t, tc.given, tc.specs, tc.section(t))
		}
	}
	var le *certify.LimitError
	for _, opts := range []certify.CheckOptions{{MaxWork: 100_000}, {MaxMemory: 1 << 20}} {
		if err := certify.Check(bg, c, opts); !errors.As(err, &le) || !errors.Is(err, certify.ErrLimit) {
			t.Fatalf("under %+v: %v, want a limit refusal", opts, err)
		}
	}
	// the longest joint cycle the format allows is refused by the estimate
	// at the default limits, before any step
	c.Structure = &certify.Structure{Class: certify.ClassSubexponential, Lambda: certify.LambdaZero, CycleStart: 999, CycleLength: 1,
		Recurrent: c.Structure.Recurrent, Configurations: c.Structure.Configurations}
	if err := certify.Check(bg, c, certify.CheckOptions{MaxMemory: 64 << 20}); !errors.As(err, &le) || le.Resource != "memory" {
		t.Fatalf("a joint cycle of 1000 steps at length 7: %v, want a memory refusal", err)
	}
}

// BenchmarkStructure times the checker's structure section (the brackets
// of these certificates are one step at N = M, next to nothing) on single
// patterns of lengths 7, 8 and 9 and a set of four length-7 patterns; the
// sections are derived once, outside the timing:
// go test ./certify/ -run X -bench Structure -benchtime 1x
func BenchmarkStructure(b *testing.B) {
	for _, given := range [][]string{{"1234567"}, {"1234576"}, {"12345678"}, {"123456789"},
		{"1234567", "1234576", "1324657", "2143657"}} {
		b.Run(strings.Join(given, ","), func(b *testing.B) {
			st := certify.OwnStructure(given)
			if len(given) == 1 && strings.HasPrefix("123456789", given[0][:len(given[0])-2]) {
				// by hand: every cyclic window of the decreasing permutation has a descent
				for v := len(given[0]); v >= 1; v-- {
					st.CyclicAvoider = append(st.CyclicAvoider, v)
				}
			} else {
				st.Lambda = certify.LambdaUndecided
			}
			longest := 0
			for _, g := range given {
				longest = max(longest, len(g))
			}
			c := assemble(b, given, []spec{wholeSpec(longest-1, 1, true)}, st)
			var total int64
			if err := certify.Check(bg, c, certify.CheckOptions{Progress: func(_, t int64) { total = t }}); err != nil {
				b.Fatal(err)
			}
			b.Logf("%s: %s, exponent %d, |D| = %d, estimated %d units", given, st.Class, st.Exponent, st.Configurations, total)
			b.ResetTimer()
			for range b.N {
				if err := certify.Check(bg, c, certify.CheckOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestStructureProgressAndCancel: the progress counts the structure
// section's steps and ends at its estimated total; a cancelled check stops
// with the context's error.
func TestStructureProgressAndCancel(t *testing.T) {
	for _, tc := range structureCases() {
		if tc.name != "four of S_3 subexponential" && tc.name != "1234567 primitive" {
			continue
		}
		c := assemble(t, tc.given, tc.specs, tc.section(t))
		var last, total int64
		err := certify.Check(bg, c, certify.CheckOptions{Progress: func(done, tot int64) {
			if done < last || done > tot {
				t.Errorf("%s: progress %d of %d after %d", tc.name, done, tot, last)
			}
			last, total = done, tot
		}})
		if err != nil || last != total {
			t.Fatalf("%s: %v; progress ended at %d of %d", tc.name, err, last, total)
		}
		ctx, cancel := context.WithCancel(bg)
		cancel()
		if err := certify.Check(ctx, c, certify.CheckOptions{}); !errors.Is(err, context.Canceled) {
			t.Fatalf("%s, cancelled: got %v", tc.name, err)
		}
	}
}
