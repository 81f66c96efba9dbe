// Package brief shortens what a user gave for a message: a value of
// megabytes is named by its start and its length, never echoed whole, so
// that every message stays one short line whatever the input.
package brief

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// Most is the number of bytes of a value that Quote shows.
const Most = 60

// Quote returns s quoted as %q quotes it, cut to its first Most bytes (at a
// character boundary) and followed by its length when it is longer.
func Quote(s string) string {
	if len(s) <= Most {
		return fmt.Sprintf("%q", s)
	}
	cut := Most
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return fmt.Sprintf("%q... (%d bytes)", s[:cut], len(s))
}

// digitsShown is how many leading and trailing digits Digits keeps.
const digitsShown = 15

// Digits shows a long run of digits (a count, a numerator, a decimal as a
// claim wrote it) by its first and last characters and its length; a short
// one is returned as it is.
func Digits(s string) string {
	if len(s) <= 2*digitsShown+10 {
		return s
	}
	unit := "digits"
	if strings.Trim(s, "0123456789") != "" {
		unit = "characters"
	}
	return fmt.Sprintf("%s...%s (%d %s)", s[:digitsShown], s[len(s)-digitsShown:], len(s), unit)
}
