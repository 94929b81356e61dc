package prep

import (
	"encoding/json"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
)

// ContourFormat is the value of the "format" key of the contour document.
const ContourFormat = "foilwright.contour/1"

// contourDoc is the JSON form of a cleaned contour.
type contourDoc struct {
	Format   string            `json:"format"`
	Units    geometry.Unit     `json:"units"`
	Files    []string          `json:"files"`
	SHA256   []string          `json:"sha256"`
	Read     int               `json:"points_read"`
	Flatness *flatnessDoc      `json:"flatness,omitempty"`
	Merged   int               `json:"merged"`
	Dropped  []section.Dropped `json:"dropped"`
	Loops    []loopDoc         `json:"loops"`
	Kept     bool              `json:"order_kept"`
	Points   []geometry.Point  `json:"points"`
	Origins  []originDoc       `json:"origins"`
}

type flatnessDoc struct {
	RMS     float64         `json:"rms"`
	Max     float64         `json:"max"`
	Kept    int             `json:"kept"`
	Outside int             `json:"outside"`
	Strays  int             `json:"strays,omitempty"`
	Plane   *geometry.Plane `json:"plane"`
}

type loopDoc struct {
	Points int     `json:"points"`
	Area   float64 `json:"area"`
	Picked bool    `json:"picked"`
	First  string  `json:"first"`
}

type originDoc struct {
	File   string `json:"file"`
	Line   int    `json:"line,omitempty"`
	Entity int    `json:"entity,omitempty"`
}

// ContourDocument returns the contour document of c (format
// foilwright.contour/1): the units, files and their sha256, the points
// read, the flatness and plane of 3D points, how many points were merged,
// every point dropped with its reason, the loops found, whether the file's
// own order was kept, and the ordered points with their origins. It is
// indented JSON with every array of numbers on one line, ending in a
// newline.
func (c *Cleaned) ContourDocument() ([]byte, error) {
	doc := contourDoc{
		Format: ContourFormat, Units: c.Units, Files: c.Files, SHA256: c.SHA256, Read: c.Read,
		Merged: len(c.Clean.Merged), Dropped: DroppedOf(c.Clean, c.Units), Kept: c.Clean.OrderKept,
		Points: c.Contour.Points,
	}
	if f := c.Flatness; f != nil {
		doc.Flatness = &flatnessDoc{RMS: f.RMS, Max: f.Max, Kept: f.Kept, Outside: f.Outside, Strays: len(f.Strays), Plane: c.Plane}
	}
	for _, l := range c.Clean.Loops {
		doc.Loops = append(doc.Loops, loopDoc{Points: l.Points, Area: l.Area, Picked: l.Picked, First: l.First.String()})
	}
	for _, o := range c.Contour.Origins {
		doc.Origins = append(doc.Origins, originDoc{File: o.File, Line: o.Line, Entity: o.Entity})
	}
	b, err := json.MarshalIndent(doc, "", "  ")
	if err != nil {
		return nil, err
	}
	return append(section.CompactNumberArrays(b), '\n'), nil
}
