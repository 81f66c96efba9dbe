package report

import (
	"context"
	"crypto/sha256"
	"fmt"
	"path/filepath"
	"sort"

	"avoidcert/census"
	"avoidcert/internal/input"
)

// Census is what a report states about a census folder: its census.json,
// every row's certificate re-checked.
type Census struct {
	Dir    string
	Report *census.Report
}

// FromCensus reads dir/census.json and has the checker re-verify every
// row's certificate (after comparing its SHA-256 with the row's).
func FromCensus(ctx context.Context, dir string) (*Census, error) {
	rep, err := census.ReadReport(ctx, dir)
	if err != nil {
		return nil, err
	}
	if rep.Shard != nil {
		return nil, fmt.Errorf("%s is one shard of a census: merge the shards first (avoidcert census merge)", dir)
	}
	for _, row := range rep.Rows {
		path := filepath.Join(dir, filepath.FromSlash(row.Certificate))
		data, err := input.ReadFile(ctx, path, input.Certificate)
		if err != nil {
			if ctx.Err() != nil {
				return nil, ctx.Err()
			}
			return nil, fmt.Errorf("%s: row %s: %v", dir, row.Representative, err)
		}
		if got := fmt.Sprintf("%x", sha256.Sum256(data)); got != row.CertificateSHA256 {
			return nil, refused{fmt.Errorf("%s: the SHA-256 of %s is %s, not the census's %s", dir, path, got, row.CertificateSHA256)}
		}
		if _, err := checked(ctx, path, data); err != nil {
			return nil, err
		}
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
