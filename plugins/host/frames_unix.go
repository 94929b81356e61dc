//go:build unix

package host

import (
	"os"
	"syscall"

	"github.com/foilwright/foilwright/plugins/stage"
)

// framesFD is the number the stage's end of the frames channel has in the
// stage process: the first of exec.Cmd's ExtraFiles.
const framesFD = 3

// framesPair returns the host's end and the stage's end of a new frames
// channel (stage.Frames), a Unix stream socket pair, both in blocking
// mode (see stage.NewFrames).
func framesPair() (host, child *os.File, err error) {
	fds, err := syscall.Socketpair(syscall.AF_UNIX, syscall.SOCK_STREAM|syscall.SOCK_CLOEXEC, 0)
	if err != nil {
		return nil, nil, err
	}
	return os.NewFile(uintptr(fds[0]), "frames"), os.NewFile(uintptr(fds[1]), "frames"), nil
}

// offerFrames hands child to the stage g starts, as file descriptor
// framesFD.
func offerFrames(g *groupRunner, child *os.File) { g.cmd.ExtraFiles = []*os.File{child} }

// framesHello reports whether the stage wrote stage.FramesHello on f,
// without waiting: a stage that speaks frames wrote it before it served
// gRPC.
func framesHello(f *os.File) bool {
	buf := make([]byte, len(stage.FramesHello))
	n := -1
	if rc, err := f.SyscallConn(); err == nil {
		rc.Control(func(fd uintptr) {
			n, _, err = syscall.Recvfrom(int(fd), buf, syscall.MSG_DONTWAIT)
			if err != nil {
				n = -1
			}
		})
	}
	return n == len(buf) && string(buf) == stage.FramesHello
}

// shutdownFrames makes a read or write under way on f, and every later
// one, fail at once (closing f would not end a read under way).
func shutdownFrames(f *os.File) {
	if rc, err := f.SyscallConn(); err == nil {
		rc.Control(func(fd uintptr) { syscall.Shutdown(int(fd), syscall.SHUT_RDWR) })
	}
}
