package campaign

import (
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/pipeline"
)

// This file is the only one of the package that calls the geometry chain;
// repoint it when the chain moves.

// prepare runs the geometry chain in process on one file, with the
// settings `foilwright prep` uses by default (panels > 0 sets the panel
// count), and returns the section document as JSON. An error is what the
// command would print before exiting with a non-zero status.
func prepare(name string, data []byte, panels int) ([]byte, error) {
	var s pipeline.PrepSettings
	if panels > 0 {
		s.Panels = &panels
	}
	p, err := pipeline.Prepare(name, []pipeline.InputFile{{Path: name, Data: data}}, s)
	if err != nil {
		return nil, err
	}
	return geometry.EncodeSection(p.Section)
}
