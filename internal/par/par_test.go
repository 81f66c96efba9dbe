package par

import (
	"context"
	"errors"
	"runtime"
	"testing"
)

func TestRunVisitsEveryTaskOnce(t *testing.T) {
	for _, procs := range []int{1, 2, 3} {
		old := runtime.GOMAXPROCS(procs)
		seen := make([]int, 1000)
		err := Run(context.Background(), len(seen), func() func(int) {
			return func(i int) { seen[i]++ }
		})
		runtime.GOMAXPROCS(old)
		if err != nil {
			t.Fatal(err)
		}
		for i, c := range seen {
			if c != 1 {
				t.Fatalf("GOMAXPROCS=%d: task %d ran %d times", procs, i, c)
			}
		}
	}
}

func TestRunStopsWhenCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	ran := 0
	err := Run(ctx, 10, func() func(int) { return func(int) { ran++ } })
	if !errors.Is(err, context.Canceled) || ran != 0 {
		t.Fatalf("err %v, %d tasks ran after cancel", err, ran)
	}
}

// A panic in a worker reaches the caller of Run as a panic of its own
// goroutine, with the worker's value, instead of ending the process.
func TestRunRaisesWorkerPanic(t *testing.T) {
	defer func() {
		r := recover()
		wp, ok := r.(*WorkerPanic)
		if !ok || wp.Value != "task 7" || len(wp.PanicStack()) == 0 {
			t.Fatalf("recovered %v, want the worker's panic", r)
		}
	}()
	Run(context.Background(), 100, func() func(int) {
		return func(i int) {
			if i == 7 {
				panic("task 7")
			}
		}
	})
	t.Fatal("Run returned after a worker panicked")
}

func TestPanicBox(t *testing.T) {
	var box PanicBox
	done := make(chan struct{})
	go func() {
		defer close(done)
		defer func() { box.Caught(recover()) }()
		panic("in a goroutine")
	}()
	<-done
	defer func() {
		if wp, ok := recover().(*WorkerPanic); !ok || wp.Value != "in a goroutine" {
			t.Fatalf("Raise did not raise the captured panic")
		}
	}()
	box.Raise()
}
