//go:build unix

package stage

import (
	"os"
	"syscall"
)

// framesFile returns the inherited descriptor fd as a file in blocking
// mode, closed on exec.
func framesFile(fd int) (*os.File, error) {
	syscall.CloseOnExec(fd)
	if err := syscall.SetNonblock(fd, false); err != nil {
		return nil, err
	}
	return os.NewFile(uintptr(fd), "frames"), nil
}
