package certify

import (
	"context"
	"fmt"
	"math/big"
)

// Counts returns a_0, .., a_n for the set of the patterns given (as a user
// types them: "1342", "1.3.4.2" or comma lists "123,321", split by
// PatternTokens and read by the checker's own parser): the
// number of permutations of 1..k that avoid every pattern consecutively,
// as the sums of the whole system's iterates G_k computed by the
// checker's own code. It is a computation independent of the engine's
// counts. Cancelling ctx stops it within one state's step.
func Counts(ctx context.Context, given []string, n int) ([]*big.Int, error) {
	if n < 0 {
		return nil, fmt.Errorf("counts: n = %d is negative", n)
	}
	set, err := parseSet(PatternTokens(given))
	if err != nil {
		return nil, fmt.Errorf("counts: %v", err)
	}
	sys := newSystem(newStateSpace(set), nil, n)
	g := sys.emptyStart()
	out := []*big.Int{g.sum()}
	for len(out) <= n {
		if g, err = sys.next(ctx, g); err != nil {
			return nil, err
		}
		out = append(out, g.sum())
	}
	return out, nil
}
