// Package bytesize reads and writes memory sizes for flags, manifests and
// messages.
package bytesize

import (
	"fmt"
	"strconv"
	"strings"
)

// Parse reads a size such as 8G, 512M, 2GiB or 1000000 (bytes); the units
// K, M, G, T are binary (1K = 1024 bytes).
func Parse(s string) (int64, error) {
	units := map[string]int64{"": 1, "K": 1 << 10, "M": 1 << 20, "G": 1 << 30, "T": 1 << 40}
	t := strings.ToUpper(strings.TrimSpace(s))
	t = strings.TrimSuffix(strings.TrimSuffix(t, "B"), "I")
	unit := ""
	if n := len(t); n > 0 && strings.ContainsAny(t[n-1:], "KMGT") {
		unit, t = t[n-1:], t[:n-1]
	}
	if len(s) > 40 { // quote a few dozen characters at most
		s = s[:40] + "..."
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || v <= 0 {
		return 0, fmt.Errorf("%q is not a memory size; write e.g. 8G, 512M or 2000000000", s)
	}
	if n := v * float64(units[unit]); n < 1<<63 {
		return int64(n), nil
	}
	return 0, fmt.Errorf("%q is larger than any memory; write e.g. 8G, 512M or 2000000000", s)
}

// Beyond is the size at which estimates stop being exact: the engine
// caps its counts of coefficients at Beyond/8 (transfer.MaxCount), so an
// estimate that reaches Beyond may be far below the true need.
const Beyond = 512 << 30

// About writes an estimate n for a message: "about 3.2 GiB", or "more
// than 512.0 GiB" from Beyond on (where estimates are lower bounds).
func About(n int64) string {
	if n >= Beyond {
		return "more than " + Format(Beyond)
	}
	return "about " + Format(n)
}

// Format writes n bytes with a binary unit: "8.0 GiB", "136.9 MiB",
// "2.0 KiB", "512 bytes", "3.5 TiB". From an exbibyte on it writes "1 EiB
// or more": estimates saturate there (an estimate of 10^30 bytes is not
// worth its digits, and need not be representable).
func Format(n int64) string {
	switch {
	case n >= 1<<60:
		return "1 EiB or more"
	case n >= 1<<50:
		return fmt.Sprintf("%.1f PiB", float64(n)/(1<<50))
	case n >= 1<<40:
		return fmt.Sprintf("%.1f TiB", float64(n)/(1<<40))
	case n >= 1<<30:
		return fmt.Sprintf("%.1f GiB", float64(n)/(1<<30))
	case n >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d bytes", n)
}

// Flag writes a size of at least n bytes as a flag or manifest value,
// rounded up to two significant digits in whole M or G: "640M", "1.3G",
// "12G" (values Parse reads back).
func Flag(n int64) string {
	const mi, gi = 1 << 20, 1 << 30
	if n < gi {
		m := max((n+mi-1)/mi, 1)
		for m >= 100 && m%10 != 0 {
			m++
		}
		return fmt.Sprintf("%dM", m)
	}
	if n >= 1<<50 {
		return fmt.Sprintf("%dG", n/gi+1) // no rounding to two digits up here, and no overflow
	}
	tenths := (n*10 + gi - 1) / gi // in 0.1 G, rounded up
	if tenths >= 100 {
		return fmt.Sprintf("%dG", (tenths+9)/10)
	}
	if tenths%10 == 0 {
		return fmt.Sprintf("%dG", tenths/10)
	}
	return fmt.Sprintf("%d.%dG", tenths/10, tenths%10)
}
