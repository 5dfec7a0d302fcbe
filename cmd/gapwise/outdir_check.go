package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
)

// check reports, before any work starts, whether d can receive the files
// named: the folder (or, when it does not exist, its nearest existing
// ancestor) must be a folder, possibly through a symbolic link, in which a
// probe folder can really be created (permission bits alone say nothing
// when running as root or on a read-only mount); an existing non-empty
// folder needs force; an existing file of an output's name must be a
// regular file and not the same file as an input. Every problem is an
// *outDirError (exit status 2).
func (d outDir) check(names ...string) error {
	_, err := d.inspect(names)
	return err
}

// inspect is check, also reporting whether the folder exists.
func (d outDir) inspect(names []string) (exists bool, err error) {
	base := nearestEntry(d.path)
	exists = base == filepath.Clean(d.path)
	if problem := notAFolder(base); problem != "" {
		if exists {
			return false, d.problem(problem)
		}
		return false, d.problem("cannot be created: " + base + " " + problem)
	}
	if exists {
		if err := d.checkExisting(names); err != nil {
			return false, err
		}
	}
	if err := probeWrite(base); err != nil {
		return false, d.problem(fmt.Sprintf("cannot write in %s: %v", base, err))
	}
	return exists, nil
}

// checkExisting checks an existing folder: emptiness without force, and
// every output name.
func (d outDir) checkExisting(names []string) error {
	entries, err := os.ReadDir(d.path)
	if err != nil {
		return d.problem(fmt.Sprintf("cannot be read: %v", pathErrText(err)))
	}
	if len(entries) > 0 && !d.force {
		return d.problem("exists and is not empty (use --force to replace the files gapwise writes there)")
	}
	if err := d.checkInputs(names...); err != nil {
		return err
	}
	for _, n := range names {
		path := filepath.Join(d.path, n)
		info, err := os.Lstat(path)
		if err != nil {
			continue // absent (or unreadable: the write will say)
		}
		if info.Mode()&fs.ModeSymlink != 0 {
			target, _ := os.Readlink(path)
			return d.problem(path + " is a symbolic link to " + target + " (gapwise replaces only regular files and never writes through a link)")
		}
		if !info.Mode().IsRegular() {
			return d.problem(path + " exists and is not a regular file (gapwise replaces only regular files)")
		}
	}
	return nil
}

// checkInputs refuses an output name in the folder that is the same file
// as one of d.inputs. Files are compared by identity (device and inode,
// os.SameFile), not by name, so a hard link, a symbolic link or another
// spelling of the same path is caught. An input that cannot be read is
// skipped: the run reports it.
func (d outDir) checkInputs(names ...string) error {
	for _, n := range names {
		path := filepath.Join(d.path, n)
		out, err := os.Stat(path)
		if err != nil {
			continue
		}
		for _, in := range d.inputs {
			if info, err := os.Stat(in); err == nil && os.SameFile(out, info) {
				return d.problem(fmt.Sprintf("%s is the same file as the input %s; gapwise never writes over an input (choose another --out folder)", path, in))
			}
		}
	}
	return nil
}

func (d outDir) problem(p string) *outDirError { return &outDirError{d.path, p} }

// nearestEntry returns path, cleaned, if it exists (as anything, a
// dangling link included), else its nearest existing ancestor.
func nearestEntry(path string) string {
	p := filepath.Clean(path)
	for {
		if _, err := os.Lstat(p); err == nil || filepath.Dir(p) == p {
			return p
		}
		p = filepath.Dir(p)
	}
}

// notAFolder describes why path, which exists, cannot hold files: "" when
// it is a folder (directly or through symbolic links).
func notAFolder(path string) string {
	info, err := os.Stat(path)
	if err == nil {
		if info.IsDir() {
			return ""
		}
		return "exists and is not a folder"
	}
	if link, lerr := os.Lstat(path); lerr == nil && link.Mode()&fs.ModeSymlink != 0 && errors.Is(err, fs.ErrNotExist) {
		target, _ := os.Readlink(path)
		return fmt.Sprintf("is a symbolic link to %s, which does not exist", target)
	}
	return "cannot be used: " + pathErrText(err)
}

// probeWrite creates and removes a hidden folder in dir: the real test of
// whether gapwise may create entries there.
func probeWrite(dir string) error {
	p, err := os.MkdirTemp(dir, ".gapwise-probe-")
	if err != nil {
		return errors.New(pathErrText(err))
	}
	return os.Remove(p)
}

// pathErrText is the cause of a *fs.PathError without the repeated path
// ("permission denied"), or the error's text.
func pathErrText(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}
