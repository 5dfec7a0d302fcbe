package main

import (
	"fmt"
	"os"
	"path/filepath"
)

// writeFileAtomic writes data to path through a temporary file in the same
// folder, flushed and then renamed over path, so that a reader sees the
// old file or the whole new one and an interrupted write leaves no half
// file. It refuses (a usage error) a path that is a folder or the same
// file as one of inputs, which it never touches.
func writeFileAtomic(path string, data []byte, inputs []string) error {
	if st, err := os.Stat(path); err == nil {
		if st.IsDir() {
			return &usageError{fmt.Sprintf("output %s is a folder; give a file name", path)}
		}
		for _, in := range inputs {
			if ist, err := os.Stat(in); err == nil && os.SameFile(st, ist) {
				return &usageError{fmt.Sprintf("output %s is the input %s; refusing to overwrite an input", path, in)}
			}
		}
	}
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	name := tmp.Name()
	tmp.Close()
	os.Remove(name)
	if err := writeSynced(name, data); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	syncDir(dir)
	return nil
}
