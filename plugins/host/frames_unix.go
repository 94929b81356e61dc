//go:build unix

package host

import (
	"net"
	"os"
	"syscall"

	"github.com/foilwright/foilwright/plugins/stage"
)

// framesFD is the number the stage's end of the frames channel has in the
// stage process: the first of exec.Cmd's ExtraFiles.
const framesFD = 3

// framesPair returns the host's end and the stage's end of a new frames
// channel (stage.Frames), a Unix stream socket pair.
func framesPair() (host net.Conn, child *os.File, err error) {
	fds, err := syscall.Socketpair(syscall.AF_UNIX, syscall.SOCK_STREAM|syscall.SOCK_CLOEXEC, 0)
	if err != nil {
		return nil, nil, err
	}
	hf := os.NewFile(uintptr(fds[0]), "frames")
	host, err = net.FileConn(hf)
	hf.Close()
	if err != nil {
		syscall.Close(fds[1])
		return nil, nil, err
	}
	return host, os.NewFile(uintptr(fds[1]), "frames"), nil
}

// offerFrames hands child to the stage g starts, as file descriptor
// framesFD.
func offerFrames(g *groupRunner, child *os.File) { g.cmd.ExtraFiles = []*os.File{child} }

// framesHello reports whether the stage wrote stage.FramesHello on conn,
// without waiting: a stage that speaks frames wrote it before it served
// gRPC.
func framesHello(conn net.Conn) bool {
	sc, ok := conn.(syscall.Conn)
	if !ok {
		return false
	}
	rc, err := sc.SyscallConn()
	if err != nil {
		return false
	}
	buf := make([]byte, len(stage.FramesHello))
	n, rerr := 0, error(nil)
	err = rc.Read(func(fd uintptr) bool {
		n, rerr = syscall.Read(int(fd), buf)
		return true // one try: the bytes are there or they are not
	})
	return err == nil && rerr == nil && n == len(buf) && string(buf) == stage.FramesHello
}
