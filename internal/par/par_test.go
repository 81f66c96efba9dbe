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
