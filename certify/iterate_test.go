package certify

import (
	"context"
	"math/big"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

// perTermStep is the reference for the fast step: G_(n+1) of a system
// straight from the contract's one-step definition (docs/prefix-states.md),
// term by term: every state p, composition a, gap i and split b; the move
// is tested against the set and its dropped values merged one at a time,
// all without the moves table or the running sums.
func perTermStep(sys *system, g *iterate) *iterate {
	sp := sys.sp
	out := &iterate{n: g.n + 1, tables: make([]*table, len(sp.states))}
	for q, st := range sp.states {
		if sys.in[q] && len(st) <= g.n+1 {
			out.tables[q] = sys.bin.newTable(len(st)+1, g.n+1-len(st), wordsFor(g.n+1))
		}
	}
	for p, st := range sp.states {
		src := g.tables[p]
		if src == nil {
			continue
		}
		L := len(st)
		a := make([]int, L+1)
		firstComposition(a, src.degree)
		for r := 0; ; r++ {
			for i := 0; i <= L; i++ {
				for b := 0; b <= a[i]; b++ {
					plus := grow(st, i)
					gaps := slices.Concat(a[:i], []int{b, a[i] - b}, a[i+1:])
					forbidden := false
					for l := 1; l <= len(plus); l++ {
						for _, pat := range sp.set {
							forbidden = forbidden || (len(pat) == l && slices.Equal(std(plus[len(plus)-l:]), pat))
						}
					}
					if forbidden {
						continue
					}
					keep := 0
					for l := len(plus); l >= 0; l-- {
						if _, ok := sp.index[stateKey(std(plus[len(plus)-l:]))]; ok {
							keep = l
							break
						}
					}
					cur := plus
					for len(cur) > keep {
						rank := cur[0]
						gaps = slices.Concat(gaps[:rank-1], []int{gaps[rank-1] + gaps[rank] + 1}, gaps[rank+1:])
						cur = std(cur[1:])
					}
					q := sp.index[stateKey(cur)]
					if !sys.in[q] {
						continue
					}
					addWords(out.tables[q].at(sys.bin.rank(gaps)), src.at(r))
				}
			}
			if !nextComposition(a) {
				break
			}
		}
	}
	return out
}

func equalIterates(g, h *iterate) bool {
	if g.n != h.n || len(g.tables) != len(h.tables) {
		return false
	}
	for p := range g.tables {
		x, y := g.tables[p], h.tables[p]
		if (x == nil) != (y == nil) {
			return false
		}
		if x == nil {
			continue
		}
		if x.parts != y.parts || x.degree != y.degree || x.words != y.words || !slices.Equal(x.w, y.w) {
			return false
		}
	}
	return true
}

// randomSet draws 1 to 4 patterns of lengths 2 to 6.
func randomSet(rng *rand.Rand) patternSet {
	var ps []perm
	for range 1 + rng.IntN(4) {
		k := 2 + rng.IntN(5)
		p := make(perm, k)
		for i, v := range rng.Perm(k) {
			p[i] = v + 1
		}
		ps = append(ps, p)
	}
	return irredundant(ps)
}

// TestFastStepEqualsPerTerm compares the running-sum step with the
// per-term reference on random mixed-length sets, for the whole system and
// for restricted systems with both starts, step by step.
func TestFastStepEqualsPerTerm(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 3))
	ctx := context.Background()
	for trial := range 60 {
		set := randomSet(rng)
		sp := newStateSpace(set)
		var states []int // nil: whole
		if trial%3 != 0 && len(sp.states) > 1 {
			for p := range sp.states {
				if rng.IntN(2) == 0 {
					states = append(states, p)
				}
			}
			if len(states) == 0 || len(states) == len(sp.states) {
				states = []int{len(sp.states) - 1}
			}
		}
		const top = 9
		sys := newSystem(sp, states, top)
		g := sys.emptyStart()
		if states != nil {
			from := 0
			for _, p := range states {
				from = max(from, len(sp.states[p]))
			}
			g = sys.onesStart(from)
		}
		for g.n < top {
			fast, err := sys.next(ctx, g)
			if err != nil {
				t.Fatal(err)
			}
			if want := perTermStep(sys, g); !equalIterates(fast, want) {
				t.Fatalf("set %v, states %v: the fast G_%d differs from the per-term one", set.strings(), states, g.n+1)
			}
			g = fast
		}
	}
}

func TestSmallStateSpaces(t *testing.T) {
	for _, tc := range []struct {
		given  []string
		states string
	}{
		{[]string{"12"}, "() (1)"}, // docs/prefix-states.md, small cases
		{[]string{"1"}, "()"},      // the same
		{[]string{"1342"}, "() (1) (12) (123)"},
		{[]string{"123", "321"}, "() (1) (12) (21)"},
		{[]string{"213", "312"}, "() (1) (21)"},
		{[]string{"2413", "1.2.3"}, "() (1) (12) (231)"}, // 2413 contains no 123; its prefix 241 gives 231
	} {
		set, err := parseSet(tc.given)
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, p := range newStateSpace(set).states {
			got = append(got, "("+formatPerm(p)+")")
		}
		if strings.Join(got, " ") != tc.states {
			t.Errorf("%v: states %v, want %s", tc.given, got, tc.states)
		}
	}
	// {1342}: 1 + C(n,1) + C(n,2) + C(n,3) coefficients, 7176 at n = 35
	// (docs/prefix-states.md, small cases)
	set, _ := parseSet([]string{"1342"})
	sys := newSystem(newStateSpace(set), nil, 35)
	if got := coefficients(sys, 35); got != 7176 {
		t.Fatalf("1342 at n = 35: %v coefficients, want 7176", got)
	}
	// {1}: a_0 = 1, a_n = 0; {12}: a_n = 1
	for _, tc := range []struct {
		given string
		want  string
	}{{"1", "1 0 0 0 0"}, {"12", "1 1 1 1 1"}} {
		counts, err := Counts(context.Background(), []string{tc.given}, 4)
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, c := range counts {
			got = append(got, c.String())
		}
		if strings.Join(got, " ") != tc.want {
			t.Errorf("{%s}: counts %v, want %s", tc.given, got, tc.want)
		}
	}
}

func TestCompositionOrderAndRank(t *testing.T) {
	bin := newBinomials(20)
	for K := 1; K <= 6; K++ {
		for D := 0; D <= 7; D++ {
			a := make([]int, K)
			firstComposition(a, D)
			prev := []int(nil)
			r := 0
			for {
				if got := bin.rank(a); got != r {
					t.Fatalf("K %d D %d: rank(%v) = %d, want %d", K, D, a, got, r)
				}
				if prev != nil && slices.Compare(prev, a) >= 0 {
					t.Fatalf("K %d D %d: %v does not come after %v", K, D, a, prev)
				}
				prev = slices.Clone(a)
				r++
				if !nextComposition(a) {
					break
				}
			}
			if r != bin.count(K, D) {
				t.Fatalf("K %d D %d: %d compositions, count says %d", K, D, r, bin.count(K, D))
			}
		}
	}
}

func TestDecimalOutward(t *testing.T) {
	for _, tc := range []struct {
		r        string
		digits   int
		down, up string
	}{
		{"0/1", 5, "0", "0"},
		{"1/3", 3, "0.333", "0.334"},
		{"2/3", 1, "0.6", "0.7"},
		{"1/1", 4, "1", "1"},
		{"3/2", 4, "1.5", "1.5"},
		{"9999/10000", 3, "0.999", "1"},
		{"1234567/1", 3, "1230000", "1240000"},
		{"1/1000000000", 2, "0.000000001", "0.000000001"},
		{"1/7000000", 2, "0.00000014", "0.00000015"},
	} {
		r, err := parseRational(tc.r)
		if err != nil {
			t.Fatal(err)
		}
		if got := decimalOutward(r, tc.digits, false); got != tc.down {
			t.Errorf("down(%s, %d) = %s, want %s", tc.r, tc.digits, got, tc.down)
		}
		if got := decimalOutward(r, tc.digits, true); got != tc.up {
			t.Errorf("up(%s, %d) = %s, want %s", tc.r, tc.digits, got, tc.up)
		}
	}
	// outward on random rationals
	rng := rand.New(rand.NewPCG(5, 9))
	for range 3000 {
		r := big.NewRat(rng.Int64N(1e12)+1, rng.Int64N(1e12)+1)
		digits := 1 + rng.IntN(25)
		down, up := decimalOutward(r, digits, false), decimalOutward(r, digits, true)
		if d, _ := new(big.Rat).SetString(down); d.Cmp(r) > 0 {
			t.Fatalf("%s at %d digits: %s is above", r, digits, down)
		}
		if u, _ := new(big.Rat).SetString(up); u.Cmp(r) < 0 {
			t.Fatalf("%s at %d digits: %s is below", r, digits, up)
		}
	}
}

func TestParseNumbersStrict(t *testing.T) {
	for _, s := range []string{"1/2", "0/1", "7/1", "123456789012345678901234567891/2"} {
		r, err := parseRational(s)
		if err != nil || formatRational(r) != s {
			t.Errorf("parseRational(%q) = %v, %v; want the same rational back", s, r, err)
		}
	}
	for _, s := range []string{"", "1", "1/", "/2", "01/2", "1/02", "2/4", "0/2", "1/0", "-1/2", "+1/2", "1/-2",
		" 1/2", "1/2 ", "1.5/2", "1e3/1", "1//2", "1/2/3", "0x10/1", strings.Repeat("1", MaxNumberLength) + "/1"} {
		if _, err := parseRational(s); err == nil {
			t.Errorf("parseRational(%q) accepted", abbreviate(s))
		}
	}
	for _, s := range []string{"", "00", "01", "-1", "+1", "1 ", "1_000", strings.Repeat("9", MaxNumberLength+1)} {
		if _, err := parseInteger(s); err == nil {
			t.Errorf("parseInteger(%q) accepted", abbreviate(s))
		}
	}
}

// TestElevationWidth elevates small iterates MaxStep times in the
// checker's words and compares with plain big.Int arithmetic: the width
// wordsFor(N+d) must hold every entry (a short N with the longest step
// grows the entries most).
func TestElevationWidth(t *testing.T) {
	for _, given := range [][]string{{"123"}, {"1342"}, {"12"}} {
		set, _ := parseSet(given)
		sp := newStateSpace(set)
		N := sp.maxLen
		sys := newSystem(sp, nil, N+MaxStep)
		g := sys.emptyStart()
		for g.n < N {
			g, _ = sys.next(context.Background(), g)
		}
		for p, tb := range g.tables {
			want := make([]*big.Int, tb.size())
			for r := range want {
				want[r] = toBig(tb.at(r))
			}
			got := tb
			a := make([]int, tb.parts)
			for D := tb.degree; D < tb.degree+MaxStep; D++ {
				got = sys.bin.elevate(got, wordsFor(N+MaxStep))
				next := make([]*big.Int, sys.bin.count(tb.parts, D+1))
				firstComposition(a, D+1)
				for r := range next {
					next[r] = new(big.Int)
					for j := range a {
						if a[j] > 0 {
							a[j]--
							next[r].Add(next[r], new(big.Int).Mul(big.NewInt(int64(a[j]+1)), want[sys.bin.rank(a)]))
							a[j]++
						}
					}
					nextComposition(a)
				}
				want = next
			}
			for r := range want {
				if toBig(got.at(r)).Cmp(want[r]) != 0 {
					t.Fatalf("%v state %d: entry %d of the %d-fold elevation is %s, want %s", given, p, r, MaxStep, toBig(got.at(r)), want[r])
				}
			}
		}
	}
}
