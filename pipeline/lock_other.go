//go:build !unix

package pipeline

import (
	"errors"
	"fmt"
	"os"
	"strconv"
	"strings"
)

// folderLock is a lock file beside a run folder, created exclusively and
// holding the owner's process id. Without flock a lock left by a crashed
// run stays until removed by hand; the message says so.
type folderLock struct{ path string }

func lockFolder(path string) (*folderLock, error) {
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o644)
	if errors.Is(err, os.ErrExist) {
		b, _ := os.ReadFile(path)
		return nil, fmt.Errorf("%w: it is being written by process %s (lock file %s; remove it if no run is going)", ErrFolderLocked, strings.TrimSpace(string(b)), path)
	}
	if err != nil {
		return nil, err
	}
	f.WriteString(strconv.Itoa(os.Getpid()) + "\n")
	f.Close()
	return &folderLock{path: path}, nil
}

func (l *folderLock) unlock() {
	if l != nil && l.path != "" {
		os.Remove(l.path)
		l.path = ""
	}
}
