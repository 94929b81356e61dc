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
	// ErrNoNumbers means the input has text but not one line of coordinates.
	ErrNoNumbers = errors.New("no coordinate lines found")
	// ErrNotNumeric means a field that should hold a coordinate does not parse as a number.
	ErrNotNumeric = errors.New("not a number")
	// ErrColumnCount means a data line has too few or too many fields.
	ErrColumnCount = errors.New("wrong number of columns")
	// ErrColumnRange means a chosen column does not exist in the file.
	ErrColumnRange = errors.New("column out of range")
	// ErrNonFinite means a coordinate is NaN or infinite.
	ErrNonFinite = errors.New("coordinate is NaN or infinite")
	// ErrUnknownUnit means a unit name was not recognised.
	ErrUnknownUnit = errors.New("unknown unit")
	// ErrNotSTL means a binary file is not a valid STL mesh.
	ErrNotSTL = errors.New("not an STL file")
	// ErrTruncated means a file ends before its own header says it should.
	ErrTruncated = errors.New("file is truncated")
	// ErrNoEntities means a DXF file has no entity foilwright can use.
	ErrNoEntities = errors.New("no usable DXF entity (POINT, LINE, LWPOLYLINE, POLYLINE, SPLINE)")
	// ErrFormat means the content does not follow the format it claims.
	ErrFormat = errors.New("malformed content")

	// ErrTooFewPoints means fewer points remain than a section needs.
	ErrTooFewPoints = errors.New("too few usable points")
	// ErrCollinear means all points lie on one straight line.
	ErrCollinear = errors.New("all points are collinear")
	// ErrNotPlanar means a 3D point set departs from its plane by more than the tolerance.
	ErrNotPlanar = errors.New("points are not planar")
	// ErrNoLoop means no closed loop could be formed from the points.
	ErrNoLoop = errors.New("no closed loop found")
)

// A ParseError reports malformed input at a place in a file. Line is 1-based;
// 0 means the error has no line (a binary file, or the file as a whole).
type ParseError struct {
	File string
	Line int
	Err  error // one of the Err... values above, possibly wrapped with detail
}

func (e *ParseError) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s:%d: %v", e.File, e.Line, e.Err)
	}
	return fmt.Sprintf("%s: %v", e.File, e.Err)
}

func (e *ParseError) Unwrap() error { return e.Err }
