package geometry

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
)

// WriteNodes writes the plain node listing of a section: a name line, then
// one "x y" line per node, in the order given. Numbers are written with the
// fewest digits that read back exactly.
func WriteNodes(w io.Writer, name string, nodes []Point) error {
	bw := bufio.NewWriter(w)
	if name == "" {
		name = "section"
	}
	fmt.Fprintln(bw, name)
	buf := make([]byte, 0, 64)
	for i, p := range nodes {
		if !p.IsFinite() {
			return fmt.Errorf("geometry: write nodes: node %d is not finite", i)
		}
		buf = strconv.AppendFloat(buf[:0], p.X, 'g', -1, 64)
		buf = append(buf, ' ')
		buf = strconv.AppendFloat(buf, p.Y, 'g', -1, 64)
		buf = append(buf, '\n')
		bw.Write(buf)
	}
	return bw.Flush()
}

// NodeCurve returns the interpolating spline through the nodes of a
// normalised section (package node order), and the arc length of its
// leading edge: the curve point nearest (0, 0). It is how properties are
// computed for a section known only by its nodes. It returns the errors of
// Fit for fewer than 8 nodes or nodes that do not form a loop.
func NodeCurve(nodes []Point) (*Curve, float64, error) {
	pts := nodes
	if n := len(pts); n > 1 && pts[0].Dist(pts[n-1]) <= 1e-12 {
		pts = pts[:n-1]
	}
	c := &Contour{Points: pts, Origins: make([]Origin, len(pts)), Units: ChordUnit}
	for i := range c.Origins {
		c.Origins[i] = Origin{File: "nodes", Entity: i + 1}
	}
	cv, _, err := Fit(c, FitOptions{Exact: true})
	if err != nil {
		return nil, 0, err
	}
	sLE, _ := cv.Project(Point{})
	return cv, sLE, nil
}
