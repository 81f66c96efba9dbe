// Package par runs independent tasks on GOMAXPROCS goroutines. Results do
// not depend on the number of goroutines as long as each task writes only
// its own output.
package par

import (
	"context"
	"runtime"
	"sync"
	"sync/atomic"
)

// Run calls a worker function for every task 0..n-1, on up to GOMAXPROCS
// goroutines; newWorker is called once per goroutine, so a worker can own
// scratch space. Run stops handing out tasks once ctx is done and returns
// ctx's error then. A panic in a worker is raised again in the caller's
// goroutine (PanicBox), after the other workers stopped.
func Run(ctx context.Context, n int, newWorker func() func(task int)) error {
	workers := min(runtime.GOMAXPROCS(0), n)
	var next atomic.Int64
	var wg sync.WaitGroup
	var box PanicBox
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			defer func() {
				if box.Caught(recover()) {
					next.Store(int64(n)) // hand out no more tasks
				}
			}()
			fn := newWorker()
			for ctx.Err() == nil {
				t := int(next.Add(1) - 1)
				if t >= n {
					return
				}
				fn(t)
			}
		}()
	}
	wg.Wait()
	box.Raise()
	return ctx.Err()
}
