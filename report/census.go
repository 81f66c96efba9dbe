package report

import (
	"context"
	"errors"
	"fmt"
	"runtime"
	"sort"

	"avoidcert/census"
	"avoidcert/prove"
)

// Census is what a report states about a census folder: its tables as
// the rows' own checked certificates and the checker's counts give them.
type Census struct {
	Dir    string
	Report *census.Report
}

// FromCensus reads dir/census.json and verifies it whole (census.Verify):
// every row's certificate, read inside the folder and matching its
// SHA-256, accepted by the checker for the row's class; every certified
// field of the row compared with that certificate, every count with the
// checker's own; the order and the groups re-derived. Any difference is
// a refusal (IsRefused) naming the row and the field; the report is made
// from the verified tables only.
func FromCensus(ctx context.Context, dir string) (*Census, error) {
	rep, err := census.ReadReport(ctx, dir)
	if err != nil {
		return nil, err
	}
	if rep.Shard != nil {
		return nil, fmt.Errorf("%s is one shard of a census: merge the shards first (avoidcert census merge)", dir)
	}
	jobs := runtime.GOMAXPROCS(0)
	check := census.CheckerOf(prove.Options{MaxMemory: prove.DefaultMaxMemory / int64(jobs)})
	rep, err = census.Verify(ctx, dir, check, jobs)
	var refusedErr *census.RefusedError
	switch {
	case errors.As(err, &refusedErr):
		return nil, refused{err}
	case err != nil:
		return nil, err
	}
	return &Census{Dir: dir, Report: rep}, nil
}

// groupOf maps a representative to its count group.
func (c *Census) groupOf() map[string]int {
	g := map[string]int{}
	for _, grp := range c.Report.Groups {
		for _, rep := range grp.Classes {
			g[rep] = grp.ID
		}
	}
	return g
}

// sharedGroups lists the groups with more than one class, in id order.
func (c *Census) sharedGroups() []census.Group {
	var out []census.Group
	for _, g := range c.Report.Groups {
		if len(g.Classes) > 1 {
			out = append(out, g)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].ID < out[j].ID })
	return out
}
