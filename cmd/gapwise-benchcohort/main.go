// Command gapwise-benchcohort writes a synthetic benchmark cohort and its
// spec for timing the CLI (see testdata/bench/time-cli.sh). The data is
// invented by fairness/synth.BenchTable: a label and a chain of Gaussian
// findings whose distributions differ between two groups.
//
//	go run ./cmd/gapwise-benchcohort -rows 200000 -k 8 -out /tmp/bench
//
// It writes cohort.csv and spec.yaml into -out (created if missing).
package main

import (
	"bufio"
	"flag"
	"fmt"
	"os"
	"path/filepath"

	"github.com/gapwise/gapwise/fairness/synth"
)

func main() {
	rows := flag.Int("rows", 200000, "records")
	k := flag.Int("k", 8, "mechanisms (label plus k-1 findings), at least 2")
	seed := flag.Uint64("seed", 1, "generator seed")
	out := flag.String("out", "bench-cohort", "output folder")
	flag.Parse()
	if err := run(*rows, *k, *seed, *out); err != nil {
		fmt.Fprintln(os.Stderr, "gapwise-benchcohort:", err)
		os.Exit(1)
	}
}

func run(rows, k int, seed uint64, out string) error {
	tab, err := synth.BenchTable(rows, k, seed)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		return err
	}
	f, err := os.Create(filepath.Join(out, "cohort.csv"))
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	if err := tab.WriteCSV(w); err != nil {
		f.Close()
		return err
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	if err := f.Close(); err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(out, "spec.yaml"), synth.BenchSpec("cohort.csv", k), 0o644)
}
