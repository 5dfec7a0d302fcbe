// Package synth generates invented data for the demo and for benchmarks.
// Nothing it produces describes real patients: the anaemia screening cohort
// is a synthetic scenario with mechanisms chosen by hand so that an audit
// of it tells a clear story, and the benchmark cohort is a plain Gaussian
// model sized for timing.
//
// Every generator is deterministic: the same size and seed give the same
// rows on every machine (math/rand/v2 PCG, one stream, no goroutines).
package synth
