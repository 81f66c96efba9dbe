package census

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"io/fs"
	"math/big"
	"os"
	"path/filepath"

	"avoidcert/internal/atomicfile"
	"avoidcert/internal/input"
)

// MergeOptions configure Merge.
type MergeOptions struct {
	Out  string   // the output folder; created if missing
	Dirs []string // the folders of every shard
	Jobs int      // certificates checked, classes refined at once
	// Check verifies the shards' certificates; Certify refines the order
	// of the groups (Params.RefineDigits), as an unsharded run does.
	Check    Checker
	Certify  Certifier
	Progress func(Event) // refinement rounds only; never concurrently
}

// Merge combines the finished shards in opts.Dirs into the whole census
// in opts.Out: the same tables and certificates an unsharded run writes.
// It first refuses (with an *InputError) shards of different parameters,
// tools or shard counts, a shard given twice or missing, and a class
// missing or present twice; then every shard is verified (Verify: each
// row's certificate accepted by the checker for its class, every certified
// field and count compared, the shard's tables derived again; a
// *RefusedError names what differs), so the merge restates nothing a
// shard's file says without its certificate. Then the order of the groups
// is refined as in Run, into opts.Out.
func Merge(ctx context.Context, opts MergeOptions) (*Report, error) {
	out, dirs, check, jobs := opts.Out, opts.Dirs, opts.Check, opts.Jobs
	if check == nil || opts.Certify == nil {
		return nil, errors.New("census: MergeOptions.Check and Certify are required")
	}
	if len(dirs) == 0 {
		return nil, inputErrorf("no shard folder given; name the folders of every shard")
	}
	if _, err := os.Stat(filepath.Join(out, journalDir, paramsFile)); err == nil {
		return nil, inputErrorf("the output folder %s holds the journal of a census run, whose tables the merge would replace; choose another --out", out)
	}
	// The bookkeeping first, on the files as they read: it is quick, and
	// the certificates are checked only for shards that fit together.
	var (
		first  *Report
		seen   = make(map[int]string) // shard index -> folder
		stated = make([]*Report, len(dirs))
	)
	for k, dir := range dirs {
		rep, err := ReadReport(ctx, dir)
		if err != nil {
			return nil, err
		}
		if rep.Shard == nil {
			return nil, inputErrorf("%s holds a whole census, not a shard; merge only the folders of 'census --shard I/N' runs", dir)
		}
		if first == nil {
			first = rep
		}
		switch {
		case rep.Params != first.Params:
			return nil, inputErrorf("%s is a census of %s but %s is of %s; merge shards of one census only",
				dir, describe(rep.Params, nil), dirs[0], describe(first.Params, nil))
		case rep.Tool != first.Tool:
			return nil, inputErrorf("%s was made by %s but %s by %s; run every shard with one version", dir, rep.Tool, dirs[0], first.Tool)
		case rep.Shard.Of != first.Shard.Of:
			return nil, inputErrorf("%s is shard %s but %s is shard %s: the shard counts differ; merge shards of one split only",
				dir, rep.Shard, dirs[0], first.Shard)
		}
		if other, dup := seen[rep.Shard.Index]; dup {
			return nil, inputErrorf("shard %s is given twice: %s and %s; name each shard once", rep.Shard, other, dir)
		}
		seen[rep.Shard.Index] = dir
		stated[k] = rep
	}
	for i := 1; i <= first.Shard.Of; i++ {
		if _, ok := seen[i]; !ok {
			return nil, inputErrorf("shard %d/%d is missing; name the folders of all %d shards", i, first.Shard.Of, first.Shard.Of)
		}
	}
	var (
		rows   []Row
		certOf = make(map[string][]byte)
	)
	for k, dir := range dirs {
		rep, certs, err := verifyShard(ctx, dir, check, jobs)
		if err != nil {
			return nil, err
		}
		if rep.Shard == nil || rep.Params != first.Params || rep.Tool != first.Tool || *rep.Shard != *stated[k].Shard {
			return nil, inputErrorf("%s changed while it was merged; merge again", dir)
		}
		for _, r := range rep.Rows {
			certOf[r.Representative] = certs[r.Representative]
			r.Group, r.Refined = 0, nil
			rows = append(rows, r)
		}
	}
	if err := os.MkdirAll(filepath.Join(out, certificateDir), 0o755); err != nil {
		return nil, folderError("output folder", out, err)
	}
	o, err := openFolder(out)
	if err != nil {
		return nil, err
	}
	defer o.close()
	if err := o.within(certificateDir); err != nil {
		return nil, err
	}
	for _, r := range rows {
		if err := atomicfile.WriteFile(o.path(r.Certificate), certOf[r.Representative], 0o644); err != nil {
			return nil, err
		}
	}
	ref := refiner{params: first.Params, folder: o, jobs: jobs, certify: opts.Certify, check: check, progress: opts.Progress}
	rows, err = ref.run(ctx, rows)
	if err != nil {
		return nil, err
	}
	rep := summarize(first.Tool, first.Params, Shard{}, rows)
	if err := writeOutputs(out, rep); err != nil {
		return nil, err
	}
	if err := removeSuperseded(o, rep.Rows); err != nil {
		return nil, err
	}
	return rep, nil
}

// verifyShard verifies the shard in dir and returns it with its
// certificates' bytes (those verified) by class.
func verifyShard(ctx context.Context, dir string, check Checker, jobs int) (*Report, map[string][]byte, error) {
	f, err := openFolder(dir)
	if err != nil {
		return nil, nil, err
	}
	defer f.close()
	return verifyFolder(ctx, f, check, jobs)
}

// ReadReport reads a folder's census.json strictly: the format, every
// member known, every number well formed. It returns an *InputError for
// a file that is missing, not a census, not a regular file or over
// input.Census's size limit, and ctx.Err() when ctx is cancelled. It
// verifies nothing against the certificates: what it returns is untrusted
// (see Verify).
func ReadReport(ctx context.Context, dir string) (*Report, error) {
	f, err := openFolder(dir)
	if err != nil {
		return nil, err
	}
	defer f.close()
	return readReport(ctx, f)
}

func readReport(ctx context.Context, f *folder) (*Report, error) {
	dir := f.dir
	data, err := f.read(ctx, JSONFile, input.Census)
	var refused *RefusedError
	var in *InputError
	switch {
	case ctx.Err() != nil:
		return nil, ctx.Err()
	case errors.Is(err, fs.ErrNotExist):
		return nil, inputErrorf("%s has no %s: the shard is not finished (run it again with the same flags to complete it) or the folder is not a census", dir, JSONFile)
	case errors.As(err, &refused), errors.As(err, &in):
		return nil, err
	case err != nil:
		return nil, inputErrorf("%v", err)
	}
	if err := input.CheckJSON(data); err != nil {
		return nil, inputErrorf("%s is not a census file: %v", filepath.Join(dir, JSONFile), err)
	}
	var rep Report
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&rep); err != nil {
		return nil, inputErrorf("%s is not a census file: %s", filepath.Join(dir, JSONFile), input.JSONProblem(err))
	}
	if rep.Format != ReportFormat || rep.Version != ReportVersion {
		return nil, inputErrorf("%s is %q version %d; this version merges %q version %d only",
			filepath.Join(dir, JSONFile), rep.Format, rep.Version, ReportFormat, ReportVersion)
	}
	if err := rep.Params.Validate(); err != nil {
		return nil, inputErrorf("%s: %v", filepath.Join(dir, JSONFile), err)
	}
	if rep.Shard != nil {
		if err := rep.Shard.Validate(); err != nil || rep.Shard.Whole() {
			return nil, inputErrorf("%s: shard %s names no slice", filepath.Join(dir, JSONFile), rep.Shard)
		}
	}
	for _, r := range rep.Rows {
		for _, s := range []string{r.Lambda.Lo, r.Lambda.Hi, r.Radius.Lo, r.Radius.Hi} {
			if _, ok := new(big.Rat).SetString(s); s != "" && !ok {
				return nil, inputErrorf("%s: class %s: %q is not a decimal", filepath.Join(dir, JSONFile), r.Representative, s)
			}
		}
		for _, a := range r.Counts {
			if _, ok := new(big.Int).SetString(a, 10); !ok {
				return nil, inputErrorf("%s: class %s: count %q is not an integer", filepath.Join(dir, JSONFile), r.Representative, a)
			}
		}
	}
	return &rep, nil
}
