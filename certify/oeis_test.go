package certify_test

import (
	"bufio"
	"context"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"avoidcert/certify"
	"avoidcert/internal/brute"
)

// oeisTerms reads the terms of ../testdata/oeis/<id>.txt and their offset.
func oeisTerms(t *testing.T, id string) (terms []*big.Int, offset int) {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "oeis", id+".txt"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	sc.Buffer(nil, 1<<20)
	for sc.Scan() {
		if v, ok := strings.CutPrefix(sc.Text(), "offset:"); ok {
			if offset, err = strconv.Atoi(strings.TrimSpace(strings.Split(v, ",")[0])); err != nil {
				t.Fatalf("%s: bad offset %q", id, v)
			}
		}
		if list, ok := strings.CutPrefix(sc.Text(), "terms:"); ok {
			for _, s := range strings.Split(list, ",") {
				v, ok := new(big.Int).SetString(strings.TrimSpace(s), 10)
				if !ok {
					t.Fatalf("%s: bad term %q", id, s)
				}
				terms = append(terms, v)
			}
		}
	}
	if len(terms) == 0 {
		t.Fatalf("%s: no terms", id)
	}
	return terms, offset
}

// TestCountsOEIS compares Counts with the published tables, as far as
// each goes (at most n = 60 for the short patterns, 30 for the long ones,
// to keep the test fast).
func TestCountsOEIS(t *testing.T) {
	for _, tc := range []struct {
		set  []string
		id   string
		upTo int
	}{
		{[]string{"123"}, "A049774", 60},        // OEIS A049774
		{[]string{"132"}, "A111004", 60},        // OEIS A111004
		{[]string{"1234"}, "A117158", 40},       // OEIS A117158
		{[]string{"1243"}, "A117226", 40},       // OEIS A117226
		{[]string{"1342"}, "A117156", 40},       // OEIS A117156
		{[]string{"1324"}, "A113228", 40},       // OEIS A113228
		{[]string{"1423"}, "A201692", 40},       // OEIS A201692
		{[]string{"2143"}, "A113229", 40},       // OEIS A113229
		{[]string{"2413"}, "A201693", 40},       // OEIS A201693
		{[]string{"12345"}, "A177523", 30},      // OEIS A177523
		{[]string{"12354"}, "A202213", 30},      // OEIS A202213
		{[]string{"123456"}, "A177533", 30},     // OEIS A177533
		{[]string{"123", "321"}, "A001250", 40}, // OEIS A001250: alternating permutations (the avoiders of {123, 321}, both directions)
	} {
		terms, offset := oeisTerms(t, tc.id)
		top := min(offset+len(terms)-1, tc.upTo)
		got, err := certify.Counts(context.Background(), tc.set, top)
		if err != nil {
			t.Fatal(err)
		}
		for n := offset; n <= top; n++ {
			if got[n].Cmp(terms[n-offset]) != 0 {
				t.Fatalf("%v: a_%d = %s, but %s gives %s", tc.set, n, got[n], tc.id, terms[n-offset])
			}
		}
	}
}

// TestCountsBruteForce compares Counts with plain enumeration
// (internal/brute) on random sets of mixed lengths 2 to 6, up to n = 8.
func TestCountsBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 6))
	for range 40 {
		pats := brute.RandomPatterns[[]int](rng, 4, 2, 6)
		var given []string
		for _, p := range pats {
			var b strings.Builder
			for _, v := range p {
				b.WriteString(strconv.Itoa(v))
			}
			given = append(given, b.String())
		}
		got, err := certify.Counts(context.Background(), given, 8)
		if err != nil {
			t.Fatal(err)
		}
		for n, c := range got {
			if want := brute.Count(n, pats); c.Cmp(big.NewInt(int64(want))) != 0 {
				t.Fatalf("%v: a_%d = %s, enumeration gives %d", given, n, c, want)
			}
		}
	}
}

// TestCountsLengthEightAndNine compares Counts with plain enumeration for
// sets with members of length 8 and 9, the longest a certificate may name,
// up to n = 9.
func TestCountsLengthEightAndNine(t *testing.T) {
	for _, given := range [][]string{{"123456789"}, {"21436587"}, {"132", "987654321"}, {"12345678", "897564231"}} {
		got, err := certify.Counts(context.Background(), given, 9)
		if err != nil {
			t.Fatal(err)
		}
		pats := parsePats(given)
		for n, c := range got {
			if want := brute.Count(n, pats); c.Cmp(big.NewInt(int64(want))) != 0 {
				t.Fatalf("%v: a_%d = %s, enumeration gives %d", given, n, c, want)
			}
		}
	}
	// a pattern of length 10 is beyond the limit
	if _, err := certify.Counts(context.Background(), []string{"1.2.3.4.5.6.7.8.9.10"}, 3); err == nil || !strings.Contains(err.Error(), "length 10 is over the limit of 9") {
		t.Fatalf("length 10: %v", err)
	}
}
