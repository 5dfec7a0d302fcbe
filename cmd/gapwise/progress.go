package main

import (
	"fmt"
	"io"
	"os"

	"golang.org/x/term"
)

// progressLine is a single status line on stderr that each update
// rewrites in place ("\r", then the text, then the ANSI erase-to-end-of-line
// sequence). It writes only when stderr is a terminal, so redirected or
// captured stderr (CI logs, tests, pipes) stays free of progress output.
type progressLine struct {
	w     io.Writer
	on    bool
	dirty bool // a line is showing and needs clearing
}

// newProgressLine returns a progress line on stderr; it is silent unless
// stderr is an *os.File that is a terminal (golang.org/x/term).
func newProgressLine(stderr io.Writer) *progressLine {
	return &progressLine{w: stderr, on: isTerminal(stderr)}
}

// isTerminal reports whether w is an *os.File connected to a terminal.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(int(f.Fd()))
}

// show replaces the line's text.
func (p *progressLine) show(format string, args ...any) {
	if !p.on {
		return
	}
	fmt.Fprintf(p.w, "\r"+format+"\x1b[K", args...)
	p.dirty = true
}

// bootstrap returns a callback for fairness.RunOptions.Progress that shows
// "gapwise: bootstrap done/total"; nil when the line is silent, so that
// no callback runs at all.
func (p *progressLine) bootstrap() func(done, total int) {
	if !p.on {
		return nil
	}
	return func(done, total int) {
		p.show("gapwise: bootstrap %d/%d", done, total)
	}
}

// sampling returns a callback for fairness.RunOptions.SamplingProgress that
// shows "gapwise: sampling Shapley values, pairs/budget permutation pairs";
// nil when the line is silent.
func (p *progressLine) sampling() func(pairs, budget int) {
	if !p.on {
		return nil
	}
	return func(pairs, budget int) {
		p.show("gapwise: sampling Shapley values, %d/%d permutation pairs", pairs, budget)
	}
}

// clear erases the line, leaving the cursor at the start of an empty line.
func (p *progressLine) clear() {
	if p.on && p.dirty {
		fmt.Fprint(p.w, "\r\x1b[K")
		p.dirty = false
	}
}
