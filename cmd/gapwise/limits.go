package main

import "fmt"

// Upper limits of flags that size work or memory; beyond them a flag is a
// usage error (exit status 2). The spec's own limits are in fairness
// (fairness.MaxReplicates and others).
const (
	maxWorkers  = 1024      // --workers
	maxDemoRows = 2_000_000 // demo --rows
)

// checkWorkers rejects a --workers value outside [0, maxWorkers].
func checkWorkers(n int) error {
	if n < 0 {
		return &usageError{fmt.Sprintf("--workers must be 0 or more, got %d", n)}
	}
	if n > maxWorkers {
		return &usageError{fmt.Sprintf("--workers must be at most %d, got %d", maxWorkers, n)}
	}
	return nil
}
