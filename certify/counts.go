package certify

import (
	"context"
	"fmt"
	"math/big"

	"avoidcert/pattern"
)

// Counts returns a_0..a_n for the set of the given patterns, computed with
// the checker's own code: by listing the permutations below length m, and
// as the sums of the iterates G_0..G_{n-m} of this file's cell-form
// recurrence (iterate.go) from there on. It shares no code with the fast
// engine, so a caller that compares the two has two independent counts.
//
// Temporary: this is the cell-form version for format version 2. The
// checker branch (format version 3) brings its own Counts with the same
// signature over its prefix-state iteration, and replaces this file at the
// merge.
func Counts(ctx context.Context, given []string, n int) ([]*big.Int, error) {
	set, err := pattern.ParseSet(given)
	if err != nil {
		return nil, err
	}
	if n < 0 {
		return nil, fmt.Errorf("certify: counts up to n = %d: n must not be negative", n)
	}
	win := windowsOf(set)
	out := make([]*big.Int, 0, n+1)
	for length := 0; length <= n && length < win.m; length++ {
		c := int64(0)
		for _, ok := range set.AvoidingPerms(length) {
			if ok {
				c++
			}
		}
		out = append(out, big.NewInt(c))
	}
	if n < win.m {
		return out, nil
	}
	sys := newSystem(win, nil, n-win.m)
	g := sys.first()
	for {
		out = append(out, g.sum())
		if g.degree == n-win.m {
			return out, nil
		}
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		g = sys.next(g)
	}
}
