package structure

import (
	"errors"
	"fmt"

	"avoidcert/internal/bytesize"
	"avoidcert/transfer"
)

// MaxSteps is the most sets R_1 .. R_MaxSteps the test computes: the
// primitivity exponent and the end of the joint cycle are at most this
// (the checker's limit too).
const MaxSteps = 1000

// ErrBudget is wrapped by a refusal of the structure test that a larger
// memory budget would lift (a *BudgetError); recognise it with errors.Is.
var ErrBudget = errors.New("structure: over the budget")

// BudgetError is the test refused because its memory would pass
// Options.MaxMemory: before it starts (Steps = 0), when its tables and
// first sets R_k are estimated over it, or after Steps sets R_0 ..
// R_(Steps-1), when one more would be.
type BudgetError struct {
	Cost  Cost
	Limit int64
	Steps int
}

func (e *BudgetError) Error() string {
	if e.Steps > 0 {
		return fmt.Sprintf("the structure test's sets R_0 .. R_%d of %d joint configurations did not reach D or repeat, and one more would need about %s, over the memory budget of %s",
			e.Steps-1, e.Cost.Space, bytesize.Format(e.Cost.Fixed+int64(e.Steps+1)*e.Cost.PerStep), bytesize.Format(e.Limit))
	}
	return fmt.Sprintf("the structure test needs about %s for %d joint configurations (%d states, %d of them recurrent), over the memory budget of %s",
		bytesize.Format(e.Cost.Memory), e.Cost.Space, e.Cost.States, e.Cost.Recurrent, bytesize.Format(e.Limit))
}

// Is makes errors.Is(err, ErrBudget) hold for a *BudgetError.
func (e *BudgetError) Is(target error) bool { return target == ErrBudget }

// maxSpace is the most configurations the test numbers: the move table
// holds them as int32 (with 17 gaps each, a table that large needs some
// 150 GB, so a memory budget refuses such a set first).
const maxSpace = 1<<31 - 1

// firstSteps is the number of sets R_k the estimate counts in advance:
// more than the exponent or the end of the joint cycle of every set tried
// (single patterns of length 9 have exponent 10 at most).
const firstSteps = 32

// Cost is the size of the structure test of a set, known before it runs.
type Cost struct {
	States, Recurrent int
	// Configurations is |D|: the configurations of every ordered pair of
	// recurrent states with no shared value.
	Configurations int
	// Space is the number of configurations the sets R_k are drawn from
	// (every overlap), the bits of one R_k.
	Space int
	// Fixed bounds the bytes of the test's tables (the move table of every
	// configuration, the domain, the step's output, the closable marks);
	// PerStep those of one more set R_k (with witnesses, its links too).
	Fixed, PerStep int64
	// Memory is Fixed plus the first sets R_0 .. R_31 (or to the step
	// limit): the estimate checked before the test starts. Each later set
	// is checked against the budget as the test goes.
	Memory int64
}

// Estimate returns the cost of the structure test of the prefix states st
// with the given options, without running it.
func Estimate(st *transfer.States, opts Options) Cost {
	return estimate(newStateDigraph(st), opts)
}

func estimate(d *stateDigraph, opts Options) Cost {
	perm := make([][]int, d.st.Len())
	for p := range perm {
		perm[p] = d.st.Perm(p)
	}
	rec := marked(d.recurrent)
	c := Cost{States: d.st.Len(), Recurrent: len(rec)}
	blocks, table := int64(0), int64(0)
	eachBlock(perm, rec, binomials(), func(s, c0, o, values, size int) {
		blocks++
		table += int64(size) * int64(values+1)
		c.Space += size
		if o == 0 {
			c.Configurations += size
		}
	})
	words := int64(c.Space+63) / 64
	c.Fixed = 4*int64(len(rec)*len(rec)*(d.st.MaxLength()+1)) + // block look-up
		128*blocks + // the blocks themselves
		4*table + // the move table, one int32 per configuration and gap
		8*words*4 // the domain, the step's output, the cycle's union, the closable marks
	c.PerStep = 8*words + 64 // the set and its hash
	if opts.Witnesses {
		c.PerStep += 8 * int64(c.Space)
	}
	c.Memory = c.Fixed + c.PerStep*int64(min(firstSteps, opts.maxSteps()+1))
	return c
}
