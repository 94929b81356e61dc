// Package pointfile reads and writes the files measured points come in and
// sections go out in. Read takes a point file of any known format —
// delimited text, the two plain coordinate listings (loop, surfaces),
// ASCII DXF, ASCII and binary STL cut by a plane — detected from the
// content, into a geometry.Cloud whose every point records its file, line
// or entity; WriteCSV writes an ordered contour and WriteNodes the plain
// node listing (nodes.dat) of a section.
//
// The formats are one list (Formats), which the flags, completions and
// the pipeline file's checks read; a new format is an entry there and a
// file of its own. Readers take bytes and a display name, never a path:
// nothing here opens a file.
package pointfile
