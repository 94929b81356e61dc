package export

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/section"
)

// Frames an export may be written in.
const (
	FramePart  = "part"  // the part's coordinates and units, through the section's frame
	FrameChord = "chord" // the normalised frame, chord units
)

// Frames returns the frames, in the order help texts give them.
func Frames() []string { return []string{FramePart, FrameChord} }

// ErrNoFrame means a part-frame export of a section that records no frame
// (a section made from chord-unit coordinates, an analytic shape): there
// is no part to map it back to.
var ErrNoFrame = errors.New("export: the section records no frame in part units")

// PlaceOptions say where Place puts a section.
type PlaceOptions struct {
	// Frame is FramePart (or "") or FrameChord.
	Frame string
	// Chord, when its value is positive, scales the normalised section to
	// a part of this chord in this unit (a part unit: mm, in, m), with its
	// leading edge at the origin and no twist, in place of the section's
	// own frame. It needs Frame FramePart.
	Chord geometry.Length
}

// Placed is a section in the coordinates of an export.
type Placed struct {
	Name  string
	Frame string        // FramePart or FrameChord
	Units geometry.Unit // of every coordinate and length here
	Nodes []geometry.Point
	// LE and TE are the leading edge and the trailing-edge midpoint, and
	// QuarterChord the point a quarter of the chord behind the leading
	// edge on the chord line.
	LE, TE, QuarterChord geometry.Point
	Chord                float64 // in Units
	TwistDeg             float64 // degrees, positive nose-up; 0 in the chord frame
	Mirrored             bool
	// Plane, when set, places the coordinates in space: (u, v) is
	// Origin + u·U + v·V (a section cut from a 3D scan, in the part frame).
	Plane *geometry.Plane
	// Sharp reports a closed trailing edge: the first and last node
	// coincide (and Nodes keeps both).
	Sharp bool
}

// sharpTol is the distance, in chord units, below which the first and last
// node count as one point (a sharp trailing edge).
const sharpTol = 1e-12

// Place returns s in the coordinates opts ask for. It returns an error
// wrapping ErrNoFrame for a part-frame export of a section without a frame
// in part units, and an error for a section with fewer than 3 nodes or an
// unusable chord.
func Place(s *section.Section, opts PlaceOptions) (*Placed, error) {
	if len(s.Nodes) < 3 {
		return nil, fmt.Errorf("export: section %q has %d node(s), want at least 3", s.Name, len(s.Nodes))
	}
	p := &Placed{Name: s.Name, Frame: FrameChord, Units: geometry.ChordUnit, Chord: 1,
		Sharp: s.Nodes[0].Dist(s.Nodes[len(s.Nodes)-1]) <= sharpTol}
	fr := frame.Frame{Chord: 1}
	switch opts.Frame {
	case "", FramePart:
		p.Frame = FramePart
		switch {
		case opts.Chord.Value != 0:
			c := opts.Chord
			if !(c.Value > 0) || math.IsInf(c.Value, 0) || c.Unit == "" || c.Unit == geometry.ChordUnit {
				return nil, fmt.Errorf("export: chord %s: want a positive length in mm, in or m", c)
			}
			fr = frame.Frame{Chord: c.Value}
			p.Units = c.Unit
		case s.Frame != nil && s.Units != "" && s.Units != geometry.ChordUnit:
			fr = frame.Frame(*s.Frame)
			p.Units = s.Units
			p.Plane = s.Frame.Plane
			if !(fr.Chord > 0) || math.IsInf(fr.Chord, 0) {
				return nil, fmt.Errorf("export: section %q: chord %g is not a positive length", s.Name, fr.Chord)
			}
		default:
			return nil, fmt.Errorf("%w (%q is in chord units): export it in the chord frame, or give it a chord length", ErrNoFrame, s.Name)
		}
	case FrameChord:
		if opts.Chord.Value != 0 {
			return nil, fmt.Errorf("export: a chord length applies to the part frame, not the chord frame")
		}
	default:
		return nil, fmt.Errorf("export: frame %q: want %s or %s", opts.Frame, FramePart, FrameChord)
	}
	p.Chord, p.TwistDeg, p.Mirrored = fr.Chord, fr.TwistDeg, fr.Mirrored
	p.Nodes = make([]geometry.Point, len(s.Nodes))
	for i, q := range s.Nodes {
		p.Nodes[i] = fr.ToPart(q)
	}
	if p.Sharp {
		p.Nodes[len(p.Nodes)-1] = p.Nodes[0]
	}
	p.LE = fr.ToPart(geometry.Point{})
	p.TE = fr.ToPart(geometry.Point{X: 1})
	p.QuarterChord = fr.ToPart(geometry.Point{X: 0.25})
	return p, nil
}

// In3D returns q of the section's plane in space: Origin + u·U + v·V, or
// (u, v, 0) when the section has no plane.
func (p *Placed) In3D(q geometry.Point) geometry.Vec3 {
	if p.Plane == nil {
		return geometry.Vec3{X: q.X, Y: q.Y}
	}
	o, u, v := p.Plane.Origin, p.Plane.U, p.Plane.V
	return geometry.Vec3{
		X: o[0] + q.X*u[0] + q.Y*v[0],
		Y: o[1] + q.X*u[1] + q.Y*v[1],
		Z: o[2] + q.X*u[2] + q.Y*v[2],
	}
}

// outline returns the nodes of the closed outline: without the repeated
// last node of a sharp trailing edge.
func (p *Placed) outline() []geometry.Point {
	if p.Sharp {
		return p.Nodes[:len(p.Nodes)-1]
	}
	return p.Nodes
}

// bounds returns the lower-left and upper-right corners of the nodes.
func (p *Placed) bounds() (lo, hi geometry.Point) {
	lo = geometry.Point{X: math.Inf(1), Y: math.Inf(1)}
	hi = geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for _, q := range p.Nodes {
		lo.X, lo.Y = math.Min(lo.X, q.X), math.Min(lo.Y, q.Y)
		hi.X, hi.Y = math.Max(hi.X, q.X), math.Max(hi.Y, q.Y)
	}
	return lo, hi
}

// unitWord is the unit as a reader sees it in a comment or a label: its
// name, or "chord".
func unitWord(u geometry.Unit) string { return string(u) }

// AtStation places a section that was not cut from a 3D scan (it has no
// plane) in the plane z = position of its part coordinates, as a station
// of a blade whose span runs along z. A section with a plane keeps it.
func (p *Placed) AtStation(position float64) {
	if p.Plane != nil {
		return
	}
	p.Plane = &geometry.Plane{Origin: [3]float64{0, 0, position}, U: [3]float64{1, 0, 0}, V: [3]float64{0, 1, 0}, N: [3]float64{0, 0, 1}}
}
