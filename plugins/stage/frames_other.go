//go:build !unix

package stage

import (
	"errors"
	"os"
)

// framesFile fails: frames need Unix sockets.
func framesFile(int) (*os.File, error) { return nil, errors.New("no frames channel on this system") }
