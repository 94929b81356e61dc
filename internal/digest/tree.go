package digest

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
)

// Bounds of a tree Tree hashes, so that a folder named by mistake (a home
// folder, a root) fails at once instead of reading for minutes.
const (
	MaxTreeFiles = 100000
	MaxTreeBytes = 1 << 30
)

// ErrTreeTooLarge means a folder holds more than MaxTreeFiles files or
// MaxTreeBytes bytes.
var ErrTreeTooLarge = errors.New("digest: folder too large to hash")

// Tree returns the tree digest of the folder dir and the number of files
// in it: the hex sha256 of one line per file below dir,
//
//	<hex sha256 of the file>  <slash path relative to dir>\n
//
// sorted by path (byte order), as sha256sum prints them. A symbolic link
// is not followed: its line carries the sha256 of "symlink " and its
// target. Folders count only through their files, so an empty folder adds
// nothing. Anything else (a device, a socket, a pipe) is an error, and so
// is a tree past MaxTreeFiles files or MaxTreeBytes bytes.
func Tree(dir string) (string, int, error) {
	type entry struct{ path, sum string }
	var entries []entry
	var total int64
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			return nil
		}
		rel, err := filepath.Rel(dir, p)
		if err != nil {
			return err
		}
		rel = filepath.ToSlash(rel)
		if strings.ContainsAny(rel, "\n\\") {
			return fmt.Errorf("%s: a file name with a line break or backslash cannot be listed", p)
		}
		if len(entries) >= MaxTreeFiles {
			return fmt.Errorf("%w: %s has more than %d files", ErrTreeTooLarge, dir, MaxTreeFiles)
		}
		switch t := d.Type(); {
		case t&fs.ModeSymlink != 0:
			target, err := os.Readlink(p)
			if err != nil {
				return err
			}
			entries = append(entries, entry{rel, Bytes([]byte("symlink " + target))})
		case t.IsRegular():
			fi, err := d.Info()
			if err != nil {
				return err
			}
			if total += fi.Size(); total > MaxTreeBytes {
				return fmt.Errorf("%w: %s holds more than %d MiB", ErrTreeTooLarge, dir, MaxTreeBytes>>20)
			}
			sum, err := File(p)
			if err != nil {
				return err
			}
			entries = append(entries, entry{rel, sum})
		default:
			return fmt.Errorf("%s is not a regular file, folder or symbolic link", p)
		}
		return nil
	})
	if err != nil {
		return "", 0, err
	}
	sort.Slice(entries, func(i, j int) bool { return entries[i].path < entries[j].path })
	h := sha256.New()
	for _, e := range entries {
		fmt.Fprintf(h, "%s  %s\n", e.sum, e.path)
	}
	return hex.EncodeToString(h.Sum(nil)), len(entries), nil
}

// Path returns the digest of the file at path, or the tree digest of the
// folder at path (see Tree). It follows a symbolic link named by path
// itself.
func Path(path string) (string, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return "", err
	}
	if fi.IsDir() {
		sum, _, err := Tree(path)
		return sum, err
	}
	return File(path)
}
