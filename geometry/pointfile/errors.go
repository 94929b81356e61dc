package pointfile

import "errors"

// Errors a reader returns, wrapped with the file and line in a
// *geometry.ParseError. Callers test them with errors.Is; the reader also
// returns geometry.ErrEmpty, ErrNonFinite and ErrUnknownUnit.
var (
	// ErrNoNumbers means the input has text but not one line of coordinates.
	ErrNoNumbers = errors.New("no coordinate lines found")
	// ErrNotNumeric means a field that should hold a coordinate does not parse as a number.
	ErrNotNumeric = errors.New("not a number")
	// ErrColumnCount means a data line has too few or too many fields.
	ErrColumnCount = errors.New("wrong number of columns")
	// ErrColumnRange means a chosen column does not exist in the file.
	ErrColumnRange = errors.New("column out of range")
	// ErrNotSTL means a binary file is not a valid STL mesh.
	ErrNotSTL = errors.New("not an STL file")
	// ErrTruncated means a file ends before its own header says it should.
	ErrTruncated = errors.New("file is truncated")
	// ErrNoEntities means a DXF file has no entity foilwright can use.
	ErrNoEntities = errors.New("no usable DXF entity (POINT, LINE, LWPOLYLINE, POLYLINE, SPLINE)")
	// ErrFormat means the content does not follow the format it claims.
	ErrFormat = errors.New("malformed content")
)
