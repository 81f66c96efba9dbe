package census

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"
	"sync"

	"avoidcert/certify"
	"avoidcert/internal/input"
	"avoidcert/internal/par"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// Checker has the independent checker accept a certificate file's bytes
// for the set typed (for a census row: its representative, one token) and
// returns the accepted certificate. Everything a census states as
// certified is read from certificates a Checker accepted in the same run.
// It must be safe for concurrent use.
type Checker func(ctx context.Context, certificate []byte, typed []string) (*certify.Certificate, error)

// CheckerOf is the Checker of the commands: prove.CheckBytes within the
// budgets of opts.
func CheckerOf(opts prove.Options) Checker {
	return func(ctx context.Context, data []byte, typed []string) (*certify.Certificate, error) {
		return prove.CheckBytes(ctx, data, typed, opts)
	}
}

// RefusedError marks a census file whose content its certificates do not
// support: a row whose certified field differs from its checked
// certificate, a certificate the checker refuses or that is another
// class's, counts that differ from the checker's own, an order or a group
// that the checked rows do not give, a path that leaves the folder. The
// message names the row and the field.
type RefusedError struct{ Msg string }

func (e *RefusedError) Error() string { return e.Msg }

func refusedf(format string, args ...any) error {
	return &RefusedError{Msg: fmt.Sprintf(format, args...)}
}

// fields are the certified fields of a row, as a checked certificate
// states them: its outward decimals (checked against its rationals), its
// structure class and the asymptotic form that class proves.
type fields struct {
	Lambda, Radius Range
	Class, Form    string
	Exponent       *int
}

func fieldsOf(c *certify.Certificate) fields {
	st := c.Statement
	f := prove.FormOf(c)
	out := fields{
		Lambda: Range{Lo: st.Lambda.LoDecimal, Hi: st.Lambda.HiDecimal},
		Radius: Range{Lo: st.Radius.LoDecimal, Hi: st.Radius.HiDecimal},
		Class:  string(f.Class),
		Form:   f.Words(),
	}
	if f.Class == certify.ClassPrimitive {
		out.Exponent = &f.Exponent
	}
	return out
}

// fill sets the certified fields of r from a checked certificate.
func (r *Row) fill(c *certify.Certificate) {
	f := fieldsOf(c)
	r.Lambda, r.Radius, r.Class, r.Form, r.Exponent = f.Lambda, f.Radius, f.Class, f.Form, f.Exponent
}

// exponentText is a primitivity exponent as census files state it.
func exponentText(e *int) string {
	if e == nil {
		return "null"
	}
	return strconv.Itoa(*e)
}

// verifyRow has the checker accept the row's certificate, read inside
// the folder and compared with the row's SHA-256, for the row's class,
// and compares every certified field and every count with what the
// certificate and the checker's own counting give; the same for the
// row's refinement. where names the file the row is from. It returns the
// certificates' bytes (the refinement's nil when there is none).
func verifyRow(ctx context.Context, f *folder, where string, row Row, params Params, check Checker) (certificate, refined []byte, err error) {
	refuse := func(field, format string, args ...any) ([]byte, []byte, error) {
		return nil, nil, rowRefusal(where, row, field, format, args...)
	}
	want := certificateDir + "/" + row.Representative + ".json"
	data, c, err := checkedFile(ctx, f, where, row, "certificate", row.Certificate, want, row.CertificateSHA256, check)
	if err != nil {
		return nil, nil, err
	}
	have := fieldsOf(c)
	for _, x := range []struct{ name, have, want string }{
		{"lambda.lo", row.Lambda.Lo, have.Lambda.Lo},
		{"lambda.hi", row.Lambda.Hi, have.Lambda.Hi},
		{"radius.lo", row.Radius.Lo, have.Radius.Lo},
		{"radius.hi", row.Radius.Hi, have.Radius.Hi},
		{"structure_class", row.Class, have.Class},
		{"primitivity_exponent", exponentText(row.Exponent), exponentText(have.Exponent)},
		{"asymptotic_form", row.Form, have.Form},
	} {
		if x.have != x.want {
			return refuse(x.name, "%s, but its checked certificate states %s", quoteShort(x.have), quoteShort(x.want))
		}
	}
	if row.Refined != nil {
		ref := row.Refined
		m := refinedName.FindStringSubmatch(strings.TrimPrefix(ref.Certificate, refinedDir+"/"))
		digits := 0
		if m != nil {
			digits, _ = strconv.Atoi(m[2])
		}
		if m == nil || m[1] != row.Representative || digits <= params.Digits || digits > params.RefineDigits {
			return refuse("refined.certificate", "%s is not a refinement of the class: %s/%s-D.json with D from %d to %d",
				quoteShort(ref.Certificate), refinedDir, row.Representative, params.Digits+1, params.RefineDigits)
		}
		refinedData, rc, err := checkedFile(ctx, f, where, row, "refined.certificate", ref.Certificate, refinedPath(row.Representative, digits), ref.CertificateSHA256, check)
		if err != nil {
			return nil, nil, err
		}
		stated := fieldsOf(rc)
		for _, x := range []struct{ name, have, want string }{
			{"refined.lambda.lo", ref.Lambda.Lo, stated.Lambda.Lo},
			{"refined.lambda.hi", ref.Lambda.Hi, stated.Lambda.Hi},
			{"refined.radius.lo", ref.Radius.Lo, stated.Radius.Lo},
			{"refined.radius.hi", ref.Radius.Hi, stated.Radius.Hi},
		} {
			if x.have != x.want {
				return refuse(x.name, "%s, but its checked certificate states %s", quoteShort(x.have), quoteShort(x.want))
			}
		}
		refined = refinedData
	}
	counts, err := certify.Counts(ctx, []string{row.Representative}, params.To)
	if err != nil {
		if ctx.Err() != nil {
			return nil, nil, ctx.Err()
		}
		return refuse("counts", "the checker cannot count the class: %v", err)
	}
	for n, a := range counts {
		if n >= len(row.Counts) || row.Counts[n] != a.String() {
			have := "none"
			if n < len(row.Counts) {
				have = row.Counts[n]
			}
			return refuse(fmt.Sprintf("counts (a_%d)", n), "%s, but the checker counts %s", quoteShort(have), quoteShort(a.String()))
		}
	}
	return data, refined, nil
}

func rowRefusal(where string, row Row, field, format string, args ...any) error {
	return refusedf("%s: class %s: %s: %s; the census was changed after it was made: make it again", where, row.Representative, field, fmt.Sprintf(format, args...))
}

// checkedFile reads the certificate rel named in field of a row inside
// the folder (it must be want), compares its SHA-256 with sha and has the
// checker accept it for the row's class.
func checkedFile(ctx context.Context, f *folder, where string, row Row, field, rel, want, sha string, check Checker) ([]byte, *certify.Certificate, error) {
	refuse := func(format string, args ...any) ([]byte, *certify.Certificate, error) {
		return nil, nil, rowRefusal(where, row, field, format, args...)
	}
	if why := f.escape(rel); why != "" {
		return refuse("%s", why)
	}
	if rel != want {
		return refuse("%s is not the class's certificate %s", quoteShort(rel), want)
	}
	data, err := f.read(ctx, rel, input.Certificate)
	var in *InputError
	switch {
	case ctx.Err() != nil:
		return nil, nil, ctx.Err()
	case errors.As(err, &in):
		return nil, nil, err // a FIFO, a device, a file over the limit: bad input, not a forgery
	case err != nil:
		return refuse("%v", err)
	}
	if sum := sha256.Sum256(data); hex.EncodeToString(sum[:]) != sha {
		return nil, nil, rowRefusal(where, row, field+"_sha256", "%s does not have the SHA-256 its row records: the file was changed", f.path(rel))
	}
	c, err := check(ctx, data, []string{row.Representative})
	if err != nil {
		switch {
		case ctx.Err() != nil:
			return nil, nil, ctx.Err()
		case errors.Is(err, prove.ErrBudget):
			// not a refusal: a larger budget would decide it
			return nil, nil, fmt.Errorf("%s: class %s: checking %s: %w", where, row.Representative, f.path(rel), err)
		}
		return refuse("the checker refuses %s for %s: %v", f.path(rel), row.Representative, err)
	}
	return data, c, nil
}

// verifyRows verifies rows with up to jobs at once and returns their
// certificates' bytes by class, or the error of the first row (in row
// order) that fails.
func verifyRows(ctx context.Context, f *folder, where string, rows []Row, params Params, jobs int, check Checker) (map[string][]byte, error) {
	certs := make([][]byte, len(rows))
	errs := make([]error, len(rows))
	inParallel(len(rows), jobs, func(i int) {
		certs[i], _, errs[i] = verifyRow(ctx, f, where, rows[i], params, check)
	})
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	byClass := make(map[string][]byte, len(rows))
	for i, err := range errs {
		if err != nil {
			return nil, err
		}
		byClass[rows[i].Representative] = certs[i]
	}
	return byClass, nil
}

// inParallel calls do(i) for i = 0..n-1 on up to jobs goroutines and
// returns when every call has. A panic in a call is raised again here
// (par.PanicBox), once the others are done.
func inParallel(n, jobs int, do func(i int)) {
	next := make(chan int)
	var wg sync.WaitGroup
	var panicked par.PanicBox
	for range max(jobs, 1) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			defer func() {
				if panicked.Caught(recover()) {
					for range next { // let the feeder finish
					}
				}
			}()
			for i := range next {
				do(i)
			}
		}()
	}
	for i := range n {
		next <- i
	}
	close(next)
	wg.Wait()
	panicked.Raise()
}

// Verify reads the census (or shard) in dir and returns it once every row
// is verified (see Merge for the bookkeeping, verifyRow for a row) and
// the tables the verified rows give (the row order by the checked
// ranges, the count groups, their separations and the order statements)
// are those of the file. Nothing of the file is trusted: a refusal is a
// *RefusedError naming the row or table and the field, a file that is
// not a census an *InputError. jobs rows are checked at once.
func Verify(ctx context.Context, dir string, check Checker, jobs int) (*Report, error) {
	f, err := openFolder(dir)
	if err != nil {
		return nil, err
	}
	defer f.close()
	rep, _, err := verifyFolder(ctx, f, check, jobs)
	return rep, err
}

// verifyFolder verifies the census in f and returns the tables its
// verified rows give, with the certificates' bytes by class.
func verifyFolder(ctx context.Context, f *folder, check Checker, jobs int) (*Report, map[string][]byte, error) {
	rep, err := readReport(ctx, f)
	if err != nil {
		return nil, nil, err
	}
	where := f.path(JSONFile)
	shard := Shard{}
	if rep.Shard != nil {
		shard = *rep.Shard
	}
	if err := rep.classesFit(where, shard); err != nil {
		return nil, nil, err
	}
	certs, err := verifyRows(ctx, f, where, rep.Rows, rep.Params, jobs, check)
	if err != nil {
		return nil, nil, err
	}
	derived := summarize(rep.Tool, rep.Params, shard, rep.Rows)
	if err := sameTables(where, rep, derived); err != nil {
		return nil, nil, err
	}
	return derived, certs, nil
}

// classesFit checks the rows are the classes of the shard, each once,
// with their members and the count of classes of the length.
func (rep *Report) classesFit(where string, shard Shard) error {
	classes := shard.Classes(rep.Params.Length)
	if all := len(Shard{}.Classes(rep.Params.Length)); rep.Classes != all {
		return refusedf("%s: classes: %d, but length %d has %d symmetry classes", where, rep.Classes, rep.Params.Length, all)
	}
	byRep := make(map[string]pattern.Class, len(classes))
	for _, c := range classes {
		byRep[c.Representative.String()] = c
	}
	seen := make(map[string]bool)
	for _, r := range rep.Rows {
		c, ok := byRep[r.Representative]
		switch {
		case seen[r.Representative]:
			return inputErrorf("%s: class %s has two rows; the file was mixed by hand", where, r.Representative)
		case !ok && rep.Shard != nil:
			return inputErrorf("%s (shard %s) holds class %s, which belongs to another shard; the folder was mixed by hand", where, rep.Shard, r.Representative)
		case !ok:
			return refusedf("%s: a row names %s, which is not a symmetry class of length %d", where, quoteShort(r.Representative), rep.Params.Length)
		}
		seen[r.Representative] = true
		if err := r.fits(c, rep.Params); err != nil {
			return refusedf("%s: class %s: %v", where, r.Representative, err)
		}
	}
	for _, c := range classes {
		if !seen[c.Representative.String()] {
			if rep.Shard != nil {
				return inputErrorf("%s (shard %s) lacks class %s, which belongs to that shard; run the shard again to complete it", where, rep.Shard, c.Representative)
			}
			return inputErrorf("%s lacks class %s; run the census again to complete it", where, c.Representative)
		}
	}
	return nil
}

// sameTables compares what the file states beyond its rows with what its
// verified rows give.
func sameTables(where string, file, derived *Report) error {
	differ := func(what, format string, args ...any) error {
		return refusedf("%s: %s: %s; the census was changed after it was made: make it again", where, what, fmt.Sprintf(format, args...))
	}
	for i, r := range derived.Rows {
		f := file.Rows[i]
		if f.Representative != r.Representative {
			return differ("rows", "rank %d holds %s, but by the checked ranges of lambda it is %s", i+1, f.Representative, r.Representative)
		}
		if f.Group != r.Group {
			return differ("class "+r.Representative+": group", "%d, but its counts put it in group %d", f.Group, r.Group)
		}
	}
	if !slices.EqualFunc(file.Groups, derived.Groups, func(a, b Group) bool {
		return a.ID == b.ID && a.DiffersFromPreviousAt == b.DiffersFromPreviousAt && a.Lambda == b.Lambda && slices.Equal(a.Classes, b.Classes)
	}) {
		return differ("groups", "%s, but the checked counts give %s", groupsText(file.Groups), groupsText(derived.Groups))
	}
	if !slices.Equal(file.GroupsByN, derived.GroupsByN) {
		return differ("groups_by_n", "%v, but the checked counts give %v", file.GroupsByN, derived.GroupsByN)
	}
	if file.SeparatingN != derived.SeparatingN {
		return differ("separating_n", "%d, but the checked counts give %d", file.SeparatingN, derived.SeparatingN)
	}
	if len(file.Order) != len(derived.Order) {
		return differ("order", "%d steps for %d rows", len(file.Order), len(derived.Rows))
	}
	for i, s := range derived.Order {
		if file.Order[i] != s {
			return differ(fmt.Sprintf("order (step %d)", i+1), "%s, but the checked ranges give %s", stepText(file.Order[i]), stepText(s))
		}
	}
	if len(file.GroupOrder) != len(derived.GroupOrder) {
		return differ("group_order", "%d steps for %d groups", len(file.GroupOrder), len(derived.Groups))
	}
	for i, s := range derived.GroupOrder {
		if file.GroupOrder[i] != s {
			return differ(fmt.Sprintf("group_order (step %d)", i+1), "%s, but the checked ranges give %s", groupStepText(file.GroupOrder[i]), groupStepText(s))
		}
	}
	return nil
}

func groupStepText(s GroupStep) string {
	return quoteShort(fmt.Sprintf("group %d %s group %d at %d digits", s.Above, s.Relation, s.Below, s.Digits))
}

func groupsText(gs []Group) string {
	var parts []string
	for _, g := range gs {
		parts = append(parts, strconv.Itoa(g.ID)+":"+strings.Join(g.Classes, " "))
	}
	return quoteShort(strings.Join(parts, ", "))
}

func stepText(s Step) string {
	t := fmt.Sprintf("%s %s %s", s.Above, s.Relation, s.Below)
	if s.SameCounts {
		t += " (same counts)"
	}
	return quoteShort(t)
}
