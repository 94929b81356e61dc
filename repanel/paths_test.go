package repanel

import (
	"math"
	"sort"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// plate is a flat plate of unit chord as a degenerate closed loop: the upper
// surface runs from (1, 0) to the leading edge (0, 0), the lower surface back
// to (1, 0) over the same points. Its arc length is 2, the leading edge at
// s = 1, and its curvature is zero.
type plate struct{}

func (plate) Length() float64 { return 2 }

func (plate) At(s float64) geometry.Point {
	s = min(max(s, 0), 2)
	if s <= 1 {
		return geometry.Point{X: 1 - s}
	}
	return geometry.Point{X: s - 1}
}

func (plate) Curvature(float64) float64 { return 0 }

// circle is a circle of radius r, centred at (0, 0), starting at (r, 0) and
// running counter-clockwise; its curvature is exactly 1/r.
type circle struct{ r float64 }

func (c circle) Length() float64 { return 2 * math.Pi * c.r }

func (c circle) At(s float64) geometry.Point {
	s = min(max(s, 0), c.Length())
	sn, cs := math.Sincos(s / c.r)
	return geometry.Point{X: c.r * cs, Y: c.r * sn}
}

func (c circle) Curvature(float64) float64 { return 1 / c.r }

// polyline is a Path through dense points: linear between them in arc
// length, with the curvature of the circle through each vertex and its two
// neighbours (Menger curvature), interpolated linearly between vertices.
type polyline struct {
	pts []geometry.Point
	cum []float64 // cum[i] is the arc length at pts[i]
	ks  []float64 // curvature at pts[i]
}

func newPolyline(pts []geometry.Point) *polyline {
	p := &polyline{pts: pts, cum: make([]float64, len(pts)), ks: make([]float64, len(pts))}
	for i := 1; i < len(pts); i++ {
		p.cum[i] = p.cum[i-1] + pts[i].Dist(pts[i-1])
	}
	for i := 1; i+1 < len(pts); i++ {
		a, b, c := pts[i-1], pts[i], pts[i+1]
		p.ks[i] = 2 * b.Sub(a).Cross(c.Sub(b)) / (a.Dist(b) * b.Dist(c) * a.Dist(c))
	}
	p.ks[0], p.ks[len(pts)-1] = p.ks[1], p.ks[len(pts)-2]
	return p
}

func (p *polyline) Length() float64 { return p.cum[len(p.cum)-1] }

// seg returns i and f with s = cum[i] + f·(cum[i+1] − cum[i]).
func (p *polyline) seg(s float64) (int, float64) {
	s = min(max(s, 0), p.Length())
	i := sort.SearchFloat64s(p.cum, s) - 1
	i = min(max(i, 0), len(p.cum)-2)
	return i, (s - p.cum[i]) / (p.cum[i+1] - p.cum[i])
}

func (p *polyline) At(s float64) geometry.Point {
	if s >= p.Length() {
		return p.pts[len(p.pts)-1]
	}
	i, f := p.seg(s)
	return p.pts[i].Add(p.pts[i+1].Sub(p.pts[i]).Scale(f))
}

func (p *polyline) Curvature(s float64) float64 {
	i, f := p.seg(s)
	return p.ks[i] + f*(p.ks[i+1]-p.ks[i])
}

// naca0012 returns the NACA 0012 section with the closed trailing edge
// (NACA Report 824 equations, shape.NACA4) as a dense polyline Path of
// 4001 points, and the arc length of its leading edge.
func naca0012() (*polyline, float64) {
	const per = 2000
	n := shape.NACA4{Thickness: 0.12, SharpTE: true}
	p := newPolyline(n.Loop(per))
	return p, p.cum[per]
}
