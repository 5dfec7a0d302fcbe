package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
)

// renameFile is os.Rename; tests replace it to make a move fail.
var renameFile = os.Rename

// swapIn writes files into the existing folder d.path as one generation:
// they are staged in a hidden folder inside it (stage/new; the same file
// system, so every move is an atomic rename), then swap moves the old
// generation out into stage/old and the new one in. The stage is removed
// afterwards, and on any failure or signal before the swap.
func (d outDir) swapIn(files []outFile, retire []string) error {
	stage, err := os.MkdirTemp(d.path, ".gapwise-tmp-")
	if err != nil {
		return err
	}
	keep := false
	defer func() {
		if !keep {
			os.RemoveAll(stage)
		}
	}()
	newDir, oldDir := filepath.Join(stage, "new"), filepath.Join(stage, "old")
	if err := os.Mkdir(newDir, 0o700); err != nil {
		return err
	}
	if err := os.Mkdir(oldDir, 0o700); err != nil {
		return err
	}
	if err := stageFiles(newDir, files); err != nil {
		return err
	}
	if err := interrupts.checkpoint("before swap"); err != nil {
		return err
	}
	g := generation{dir: d.path, newDir: newDir, oldDir: oldDir}
	for _, f := range files {
		g.names = append(g.names, f.name)
	}
	if err := g.swap(retire); err != nil {
		var se *strandedError
		keep = errors.As(err, &se)
		return err
	}
	syncDir(d.path)
	return nil
}

// generation is one swap of files in dir: names are staged in newDir; the
// files they replace are moved to oldDir.
type generation struct {
	dir, newDir, oldDir string
	names               []string
	out, in             []string // names moved out of dir, and into it, so far
}

// swap moves every present file of names and retire out of dir, then every
// new file in. dir thus holds, at each moment, files of one generation
// only. A failed move is rolled back (see rollback).
func (g *generation) swap(retire []string) error {
	for _, n := range append(append([]string(nil), g.names...), retire...) {
		if slices.Contains(g.out, n) {
			continue
		}
		err := renameFile(filepath.Join(g.dir, n), filepath.Join(g.oldDir, n))
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return g.rollback(err)
		}
		g.out = append(g.out, n)
	}
	for _, n := range g.names {
		if err := renameFile(filepath.Join(g.newDir, n), filepath.Join(g.dir, n)); err != nil {
			return g.rollback(err)
		}
		g.in = append(g.in, n)
	}
	return nil
}

// rollback undoes a swap that failed with cause: the new files moved in
// are removed first, then the old ones moved back. If a new file cannot be
// removed the old ones stay in the stage (so dir still holds one
// generation only) and a *strandedError says where they are.
func (g *generation) rollback(cause error) error {
	for _, n := range g.in {
		if err := os.Remove(filepath.Join(g.dir, n)); err != nil {
			return &strandedError{cause, err, g.oldDir}
		}
	}
	for _, n := range g.out {
		if err := renameFile(filepath.Join(g.oldDir, n), filepath.Join(g.dir, n)); err != nil {
			return &strandedError{cause, err, g.oldDir}
		}
	}
	return cause
}

// strandedError is a failed swap whose rollback failed too: the earlier
// files are left in a hidden folder, which is kept.
type strandedError struct {
	cause, undo error
	kept        string
}

func (e *strandedError) Error() string {
	return fmt.Sprintf("replacing the outputs failed (%v) and undoing it failed too (%v); the earlier files are in %s", e.cause, e.undo, e.kept)
}

func (e *strandedError) Unwrap() error { return e.cause }
