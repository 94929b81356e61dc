package align

import "github.com/foilwright/foilwright/geometry"

// A Foot is the point of an outline nearest to a given point, with the
// signed distance to it.
type Foot struct {
	// Point is the nearest point of the outline.
	Point geometry.Point
	// Normal is the unit vector along which the signed distance grows
	// fastest: the outward normal of the outline at a smooth foot, or the
	// direction from a corner to the point.
	Normal geometry.Point
	// Distance is the signed distance, positive outside the outline.
	Distance float64
	// Position locates the foot along the outline in a way the outline
	// defines (arc length, say); this package does not read it.
	Position float64
	// Hint is where an outline that is also a Tracker resumes its search
	// for a point near this one; this package does not read it.
	Hint [2]float64
}

// An Outline is a closed nominal curve that answers the nearest-point
// question. Nearest must be safe for concurrent use.
type Outline interface {
	Nearest(p geometry.Point) Foot
}

// A Tracker is an Outline that finds a foot faster from the foot of a
// point nearby: the same point before a small step of a fit. It must find
// the nearest point when near is the foot of a point within a small
// fraction of the outline's size. The fits track the points during their
// steps and find every foot afresh (Nearest) for their result.
type Tracker interface {
	Outline
	NearestFrom(p geometry.Point, near Foot) Foot
}
