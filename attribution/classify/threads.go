package classify

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
