package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
)

// outFile is one file to place in an output folder.
type outFile struct {
	name string
	data []byte
}

// outDirError is an output folder that cannot be used as asked, e.g. one
// that is not empty without --force. It is a usage problem (exit status 2).
type outDirError struct {
	dir, problem string
}

func (e *outDirError) Error() string { return fmt.Sprintf("output folder %s: %s", e.dir, e.problem) }

// checkOutDir reports whether dir can receive outputs: it must not exist,
// be an empty folder, or (with force) be any folder. It is called before
// the work starts so that a long run does not end in a refusal.
func checkOutDir(dir string, force bool) error {
	info, err := os.Stat(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	if !info.IsDir() {
		return &outDirError{dir, "exists and is not a folder"}
	}
	empty, err := isEmptyDir(dir)
	if err != nil {
		return err
	}
	if !empty && !force {
		return &outDirError{dir, "exists and is not empty (use --force to replace the files gapwise writes there)"}
	}
	return nil
}

func isEmptyDir(dir string) (bool, error) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return false, err
	}
	return len(entries) == 0, nil
}

// writeOutDir places files in dir so that a reader never sees a partial
// set. When dir does not exist (or is empty) the files are written into a
// temporary folder beside it, which is then renamed to dir: dir appears
// only if every file was written. When dir holds other files (allowed by
// force), each file is written to a temporary file in dir and renamed over
// its target, so each file is replaced whole; other files are left alone.
// Missing parent folders are created.
func writeOutDir(dir string, files []outFile, force bool) error {
	if err := checkOutDir(dir, force); err != nil {
		return err
	}
	if _, err := os.Stat(dir); err == nil {
		empty, err := isEmptyDir(dir)
		if err != nil {
			return err
		}
		if !empty {
			return replaceFiles(dir, files)
		}
		if err := os.Remove(dir); err != nil { // an empty folder: rebuild it whole
			return err
		}
	}
	parent := filepath.Dir(filepath.Clean(dir))
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return err
	}
	tmp, err := os.MkdirTemp(parent, "."+filepath.Base(dir)+".tmp-")
	if err != nil {
		return err
	}
	committed := false
	defer func() {
		if !committed {
			os.RemoveAll(tmp)
		}
	}()
	for _, f := range files {
		if err := writeSynced(filepath.Join(tmp, f.name), f.data); err != nil {
			return err
		}
	}
	if err := os.Chmod(tmp, 0o755); err != nil { // MkdirTemp makes it 0700
		return err
	}
	if err := os.Rename(tmp, dir); err != nil {
		return err
	}
	committed = true
	return nil
}

// replaceFiles writes each file to a temporary file in dir and renames it
// over its target.
func replaceFiles(dir string, files []outFile) error {
	for _, f := range files {
		tmp, err := os.CreateTemp(dir, "."+f.name+".tmp-")
		if err != nil {
			return err
		}
		name := tmp.Name()
		_, werr := tmp.Write(f.data)
		if werr == nil {
			werr = tmp.Sync()
		}
		cerr := tmp.Close()
		if werr == nil {
			werr = cerr
		}
		if werr == nil {
			werr = os.Chmod(name, 0o644)
		}
		if werr == nil {
			werr = os.Rename(name, filepath.Join(dir, f.name))
		}
		if werr != nil {
			os.Remove(name)
			return werr
		}
	}
	return nil
}

// writeSynced creates path with data and flushes it to disk.
func writeSynced(path string, data []byte) error {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		return err
	}
	if err := f.Sync(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// refuseOverwritingInputs returns an *outDirError when one of the output
// files names (in dir) is the same file as one of the inputs, compared by
// file identity (os.SameFile: hard links, symbolic links and different
// spellings of one path are all caught), so that --force can never replace
// a spec or data file with a result.
func refuseOverwritingInputs(dir string, names []string, inputs ...string) error {
	for _, in := range inputs {
		ii, err := os.Stat(in)
		if err != nil {
			continue // a missing input is reported by its loader
		}
		for _, name := range names {
			out := filepath.Join(dir, name)
			oi, err := os.Stat(out)
			if err == nil && os.SameFile(ii, oi) {
				return &outDirError{dir, fmt.Sprintf("its %s is the input file %s; gapwise never writes over an input (choose another --out)", name, in)}
			}
		}
	}
	return nil
}
