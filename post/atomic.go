package post

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// WriteFileAtomic writes through write() into a temporary file in path's
// folder, syncs, closes and renames it to path. On any error the temporary
// file is removed and path is left untouched. write receives a buffered
// writer; the file gets permissions 0644.
func WriteFileAtomic(path string, write func(w io.Writer) error) (err error) {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return fmt.Errorf("post: write %s: %w", path, err)
	}
	tmp := f.Name()
	renamed := false
	defer func() {
		// Also runs if write panics, so no temporary file is left behind.
		if !renamed {
			f.Close()
			os.Remove(tmp)
		}
	}()
	bw := bufio.NewWriterSize(f, 1<<16)
	if err := write(bw); err != nil {
		return fmt.Errorf("post: write %s: %w", path, err)
	}
	if err := errors.Join(bw.Flush(), f.Chmod(0o644), f.Sync()); err != nil {
		return fmt.Errorf("post: write %s: %w", path, err)
	}
	if err := f.Close(); err != nil {
		return fmt.Errorf("post: write %s: %w", path, err)
	}
	if err := os.Rename(tmp, path); err != nil {
		return fmt.Errorf("post: write %s: %w", path, err)
	}
	renamed = true
	return nil
}
