// Package workers runs independent items of work on a bounded number of
// goroutines.
package workers

import (
	"fmt"
	"runtime"
	"sync"
	"sync/atomic"
)

// Count returns n when n > 0 and GOMAXPROCS otherwise: the convention of
// every Workers or Threads option in gapwise.
func Count(n int) int {
	if n > 0 {
		return n
	}
	return runtime.GOMAXPROCS(0)
}

// For calls fn(worker, i) for i = 0 … n−1 on up to Count(goroutines)
// goroutines; worker ∈ [0, goroutines) identifies per-goroutine scratch
// space. Items are handed out dynamically, so fn must make item i's result
// independent of which worker runs it and of the order of items — that is
// what keeps results identical for any number of goroutines. With one
// goroutine (or one item) the items run in order on the caller's goroutine.
// A panic in fn stops the handing out of items and is raised again on the
// caller's goroutine, as a *Panic, once every goroutine has returned.
func For(goroutines, n int, fn func(worker, i int)) {
	w := min(Count(goroutines), n)
	if w <= 1 {
		for i := 0; i < n; i++ {
			fn(0, i)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	var failed atomic.Pointer[Panic]
	for g := 0; g < w; g++ {
		wg.Add(1)
		go func(g int) {
			defer wg.Done()
			defer func() {
				if v := recover(); v != nil {
					failed.CompareAndSwap(nil, &Panic{Value: v})
					next.Store(int64(n)) // the others stop after their item
				}
			}()
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				fn(g, i)
			}
		}(g)
	}
	wg.Wait()
	if p := failed.Load(); p != nil {
		panic(p)
	}
}

// Panic carries a panic raised by fn in one of For's goroutines to the
// goroutine that called For, where it is raised again (a panic in another
// goroutine could not be recovered by the caller and would end the
// process). When several items panic, Value is the first recorded.
type Panic struct{ Value any }

func (p *Panic) Error() string { return fmt.Sprintf("panic in a worker: %v", p.Value) }
