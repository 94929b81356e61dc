package host

import (
	"errors"
	"fmt"
	"strings"
)

// Errors of the host side, wrapped in an *Error.
var (
	// ErrNotFound means the executable of an external stage does not exist.
	ErrNotFound = errors.New("host: stage executable not found")
	// ErrNotExecutable means the file of an external stage cannot be run.
	ErrNotExecutable = errors.New("host: stage file is not executable")
	// ErrChecksum means the executable's sha256 is not the pinned one, or
	// the pin is not a sha256.
	ErrChecksum = errors.New("host: stage checksum mismatch")
	// ErrHandshake means the stage process did not complete the go-plugin
	// handshake: it exited, timed out, wrote something else to stdout, or
	// described itself wrongly.
	ErrHandshake = errors.New("host: stage failed to start")
	// ErrVersion means the stage speaks no protocol version this host
	// speaks.
	ErrVersion = errors.New("host: stage protocol version mismatch")
	// ErrCrashed means the stage process died during a call.
	ErrCrashed = errors.New("host: stage process crashed")
	// ErrTimeout means a call ran past its time limit; the process was
	// killed.
	ErrTimeout = errors.New("host: stage call timed out")
	// ErrTooLarge means a request or reply exceeded the message size limit.
	ErrTooLarge = errors.New("host: message too large")
	// ErrTooManyNodes means the section has more nodes than the stage
	// takes (its description, or the stage-nodes limit).
	ErrTooManyNodes = errors.New("host: section too large for the stage")
	// ErrClosed means the Host, Runner or Pool was closed.
	ErrClosed = errors.New("host: closed")
)

// Error reports a failure of a stage: which stage, on which section, in
// which operation, and, when the process failed, how it ended and what it
// last wrote to stderr.
type Error struct {
	Stage   string // stage name or executable path
	Section string // display name of the section; "" outside a run
	Op      string // "start", "describe" or "run"
	Err     error
	Exit    string // how the process ended ("exit status 3"); "" if it did not
	Stderr  string // last lines of the stage's stderr; "" if none are kept
}

func (e *Error) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "stage %q", e.Stage)
	if e.Section != "" {
		fmt.Fprintf(&b, " on %s", e.Section)
	}
	fmt.Fprintf(&b, ": %s: %v", e.Op, e.Err)
	if e.Exit != "" {
		fmt.Fprintf(&b, " (process %s)", e.Exit)
	}
	if e.Stderr != "" {
		b.WriteString("\nlast lines of the stage's stderr:")
		for _, l := range strings.Split(e.Stderr, "\n") {
			b.WriteString("\n  | ")
			b.WriteString(l)
		}
	}
	return b.String()
}

func (e *Error) Unwrap() error { return e.Err }
