//go:build !unix

package host

import (
	"errors"
	"net"
	"os"
)

const framesFD = 3

// framesPair fails: without Unix process groups the host lets go-plugin
// start the stage, and Run calls go over gRPC.
func framesPair() (net.Conn, *os.File, error) {
	return nil, nil, errors.New("host: no frames channel on this system")
}

func offerFrames(*groupRunner, *os.File) {}

func framesHello(net.Conn) bool { return false }
