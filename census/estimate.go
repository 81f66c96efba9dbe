package census

import (
	"fmt"
	"math"
	"slices"

	"avoidcert/internal/bytesize"
	"avoidcert/pattern"
	"avoidcert/structure"
	"avoidcert/transfer"
)

// The census's model of one class, calibrated on measured runs: a random
// sample of 200 classes of length 8 run one by one (counts to 25, 10
// digits: 4.2 s of CPU and 209 MB resident per class on average, the
// machine shared at a load of about 6; docs/census-8/sample.tsv) and
// in-process times of counting and bracketing classes of lengths 6 to 8.
// It is a model: its figures are estimates, never bounds.
const (
	// bracketSteps: the bracket that reaches D digits is taken at about
	// n = M + 4 + ceil(bracketSteps * D), M the longest prefix state
	// (measured at 10 digits: n - M - 4 from 12 to 15 for length 8,
	// 11 to 17 for lengths 6 and 7).
	bracketSteps = 1.4
	// countNanos and bracketNanos are the CPU nanoseconds per byte of the
	// iterates G_0..G_n summed: counting to N with the engine and the
	// checker side by side, and the bracket run with its certificate's
	// check (measured 25 to 40 and 23 to 52 in process; scaled by 1.35 to
	// the whole command's CPU time in the sample).
	countNanos   = 36
	bracketNanos = 47
	// residentFactor scales the engine's largest footprint (counting, or
	// the step to the bracket) to the peak resident memory of the class,
	// the checker's work and the collector's slack included; residentBase
	// is the process's own (modelled 197 MB for length 8 against 209 MB
	// measured on average, 350 MB at most).
	residentFactor = 5
	residentBase   = 12 << 20
)

// ClassEstimate is the estimated need of one class.
type ClassEstimate struct {
	Representative string
	// Resident is the modelled peak resident memory of the class's work;
	// Seconds its modelled CPU time.
	Resident int64
	Seconds  float64
	// Counting and Structure are the engine's own closed-form estimates
	// of counting to N and of the structure test: the budget of a worker
	// refuses them exactly as the run would.
	Counting, Structure int64
}

// Estimate is what a census run expects to need, before it starts.
type Estimate struct {
	Params Params
	Jobs   int
	// Worker is the memory budget of each of the Jobs workers: counting,
	// the structure test, the bracket and the checker of every class are
	// held to it (a class over it stops, never the machine).
	Worker  int64
	Classes []ClassEstimate // the run's classes, in shard order
}

// EstimateRun returns the estimate of a census of params over shard with
// jobs workers of worker bytes each. It runs no iteration: the sizes are
// closed forms of the prefix states (a few seconds for the 10176 classes
// of length 8, on jobs goroutines).
func EstimateRun(params Params, shard Shard, jobs int, worker int64) *Estimate {
	e := &Estimate{Params: params, Jobs: max(jobs, 1), Worker: worker}
	classes := shard.Classes(params.Length)
	e.Classes = make([]ClassEstimate, len(classes))
	inParallel(len(classes), e.Jobs, func(i int) {
		e.Classes[i] = estimateClass(classes[i].Representative, params)
	})
	return e
}

func estimateClass(p pattern.Perm, params Params) ClassEstimate {
	set := pattern.NewSet(p)
	st := transfer.NewStates(set)
	eng := transfer.New(transfer.Whole(st))
	n := st.MaxLength() + 4 + int(math.Ceil(bracketSteps*float64(params.Digits)))
	var countBytes, bracketBytes float64
	for k := 0; k <= max(params.To, n+1); k++ {
		b := float64(eng.IterateBytes(k))
		if k <= params.To {
			countBytes += b
		}
		if k <= n+1 {
			bracketBytes += b
		}
	}
	c := ClassEstimate{
		Representative: p.String(),
		Counting:       transfer.CountsFootprint(set, params.To),
		Structure:      structure.Estimate(st, structure.Options{}).Memory,
		Seconds:        (countNanos*countBytes + bracketNanos*bracketBytes) / 1e9,
	}
	c.Resident = residentBase + residentFactor*max(c.Counting, eng.Footprint(n)+eng.IterateBytes(n))
	return c
}

// Over returns the first class whose counting or structure test the
// worker's budget refuses (the run would stop on it), with what it needs.
func (e *Estimate) Over() (class string, what string, need int64, over bool) {
	for _, c := range e.Classes {
		switch {
		case c.Counting > e.Worker:
			return c.Representative, fmt.Sprintf("counting to n = %d", e.Params.To), c.Counting, true
		case c.Structure > e.Worker:
			return c.Representative, "the structure test", c.Structure, true
		}
	}
	return "", "", 0, false
}

// Seconds returns the modelled wall time of the run: the classes' CPU
// time shared by the workers, and at least the longest class.
func (e *Estimate) Seconds() float64 {
	var sum, longest float64
	for _, c := range e.Classes {
		sum += c.Seconds
		longest = max(longest, c.Seconds)
	}
	return max(sum/float64(min(e.Jobs, max(len(e.Classes), 1))), longest)
}

// Summary states the estimate in one line: per class (median and
// largest), in all, and the worker's budget.
func (e *Estimate) Summary() string {
	if len(e.Classes) == 0 {
		return "no class to do"
	}
	secs := make([]float64, len(e.Classes))
	var largest ClassEstimate
	for i, c := range e.Classes {
		secs[i] = c.Seconds
		if c.Resident > largest.Resident {
			largest = c
		}
	}
	slices.Sort(secs)
	return fmt.Sprintf("estimated per class %s of CPU (median, %s at most) and %s of memory at most (%s); in all %s on %d worker(s), each held to %s (estimates from a model calibrated on measured runs, not bounds; the refinement of the groups' order comes on top)",
		duration(secs[len(secs)/2]), duration(secs[len(secs)-1]), bytesize.About(largest.Resident), largest.Representative,
		duration(e.Seconds()), e.Jobs, bytesize.Format(e.Worker))
}

// duration writes seconds for a reader: 0.8 s, 12 min, 3.4 h.
func duration(s float64) string {
	switch {
	case s < 1:
		return fmt.Sprintf("%.2g s", s)
	case s < 60:
		return fmt.Sprintf("%.1f s", s)
	case s < 3600:
		return fmt.Sprintf("%.0f min", s/60)
	}
	return fmt.Sprintf("%.1f h", s/3600)
}
