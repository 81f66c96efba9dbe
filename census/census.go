package census

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"sync"
	"time"

	"avoidcert/certify"
	"avoidcert/internal/par"
	"avoidcert/pattern"
)

// Lengths of patterns a census covers.
const (
	MinLength = 3
	MaxLength = 8
)

// Params are what a census computes; two runs with equal Params write the
// same tables.
type Params struct {
	Length int `json:"length"` // pattern length K
	To     int `json:"to"`     // counts a_0..a_To
	// Digits are the significant digits certified for lambda; 0 asks for
	// counts, groups and forms only: each class is certified by the
	// cheapest certificate its structure allows (prove.Classify), whose
	// lambda range is coarse, and the groups are not refined.
	Digits int `json:"digits"`
	// RefineDigits caps the digits at which the classes of two adjacent
	// count groups whose ranges overlap are bracketed again (Digits: no
	// refinement).
	RefineDigits int `json:"refine_digits"`
}

// Validate reports parameters a census cannot run with.
func (p Params) Validate() error {
	switch {
	case p.Length < MinLength || p.Length > MaxLength:
		return fmt.Errorf("length %d is outside %d..%d", p.Length, MinLength, MaxLength)
	case p.To < 0:
		return fmt.Errorf("counts to n = %d: n must not be negative", p.To)
	case p.Digits < 0:
		return fmt.Errorf("%d digits: the digits must not be negative (0: counts, groups and forms only)", p.Digits)
	case p.RefineDigits < p.Digits:
		return fmt.Errorf("refining up to %d digits: the cap must be at least the census's %d digits", p.RefineDigits, p.Digits)
	}
	return nil
}

// Shard names the Index-th (1-based) of Of slices of the classes; the
// zero value (or 1 of 1) is the whole census. Class i (0-based, in
// pattern.SymmetryClasses order) belongs to slice i mod Of + 1, so that
// every slice gets patterns from all over the list.
type Shard struct {
	Index int `json:"index"`
	Of    int `json:"of"`
}

// Whole reports whether s is the whole census.
func (s Shard) Whole() bool { return s.Of <= 1 }

// Validate reports a shard that names no slice.
func (s Shard) Validate() error {
	if s.Whole() && s.Index <= 1 {
		return nil
	}
	if s.Index < 1 || s.Index > s.Of {
		return fmt.Errorf("shard %d/%d: the index must be between 1 and %d", s.Index, s.Of, s.Of)
	}
	return nil
}

func (s Shard) String() string { return fmt.Sprintf("%d/%d", s.Index, s.Of) }

// Classes returns the symmetry classes of the length that belong to s.
func (s Shard) Classes(length int) []pattern.Class {
	all := pattern.SymmetryClasses(length)
	if s.Whole() {
		return all
	}
	var mine []pattern.Class
	for i, c := range all {
		if i%s.Of == s.Index-1 {
			mine = append(mine, c)
		}
	}
	return mine
}

// Range is a certified closed interval as outward-rounded decimals. Hi is
// "" when no finite upper end is proved.
type Range struct {
	Lo string `json:"lo"`
	Hi string `json:"hi"`
}

// Certified is what a Certifier returns for one set: Certificate holds
// the file bytes of a certificate the checker has accepted for exactly
// this set, Checked the same certificate as it was checked. The row's
// certified fields are read from Checked (its outward decimals, its
// structure class and form), never given separately. Short is the budget
// that stopped the bracket before the digits asked for (wrapping
// prove.ErrBudget), nil when they were reached: a class certificate must
// reach them, a refinement keeps the best bracket it got.
type Certified struct {
	Certificate []byte
	Checked     *certify.Certificate
	Short       error
}

// Certifier certifies one set to the given digits (structure, bracket,
// certificate and the checker's verdict). It must be safe for concurrent
// use and give the same bytes for the same set and digits on every run.
type Certifier func(ctx context.Context, set pattern.Set, digits int) (Certified, error)

// Counter returns the exact counts a_0..a_n of a set. It must be safe for
// concurrent use.
type Counter func(ctx context.Context, set pattern.Set, n int) ([]*big.Int, error)

// Event reports progress: Done of Total classes of the run's shard are
// finished (Resumed of them were in the journal when the run started);
// Class is the class just finished, "" for the first event of a phase.
// Round is 0 while the classes are certified, r >= 1 in the r-th round of
// the refinement (Done of Total classes of that round bracketed again,
// Resumed of them found in the folder).
type Event struct {
	Done, Total, Resumed int
	Class                string
	Round                int
}

// Options configure Run.
type Options struct {
	Params  Params
	Shard   Shard
	Dir     string // output folder; created if missing
	Jobs    int    // classes certified at once (at least 1)
	Tool    string // the producing tool and version, written into census.json
	Certify Certifier
	Count   Counter
	// Check re-checks the certificates of classes taken from the journal
	// of an earlier run: a journal is untrusted, and a record whose
	// certificate the checker refuses or does not support is done again.
	Check Checker
	// Progress, if set, is called once when the run starts (with the
	// classes taken from the journal) and after each finished class,
	// never concurrently.
	Progress func(Event)
}

// Run computes the census of opts.Params for opts.Shard in opts.Dir,
// continuing from the journal of an earlier run, and writes the tables
// once every class of the shard is finished. A cancelled run, or one
// where a class failed, keeps every finished class in the journal.
func Run(ctx context.Context, opts Options) (*Report, error) {
	if err := opts.Params.Validate(); err != nil {
		return nil, err
	}
	if err := opts.Shard.Validate(); err != nil {
		return nil, err
	}
	if opts.Certify == nil || opts.Count == nil || opts.Check == nil {
		return nil, errors.New("census: Options.Certify, Count and Check are required")
	}
	if opts.Shard.Whole() {
		opts.Shard = Shard{}
	}
	j, err := openJournal(ctx, opts.Dir, opts.Params, opts.Shard)
	if err != nil {
		return nil, err
	}
	defer j.close()
	classes := opts.Shard.Classes(opts.Params.Length)
	if len(classes) == 0 {
		return nil, inputErrorf("shard %s of length %d holds no class: there are only %d classes; use at most that many shards",
			opts.Shard, opts.Params.Length, len(Shard{}.Classes(opts.Params.Length)))
	}
	rows, err := j.finished(ctx, classes, opts.Check, opts.Jobs)
	if err != nil {
		return nil, err
	}
	var todo []pattern.Class
	for _, c := range classes {
		if _, ok := rows[c.Representative.String()]; !ok {
			todo = append(todo, c)
		}
	}
	ev := Event{Done: len(rows), Total: len(classes), Resumed: len(rows)}
	if opts.Progress != nil {
		opts.Progress(ev)
	}
	if err := runClasses(ctx, opts, j, todo, rows, ev); err != nil {
		return nil, err
	}
	list := make([]Row, 0, len(classes))
	for _, c := range classes {
		list = append(list, rows[c.Representative.String()])
	}
	if opts.Shard.Whole() {
		// The order of the groups needs every class: a sharded census is
		// refined by its merge.
		r := refiner{params: opts.Params, folder: j.folder, jobs: opts.Jobs, certify: opts.Certify, check: opts.Check, progress: opts.Progress}
		if list, err = r.run(ctx, list); err != nil {
			return nil, err
		}
	}
	rep := summarize(opts.Tool, opts.Params, opts.Shard, list)
	if err := writeOutputs(opts.Dir, rep); err != nil {
		return nil, err
	}
	if err := removeSuperseded(j.folder, rep.Rows); err != nil {
		return nil, err
	}
	return rep, nil
}

// runClasses certifies the classes in todo with opts.Jobs workers,
// journalling each and adding it to rows. The first failure cancels the
// others.
func runClasses(ctx context.Context, opts Options, j *journal, todo []pattern.Class, rows map[string]Row, ev Event) error {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	work := make(chan pattern.Class)
	var (
		mu       sync.Mutex
		firstErr error
		wg       sync.WaitGroup
		panicked par.PanicBox
	)
	fail := func(err error) {
		mu.Lock()
		if firstErr == nil {
			firstErr = err
		}
		mu.Unlock()
		cancel()
	}
	for range max(opts.Jobs, 1) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			defer func() {
				if panicked.Caught(recover()) {
					cancel() // the others stop; Raise reports it below
				}
			}()
			for c := range work {
				row, err := certifyClass(ctx, opts, j, c)
				if err != nil {
					fail(err)
					continue
				}
				mu.Lock()
				rows[row.Representative] = row
				ev.Done++
				ev.Class = row.Representative
				if opts.Progress != nil {
					opts.Progress(ev)
				}
				mu.Unlock()
			}
		}()
	}
feed:
	for _, c := range todo {
		select {
		case work <- c:
		case <-ctx.Done():
			break feed
		}
	}
	close(work)
	wg.Wait()
	panicked.Raise()
	if firstErr != nil {
		return firstErr
	}
	return ctx.Err() // the caller cancelled before every class was fed
}

// certifyClass counts and certifies the representative of c and journals
// the row.
func certifyClass(ctx context.Context, opts Options, j *journal, c pattern.Class) (Row, error) {
	start := time.Now()
	rep := c.Representative.String()
	set := pattern.NewSet(c.Representative)
	counts, err := opts.Count(ctx, set, opts.Params.To)
	if err != nil {
		return Row{}, fmt.Errorf("class %s: counting: %w", rep, err)
	}
	if len(counts) != opts.Params.To+1 {
		return Row{}, fmt.Errorf("class %s: the counter returned %d counts, not a_0..a_%d", rep, len(counts), opts.Params.To)
	}
	cert, err := opts.Certify(ctx, set, opts.Params.Digits)
	if err != nil {
		return Row{}, fmt.Errorf("class %s: certifying: %w", rep, err)
	}
	if cert.Short != nil {
		return Row{}, fmt.Errorf("class %s: %d digits not reached: %w", rep, opts.Params.Digits, cert.Short)
	}
	row := Row{Representative: rep}
	row.fill(cert.Checked)
	for _, m := range c.Members {
		row.Members = append(row.Members, m.String())
	}
	for _, a := range counts {
		row.Counts = append(row.Counts, a.String())
	}
	row, err = j.record(row, cert.Certificate, time.Since(start).Seconds())
	if err != nil {
		return Row{}, fmt.Errorf("class %s: %w", rep, err)
	}
	return row, nil
}
