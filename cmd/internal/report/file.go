package report

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// What zapnet writes: a regular file, made whole in a temporary file beside
// it and renamed over the target, so that a reader sees the old file or
// the new one, never half of it. It replaces only an absent target or a
// regular file; it refuses a folder, a device, a pipe, a socket and a
// symbolic link (whose target would be left as it was while the link was
// replaced), so that an output can never take the place of something that
// is not an output.

// CheckTarget says why path cannot take an output file, or nil: it must be
// absent or a regular file, in an existing folder zapnet can write in.
func CheckTarget(path string) error {
	if fi, err := os.Lstat(path); err == nil {
		switch m := fi.Mode(); {
		case m&fs.ModeSymlink != 0:
			return fmt.Errorf("%s is a symbolic link: give the file it points to, or another name", path)
		case m.IsDir():
			return fmt.Errorf("%s is a folder: give a file name", path)
		case !m.IsRegular():
			return fmt.Errorf("%s is not a regular file (a device, a pipe or a socket): zapnet writes only regular files", path)
		}
	} else if !errors.Is(err, fs.ErrNotExist) {
		return fmt.Errorf("%s: %w", path, unwrapPath(err))
	}
	return writableDir(filepath.Dir(path))
}

// PrepareDir makes the folder dir (and its parents) when it is missing and
// says why it cannot take output files, or nil.
func PrepareDir(dir string) error {
	if fi, err := os.Lstat(dir); err == nil && !fi.IsDir() {
		return fmt.Errorf("%s is not a folder", dir)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("cannot make the folder %s: %w", dir, unwrapPath(err))
	}
	return writableDir(dir)
}

// writableDir says why no file can be made in dir, or nil: it tries.
func writableDir(dir string) error {
	fi, err := os.Stat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return fmt.Errorf("the folder %s does not exist", dir)
	case err != nil:
		return fmt.Errorf("%s: %w", dir, unwrapPath(err))
	case !fi.IsDir():
		return fmt.Errorf("%s is not a folder", dir)
	}
	f, err := os.CreateTemp(dir, ".zapnet-check-*")
	if err != nil {
		return fmt.Errorf("cannot write in the folder %s: %w", dir, unwrapPath(err))
	}
	f.Close()
	os.Remove(f.Name())
	return nil
}

// WriteFile writes path whole or not at all: write fills a temporary file in
// the same folder, which replaces path only when write and the flush
// succeed and path is still absent or a regular file (CheckTarget). On
// failure path is left as it was and the temporary file removed. Errors
// name path, not the temporary file.
func WriteFile(path string, write func(w io.Writer) error) (err error) {
	if err := CheckTarget(path); err != nil {
		return err
	}
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return fmt.Errorf("cannot write %s: %w", path, unwrapPath(err))
	}
	var refused error // a target that changed while the file was written
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(f.Name())
			if refused == nil {
				err = fmt.Errorf("cannot write %s: %w", path, unwrapPath(err))
			}
		}
	}()
	bw := bufio.NewWriter(f)
	if err = write(bw); err != nil {
		return err
	}
	if err = bw.Flush(); err != nil {
		return err
	}
	if err = f.Chmod(0o644); err != nil {
		return err
	}
	if err = f.Close(); err != nil {
		return err
	}
	if refused = CheckTarget(path); refused != nil {
		return refused
	}
	return os.Rename(f.Name(), path)
}

// unwrapPath drops a *fs.PathError's operation and path (the temporary
// file's, which means nothing to the user) and keeps the cause.
func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	var le *os.LinkError
	if errors.As(err, &le) {
		return le.Err
	}
	return err
}
