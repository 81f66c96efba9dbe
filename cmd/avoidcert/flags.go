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
			return nil, usagef("%s: %s; run 'avoidcert help %s'", fs.Name(), asTyped(fs, err.Error(), args), fs.Name())
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

func (b *byteSize) Set(s string) error {
	v, err := bytesize.Parse(s)
	if err != nil {
		return err
	}
	*b = byteSize(v)
	return nil
}

// flagInMessage finds the flag name in the flag package's messages, which
// always write it with one dash ("flag provided but not defined: -to").
var flagInMessage = regexp.MustCompile(`(flag(?: provided but not defined:| needs an argument:)? |value .* for )-([A-Za-z0-9][A-Za-z0-9-]*)`)

// valueInMessage finds the value the flag package quotes in full.
var valueInMessage = regexp.MustCompile(`^invalid value (".*") for `)

// asTyped rewrites a flag error to name the flag as the user typed it
// ("--to" rather than the flag package's "-to"), found in args, to cut the
// value quoted to a few dozen characters, and to say what a number flag
// wants instead of "parse error".
func asTyped(fs *flag.FlagSet, msg string, args []string) string {
	if sub := flagInMessage.FindStringSubmatch(msg); sub != nil && strings.HasSuffix(msg, ": parse error") {
		if f := fs.Lookup(sub[2]); f != nil {
			want := "a number"
			if _, err := strconv.Atoi(f.DefValue); err == nil {
				want = "a whole number"
			}
			msg = strings.TrimSuffix(msg, "parse error") + "not " + want
		}
	}
	msg = valueInMessage.ReplaceAllStringFunc(msg, func(m string) string {
		v, err := strconv.Unquote(valueInMessage.FindStringSubmatch(m)[1])
		if err != nil {
			return m
		}
		return "invalid value " + quote(v) + " for "
	})
	return flagInMessage.ReplaceAllStringFunc(msg, func(m string) string {
		sub := flagInMessage.FindStringSubmatch(m)
		name := sub[2]
		typed := "-" + name
		for _, a := range args {
			if a == "--" {
				break
			}
			if a == "--"+name || strings.HasPrefix(a, "--"+name+"=") {
				typed = "--" + name
				break
			}
		}
		return sub[1] + quoteArg(typed)
	})
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
	*d = duration(v)
	return nil
}
