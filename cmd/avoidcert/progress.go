package main

import (
	"fmt"
	"io"
	"os"
	"sync"
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

// checkLines reports the checker's progress as lines on log: at most one
// line per percent of the estimated work, and what it is doing between
// them for the heartbeat.
func checkLines(log *progressLog) func(done, total int64) {
	shown := int64(-1)
	return func(done, total int64) {
		pct := 100 * done / max(total, 1)
		log.doing(fmt.Sprintf("checking the certificate, %d%% of about %d coefficient operations", pct, total))
		if pct > shown {
			shown = pct
			log.printf("checked %d%%: about %d of %d coefficient operations", pct, done, total)
		}
	}
}

// heartbeat is the longest a progress log stays silent while work goes
// on (a variable so that tests can shorten it).
var heartbeat = 3 * time.Second

// progressLog writes progress lines for logs (--progress) and, whenever
// the work has printed nothing for a heartbeat, a line saying what it is
// doing and for how long: a single step of a large iterate, a bracket or a
// percent of a check can take minutes. Its methods may be called from any
// goroutine; close stops the heartbeat.
type progressLog struct {
	w     io.Writer
	start time.Time
	mu    sync.Mutex
	last  time.Time // of the last line
	now   string    // what the work is doing
	done  chan struct{}
	wg    sync.WaitGroup
}

func newProgressLog(w io.Writer) *progressLog {
	l := &progressLog{w: w, start: time.Now(), last: time.Now(), now: "starting", done: make(chan struct{})}
	l.wg.Add(1)
	go func() {
		defer l.wg.Done()
		tick := time.NewTicker(heartbeat / 4)
		defer tick.Stop()
		for {
			select {
			case <-l.done:
				return
			case <-tick.C:
				l.mu.Lock()
				if time.Since(l.last) >= heartbeat {
					fmt.Fprintf(l.w, "still working after %s: %s\n", time.Since(l.start).Round(time.Second/10), l.now)
					l.last = time.Now()
				}
				l.mu.Unlock()
			}
		}
	}()
	return l
}

// printf prints one progress line.
func (l *progressLog) printf(format string, args ...any) {
	l.mu.Lock()
	defer l.mu.Unlock()
	fmt.Fprintf(l.w, format+"\n", args...)
	l.last = time.Now()
}

// doing records what the work is doing, for the next heartbeat line.
func (l *progressLog) doing(what string) {
	l.mu.Lock()
	defer l.mu.Unlock()
	l.now = what
}

// close stops the heartbeat; nothing is printed after it returns.
func (l *progressLog) close() {
	close(l.done)
	l.wg.Wait()
}
