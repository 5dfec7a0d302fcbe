package fairness

import (
	"errors"
	"fmt"
	"io"
)

// Upper limits on what a spec or data file may ask for, so that no input
// makes gapwise grow memory or work without bound. Values beyond them are
// refused as bad input (exit status 2). The README's "Reliability and
// safety" section lists them.
const (
	// MaxSpecBytes caps the size of a spec file.
	MaxSpecBytes = 1 << 20
	// MaxDataBytes caps the size of a data file: the audit holds about ten
	// times the file's size in memory.
	MaxDataBytes = 2 << 30
	// MaxLineBytes caps one line of a data file (a header of thousands of
	// columns is far below it; a stream without line breaks is not).
	MaxLineBytes = 1 << 20
	// MaxFolds caps the cross-fitting folds (common practice uses 5 to 10).
	MaxFolds = 50
	// MaxFoldSplits caps fold_splits, the independent fold splits whose
	// estimates are averaged: each costs one full estimate, and the
	// split-to-split noise of the average falls as 1/√R, so beyond 100 it
	// is far below the sampling error.
	MaxFoldSplits = 100
	// MaxECEBins caps the bins of the expected calibration error.
	MaxECEBins = 1000
	// MaxReplicates caps the bootstrap replicates (intervals.replicates and
	// the --intervals flag).
	MaxReplicates = 10000
	// MaxNodes caps the graph's nodes: coalitions of mechanisms are sets
	// held in 64-bit words.
	MaxNodes = 63
	// MaxSuppressBelow caps suppress_below (and --suppress-below), the
	// threshold of small-cell suppression; publishers use about 5 to 20
	// (common practice).
	MaxSuppressBelow = 1000
)

// CheckSuppressBelow returns nil when t is a threshold of small-cell
// suppression: 0 (none) or 2 to MaxSuppressBelow (1 would withhold
// nothing); otherwise an error that reads after the key or flag's name.
func CheckSuppressBelow(t int) error {
	if t == 0 || (t >= 2 && t <= MaxSuppressBelow) {
		return nil
	}
	return fmt.Errorf("must be 0 (no suppression) or from 2 to %d (10 is common), got %d", MaxSuppressBelow, t)
}

// ErrTooLarge is wrapped by errors for inputs beyond a limit.
var ErrTooLarge = errors.New("input exceeds a limit")

// boundedReader reads from r but fails with ErrTooLarge once more than
// total bytes were read, or a line runs longer than line bytes.
type boundedReader struct {
	r           io.Reader
	total, line int64
	read, run   int64 // bytes read so far; bytes since the last '\n'
}

func (b *boundedReader) Read(p []byte) (int, error) {
	n, err := b.r.Read(p)
	b.read += int64(n)
	for _, c := range p[:n] {
		if c == '\n' {
			b.run = 0
		} else {
			b.run++
		}
		if b.run > b.line {
			return n, fmt.Errorf("a line is longer than %d bytes (is it a data file?): %w", b.line, ErrTooLarge)
		}
	}
	if b.read > b.total {
		return n, fmt.Errorf("the data file is larger than the limit of %d bytes: %w", b.total, ErrTooLarge)
	}
	return n, err
}

// readSpecFile reads at most MaxSpecBytes from r, failing with ErrTooLarge
// beyond.
func readSpecFile(r io.Reader) ([]byte, error) {
	src, err := io.ReadAll(io.LimitReader(r, MaxSpecBytes+1))
	if err != nil {
		return nil, err
	}
	if len(src) > MaxSpecBytes {
		return nil, fmt.Errorf("the spec file is larger than the limit of %d bytes: %w", MaxSpecBytes, ErrTooLarge)
	}
	return src, nil
}
