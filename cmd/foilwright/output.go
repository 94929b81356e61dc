package main

import (
	"io"

	"github.com/foilwright/foilwright/internal/atomicfile"
)

// writeOutput writes through fill to path atomically, or to stdout when path
// is "" or "-".
func writeOutput(stdout io.Writer, path string, fill func(io.Writer) error) error {
	if path == "" || path == "-" {
		return fill(stdout)
	}
	return atomicfile.Write(path, fill)
}
