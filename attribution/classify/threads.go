package classify

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// Threaded is implemented by learners whose Fit, and whose fitted models'
// LogOdds, spread their work over several goroutines. A caller that already
// runs several fits at once (one per goroutine) asks each learner for a copy
// limited to fewer goroutines, so that the goroutines doing work do not
// outnumber the processors. Results never depend on the thread count: work
// is cut into fixed blocks whose partial results are reduced in block order.
type Threaded interface {
	Learner
	// WithThreads returns a copy of the learner whose Fit and models use at
	// most n goroutines; n ≤ 0 means GOMAXPROCS.
	WithThreads(n int) Learner
}

// threadCount resolves a Threads setting: n > 0 is used as is, n ≤ 0 means
// GOMAXPROCS.
func threadCount(n int) int {
	if n > 0 {
		return n
	}
	return runtime.GOMAXPROCS(0)
}

// parallelIndex calls fn(i) for i = 0 … n−1 on up to threads goroutines
// (threads ≤ 0 means GOMAXPROCS). Each call must write only to state owned
// by its index, so the outcome does not depend on scheduling.
func parallelIndex(threads, n int, fn func(i int)) {
	workers := min(n, threadCount(threads))
	if workers <= 1 {
		for i := range n {
			fn(i)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() {
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				fn(i)
			}
		})
	}
	wg.Wait()
}
