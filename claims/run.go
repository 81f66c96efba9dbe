package claims

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"strings"
	"time"

	"avoidcert/bounds"
	"avoidcert/certify"
	"avoidcert/pattern"
	"avoidcert/prove"
)

// Options of Run.
type Options struct {
	// CacheDir holds certificates between runs, keyed by a digest of each
	// claim's content ("" for no cache). It must exist.
	CacheDir string
	// CertDir, if set, receives a copy of every certificate a verdict
	// rests on, named after the claim id. It must exist.
	CertDir string
	// Timeout is the whole run's; it overrides the manifest's [run]
	// timeout when positive.
	Timeout time.Duration
	// MaxMemory caps every claim's max_memory when positive (else the
	// manifest's [run] max_memory, if any).
	MaxMemory int64
	// Tool is written into new certificates.
	Tool string
	// Done, if set, is called after each claim with its result.
	Done func(Result)
}

// CertificateRef names a certificate a verdict rests on.
type CertificateRef struct {
	Patterns []string // the pattern set it is for
	Path     string   // where it was written ("" when neither kept nor cached)
	SHA256   string   // of the file's bytes
}

// Result is the outcome of one claim.
type Result struct {
	ID       string
	Kind     Kind
	Line     int
	Manifest string // the manifest's file, as given to Parse
	Claim    Claim  // the claim judged, as the manifest states it
	Verdict  Verdict
	Evidence string // in a few words
	// Certified are the checked enclosures a growth claim (of its
	// quantity) or an order claim (of lambda of each set) was judged on;
	// nil for the other kinds and when no certificate was made.
	Certified []bounds.Enclosure
	// Certificates are the checked certificates the verdict rests on
	// (growth, form and order claims).
	Certificates []CertificateRef
	// Cached reports that the verdict rests on cached certificates that
	// the checker re-verified in this run, with nothing recomputed.
	Cached  bool
	Elapsed time.Duration
}

// Run judges every claim of the manifest in order. It returns an error
// only when ctx is cancelled (an interrupt), with the results so far;
// budgets make claims undecided, and a failure of the tool on one claim
// is that claim's Failed verdict.
func Run(ctx context.Context, m *Manifest, opts Options) ([]Result, error) {
	runCtx := ctx
	timeout := m.Timeout
	if opts.Timeout > 0 {
		timeout = opts.Timeout
	}
	if timeout > 0 {
		var cancel context.CancelFunc
		runCtx, cancel = context.WithTimeout(ctx, timeout)
		defer cancel()
	}
	var results []Result
	for _, c := range m.Claims {
		if err := ctx.Err(); err != nil {
			return results, err
		}
		c.Budget.MaxMemory = m.claimMemory(c, opts)
		r := judge(runCtx, c, opts)
		r.Manifest = m.File
		if err := ctx.Err(); err != nil {
			return results, err
		}
		results = append(results, r)
		if opts.Done != nil {
			opts.Done(r)
		}
	}
	return results, nil
}

// MemoryLimit is the largest memory budget a claim of the run may use:
// every claim's max_memory, capped by opts.MaxMemory or else by [run]
// max_memory.
func (m *Manifest) MemoryLimit(opts Options) int64 {
	var largest int64
	for _, c := range m.Claims {
		largest = max(largest, m.claimMemory(c, opts))
	}
	return largest
}

// claimMemory is the memory budget of claim c within the run's cap:
// opts.MaxMemory, which overrides [run] max_memory.
func (m *Manifest) claimMemory(c Claim, opts Options) int64 {
	limit := m.MaxMemory
	if opts.MaxMemory > 0 {
		limit = opts.MaxMemory
	}
	if limit > 0 {
		return min(c.Budget.MaxMemory, limit)
	}
	return c.Budget.MaxMemory
}

func judge(runCtx context.Context, c Claim, opts Options) Result {
	start := time.Now()
	ctx := runCtx
	if c.Budget.Timeout > 0 {
		var cancel context.CancelFunc
		ctx, cancel = context.WithTimeout(runCtx, c.Budget.Timeout)
		defer cancel()
	}
	po := prove.Options{MaxK: c.Budget.MaxK, MaxMemory: c.Budget.MaxMemory, Tool: opts.Tool, Typed: c.Typed}
	r := Result{ID: c.ID, Kind: c.Kind, Line: c.Line, Claim: c}
	var o outcome
	err := ctx.Err()
	why := ""
	if c.Kind == KindGrowth {
		why = prove.Impossible(c.Claimed, c.Of)
	}
	if err == nil && why != "" {
		// refuted by what every set satisfies: no certificate is needed
		o = outcome{Refuted, why + "; no certificate needed"}
	} else if err == nil {
		switch c.Kind {
		case KindCount, KindEqualCounts, KindProbability:
			o, err = judgeCounts(ctx, c, po)
		default:
			o, r.Certificates, r.Certified, r.Cached, err = judgeCertified(ctx, c, po, opts)
		}
	}
	if err != nil {
		if bo, ok := budgetOutcome(err, ctx, runCtx, c); ok {
			o = bo
		} else {
			o = outcome{Failed, err.Error()}
		}
	}
	r.Verdict, r.Evidence, r.Elapsed = o.verdict, o.evidence, time.Since(start)
	return r
}

// judgeCertified decides a claim from certificates: cached ones that the
// checker accepts again when they decide it, otherwise fresh ones. It
// returns the certificates' references and the enclosures the verdict was
// read from (enclosures).
func judgeCertified(ctx context.Context, c Claim, po prove.Options, opts Options) (outcome, []CertificateRef, []bounds.Enclosure, bool, error) {
	cf := certifiedFor(c)
	note := ""
	if opts.CacheDir != "" {
		certs, err := loadChecked(ctx, cf, cachePaths(opts.CacheDir, c, len(cf.sets)), po)
		switch {
		case err == nil:
			if o := cf.decide(certs); o.verdict != Undecided {
				refs, err := keep(c, cf.sets, certs, opts, false)
				o.evidence = "re-checked cached certificate: " + o.evidence
				return o, refs, enclosures(c, certs), true, err
			}
		case errors.Is(err, fs.ErrNotExist):
		case ctx.Err() != nil:
			return outcome{}, nil, nil, false, err
		default:
			note = fmt.Sprintf("cached certificate refused (%v), recomputed; ", err)
		}
	}
	certs, o, err := cf.compute(ctx, po)
	if err != nil {
		return outcome{}, nil, nil, false, err
	}
	refs, err := keep(c, cf.sets, certs, opts, true)
	o.evidence = note + o.evidence
	return o, refs, enclosures(c, certs), false, err
}

// enclosures are what a verdict was read from: the checked enclosure of a
// growth claim's quantity, of lambda of both sets of an order claim; nil
// for a form claim.
func enclosures(c Claim, certs []*certify.Certificate) []bounds.Enclosure {
	switch c.Kind {
	case KindGrowth:
		return []bounds.Enclosure{prove.Enclosure(certs[0], c.Of)}
	case KindOrder:
		return []bounds.Enclosure{prove.Enclosure(certs[0], bounds.QuantityLambda), prove.Enclosure(certs[1], bounds.QuantityLambda)}
	}
	return nil
}

// loadChecked reads cached certificates and has the checker accept each
// for its set as the manifest writes it.
func loadChecked(ctx context.Context, cf certified, paths []string, po prove.Options) ([]*certify.Certificate, error) {
	var certs []*certify.Certificate
	for i, p := range paths {
		cert, err := prove.Load(ctx, p)
		if err != nil {
			return nil, err
		}
		po.Typed = cf.typed[i]
		if err := prove.Recheck(ctx, cert, cf.sets[i], po); err != nil {
			return nil, fmt.Errorf("%s: %w", filepath.Base(p), err)
		}
		certs = append(certs, cert)
	}
	return certs, nil
}

// keep writes the certificates into the cache (when fresh) and into
// CertDir, and returns their references.
func keep(c Claim, sets []pattern.Set, certs []*certify.Certificate, opts Options, fresh bool) ([]CertificateRef, error) {
	var refs []CertificateRef
	var cached []string
	if opts.CacheDir != "" {
		cached = cachePaths(opts.CacheDir, c, len(certs))
	}
	for i, cert := range certs {
		ref := CertificateRef{Patterns: sets[i].Strings()}
		var err error
		if ref.SHA256, err = prove.Digest(cert); err != nil {
			return nil, err
		}
		if cached != nil {
			ref.Path = cached[i]
			if fresh {
				if err := prove.Save(cached[i], cert); err != nil {
					return nil, writeError("the cache entry", cached[i], err)
				}
			}
		}
		if opts.CertDir != "" {
			ref.Path = filepath.Join(opts.CertDir, certName(c.ID, i, len(certs)))
			if err := prove.Save(ref.Path, cert); err != nil {
				return nil, writeError("the kept certificate", ref.Path, err)
			}
		}
		refs = append(refs, ref)
	}
	return refs, nil
}

// Files lists every file a run of the manifest may read or replace: each
// certificate claim's cache entries (when opts.CacheDir is set) and kept
// certificates (when opts.CertDir is set). A caller checks them before the
// run, so that a FIFO or a device at one of these paths is refused at once.
func (m *Manifest) Files(opts Options) []string {
	var paths []string
	for _, c := range m.Claims {
		if c.Kind == KindCount || c.Kind == KindEqualCounts || c.Kind == KindProbability {
			continue // no certificate
		}
		n := len(certifiedFor(c).sets)
		if opts.CacheDir != "" {
			paths = append(paths, cachePaths(opts.CacheDir, c, n)...)
		}
		if opts.CertDir != "" {
			for i := range n {
				paths = append(paths, filepath.Join(opts.CertDir, certName(c.ID, i, n)))
			}
		}
	}
	return paths
}

// writeError says which file could not be written and the system's reason
// ("no space left on device"), without the temp file's name.
func writeError(what, path string, err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	return fmt.Errorf("cannot write %s %s: %w", what, path, err)
}

// certName is "ID.json", or "ID.1.json" and "ID.2.json" for the two
// sets of an order claim.
func certName(id string, i, n int) string {
	if n == 1 {
		return id + ".json"
	}
	return fmt.Sprintf("%s.%d.json", id, i+1)
}

// Key is the digest of a claim's content: its kind, sets and claimed
// values, not its id, note or budget. Two claims with one key need the
// same certificates.
func Key(c Claim) string {
	var b strings.Builder
	fmt.Fprintf(&b, "avoidcert-claim-v1\nkind %s\nset %s\nother %s\nof %s\n", c.Kind, c.Set, c.Other, c.Of)
	if c.Claimed.Lo != nil {
		fmt.Fprintf(&b, "claimed %s %s\n", c.Claimed.Lo.RatString(), c.Claimed.Hi.RatString())
	}
	fmt.Fprintf(&b, "form %s period %d\n", c.Form, c.Period)
	sum := sha256.Sum256([]byte(b.String()))
	return hex.EncodeToString(sum[:])
}

func cachePaths(dir string, c Claim, n int) []string {
	paths := make([]string, n)
	for i := range paths {
		paths[i] = filepath.Join(dir, certName(Key(c)[:32], i, n))
	}
	return paths
}
