// Package testfoil makes the test sections that the tests of several
// geometry packages share: NACA 4-digit outlines (NACA Report 824
// equations) placed in a part frame with a chord, a rotation, a shift and
// Gaussian noise of a fixed seed, and the distances the tests measure
// them by, and the shuffled scan of the prep benchmarks. It is imported
// by tests and by the benchmark programs only.
package testfoil

import (
	"math"
	"math/rand/v2"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// Part describes how a test contour is placed in the part frame.
type Part struct {
	Chord  float64 // input units
	RotDeg float64 // counter-clockwise rotation of the section (nose-down twist)
	Shift  geometry.Point
	Noise  float64 // standard deviation of Gaussian noise on each coordinate
	Seed   uint64
	FlipX  bool // mirror x before placing (nose pointing the other way)
	FlipY  bool // mirror y before placing (measured upside down)
}

// ToPart maps a chord-frame point into the part frame.
func (f Part) ToPart(p geometry.Point) geometry.Point {
	if f.FlipX {
		p.X = -p.X
	}
	if f.FlipY {
		p.Y = -p.Y
	}
	return p.Scale(f.Chord).Rotate(f.RotDeg * math.Pi / 180).Add(f.Shift)
}

// Station returns half-cosine chord stations x = 1 − cos(πi/2n),
// clustered at the leading edge only, so that the spacing at the trailing
// edge stays well above the noise (common practice for measured sections).
func Station(i, n int) float64 {
	return math.Min(1, 1-math.Cos(math.Pi/2*float64(i)/float64(n)))
}

// Loop returns a NACA 4-digit loop (NACA Report 824 equations) in the node
// order of package geometry, with stations Station(i, perSurface). For the
// closed-edge variant the repeated trailing-edge point is left out.
func Loop(n shape.NACA4, perSurface int) []geometry.Point {
	var pts []geometry.Point
	for i := perSurface; i >= 1; i-- {
		pts = append(pts, n.Upper(Station(i, perSurface)))
	}
	pts = append(pts, geometry.Point{})
	for i := 1; i <= perSurface; i++ {
		pts = append(pts, n.Lower(Station(i, perSurface)))
	}
	if n.SharpTE {
		pts = pts[:len(pts)-1]
	}
	return pts
}

// Contour places loop in the part frame with noise (fixed seed) and
// origins test.csv:2, 3, ….
func Contour(loop []geometry.Point, f Part) *geometry.Contour {
	rng := rand.New(rand.NewPCG(f.Seed, 7))
	pts := make([]geometry.Point, len(loop))
	for i, p := range loop {
		pts[i] = f.ToPart(p).Add(geometry.Point{X: rng.NormFloat64() * f.Noise, Y: rng.NormFloat64() * f.Noise})
	}
	if f.FlipX != f.FlipY {
		// A mirror reverses the loop; restore counter-clockwise order with
		// the trailing edge first.
		for i, j := 1, len(pts)-1; i < j; i, j = i+1, j-1 {
			pts[i], pts[j] = pts[j], pts[i]
		}
	}
	c := &geometry.Contour{Units: geometry.Millimetre}
	for i, p := range pts {
		c.Points = append(c.Points, p)
		c.Origins = append(c.Origins, geometry.Origin{File: "test.csv", Line: i + 2})
	}
	return c
}

// Dense returns the analytic outline (NACA Report 824 equations) as a dense
// polyline in the NACA frame, upper trailing edge to lower: 6000 cosine
// stations per surface.
func Dense(n shape.NACA4) []geometry.Point {
	return n.Nodes(12000)
}

// MaxDist returns the largest distance from the points qs (in order along
// the outline) to the polyline poly, searching a moving window.
func MaxDist(qs, poly []geometry.Point) float64 {
	segDist := func(p geometry.Point, k int) float64 {
		a, b := poly[k], poly[k+1]
		d := b.Sub(a)
		t := math.Max(0, math.Min(1, p.Sub(a).Dot(d)/d.Dot(d)))
		return p.Dist(a.Add(d.Scale(t)))
	}
	var worst float64
	at := 0 // both start at the upper trailing edge
	for _, q := range qs {
		lo, hi := max(0, at-400), min(len(poly)-1, at+400)
		best := math.Inf(1)
		for k := lo; k < hi; k++ {
			if d := segDist(q, k); d < best {
				best, at = d, k
			}
		}
		worst = math.Max(worst, best)
	}
	return worst
}

// Farthest returns the point of poly farthest from p.
func Farthest(poly []geometry.Point, p geometry.Point) geometry.Point {
	var best geometry.Point
	bd := -1.0
	for _, q := range poly {
		if d := q.Dist(p); d > bd {
			best, bd = q, d
		}
	}
	return best
}

// Placed returns the NACA 4-digit section of code (NACA Report 824
// equations; sharp closes its trailing edge) as a contour of 150 points per
// surface placed with a 152.4 mm chord, a 7° rotation and a shift, with
// Gaussian noise of the given standard deviation (seed 42), and the
// placement, which maps section points into the part.
func Placed(code string, sharp bool, noise float64) (*geometry.Contour, Part, shape.NACA4, error) {
	n, err := shape.ParseNACA4(code)
	if err != nil {
		return nil, Part{}, n, err
	}
	n.SharpTE = sharp
	part := Part{Chord: 152.4, RotDeg: 7, Shift: geometry.Point{X: 37, Y: -12}, Noise: noise, Seed: 42}
	return Contour(Loop(n, 150), part), part, n, nil
}
