package main

import (
	"fmt"
	"os"
	"path/filepath"
)

// outFile is one file to place in an output folder.
type outFile struct {
	name string
	data []byte
}

// outDirError is an output folder that cannot be used as asked: one in the
// way, not writable, or holding an input under an output's name. It is a
// usage problem (exit status 2).
type outDirError struct {
	dir, problem string
}

func (e *outDirError) Error() string { return fmt.Sprintf("output folder %s: %s", e.dir, e.problem) }

// outDir is an output folder and the rules for writing it.
//
// What a write guarantees:
//   - Each file appears whole: it is written under a temporary name,
//     flushed to disk (fsync) and renamed, never written in place.
//   - A folder that does not exist appears only with every file in it: the
//     files go into a hidden folder beside it, which is renamed to path.
//   - In an existing folder (with force when it is not empty) the files of
//     one write change together: they are staged in a hidden folder inside
//     it (.gapwise-tmp-*), then every old file of the same names (and of
//     the retired names) is moved out into the stage before any new one is
//     moved in. At no moment, not even after a crash, does the folder hold
//     a new file beside an old one; other files are left alone. A failed
//     move is rolled back.
//   - SIGINT, SIGTERM and SIGHUP are held back while writing (see
//     interruptGuard): the temporary files are removed and the folder is
//     left as it was; the final moves are never interrupted halfway.
//   - No output is the same file as an input (compared by identity, so hard
//     links, symbolic links and different spellings of a path are caught),
//     and an existing output name must be a regular file: it is replaced by
//     rename, so a link is never written through.
//   - A symbolic link to a folder is written through; it is never replaced.
//
// What cannot be guaranteed: a crash (power loss, SIGKILL, the kernel's
// out-of-memory killer) while the files are moved leaves the folder with
// only part of one write's files and the rest in the hidden stage folder;
// a crash before leaves a hidden temporary folder. Neither is removed by a
// later run (another gapwise may be using it); both can be deleted.
type outDir struct {
	path   string   // the folder, as given
	force  bool     // a non-empty folder may receive files
	inputs []string // files the run reads: no output may be one of them
}

// write places files in d (see outDir) after checking it again, and moves
// the files named in retire, if present, out of the folder together with
// the old files (so that stale outputs never sit beside new inputs).
// Missing parent folders are created, and removed again on failure.
func (d outDir) write(files []outFile, retire ...string) error {
	names := make([]string, 0, len(files)+len(retire))
	for _, f := range files {
		names = append(names, f.name)
	}
	exists, err := d.inspect(append(names, retire...))
	if err != nil {
		return err
	}
	if err := interrupts.begin(); err != nil {
		return err
	}
	defer interrupts.end()
	if exists {
		return d.swapIn(files, retire)
	}
	return d.create(files)
}

// create writes files into a new folder d.path: a hidden temporary folder
// beside it, renamed to d.path once every file is on disk.
func (d outDir) create(files []outFile) (err error) {
	parent := filepath.Dir(filepath.Clean(d.path))
	made, err := mkdirParents(parent)
	if err != nil {
		return err
	}
	tmp := ""
	defer func() {
		if err != nil {
			if tmp != "" {
				os.RemoveAll(tmp)
			}
			removeEmpty(made)
		}
	}()
	if tmp, err = os.MkdirTemp(parent, "."+filepath.Base(d.path)+".tmp-"); err != nil {
		return err
	}
	if err = stageFiles(tmp, files); err != nil {
		return err
	}
	if err = os.Chmod(tmp, 0o755); err != nil { // MkdirTemp makes it 0700
		return err
	}
	if err = interrupts.checkpoint("before rename"); err != nil {
		return err
	}
	if err = os.Rename(tmp, d.path); err != nil {
		return err
	}
	syncDir(parent)
	return nil
}

// stageFiles writes each file into dir, checking for a signal after each.
func stageFiles(dir string, files []outFile) error {
	for _, f := range files {
		if err := writeSynced(filepath.Join(dir, f.name), f.data); err != nil {
			return err
		}
		if err := interrupts.checkpoint("staged " + f.name); err != nil {
			return err
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

// syncDir flushes a folder's entries (the renames in it) to disk. It is
// best effort: some systems cannot sync a folder, and the files themselves
// are already synced.
func syncDir(dir string) {
	if f, err := os.Open(dir); err == nil {
		f.Sync()
		f.Close()
	}
}

// mkdirParents creates dir and its missing parents, returning the folders
// it created, outermost first.
func mkdirParents(dir string) ([]string, error) {
	var missing []string
	for p := filepath.Clean(dir); ; p = filepath.Dir(p) {
		if _, err := os.Lstat(p); err == nil || filepath.Dir(p) == p {
			break
		}
		missing = append(missing, p)
	}
	var made []string
	for i := len(missing) - 1; i >= 0; i-- {
		if err := os.Mkdir(missing[i], 0o755); err != nil {
			removeEmpty(made)
			return nil, err
		}
		made = append(made, missing[i])
	}
	return made, nil
}

// removeEmpty removes the folders made by mkdirParents, innermost first,
// if they are still empty.
func removeEmpty(made []string) {
	for i := len(made) - 1; i >= 0; i-- {
		os.Remove(made[i])
	}
}
