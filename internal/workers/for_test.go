package workers

import (
	"sync/atomic"
	"testing"
)

func TestForVisitsEachItemOnce(t *testing.T) {
	for _, g := range []int{0, 1, 2, 7} {
		for _, n := range []int{0, 1, 5, 1000} {
			seen := make([]int32, n)
			var maxWorker atomic.Int64
			For(g, n, func(w, i int) {
				atomic.AddInt32(&seen[i], 1)
				for {
					m := maxWorker.Load()
					if int64(w) <= m || maxWorker.CompareAndSwap(m, int64(w)) {
						break
					}
				}
			})
			for i, c := range seen {
				if c != 1 {
					t.Fatalf("goroutines %d, n %d: item %d ran %d times", g, n, i, c)
				}
			}
			if n > 0 && int(maxWorker.Load()) >= min(Count(g), n) {
				t.Errorf("goroutines %d, n %d: worker index %d out of range", g, n, maxWorker.Load())
			}
		}
	}
}

func TestCount(t *testing.T) {
	if Count(3) != 3 || Count(0) < 1 || Count(-1) < 1 {
		t.Errorf("Count(3)=%d Count(0)=%d Count(-1)=%d", Count(3), Count(0), Count(-1))
	}
}

// TestForCarriesPanics: a panic in an item reaches For's caller, where it
// can be recovered, for any number of goroutines.
func TestForCarriesPanics(t *testing.T) {
	for _, g := range []int{1, 2, 8} {
		func() {
			defer func() {
				v := recover()
				if v == nil {
					t.Fatalf("%d goroutines: the panic was lost", g)
				}
				if p, ok := v.(*Panic); ok && p.Value != "boom" || !ok && v != "boom" {
					t.Errorf("%d goroutines: recovered %v", g, v)
				}
			}()
			For(g, 100, func(_, i int) {
				if i == 37 {
					panic("boom")
				}
			})
		}()
	}
}
