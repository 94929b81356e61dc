//go:build !unix

package host

import (
	"errors"
	"os"
)

const framesFD = 3

// framesPair fails: without Unix process groups the host lets go-plugin
// start the stage, and Run calls go over gRPC.
func framesPair() (*os.File, *os.File, error) {
	return nil, nil, errors.New("host: no frames channel on this system")
}

func offerFrames(*groupRunner, *os.File) {}

func framesHello(*os.File) bool { return false }

func shutdownFrames(*os.File) {}
