package main

import (
	"fmt"
	"io"
	"os"
	"sync/atomic"
	"time"

	"github.com/vbauerster/cupwriter"
	"github.com/vbauerster/mpb/v8"
	"github.com/vbauerster/mpb/v8/decor"
)

// progressWanted reports whether f is a terminal: live progress is drawn
// there by default, and never into a file or a pipe.
func progressWanted(f *os.File) bool {
	return cupwriter.New(f, false).IsTerminal()
}

// liveBar is one live progress bar on a terminal (mpb). Its methods may be
// called from the goroutine doing the work; finish must be called before
// the command prints its result.
type liveBar struct {
	container *mpb.Progress
	bar       *mpb.Bar
	label     atomic.Pointer[string] // what the bar shows before it, updated with the work
}

// newLiveBar draws a bar of total units on w; describe prints the label
// before it from the bar's current state.
func newLiveBar(w io.Writer, total int64, unit string) *liveBar {
	lb := &liveBar{container: mpb.New(mpb.WithOutput(w), mpb.WithWidth(30), mpb.WithRefreshRate(250*time.Millisecond))}
	lb.bar = lb.container.New(max(total, 1), mpb.BarStyle(),
		mpb.PrependDecorators(decor.Any(func(decor.Statistics) string {
			if l := lb.label.Load(); l != nil {
				return *l
			}
			return ""
		})),
		mpb.AppendDecorators(
			decor.CountersNoUnit(" %d/%d "+unit),
			decor.Name("  elapsed "), decor.Elapsed(decor.ET_STYLE_GO),
			decor.Name("  ETA ~"), decor.AverageETA(decor.ET_STYLE_GO),
		))
	return lb
}

// set moves the bar to current of total with a new label.
func (lb *liveBar) set(label string, current, total int64) {
	lb.label.Store(&label)
	lb.bar.SetTotal(max(total, 1), false)
	lb.bar.SetCurrent(min(current, max(total, 1)))
}

// finish removes the bar from the terminal's flow and waits until it is
// drawn for the last time.
func (lb *liveBar) finish() {
	lb.bar.Abort(false)
	lb.container.Wait()
}

// checkLines reports the checker's progress as lines on w, for logs: at
// most one line per percent of the estimated work.
func checkLines(w io.Writer) func(done, total int64) {
	shown := int64(-1)
	return func(done, total int64) {
		if pct := 100 * done / max(total, 1); pct > shown {
			shown = pct
			fmt.Fprintf(w, "checked %d%%: about %d of %d coefficient operations\n", pct, done, total)
		}
	}
}
