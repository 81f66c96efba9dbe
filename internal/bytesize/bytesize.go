// Package bytesize writes memory sizes for messages.
package bytesize

import "fmt"

// Format writes n bytes with a binary unit: "8.0 GiB", "136.9 MiB",
// "2.0 KiB", "512 bytes".
func Format(n int64) string {
	switch {
	case n >= 1<<30:
		return fmt.Sprintf("%.1f GiB", float64(n)/(1<<30))
	case n >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d bytes", n)
}
