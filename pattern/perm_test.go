package pattern_test

import (
	"slices"
	"sort"
	"strings"
	"testing"

	"avoidcert/internal/brute"
	"avoidcert/pattern"
)

// mustPerm parses a pattern the test writes itself.
func mustPerm(t testing.TB, s string) pattern.Perm {
	t.Helper()
	p, err := pattern.Parse(s)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func TestRankUnrankAll(t *testing.T) {
	for n := 0; n <= 7; n++ {
		all := pattern.All(n)
		if len(all) != pattern.Factorial(n) {
			t.Fatalf("All(%d) has %d entries, want %d", n, len(all), pattern.Factorial(n))
		}
		// the independent enumeration lists the same permutations in
		// the same (lexicographic) order
		r := 0
		brute.Permutations(n, func(p []int) {
			if !slices.Equal(all[r], p) {
				t.Fatalf("All(%d)[%d] = %v, lexicographic order has %v", n, r, all[r], p)
			}
			if got := pattern.Rank(pattern.Perm(p)); got != r {
				t.Fatalf("Rank(%v) = %d, want %d", p, got, r)
			}
			if got := pattern.Unrank(n, r); !slices.Equal(got, p) {
				t.Fatalf("Unrank(%d, %d) = %v, want %v", n, r, got, p)
			}
			r++
		})
	}
}

func TestFactorial(t *testing.T) {
	want := 1
	for n := 0; n <= 20; n++ {
		if n > 0 {
			want *= n
		}
		if got := pattern.Factorial(n); got != want {
			t.Errorf("Factorial(%d) = %d, want %d", n, got, want)
		}
	}
}

func TestStandardize(t *testing.T) {
	tests := []struct {
		seq  []int
		want string
	}{
		{[]int{}, ""},
		{[]int{7}, "1"},
		{[]int{10, 30, 40, 20}, "1342"},
		{[]int{-5, 100, 3}, "132"},
		{[]int{9, 8, 7, 1}, "4321"},
	}
	for _, tc := range tests {
		got := pattern.Standardize(tc.seq)
		if got.String() != tc.want {
			t.Errorf("Standardize(%v) = %v, want %s", tc.seq, got, tc.want)
		}
		if len(tc.seq) > 0 && !pattern.OrderIsomorphic(tc.seq, got) {
			t.Errorf("%v is not order-isomorphic to its own pattern %v", tc.seq, got)
		}
	}
}

func TestSymmetriesOfPerms(t *testing.T) {
	for n := 1; n <= 6; n++ {
		for _, p := range pattern.All(n) {
			r, c, i := p.Reverse(), p.Complement(), p.Inverse()
			if !r.Reverse().Equal(p) || !c.Complement().Equal(p) || !i.Inverse().Equal(p) {
				t.Fatalf("%v: reverse, complement and inverse must be involutions", p)
			}
			if !r.Complement().Equal(c.Reverse()) {
				t.Fatalf("%v: reverse and complement must commute", p)
			}
			for k := range p {
				if r[k] != p[n-1-k] || c[k] != n+1-p[k] || p[i[k]-1] != k+1 {
					t.Fatalf("%v: reverse %v, complement %v or inverse %v is wrong at %d", p, r, c, i, k)
				}
			}
		}
	}
	// a worked case, checked by hand
	p := mustPerm(t, "1342")
	if got := p.Reverse().String() + " " + p.Complement().String() + " " + p.Inverse().String(); got != "2431 4213 1423" {
		t.Errorf("1342: reverse, complement, inverse = %s, want 2431 4213 1423", got)
	}
}

func TestPermStringAndOrder(t *testing.T) {
	long := pattern.Perm{1, 10, 2, 3, 4, 5, 6, 7, 8, 9}
	if got := long.String(); got != "1.10.2.3.4.5.6.7.8.9" {
		t.Errorf("String of a length-10 permutation = %q, want dots between entries", got)
	}
	ps := []pattern.Perm{mustPerm(t, "321"), mustPerm(t, "12"), mustPerm(t, "132"), mustPerm(t, "1"), mustPerm(t, "123")}
	sort.Slice(ps, func(i, j int) bool { return ps[i].Less(ps[j]) })
	var got []string
	for _, p := range ps {
		got = append(got, p.String())
	}
	if strings.Join(got, " ") != "1 12 123 132 321" {
		t.Errorf("Less orders %v, want shorter first, then lexicographic", got)
	}
	if ps[0].Less(ps[0]) || !ps[1].Equal(pattern.Perm{1, 2}) || ps[1].Equal(pattern.Perm{1, 2, 3}) {
		t.Error("Less must be strict and Equal must compare lengths and entries")
	}
}

// The OEIS entries list some permutations that contain or avoid a pattern;
// Contains must agree with every listed one and with the number of
// unlisted ones.
func TestContainsPublishedExamples(t *testing.T) {
	tests := []struct {
		source   string
		pattern  string
		n        int
		listed   string // space-separated
		contains bool   // true: the listed permutations are exactly those containing the pattern; false: exactly those avoiding it
	}{
		// OEIS A111004, %e: the 4! - a(4) = 8 permutations containing a consecutive 132
		{"A111004", "132", 4, "1243 1324 1423 1432 2143 2431 3142 4132", true},
		// OEIS A049774, %e: a(4) = 17, the permutations avoiding 123
		{"A049774", "123", 4, "1324 1423 1432 2143 2314 2413 2431 3142 3214 3241 3412 3421 4132 4213 4231 4312 4321", false},
		// OEIS A049774, %e: a(3) = 5
		{"A049774", "123", 3, "132 213 231 312 321", false},
		// OEIS A113229, %e: the 5! - a(5) = 10 permutations containing 3412
		{"A113229", "3412", 5, "14523 24513 34125 34512 35124 43512 45123 45132 45231 53412", true},
	}
	for _, tc := range tests {
		pat := mustPerm(t, tc.pattern)
		listed := make(map[string]bool)
		for _, s := range strings.Fields(tc.listed) {
			listed[s] = true
		}
		for _, p := range pattern.All(tc.n) {
			has := pattern.Contains(p, pat)
			if inList := listed[p.String()]; inList != (has == tc.contains) {
				t.Errorf("OEIS %s: Contains(%v, %s) = %v, but the entry's list (of permutations that contain it: %v) has %v: %v",
					tc.source, p, tc.pattern, has, tc.contains, p, inList)
			}
		}
	}
	// OEIS A111004, %e: 2431 contains 132 in its first three entries, and
	// 1342 contains a scattered but no consecutive 132.
	if !pattern.Contains([]int{2, 4, 3, 1}, mustPerm(t, "132")) || pattern.Contains([]int{1, 3, 4, 2}, mustPerm(t, "132")) {
		t.Error("OEIS A111004 example: 2431 contains consecutive 132, 1342 does not")
	}
	// OEIS A113228, %e: 24135 avoids the consecutive 1324.
	if pattern.Contains([]int{2, 4, 1, 3, 5}, mustPerm(t, "1324")) {
		t.Error("OEIS A113228 example: 24135 avoids the consecutive pattern 1324")
	}
}
