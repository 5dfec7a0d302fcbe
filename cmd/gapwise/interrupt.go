package main

import (
	"fmt"
	"os"
	"os/signal"
	"sync"
	"syscall"
	"time"
)

// stopSignals are the signals that end gapwise cleanly: interrupt (Ctrl-C),
// terminate (kill's default) and hang-up (the terminal went away).
var stopSignals = []os.Signal{syscall.SIGINT, syscall.SIGTERM, syscall.SIGHUP}

// signalNames are the names users know stopSignals by.
var signalNames = map[os.Signal]string{syscall.SIGINT: "SIGINT", syscall.SIGTERM: "SIGTERM", syscall.SIGHUP: "SIGHUP"}

// interruptGuard holds back SIGINT, SIGTERM and SIGHUP while outputs are
// being written. Outside a write a signal ends the process at once (nothing
// of gapwise's is on disk then); during a write it is only recorded, and the
// writer, at its next checkpoint, removes its temporary files and returns an
// *interruptedError. The final renames that swap outputs in are not
// checkpointed: they always run to the end (or roll back), so a signal
// never leaves a mixed set. A nil guard never reports a signal.
type interruptGuard struct {
	mu      sync.Mutex
	writing int       // writes in progress
	caught  os.Signal // first signal received, nil if none

	// hook, when set (by tests), runs at every checkpoint with its name.
	hook func(checkpoint string)
}

// interrupts is the process's guard, installed by main; nil in tests that
// do not install one.
var interrupts *interruptGuard

// watchSignals installs the guard for the signals of stopSignals that are
// not ignored (a job started with `nohup` or in the background of a
// non-interactive shell keeps ignoring them).
func watchSignals() *interruptGuard {
	g := &interruptGuard{}
	ch := make(chan os.Signal, 1)
	for _, s := range stopSignals {
		if !signal.Ignored(s) {
			signal.Notify(ch, s)
		}
	}
	go func() {
		for s := range ch {
			g.receive(s)
		}
	}()
	return g
}

// receive records s; outside a write it ends the process by s at once.
func (g *interruptGuard) receive(s os.Signal) {
	g.mu.Lock()
	defer g.mu.Unlock()
	if g.caught == nil {
		g.caught = s
	}
	if g.writing == 0 {
		dieBy(g.caught)
	}
}

// begin marks the start of a write; it fails if a signal already came.
func (g *interruptGuard) begin() error {
	if g == nil {
		return nil
	}
	g.mu.Lock()
	defer g.mu.Unlock()
	if g.caught != nil {
		return &interruptedError{g.caught}
	}
	g.writing++
	return nil
}

// end marks the end of a write begun with begin.
func (g *interruptGuard) end() {
	if g == nil {
		return
	}
	g.mu.Lock()
	defer g.mu.Unlock()
	g.writing--
}

// checkpoint returns an *interruptedError if a signal came; the writer
// then undoes what it did.
func (g *interruptGuard) checkpoint(name string) error {
	if g == nil {
		return nil
	}
	if g.hook != nil {
		g.hook(name)
	}
	g.mu.Lock()
	defer g.mu.Unlock()
	if g.caught != nil {
		return &interruptedError{g.caught}
	}
	return nil
}

// exit ends the process: by the caught signal if there was one (so that a
// calling shell sees the job was interrupted, status 128+n: 130 for
// SIGINT, 143 for SIGTERM, 129 for SIGHUP), otherwise with code.
func (g *interruptGuard) exit(code int) {
	if g != nil {
		g.mu.Lock()
		if g.caught != nil {
			dieBy(g.caught)
		}
		g.mu.Unlock()
	}
	os.Exit(code)
}

// dieBy ends the process by signal s with its default action, the
// convention for a program that caught a signal to clean up (the shell
// then shows status 128+n). Where a signal cannot be re-raised it exits
// with status 128+n itself.
func dieBy(s os.Signal) {
	signal.Reset(s)
	if p, err := os.FindProcess(os.Getpid()); err == nil && p.Signal(s) == nil {
		time.Sleep(time.Second) // the signal ends the process meanwhile
	}
	os.Exit(signalStatus(s))
}

// signalStatus is the shell's exit status of a process ended by s: 128+n.
func signalStatus(s os.Signal) int {
	if n, ok := s.(syscall.Signal); ok {
		return 128 + int(n)
	}
	return exitFailure
}

// interruptedError is a write stopped by a signal after its temporary
// files were removed.
type interruptedError struct{ sig os.Signal }

func (e *interruptedError) Error() string {
	name, ok := signalNames[e.sig]
	if !ok {
		name = e.sig.String()
	}
	return fmt.Sprintf("interrupted by %s: temporary files removed, outputs left as they were", name)
}
