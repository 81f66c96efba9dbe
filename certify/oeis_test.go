package certify_test

import (
	"bufio"
	"context"
	"math/big"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"avoidcert/certify"
	"avoidcert/pattern"
)

// oeisTerms reads the terms of ../testdata/oeis/<id>.txt (offset 0).
func oeisTerms(t *testing.T, id string) []*big.Int {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "oeis", id+".txt"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var terms []*big.Int
	sc := bufio.NewScanner(f)
	sc.Buffer(nil, 1<<20)
	for sc.Scan() {
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
	return terms
}

func TestIterateSumsOEIS(t *testing.T) {
	for _, tc := range []struct{ set, id string }{
		{"123", "A049774"},  // OEIS A049774, offset 0
		{"132", "A111004"},  // OEIS A111004, offset 0
		{"1234", "A117158"}, // OEIS A117158, offset 0
	} {
		s, err := pattern.ParseSet([]string{tc.set})
		if err != nil {
			t.Fatal(err)
		}
		m := s.Window() - 1
		terms := oeisTerms(t, tc.id)
		for k := 0; m+k < len(terms) && k <= 14; k++ {
			if _, got := certify.IterateDigest(s, nil, k); got.Cmp(terms[m+k]) != 0 {
				t.Fatalf("%s: a_%d = %s, %s gives %s", tc.set, m+k, got, tc.id, terms[m+k])
			}
		}
	}
}

func TestCountsOEIS(t *testing.T) {
	for _, tc := range []struct {
		given []string
		id    string
	}{
		{[]string{"123"}, "A049774"},   // OEIS A049774, offset 0
		{[]string{"1342"}, "A117156"},  // OEIS A117156, offset 0
		{[]string{"12345"}, "A177523"}, // OEIS A177523, offset 0
	} {
		terms := oeisTerms(t, tc.id)
		n := min(len(terms)-1, 14)
		got, err := certify.Counts(context.Background(), tc.given, n)
		if err != nil {
			t.Fatal(err)
		}
		for i := range n + 1 {
			if got[i].Cmp(terms[i]) != 0 {
				t.Fatalf("%v: a_%d = %s, %s gives %s", tc.given, i, got[i], tc.id, terms[i])
			}
		}
	}
}
