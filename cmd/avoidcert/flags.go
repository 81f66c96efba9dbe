package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"regexp"
	"strconv"
	"strings"
	"time"

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
			return nil, usagef("%s: %s; run 'avoidcert help %s'", fs.Name(), flagProblem(fs, err, args), fs.Name())
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

// parseSet is the engine's reading of pattern arguments. It is a variable
// so that a test can give it a fault and show that the checker, which
// reads the typed arguments with its own parser (prove.Options.Typed),
// then refuses rather than answering for the misread set.
var parseSet = pattern.ParseSet

// parsePatterns reads the pattern set from positional arguments.
func parsePatterns(cmd string, args []string) (pattern.Set, error) {
	if len(args) == 0 {
		return pattern.Set{}, usagef("%s: no pattern given; name at least one, e.g. 'avoidcert %s 132'", cmd, cmd)
	}
	s, err := parseSet(args)
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

// Set reads a memory size and refuses one larger than the memory this
// process can have (machineMemory): such a budget would promise what the
// machine cannot give, and the run would fail on it instead of stopping
// within it.
func (b *byteSize) Set(s string) error {
	v, err := bytesize.Parse(s)
	if err != nil {
		return err
	}
	if have, what, ok := machineMemory(); ok && v > have {
		return fmt.Errorf("more than %s (%s); give at most %s", what, bytesize.Format(have), sizeFlag(have))
	}
	*b = byteSize(v)
	return nil
}

// sizeFlag writes n bytes as a --max-memory value, rounded down to whole
// MiB or GiB.
func sizeFlag(n int64) string {
	if n >= 1<<30 {
		return strconv.FormatInt(n>>30, 10) + "G"
	}
	return strconv.FormatInt(max(n>>20, 1), 10) + "M"
}

// The flag package's messages, read so that the command can say the same
// in its own words: the flag named as the user typed it ("--to", where
// the package writes "-to"), the value quoted short, what the flag wants.
var (
	undefinedFlag = regexp.MustCompile(`^flag provided but not defined: -(.*)$`)
	missingValue  = regexp.MustCompile(`^flag needs an argument: -(.*)$`)
	badValue      = regexp.MustCompile(`^invalid (?:boolean )?value ("(?:[^"\\]|\\.)*") for (?:flag )?-([A-Za-z0-9][A-Za-z0-9-]*): (.*)$`)
	badSyntax     = regexp.MustCompile(`^bad flag syntax: (.*)$`)
)

// flagProblem turns an error of the flag package into a message in the
// tool's own words. The flag named is written as the user typed it
// (found in args), a value is quoted short, and a number flag says what
// it wants.
func flagProblem(fs *flag.FlagSet, err error, args []string) string {
	msg := err.Error()
	if sub := undefinedFlag.FindStringSubmatch(msg); sub != nil {
		return fmt.Sprintf("%s is not a flag of %s", quoteArg(typedFlag(sub[1], args)), fs.Name())
	}
	if sub := missingValue.FindStringSubmatch(msg); sub != nil {
		return fmt.Sprintf("%s needs a value after it", typedFlag(sub[1], args))
	}
	if sub := badSyntax.FindStringSubmatch(msg); sub != nil {
		return fmt.Sprintf("%s is not a flag: write --NAME or --NAME=VALUE", quote(sub[1]))
	}
	sub := badValue.FindStringSubmatch(msg)
	if sub == nil {
		return "cannot read the flags" // every message of the flag package is matched above
	}
	value, uerr := strconv.Unquote(sub[1])
	if uerr != nil {
		value = sub[1]
	}
	name, reason := typedFlag(sub[2], args), sub[3]
	f := fs.Lookup(sub[2])
	switch {
	case f != nil && isBoolFlag(f):
		return fmt.Sprintf("%s takes no value (it is on when given), not %s", name, quote(value))
	case reason == "parse error" || reason == "value out of range":
		want := "a number, such as 1e12"
		if f != nil {
			if _, err := strconv.Atoi(f.DefValue); err == nil {
				want = "a whole number"
			}
		}
		if reason == "value out of range" {
			return fmt.Sprintf("%s %s is far too large; give %s of sensible size", name, quote(value), want)
		}
		return fmt.Sprintf("%s %s is not %s", name, quote(value), want)
	}
	return fmt.Sprintf("%s %s: %s", name, quote(value), reason) // our own flag types' reasons
}

func isBoolFlag(f *flag.Flag) bool {
	b, ok := f.Value.(interface{ IsBoolFlag() bool })
	return ok && b.IsBoolFlag()
}

// typedFlag is the flag name as the user typed it: "--to" or "-to".
func typedFlag(name string, args []string) string {
	for _, a := range args {
		if a == "--" {
			break
		}
		if a == "--"+name || strings.HasPrefix(a, "--"+name+"=") {
			return "--" + name
		}
	}
	return "-" + name
}

// quoteArg cuts a user's argument to a few dozen characters for a message.
func quoteArg(s string) string {
	if len(s) > 40 {
		return s[:40] + "..."
	}
	return s
}

// duration is a flag value like 90s or 10m whose errors say what is wrong.
type duration time.Duration

func (d *duration) String() string { return time.Duration(*d).String() }

func (d *duration) Set(s string) error {
	v, err := time.ParseDuration(s)
	if err != nil {
		if _, nerr := strconv.ParseFloat(s, 64); nerr == nil {
			return fmt.Errorf("%s has no unit; write e.g. %ss, 90s or 10m", quote(s), s)
		}
		return errors.New("not a duration; write e.g. 90s, 10m or 1h30m")
	}
	if v <= 0 {
		return fmt.Errorf("%s is no time at all; give a positive duration such as 90s, or leave the flag out for no limit", quote(s))
	}
	*d = duration(v)
	return nil
}
