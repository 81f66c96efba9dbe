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

// DefaultMaxMemory caps the test's estimated memory when
// Options.MaxMemory is 0.
const DefaultMaxMemory = 8 << 30

// ErrBudget is wrapped by a refusal of the structure test that a larger
// memory budget would lift (a *BudgetError); recognise it with errors.Is.
var ErrBudget = errors.New("structure: over the budget")

// BudgetError is the test refused before it starts because its estimated
// memory is over Options.MaxMemory.
type BudgetError struct {
	Cost  Cost
	Limit int64
}

func (e *BudgetError) Error() string {
	return fmt.Sprintf("the structure test needs about %s for %d joint configurations (%d states, %d of them recurrent), over the memory budget of %s",
		bytesize.Format(e.Cost.Memory), e.Cost.Space, e.Cost.States, e.Cost.Recurrent, bytesize.Format(e.Limit))
}

// Is makes errors.Is(err, ErrBudget) hold for a *BudgetError.
func (e *BudgetError) Is(target error) bool { return target == ErrBudget }

// Cost is the size of the structure test of a set, known before it runs.
type Cost struct {
	States, Recurrent int
	// Configurations is |D|: the configurations of every ordered pair of
	// recurrent states with no shared value.
	Configurations int
	// Space is the number of configurations the sets R_k are drawn from
	// (every overlap), the bits of one R_k.
	Space int
	// Memory bounds the bytes the test holds: its tables, R_0 .. R_k up to
	// the step limit, and with witnesses one link per configuration and
	// step.
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
	eachBlock(d, perm, rec, binomials(), func(s, c0, o, values, size int) {
		blocks++
		table += int64(size) * int64(values+1)
		c.Space += size
		if o == 0 {
			c.Configurations += size
		}
	})
	words := int64(c.Space+63) / 64
	steps := int64(opts.maxSteps()) + 1
	mem := 4*int64(len(rec)*len(rec)*(d.st.MaxLength()+1)) + // block look-up
		128*blocks + // the blocks themselves
		4*table + // the move table, one int32 per configuration and gap
		8*words*(steps+4) + // R_0 .. R_MaxSteps, the domain, the step's output, the closable marks
		64*steps // hashes of the sets
	if opts.Witnesses {
		mem += 8 * int64(c.Space) * steps
	}
	c.Memory = mem
	return c
}
