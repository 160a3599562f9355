package atomicfile

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// Write creates path with the bytes that fill writes. Unless force is set,
// an existing path is an error that wraps fs.ErrExist and leaves the file
// untouched. If fill fails or panics, no output and no temporary file remain.
func Write(path string, force bool, fill func(w io.Writer) error) (err error) {
	if !force {
		if _, statErr := os.Lstat(path); statErr == nil {
			return existsError(path)
		}
	}
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	tmp, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return err
	}
	placed := false
	// Deferred so that a panic in fill also removes the temporary file.
	defer func() {
		if !placed {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()

	buf := bufio.NewWriter(tmp)
	if err := fill(buf); err != nil {
		return err
	}
	if err := buf.Flush(); err != nil {
		return err
	}
	// CreateTemp makes the file owner-only; outputs are meant to be shared.
	if err := tmp.Chmod(0o644); err != nil {
		return err
	}
	if err := tmp.Sync(); err != nil {
		return err
	}
	if err := tmp.Close(); err != nil {
		return err
	}
	if err := place(tmp.Name(), path, force); err != nil {
		return err
	}
	placed = true
	syncDir(dir)
	return nil
}

// place moves the finished temporary file to path. Without force it uses a
// hard link, which fails if path appeared meanwhile, instead of a rename,
// which would silently replace it.
func place(tmp, path string, force bool) error {
	if !force {
		err := os.Link(tmp, path)
		if errors.Is(err, fs.ErrExist) {
			return existsError(path)
		}
		if err == nil {
			// path is complete already; a leftover temporary name is harmless.
			os.Remove(tmp)
			return nil
		}
		// Some file systems have no hard links; fall back to rename.
	}
	return os.Rename(tmp, path)
}

func existsError(path string) error {
	return fmt.Errorf("%s already exists; pass --force to replace it: %w", path, fs.ErrExist)
}

// syncDir makes the rename itself durable. Best effort: not every
// platform can sync a directory, and the data is already safe.
func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
}
