package par

import (
	"fmt"
	"runtime/debug"
	"sync"
)

// PanicBox carries a panic out of the goroutines that wait on it: a panic
// that no goroutine recovers ends the process with the Go runtime's exit
// code 2, which is the tool's code for bad input. A goroutine defers
// func() { box.Caught(recover()) }() first thing; the goroutine that
// waited for it calls Raise, which panics again there (where the command
// recovers it and reports an internal error), with the first caught value
// and its stack. The zero value is ready to use.
type PanicBox struct {
	once  sync.Once
	value *WorkerPanic
}

// WorkerPanic is what Raise panics with: the worker's value and stack.
type WorkerPanic struct {
	Value any
	Stack []byte
}

func (w *WorkerPanic) String() string { return fmt.Sprintf("%v (in a worker goroutine)", w.Value) }

// PanicStack is the stack of the goroutine that panicked, for the report.
func (w *WorkerPanic) PanicStack() []byte { return w.Stack }

// Caught keeps r, what recover returned in a deferred function of the
// goroutine, with that goroutine's stack, and reports whether there was a
// panic (r != nil); only the first panic is kept.
func (b *PanicBox) Caught(r any) bool {
	if r == nil {
		return false
	}
	stack := debug.Stack()
	b.once.Do(func() { b.value = &WorkerPanic{Value: r, Stack: stack} })
	return true
}

// Raise panics with the captured panic, if any; call it after the
// goroutines are done.
func (b *PanicBox) Raise() {
	if b.value != nil {
		panic(b.value)
	}
}
