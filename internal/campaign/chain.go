package campaign

import (
	secdoc "github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/prep"
)

// This file is the only one of the package that calls the geometry chain;
// repoint it when the chain moves.

// prepare runs the geometry chain in process on one file, with the
// settings `foilwright prep` uses by default (panels > 0 sets the panel
// count), and returns the section document as JSON. An error is what the
// command would print before exiting with a non-zero status.
func prepare(name string, data []byte, panels int) ([]byte, error) {
	var s prep.Settings
	if panels > 0 {
		s.Panels = &panels
	}
	p, err := prep.Prepare(name, []prep.File{prep.NewFile(name, data)}, s)
	if err != nil {
		return nil, err
	}
	return secdoc.Encode(p.Section)
}
