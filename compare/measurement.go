package compare

import (
	"fmt"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/prep"
)

// Measurement is the measured part: the points kept by the geometry chain,
// each with where it came from, and the section the chain made of them.
type Measurement struct {
	Name  string
	Units geometry.Unit
	// Points are the kept points in the measurement's coordinates (plane
	// coordinates for points cut from 3D data); Origins[i] is where
	// Points[i] came from.
	Points  []geometry.Point
	Origins []geometry.Origin
	// Section is the measured section: normalised, repanelled, with its
	// frame and properties.
	Section *section.Section
}

// FromPreparation returns the measurement a preparation made: its kept
// points and its section.
func FromPreparation(p *prep.Preparation) *Measurement {
	return &Measurement{
		Name: p.Section.Name, Units: p.Section.Units,
		Points: p.Contour.Points, Origins: p.Contour.Origins,
		Section: p.Section,
	}
}

// FromSection returns the measurement of a section document: its nodes,
// mapped back to the part by its frame (a section without a frame is
// taken in chord units), each named by the document and its node number.
// It returns an error for a section without properties, which the
// comparison of derived figures needs.
func FromSection(s *section.Section, name string) (*Measurement, error) {
	if s.Properties == nil {
		return nil, fmt.Errorf("%s: the section document has no properties (write it with prep or shape)", name)
	}
	m := &Measurement{Name: s.Name, Units: s.Units, Section: s}
	if m.Name == "" {
		m.Name = name
	}
	if s.Frame == nil {
		m.Units = geometry.ChordUnit
	}
	if m.Units == "" {
		m.Units = geometry.ChordUnit
	}
	fr := m.Frame()
	pts := s.Nodes
	if len(pts) > 1 && pts[0] == pts[len(pts)-1] {
		pts = pts[:len(pts)-1]
	}
	for i, q := range pts {
		m.Points = append(m.Points, fr.ToPart(q))
		m.Origins = append(m.Origins, geometry.Origin{File: name, Entity: i + 1})
	}
	return m, nil
}

// Frame returns the measured section's frame, or the identity frame (unit
// chord) when it has none.
func (m *Measurement) Frame() frame.Frame {
	if m.Section.Frame == nil {
		return frame.Frame{Chord: 1}
	}
	return frame.Frame{Chord: m.Section.Frame.Chord, TwistDeg: m.Section.Frame.TwistDeg, LE: m.Section.Frame.LE, Mirrored: m.Section.Frame.Mirrored}
}
