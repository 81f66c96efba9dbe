// Package memory keeps a process within its memory budget: Limit tells
// the Go runtime the budget, and Collect returns dead storage to it before
// work that allocates a large part of the budget at once.
//
// Why both: the runtime's memory limit makes the collector run as the heap
// approaches the budget, but it starts a collection only after an
// allocation has passed its goal, and one large allocation (an iterate of
// hundreds of megabytes) can then take the heap that far past it while
// the storage it replaces is still uncollected. Work whose estimated live
// memory fits the budget stays within it when Collect runs first.
package memory

import (
	"math"
	"runtime"
	"runtime/debug"
)

// Limit sets the runtime's memory limit to bytes (debug.SetMemoryLimit),
// for the whole process.
func Limit(bytes int64) {
	debug.SetMemoryLimit(bytes)
}

// Collect runs the garbage collector when need, the estimated peak bytes
// of the work about to start, is more than half of the process's memory
// limit; otherwise, or without a limit, it does nothing. Its cost is small
// next to such work: large tables of words hold no pointers, so there is
// little to mark.
func Collect(need int64) {
	limit := debug.SetMemoryLimit(-1) // reads the limit without changing it
	if limit < math.MaxInt64 && need > limit/2 {
		runtime.GC()
	}
}
