package prob

import (
	"context"
	"fmt"
	"math/big"

	"avoidcert/internal/bytesize"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// MaxExactN is the largest N that Exact counts to: a_N for N <= 500 takes
// seconds for patterns of length 3 and grows with the longest prefix state
// (docs/benchmarks.md); the memory limit of Exact decides below it.
const MaxExactN = 500

// InExactRange reports whether a_N is counted exactly within memory bytes
// (N <= MaxExactN and the estimated memory of the engine and the checker
// counting side by side, prove.CountsMemory, fits), and the estimate.
func InExactRange(set pattern.Set, N int, memory int64) (bool, int64) {
	if N < 0 || N > MaxExactN {
		return false, 0
	}
	need := prove.CountsMemory(set, N, prove.Options{})
	return need <= memory, need
}

// Exact returns a_N and a_N/N! for set, counted by the engine and the
// checker side by side (prove.Counts: the checker counts opts.Typed, the
// patterns as the user typed them, when set). It refuses N outside the
// exact range for opts.MaxMemory bytes (prove.DefaultMaxMemory when 0)
// before any work.
func Exact(ctx context.Context, set pattern.Set, N int, opts prove.Options) (*big.Int, *big.Rat, error) {
	memory := opts.MaxMemory
	if memory == 0 {
		memory = prove.DefaultMaxMemory
	}
	ok, need := InExactRange(set, N, memory)
	if !ok {
		if N < 0 || N > MaxExactN {
			return nil, nil, fmt.Errorf("prob: N = %d is outside the exact range 0..%d", N, MaxExactN)
		}
		return nil, nil, fmt.Errorf("%w: counting %s to N = %d needs %s, over the memory budget of %s",
			prove.ErrBudget, set, N, bytesize.About(need), bytesize.Format(memory))
	}
	opts.MaxMemory = memory
	counts, err := prove.Counts(ctx, set, N, opts)
	if err != nil {
		return nil, nil, err
	}
	a := counts[N]
	return a, new(big.Rat).SetFrac(a, factorial(N)), nil
}

func factorial(n int) *big.Int {
	return new(big.Int).MulRange(1, int64(n))
}
