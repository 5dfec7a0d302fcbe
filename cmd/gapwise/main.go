// Command gapwise audits a diagnostic model for fairness: it splits the
// gap in a performance metric between two patient groups into
// contributions of the mechanisms of a causal graph over the recorded
// variables. See the README for the method and its assumptions.
//
// Usage:
//
//	gapwise decompose --spec FILE [--out DIR] [--format text|json|markdown] [--workers N] [--force]
//	gapwise check --spec FILE
//	gapwise demo [--out DIR] [--rows N] [--seed S] [--force]
//	gapwise --version
//
// Exit status: 0 on success, 1 when the tool fails, 2 for bad input or
// usage (an unknown flag, a bad spec or data file, an output folder in the
// way). On SIGINT, SIGTERM or SIGHUP gapwise removes its temporary files
// and ends by the same signal (the shell shows 128+n: 130 for SIGINT).
package main

import "os"

// version is the program's version, set at build time with
// -ldflags "-X main.version=v1.2.3".
var version = "dev"

func main() {
	interrupts = watchSignals()
	interrupts.exit(execute(os.Args[1:], os.Stdout, os.Stderr))
}
