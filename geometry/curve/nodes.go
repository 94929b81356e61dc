package curve

import "github.com/foilwright/foilwright/geometry"

// NodeCurve returns the interpolating spline through the nodes of a
// normalised section (package node order), and the arc length of its
// leading edge: the curve point nearest (0, 0). It is how properties are
// computed for a section known only by its nodes. It returns the errors of
// Fit for fewer than 8 nodes or nodes that do not form a loop.
func NodeCurve(nodes []geometry.Point) (*Curve, float64, error) {
	pts := nodes
	if n := len(pts); n > 1 && pts[0].Dist(pts[n-1]) <= 1e-12 {
		pts = pts[:n-1]
	}
	c := &geometry.Contour{Points: pts, Origins: make([]geometry.Origin, len(pts)), Units: geometry.ChordUnit}
	for i := range c.Origins {
		c.Origins[i] = geometry.Origin{File: "nodes", Entity: i + 1}
	}
	cv, _, err := Fit(c, FitOptions{Exact: true})
	if err != nil {
		return nil, 0, err
	}
	sLE, _ := cv.Project(geometry.Point{})
	return cv, sLE, nil
}
