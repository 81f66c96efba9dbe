package structure

import (
	"avoidcert/internal/settest"
	"context"
	"math/rand/v2"
	"slices"
	"testing"

	"avoidcert/pattern"
)

// unrank agrees with pattern.Unrank, pattern.Rank needs no standardising,
// and the cursor visits the permutations in rank order.
func TestRankHelpersMatchPattern(t *testing.T) {
	for n := 1; n <= 7; n++ {
		js := &jointSpace{n: n, fact: factorials(n)}
		q, d := make([]int, n), make([]int, n)
		c := js.newCursor()
		for r, p := range pattern.All(n) {
			js.unrank(r, q, d)
			if !p.Equal(q) {
				t.Fatalf("unrank(%d, %d) = %v, want %v", n, r, q, p)
			}
			if got := pattern.Rank(spread(p)); got != r {
				t.Fatalf("Rank of %v spread out = %d, want %d", p, got, r)
			}
			sum := 0
			for i, di := range d {
				sum += di * js.fact[n-1-i]
			}
			if sum != r {
				t.Fatalf("digits of %v give rank %d, want %d", p, sum, r)
			}
			c.seek(r)
			if !p.Equal(c.q) || !slices.Equal(c.d, d) {
				t.Fatalf("cursor at %d holds %v %v, want %v %v", r, c.q, c.d, p, d)
			}
		}
	}
}

// spread maps a permutation to other distinct values in the same order.
func spread(p []int) []int {
	out := make([]int, len(p))
	for i, v := range p {
		out[i] = 3*v*v - 7
	}
	return out
}

// R_k computed by the step is the set of joint patterns of the avoiding
// permutations of length m+k (the definition, by enumeration).
func TestJointStepsMatchDefinition(t *testing.T) {
	sets := [][]string{
		{"12"}, {"21"}, {"123"}, {"132"}, {"123,321"}, {"132,231"}, {"123,231,312,321"},
		{"1234"}, {"1324"}, {"2413"}, {"123,2143"}, {"12,2341"}, {"1234,4321,1342"},
	}
	rng := rand.New(rand.NewPCG(7, 11))
	for range 12 {
		sets = append(sets, []string{settest.Random(rng, 5, 4).String()})
	}
	for _, args := range sets {
		s := settest.Must(t, args...)
		sys := WindowsOf(s)
		m := sys.M
		js := newJointSpace(sys)
		cur, err := js.initial(context.Background())
		if err != nil {
			t.Fatal(err)
		}
		for k := m; m+k <= 8; k++ {
			want := bruteJoint(s, m, m+k)
			if got := cur.count(); got != len(want) {
				t.Fatalf("%v: |R_%d| = %d, enumeration finds %d joint patterns", s, k, got, len(want))
			}
			for r := range want {
				if !cur.has(r) {
					t.Fatalf("%v: R_%d lacks %v", s, k, pattern.Unrank(2*m, r))
				}
			}
			if cur, err = js.step(context.Background(), cur, nil); err != nil {
				t.Fatal(err)
			}
		}
	}
}

// The domain holds the joint patterns whose halves avoid the shorter
// members; with one length it is all of S_2m.
func TestDomain(t *testing.T) {
	for _, args := range []string{"1324", "123,2143", "12,2341", "21,123"} {
		s := settest.Must(t, args)
		sys := WindowsOf(s)
		m := sys.M
		js := newJointSpace(sys)
		for r, p := range pattern.All(2 * m) {
			want := s.Avoids(p[:m]) && s.Avoids(p[m:])
			if js.domain.has(r) != want {
				t.Fatalf("%v: domain holds %v: %v, want %v", s, p, js.domain.has(r), want)
			}
		}
	}
}

// realise places each new entry in the stated gap of the tracked entries,
// and predecessor inverts one step.
func TestPredecessorInvertsStep(t *testing.T) {
	for _, args := range []string{"1324", "123,321", "2143,1234"} {
		s := settest.Must(t, args)
		sys := WindowsOf(s)
		m := sys.M
		js := newJointSpace(sys)
		prev, _ := js.initial(context.Background())
		next, _ := js.step(context.Background(), prev, nil)
		q, d := make([]int, js.n), make([]int, js.n)
		checked := 0
		for r := range js.size {
			if !next.has(r) {
				continue
			}
			src, gap, ok := js.predecessor(r, prev)
			if !ok {
				t.Fatalf("%v: %v in R_%d has no predecessor", s, pattern.Unrank(2*m, r), m+1)
			}
			js.unrank(src, q, d)
			p := realise(m, q, []int{gap})
			if !s.Avoids(p) || pattern.Rank(Joint(p, m)) != r {
				t.Fatalf("%v: predecessor %v with gap %d realises %v, joint %v, want %v", s, q, gap, p, Joint(p, m), pattern.Unrank(2*m, r))
			}
			checked++
		}
		if checked == 0 {
			t.Fatalf("%v: empty R_%d", s, m+1)
		}
	}
}
