package census

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"math/big"
	"os"
	"regexp"
	"slices"
	"strconv"
	"sync"

	"avoidcert/internal/atomicfile"
	"avoidcert/internal/input"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// refinedDir holds the certificates of classes bracketed again at more
// digits, named REPRESENTATIVE-DIGITS.json by the digits asked for.
const refinedDir = "refined"

// refinedName matches the name of a refined certificate.
var refinedName = regexp.MustCompile(`^([1-9]+)-([1-9][0-9]*)\.json$`)

func refinedPath(rep string, digits int) string {
	return refinedDir + "/" + rep + "-" + strconv.Itoa(digits) + ".json"
}

// refiner orders the count groups: where two adjacent groups' ranges
// overlap, it brackets the classes whose ranges reach into the overlap
// again at more digits, round after round, until every adjacent pair is
// ordered or its classes have reached Params.RefineDigits (or a budget).
// Each certificate it uses is one the checker accepted in this run, its
// own or one found in the folder under the name it would write (so a run
// killed while refining continues where it stopped, and writes the same
// bytes as one that was not).
type refiner struct {
	params   Params
	folder   *folder
	jobs     int
	certify  Certifier
	check    Checker
	progress func(Event)
}

// run returns rows with the refinements the order of their groups needs.
func (r *refiner) run(ctx context.Context, rows []Row) ([]Row, error) {
	if r.params.RefineDigits <= r.params.Digits || len(rows) < 2 {
		return rows, nil
	}
	rows = slices.Clone(rows)
	done := map[string]bool{} // classes that cannot be refined further
	for round := 1; ; round++ {
		slices.SortFunc(rows, byLambda)
		groups, _, _ := group(rows, r.params.To)
		targets := r.plan(rows, groups, done)
		if len(targets) == 0 {
			return rows, nil
		}
		if round == 1 {
			if err := r.prepare(); err != nil {
				return nil, err
			}
		}
		if err := r.round(ctx, round, rows, targets, done); err != nil {
			return nil, err
		}
	}
}

// prepare makes the folder of refined certificates, refuses one that is a
// link leading out, and removes temp files a killed run left in it.
func (r *refiner) prepare() error {
	if err := os.MkdirAll(r.folder.path(refinedDir), 0o755); err != nil {
		return fmt.Errorf("cannot create %s: %w", r.folder.path(refinedDir), err)
	}
	if err := r.folder.within(refinedDir); err != nil {
		return err
	}
	return atomicfile.RemoveStale(r.folder.path(refinedDir))
}

// plan returns the digits to bracket each class at in the next round: the
// classes of each unresolved adjacent pair of groups whose ranges reach
// into the other group's range, at the digits that pair needs next
// (nextDigits), the largest over the pairs of a class.
func (r *refiner) plan(rows []Row, groups []Group, done map[string]bool) map[string]int {
	byRep := make(map[string]Row, len(rows))
	for _, row := range rows {
		byRep[row.Representative] = row
	}
	targets := map[string]int{}
	for _, s := range groupOrder(rows, groups) {
		if s.Relation == ">" {
			continue
		}
		above, below := groups[s.Above-1], groups[s.Below-1]
		var involved []Row
		for _, c := range above.Classes {
			if !wholeAbove(byRep[c].Best(), below.Lambda) {
				involved = append(involved, byRep[c])
			}
		}
		for _, c := range below.Classes {
			if !wholeAbove(above.Lambda, byRep[c].Best()) {
				involved = append(involved, byRep[c])
			}
		}
		have := 0
		for _, row := range involved {
			have = max(have, row.Digits())
		}
		want := nextDigits(have, above.Lambda, below.Lambda, r.params.Digits, r.params.RefineDigits)
		for _, row := range involved {
			if !done[row.Representative] && row.Digits() < want {
				targets[row.Representative] = max(targets[row.Representative], want)
			}
		}
	}
	return targets
}

// nextDigits returns the digits to aim for when ranges a and b overlap and
// the most digits certified among their classes is have (taken as at
// least floor, the census's digits): enough for ranges a quarter as wide
// as the distance of their midpoints (a planning figure, never trusted),
// at least one more than have and at most twice as many, and at most
// limit.
func nextDigits(have int, a, b Range, floor, limit int) int {
	have = max(have, floor)
	want := 2 * have
	if da, db := midpoint(a), midpoint(b); da != nil && db != nil {
		gap := new(big.Rat).Sub(da, db)
		if gap.Sign() != 0 {
			ratio, _ := new(big.Rat).Quo(da, gap.Abs(gap)).Float64()
			if ratio > 0 && !math.IsInf(ratio, 0) {
				want = min(want, int(math.Ceil(math.Log10(4*ratio)))+1)
			}
		}
	}
	return min(max(want, have+1), limit)
}

// midpoint returns the middle of a finite range, or nil.
func midpoint(r Range) *big.Rat {
	lo, hi := decimal(r.Lo), decimal(r.Hi)
	if lo == nil || hi == nil || lo.Sign() <= 0 {
		return nil
	}
	m := new(big.Rat).Add(lo, hi)
	return m.Quo(m, big.NewRat(2, 1))
}

// round brackets the classes of targets again, r.jobs at once, and sets
// their rows' refinements. A class whose new certificate does not improve
// on its best range, falls short of the digits asked for or is refused
// (a budget), or reaches the cap is done.
func (r *refiner) round(ctx context.Context, round int, rows []Row, targets map[string]int, done map[string]bool) error {
	reps := make([]string, 0, len(targets))
	for rep := range targets {
		reps = append(reps, rep)
	}
	slices.Sort(reps)
	index := make(map[string]int, len(rows))
	for i, row := range rows {
		index[row.Representative] = i
	}
	results := make([]*Refined, len(reps))
	errs := make([]error, len(reps))
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	var (
		mu sync.Mutex
		ev = Event{Total: len(reps), Round: round}
	)
	if r.progress != nil {
		r.progress(ev)
	}
	inParallel(len(reps), r.jobs, func(i int) {
		if ctx.Err() != nil {
			return
		}
		var found bool
		results[i], found, errs[i] = r.refineClass(ctx, reps[i], targets[reps[i]])
		if errors.Is(errs[i], prove.ErrBudget) {
			// The worker's budget cannot hold this bracket: the class
			// keeps its ranges, and its pairs stay unresolved.
			results[i], errs[i] = nil, nil
		}
		mu.Lock()
		defer mu.Unlock()
		if errs[i] != nil {
			cancel() // the first failure stops the others
			return
		}
		ev.Done++
		if found {
			ev.Resumed++
		}
		ev.Class = reps[i]
		if r.progress != nil {
			r.progress(ev)
		}
	})
	for _, err := range errs {
		if err != nil && !errors.Is(err, context.Canceled) {
			return err
		}
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	for i, rep := range reps {
		row := &rows[index[rep]]
		if results[i] == nil {
			done[rep] = true
			continue
		}
		got := commonDigits(results[i].Lambda)
		better := got > row.Digits()
		if better {
			row.Refined = results[i]
		}
		// Short of the digits asked for (a budget stopped it), no better
		// than before, or at the cap: more rounds would not help.
		if !better || got < targets[rep] || got >= r.params.RefineDigits {
			done[rep] = true
		}
	}
	return nil
}

// refineClass returns the refinement of class rep at the given digits:
// the certificate found in the folder under its name if the checker
// accepts it for the class, else a new one, written there; found reports
// the first.
func (r *refiner) refineClass(ctx context.Context, rep string, digits int) (ref *Refined, found bool, err error) {
	path := refinedPath(rep, digits)
	data, err := r.folder.read(ctx, path, input.Certificate)
	var in *InputError
	switch {
	case ctx.Err() != nil:
		return nil, false, ctx.Err()
	case errors.As(err, &in):
		return nil, false, err // a FIFO, a device, a file over the limit
	case err == nil:
		if c, cerr := r.check(ctx, data, []string{rep}); cerr == nil {
			return refinedOf(fieldsOf(c), path, data), true, nil
		} else if ctx.Err() != nil {
			return nil, false, ctx.Err()
		}
		// refused: made again below
	case !errors.Is(err, fs.ErrNotExist):
		var refused *RefusedError
		if errors.As(err, &refused) {
			return nil, false, err // a link out of the folder
		}
	}
	p, err := pattern.Parse(rep)
	if err != nil {
		return nil, false, fmt.Errorf("class %s: %w", rep, err)
	}
	cert, err := r.certify(ctx, pattern.NewSet(p), digits)
	if err != nil {
		return nil, false, fmt.Errorf("class %s: refining to %d digits: %w", rep, digits, err)
	}
	if err := atomicfile.WriteFile(r.folder.path(path), cert.Certificate, 0o644); err != nil {
		return nil, false, fmt.Errorf("class %s: writing %s: %w", rep, path, err)
	}
	return refinedOf(fieldsOf(cert.Checked), path, cert.Certificate), false, nil
}

func refinedOf(f fields, path string, data []byte) *Refined {
	sum := sha256.Sum256(data)
	return &Refined{Lambda: f.Lambda, Radius: f.Radius, Certificate: path, CertificateSHA256: hex.EncodeToString(sum[:])}
}

// removeSuperseded removes the refined certificates the rows do not name
// (those of earlier rounds): only files named as the refiner names them.
func removeSuperseded(f *folder, rows []Row) error {
	dir, err := f.root.Open(refinedDir)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return fmt.Errorf("cannot read %s: %w", f.path(refinedDir), err)
	}
	entries, err := dir.ReadDir(-1)
	dir.Close()
	if err != nil {
		return fmt.Errorf("cannot read %s: %w", f.path(refinedDir), err)
	}
	named := map[string]bool{}
	for _, row := range rows {
		if row.Refined != nil {
			named[row.Refined.Certificate] = true
		}
	}
	for _, e := range entries {
		rel := refinedDir + "/" + e.Name()
		if e.Type().IsRegular() && refinedName.MatchString(e.Name()) && !named[rel] {
			if err := f.root.Remove(rel); err != nil && !errors.Is(err, fs.ErrNotExist) {
				return fmt.Errorf("cannot remove %s: %w", f.path(rel), err)
			}
		}
	}
	return nil
}
