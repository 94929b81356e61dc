package campaign

import (
	"encoding/json"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// section is what the campaign reads of a section document
// (foilwright.section/1, see DESIGN.md), by its JSON keys, so that it keeps
// working whatever the Go types behind the document become.
type section struct {
	Units  string `json:"units"`
	Source struct {
		PointsRead int `json:"points_read"`
		PointsUsed int `json:"points_used"`
		Dropped    []struct {
			Line   int    `json:"line"`
			Reason string `json:"reason"`
		} `json:"dropped"`
	} `json:"source"`
	Frame struct {
		Chord    float64    `json:"chord"`
		TwistDeg float64    `json:"twist_deg"`
		LE       [2]float64 `json:"le"`
		Mirrored bool       `json:"mirrored"`
		Plane    *struct {
			Origin [3]float64 `json:"origin"`
			U      [3]float64 `json:"u"`
			V      [3]float64 `json:"v"`
		} `json:"plane"`
	} `json:"frame"`
	TrailingEdge struct {
		Kind      string  `json:"kind"`
		Thickness float64 `json:"thickness"`
	} `json:"trailing_edge"`
	Uncertainty *uncertainty     `json:"uncertainty"`
	Nodes       []geometry.Point `json:"nodes"`
}

// uncertainty is the section's statement of its own accuracy: 95 % bounds
// on the error of chord and leading edge (input units), twist (degrees)
// and the surface (chord units). A missing figure reads as zero.
type uncertainty struct {
	Chord    float64 `json:"chord"`
	TwistDeg float64 `json:"twist_deg"`
	LE       float64 `json:"-"`
	Surface  float64 `json:"surface"`
	// RawLE is the le figure as written: a distance, or per-axis bounds
	// [x, y] that combine into one.
	RawLE json.RawMessage `json:"le"`
}

// decodeSection reads a section document.
func decodeSection(doc []byte) (*section, error) {
	var s section
	if err := json.Unmarshal(doc, &s); err != nil {
		return nil, fmt.Errorf("section document: %w", err)
	}
	if u := s.Uncertainty; u != nil && len(u.RawLE) > 0 {
		var d float64
		var xy []float64
		switch {
		case json.Unmarshal(u.RawLE, &d) == nil:
			u.LE = d
		case json.Unmarshal(u.RawLE, &xy) == nil && len(xy) == 2:
			u.LE = math.Hypot(xy[0], xy[1])
		default:
			return nil, fmt.Errorf("section document: uncertainty.le %s: want a number or [x, y]", u.RawLE)
		}
	}
	if len(s.Nodes) < 3 || !(s.Frame.Chord > 0) {
		return nil, fmt.Errorf("section document: %d node(s), chord %g", len(s.Nodes), s.Frame.Chord)
	}
	return &s, nil
}

// toPart maps a normalised point into the file's coordinates with the
// section's frame, p = LE + c·M·R(−τ)·q, lifted into space through the
// frame's plane for 3D input (DESIGN.md, "Section document").
func (s *section) toPart(q geometry.Point) geometry.Vec3 {
	f := s.Frame
	p := q.Rotate(-f.TwistDeg * math.Pi / 180).Scale(f.Chord)
	if f.Mirrored {
		p.X = -p.X
	}
	p = p.Add(geometry.Point{X: f.LE[0], Y: f.LE[1]})
	if f.Plane == nil {
		return geometry.Vec3{X: p.X, Y: p.Y}
	}
	v3 := func(a [3]float64) geometry.Vec3 { return geometry.Vec3{X: a[0], Y: a[1], Z: a[2]} }
	return v3(f.Plane.Origin).Add(v3(f.Plane.U).Scale(p.X)).Add(v3(f.Plane.V).Scale(p.Y))
}
