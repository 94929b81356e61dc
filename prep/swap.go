package prep

import (
	"github.com/foilwright/foilwright/geometry"
)

// Turning a section end for end.
//
// The cleaning step starts the loop at the trailing edge it finds on the
// points, and the fit looks for the trailing edge's corners or rounding
// at the loop's start. On a thin section whose rounded or blunt trailing
// edge is blunter than its nose (a small-radius nose, a printed edge
// rounded to a large radius), that end can pass for the nose and the nose
// for the trailing edge: the section made is turned end for end, and the
// gate "thin end aft" refuses it. The other end of the loop, the point
// farthest from its start, is then the trailing edge to try: the loop is
// started there and fitted with the ends the fit finds on its own, the
// edge found on the points (which lay at the nose) set aside.

// endForEnd returns a copy of cl whose contour holds the same points in
// the same order, started at the point farthest from its first one (the
// other end of the section), with no trailing edge found on the points;
// nil when the contour is too short to turn.
func (cl *Cleaned) endForEnd() *Cleaned {
	c := cl.Contour
	n := c.Len()
	if n < 3 {
		return nil
	}
	far, fd := 0, -1.0
	for i, p := range c.Points {
		if d := p.Dist(c.Points[0]); d > fd {
			far, fd = i, d
		}
	}
	if far == 0 {
		return nil
	}
	out := &geometry.Contour{Units: c.Units, Points: make([]geometry.Point, n), Origins: make([]geometry.Origin, n)}
	for i := range n {
		out.Points[i] = c.Points[(far+i)%n]
		out.Origins[i] = c.Origins[(far+i)%n]
	}
	if len(c.Along) == n {
		// Positions along the loop from the new start: the stretch
		// before it moves to the end, one loop length on.
		loop := c.Along[n-1] + c.Points[n-1].Dist(c.Points[0])
		out.Along = make([]float64, n)
		for i := range n {
			k := (far + i) % n
			out.Along[i] = c.Along[k] - c.Along[far]
			if k < far {
				out.Along[i] += loop
			}
		}
	}
	rep := *cl.Clean
	rep.Edge = nil
	alt := *cl
	alt.Contour, alt.Clean, alt.alongFit = out, &rep, false
	return &alt
}
