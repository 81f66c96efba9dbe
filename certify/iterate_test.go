package certify

import (
	"math/big"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/interval"
	"avoidcert/pattern"
)

func TestCompositionsOrderAndRank(t *testing.T) {
	for p := 1; p <= pattern.MaxLength; p++ {
		cp := newCompositions(p, 9)
		for D := 0; D <= 9; D++ {
			a := make([]int, p)
			cp.firstOf(D, a)
			var prev []int
			n := 0
			for {
				if s := sum(a); s != D {
					t.Fatalf("p=%d D=%d: %v sums to %d", p, D, a, s)
				}
				if prev != nil && slices.Compare(prev, a) >= 0 {
					t.Fatalf("p=%d D=%d: %v does not follow %v in lexicographic order", p, D, a, prev)
				}
				if r := cp.rank(a); r != n {
					t.Fatalf("p=%d D=%d: rank(%v) = %d, want %d", p, D, a, r, n)
				}
				prev = append(prev[:0], a...)
				n++
				if !cp.next(a) {
					break
				}
			}
			if n != cp.count(D) {
				t.Fatalf("p=%d D=%d: enumerated %d compositions, count says %d", p, D, n, cp.count(D))
			}
		}
	}
}

func sum(a []int) int {
	s := 0
	for _, v := range a {
		s += v
	}
	return s
}

// enumerate counts, by listing every permutation of length m+k, the
// avoiders of s whose windows of length m all have patterns in cells (nil:
// any), by the pattern sigma of their last m entries and the gap sizes a of
// the other values: the combinatorial meaning of G_k[sigma][a].
func enumerate(s pattern.Set, cells []int, k int) map[[2]int]int {
	m := s.Window() - 1
	var pats [][]int
	for _, p := range s.Patterns() {
		pats = append(pats, p)
	}
	cp := newCompositions(m+1, k)
	out := map[[2]int]int{}
	brute.Permutations(m+k, func(p []int) {
		if !brute.Avoids(p, pats) {
			return
		}
		for i := 0; i+m <= len(p) && cells != nil; i++ {
			if !slices.Contains(cells, pattern.Rank(pattern.Standardize(p[i:i+m]))) {
				return
			}
		}
		last := p[k:]
		sorted := slices.Sorted(slices.Values(last))
		a := make([]int, m+1)
		for _, v := range p[:k] {
			a[sortedGap(sorted, v)]++
		}
		out[[2]int{pattern.Rank(pattern.Standardize(last)), cp.rank(a)}]++
	})
	return out
}

// sortedGap returns the number of entries of sorted below v.
func sortedGap(sorted []int, v int) int {
	g := 0
	for g < len(sorted) && sorted[g] < v {
		g++
	}
	return g
}

func TestIterateMatchesEnumeration(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 1))
	for trial := range 40 {
		s := pattern.NewSet(brute.RandomPatterns[pattern.Perm](rng, 3, 2, 4)...)
		m := s.Window() - 1
		var cells []int // every third trial: a random restriction
		if trial%3 == 2 {
			for c := range pattern.Factorial(m) {
				if rng.IntN(3) > 0 {
					cells = append(cells, c)
				}
			}
			if cells == nil {
				cells = []int{0}
			}
		}
		for k := 0; m+k <= 8; k++ {
			sys := newSystem(windowsOf(s), cells, k)
			g := sys.first()
			for range k {
				g = sys.next(g)
			}
			want := enumerate(s, cells, k)
			if k == 0 && cells != nil { // a restricted start is 1 on its cells by definition
				want = map[[2]int]int{}
				for _, c := range cells {
					want[[2]int{c, 0}] = 1
				}
			}
			for cell := range sys.cells {
				for r := range sys.comb.count(k) {
					if got := sys.at(g, cell, r); got.Cmp(big.NewInt(int64(want[[2]int{cell, r}]))) != 0 {
						t.Fatalf("set %s cells %v k=%d: G[%d][%d] = %s, enumeration gives %d", s, cells, k, cell, r, got, want[[2]int{cell, r}])
					}
				}
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
	// outward, and the same digits as the interval package's independent
	// implementation (whose format agrees for values in 1e-6..1e21)
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
		if want := interval.DecimalDown(r, digits); down != want {
			t.Fatalf("%s at %d digits: down %s, interval.DecimalDown %s", r, digits, down, want)
		}
		if want := interval.DecimalUp(r, digits); up != want {
			t.Fatalf("%s at %d digits: up %s, interval.DecimalUp %s", r, digits, up, want)
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
