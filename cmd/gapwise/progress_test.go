package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// nonTerminal returns a regular file to use as stderr: an *os.File that
// is not a terminal, like stderr redirected to a log.
func nonTerminal(t *testing.T) *os.File {
	t.Helper()
	f, err := os.Create(filepath.Join(t.TempDir(), "stderr.txt"))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

// TestProgressLine checks what the progress line writes: nothing (and no
// bootstrap callback) when stderr is a buffer or a regular file, and on a
// terminal one line rewritten in place with "\r" and erased at the end
// (ANSI "erase in line", ESC [ K, from memory).
func TestProgressLine(t *testing.T) {
	var buf bytes.Buffer
	file := nonTerminal(t)
	for name, w := range map[string]*progressLine{"buffer": newProgressLine(&buf), "file": newProgressLine(file)} {
		if w.on {
			t.Errorf("%s: progress line is on for a non-terminal", name)
		}
		if w.bootstrap() != nil || w.sampling() != nil {
			t.Errorf("%s: progress callback for a non-terminal", name)
		}
		w.show("gapwise: estimating %d mechanisms", 5)
		w.clear()
	}
	if buf.Len() != 0 || readFile(t, file.Name()) != "" {
		t.Errorf("non-terminal stderr got %q / %q", buf.String(), readFile(t, file.Name()))
	}

	var term bytes.Buffer
	p := &progressLine{w: &term, on: true} // as on a terminal
	p.show("gapwise: estimating %d mechanisms", 5)
	cb := p.bootstrap()
	cb(1, 200)
	cb(37, 200)
	p.sampling()(16, 500)
	p.clear()
	p.clear() // a second clear writes nothing
	want := "\rgapwise: estimating 5 mechanisms\x1b[K" + "\rgapwise: bootstrap 1/200\x1b[K" + "\rgapwise: bootstrap 37/200\x1b[K" +
		"\rgapwise: sampling Shapley values, 16/500 permutation pairs\x1b[K" + "\r\x1b[K"
	if term.String() != want {
		t.Errorf("terminal got %q\nwant %q", term.String(), want)
	}
}
