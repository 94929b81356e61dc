// Package atomicfile writes files so that a reader never sees a partial file
// and a failed write never truncates or replaces an earlier good file: data
// goes to a temporary file in the same folder, is synced, and is renamed over
// the destination only when everything succeeded.
//
// Only a regular file is ever replaced. A destination that is a symbolic
// link, a folder, a FIFO, a device or a socket is refused with a
// *TargetError (ErrNotRegular), checked before anything is written and
// again just before the rename: renaming over such a node would put a
// regular file in its place (as root, over /dev/null).
//
// A Set writes several files as one: every file is written to its
// temporary first, and the renames happen only when all of them were
// written, so a failure leaves none of the new files.
package atomicfile

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// ErrNotRegular is wrapped by the error for a destination that exists and
// is not a regular file.
var ErrNotRegular = errors.New("not a regular file")

// ErrNoFolder is wrapped by the error for a destination whose folder does
// not exist.
var ErrNoFolder = errors.New("folder does not exist")

// A TargetError reports a destination that may not be written.
type TargetError struct {
	Path string
	What string // "is a symbolic link", "is in a folder that does not exist", …
	Err  error  // ErrNotRegular or ErrNoFolder
}

func (e *TargetError) Error() string {
	msg := fmt.Sprintf("%s %s", e.Path, e.What)
	if errors.Is(e.Err, ErrNotRegular) {
		msg += "; only a regular file is replaced (name a new or regular file, or - for standard output)"
	}
	return msg
}

func (e *TargetError) Unwrap() error { return e.Err }

// kindOf says what a file mode is, for messages.
func kindOf(m fs.FileMode) string {
	switch {
	case m&fs.ModeSymlink != 0:
		return "is a symbolic link"
	case m.IsDir():
		return "is a folder"
	case m&fs.ModeNamedPipe != 0:
		return "is a FIFO (named pipe)"
	case m&fs.ModeCharDevice != 0:
		return "is a character device"
	case m&fs.ModeDevice != 0:
		return "is a block device"
	case m&fs.ModeSocket != 0:
		return "is a socket"
	}
	return "is not a regular file"
}

// CheckTarget returns a *TargetError when path may not be written: it
// exists and is not a regular file (a symbolic link, even to a regular
// file, is refused: the rename would replace the link, not its target), or
// its folder does not exist. A missing path in an existing folder, or a
// regular file, passes.
func CheckTarget(path string) error {
	fi, err := os.Lstat(path)
	switch {
	case err == nil && !fi.Mode().IsRegular():
		return &TargetError{Path: path, What: kindOf(fi.Mode()), Err: ErrNotRegular}
	case err == nil:
		return nil
	case !errors.Is(err, fs.ErrNotExist):
		return fmt.Errorf("write %s: %w", path, err)
	}
	dir := filepath.Dir(path)
	di, err := os.Stat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return &TargetError{Path: path, What: "is in a folder that does not exist (" + dir + ")", Err: ErrNoFolder}
	case err != nil:
		return fmt.Errorf("write %s: %w", path, err)
	case !di.IsDir():
		return &TargetError{Path: path, What: "is in " + dir + ", which is not a folder", Err: ErrNoFolder}
	}
	return nil
}

// CheckTargets checks every path as CheckTarget does, skipping "" and
// "-" (standard output), and returns the first error.
func CheckTargets(paths ...string) error {
	for _, p := range paths {
		if p == "" || p == "-" {
			continue
		}
		if err := CheckTarget(p); err != nil {
			return err
		}
	}
	return nil
}

// pending is one file written to its temporary and not yet renamed.
type pending struct {
	path, tmp string
}

// create writes a temporary file beside path through fill and syncs it.
func create(path string, fill func(w io.Writer) error) (p pending, err error) {
	if err := CheckTarget(path); err != nil {
		return p, err
	}
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return p, fmt.Errorf("write %s: %w", path, err)
	}
	tmp := f.Name()
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(tmp)
		}
	}()
	if err = fill(f); err != nil {
		return p, err
	}
	if err = f.Chmod(0o644); err != nil {
		return p, fmt.Errorf("write %s: %w", path, err)
	}
	if err = f.Sync(); err != nil {
		return p, fmt.Errorf("write %s: %w", path, err)
	}
	if err = f.Close(); err != nil {
		return p, fmt.Errorf("write %s: %w", path, err)
	}
	return pending{path: path, tmp: tmp}, nil
}

// commit renames the temporary over the destination, checking once more
// that the destination may be replaced.
func (p pending) commit() error {
	if err := CheckTarget(p.path); err != nil {
		return err
	}
	if err := os.Rename(p.tmp, p.path); err != nil {
		return fmt.Errorf("write %s: %w", p.path, err)
	}
	return nil
}

// Write calls fill with a writer on a temporary file beside path and, if fill
// returns nil, syncs the file and renames it to path. If fill or any step
// fails, the temporary file is removed and path is left as it was. The new
// file has mode 0644. A path that exists and is not a regular file, or
// whose folder does not exist, is refused with a *TargetError.
func Write(path string, fill func(w io.Writer) error) error {
	p, err := create(path, fill)
	if err != nil {
		return err
	}
	if err := p.commit(); err != nil {
		os.Remove(p.tmp)
		return err
	}
	return nil
}

// WriteBytes writes data to path atomically, as Write does.
func WriteBytes(path string, data []byte) error {
	return Write(path, func(w io.Writer) error {
		_, err := io.Copy(w, bytes.NewReader(data))
		return err
	})
}

// A Set writes several files as one. Add writes each to a temporary file
// beside its destination; Commit renames them all into place; Abort (or a
// failed Add) removes the temporaries, leaving every destination as it
// was. The zero Set is ready to use; it is not safe for concurrent use.
type Set struct {
	files []pending
}

// Add writes a file of the set through fill. On error the whole set is
// aborted.
func (s *Set) Add(path string, fill func(w io.Writer) error) error {
	for _, f := range s.files {
		if filepath.Clean(f.path) == filepath.Clean(path) {
			s.Abort()
			return fmt.Errorf("write %s: named twice", path)
		}
	}
	p, err := create(path, fill)
	if err != nil {
		s.Abort()
		return err
	}
	s.files = append(s.files, p)
	return nil
}

// AddBytes adds a file holding data.
func (s *Set) AddBytes(path string, data []byte) error {
	return s.Add(path, func(w io.Writer) error {
		_, err := w.Write(data)
		return err
	})
}

// Commit checks every destination once more and renames the files into
// place, in the order they were added. Only a rename failing after the
// checks (a disk fault) can leave some files renamed and others not.
func (s *Set) Commit() error {
	for _, f := range s.files {
		if err := CheckTarget(f.path); err != nil {
			s.Abort()
			return err
		}
	}
	for i, f := range s.files {
		if err := os.Rename(f.tmp, f.path); err != nil {
			s.files = s.files[i:]
			s.Abort()
			return fmt.Errorf("write %s: %w", f.path, err)
		}
	}
	s.files = nil
	return nil
}

// Abort removes the temporaries of files not yet committed.
func (s *Set) Abort() {
	for _, f := range s.files {
		os.Remove(f.tmp)
	}
	s.files = nil
}
