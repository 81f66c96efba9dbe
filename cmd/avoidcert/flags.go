package main

import (
	"flag"
	"fmt"
	"io"
	"strconv"

	"avoidcert/internal/bytesize"
	"avoidcert/pattern"
)

// newFlags returns a flag set whose errors are reported by the caller.
func newFlags(name string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	return fs
}

// parseArgs parses flags that may stand before, between or after the
// positional arguments ("bound 1342 --digits 50"), and returns the
// positional ones. "--" ends flag parsing.
func parseArgs(fs *flag.FlagSet, args []string) ([]string, error) {
	var positional []string
	for {
		if err := fs.Parse(args); err != nil {
			return nil, usagef("%s: %v; run 'avoidcert help %s'", fs.Name(), err, fs.Name())
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return positional, nil
		}
		if len(args) > 0 && len(rest) < len(args) && args[len(args)-len(rest)-1] == "--" {
			return append(positional, rest...), nil
		}
		positional = append(positional, rest[0])
		args = rest[1:]
	}
}

// parsePatterns reads the pattern set from positional arguments.
func parsePatterns(cmd string, args []string) (pattern.Set, error) {
	if len(args) == 0 {
		return pattern.Set{}, usagef("%s: no pattern given; name at least one, e.g. 'avoidcert %s 132'", cmd, cmd)
	}
	s, err := pattern.ParseSet(args)
	if err != nil {
		return pattern.Set{}, usagef("%s: %v", cmd, err)
	}
	return s, nil
}

// reportDropped tells, in verbose mode, which patterns were dropped.
func reportDropped(w io.Writer, s pattern.Set) {
	for _, d := range s.Dropped() {
		if d.Inside == nil {
			fmt.Fprintf(w, "note: pattern %s given twice; counted once\n", d.Pattern)
		} else {
			fmt.Fprintf(w, "note: pattern %s is redundant: it contains %s, so avoiding %s already avoids it\n",
				d.Pattern, d.Inside, d.Inside)
		}
	}
}

// byteSize is a flag value like 8G, 512M or 1000000 (bytes).
type byteSize int64

func (b *byteSize) String() string { return strconv.FormatInt(int64(*b), 10) }

func (b *byteSize) Set(s string) error {
	v, err := bytesize.Parse(s)
	if err != nil {
		return err
	}
	*b = byteSize(v)
	return nil
}
