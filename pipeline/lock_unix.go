//go:build unix

package pipeline

import (
	"errors"
	"fmt"
	"os"
	"strconv"
	"strings"
	"syscall"
)

// folderLock is an exclusive lock on a run folder: a file beside it,
// locked with flock and holding the owner's process id. The kernel
// releases the lock when the owner dies, so a stale file does not block.
type folderLock struct {
	f    *os.File
	path string
}

// lockFolder takes the lock at path, or fails with an error wrapping
// ErrFolderLocked that names the owner.
func lockFolder(path string) (*folderLock, error) {
	for range 10 {
		f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, 0o644)
		if err != nil {
			return nil, err
		}
		if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
			b := make([]byte, 32)
			n, _ := f.ReadAt(b, 0)
			f.Close()
			if errors.Is(err, syscall.EWOULDBLOCK) {
				owner := strings.TrimSpace(string(b[:n]))
				if _, err := strconv.Atoi(owner); err != nil {
					owner = "another foilwright"
				} else {
					owner = "process " + owner
				}
				return nil, fmt.Errorf("%w: it is being written by %s (lock file %s)", ErrFolderLocked, owner, path)
			}
			return nil, err
		}
		// The owner before us removes the file as it unlocks: make sure
		// the locked file is still the one at path.
		fi, err1 := f.Stat()
		pi, err2 := os.Stat(path)
		if err1 != nil || err2 != nil || !os.SameFile(fi, pi) {
			f.Close()
			continue
		}
		f.Truncate(0)
		f.WriteAt([]byte(strconv.Itoa(os.Getpid())+"\n"), 0)
		return &folderLock{f: f, path: path}, nil
	}
	return nil, fmt.Errorf("%w: lock file %s keeps changing", ErrFolderLocked, path)
}

// unlock removes the lock file and releases the lock.
func (l *folderLock) unlock() {
	if l == nil || l.f == nil {
		return
	}
	os.Remove(l.path)
	l.f.Close()
	l.f = nil
}
