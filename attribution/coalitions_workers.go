package attribution

import (
	"sync"
	"sync/atomic"
)

// parallelFor calls fn(worker, i) for i = 0..n−1 on up to workers
// goroutines; worker ∈ [0, workers) identifies per-goroutine scratch space.
// Items are handed out dynamically, so fn must make item i's result
// independent of which worker runs it and of the order of items: that is
// what keeps the engine's output identical for any number of workers.
func parallelFor(workers, n int, fn func(worker, i int)) {
	if workers > n {
		workers = n
	}
	if workers <= 1 {
		for i := 0; i < n; i++ {
			fn(0, i)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				fn(w, i)
			}
		}(w)
	}
	wg.Wait()
}

// splitRange returns the bounds of part p of [0, n) cut into parts nearly
// equal contiguous pieces.
func splitRange(n, parts, p int) (lo, hi int) {
	return n * p / parts, n * (p + 1) / parts
}
