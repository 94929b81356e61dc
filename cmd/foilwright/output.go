package main

import (
	"bytes"
	"io"

	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/plot"
)

// outputs writes a command's files as one: every target is checked before
// any work (a FIFO, a device, a symbolic link, a folder or a path in a
// missing folder is refused with exit status 2), each file goes to a
// temporary beside its target, and commit renames them all, so a failure
// leaves none of them. "" and "-" mean standard output, written at once.
type outputs struct {
	stdout io.Writer
	set    atomicfile.Set
}

// newOutputs checks targets and returns the set to write them with.
func newOutputs(stdout io.Writer, targets ...string) (*outputs, error) {
	if err := atomicfile.CheckTargets(targets...); err != nil {
		return nil, err
	}
	return &outputs{stdout: stdout}, nil
}

// write adds a file written through fill.
func (o *outputs) write(path string, fill func(io.Writer) error) error {
	if path == "" || path == "-" {
		return fill(o.stdout)
	}
	return o.set.Add(path, fill)
}

// picture adds a picture, in the format its path's extension names.
func (o *outputs) picture(f *plot.Figure, path string) error {
	format, err := plot.FormatOf(path)
	if err != nil {
		o.set.Abort()
		return err
	}
	data, err := plot.Encode(f, format)
	if err != nil {
		o.set.Abort()
		return err
	}
	return o.set.Add(path, func(w io.Writer) error { _, err := io.Copy(w, bytes.NewReader(data)); return err })
}

// commit renames every file into place; abort drops them.
func (o *outputs) commit() error { return o.set.Commit() }
func (o *outputs) abort()        { o.set.Abort() }
