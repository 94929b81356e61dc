package geometry

import (
	"errors"
	"fmt"
)

// Errors a reader or a cleaning step returns, wrapped with the file and line
// in a *ParseError or with figures in the message. Callers test them with
// errors.Is.
var (
	// ErrEmpty means the input holds no data at all.
	ErrEmpty = errors.New("file is empty")
	// ErrNonFinite means a coordinate is NaN or infinite.
	ErrNonFinite = errors.New("coordinate is NaN or infinite")
	// ErrUnknownUnit means a unit name was not recognised.
	ErrUnknownUnit = errors.New("unknown unit")

	// ErrTooFewPoints means fewer points remain than a section needs.
	ErrTooFewPoints = errors.New("too few usable points")
	// ErrCollinear means all points lie on one straight line.
	ErrCollinear = errors.New("all points are collinear")
	// ErrNoLoop means no closed loop could be formed from the points.
	ErrNoLoop = errors.New("no closed loop found")
)

// A ParseError reports malformed input at a place in a file. Line is 1-based;
// 0 means the error has no line (a binary file, or the file as a whole).
type ParseError struct {
	File string
	Line int
	Err  error // a sentinel error of this package or of the reader's, possibly wrapped with detail
}

func (e *ParseError) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s:%d: %v", e.File, e.Line, e.Err)
	}
	return fmt.Sprintf("%s: %v", e.File, e.Err)
}

func (e *ParseError) Unwrap() error { return e.Err }
