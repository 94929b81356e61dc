package testfoil

import (
	"math"
	"math/rand/v2"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// RoundedBlade is a NACA 4415-like section (NACA Report 824 equations: 4 %
// camber at 40 % chord, 15 % thick) thickened linearly towards the trailing
// edge so that it ends in a half circle of radius R (chord units) about the
// end of the camber line, the way a printer rounds an edge (as
// internal/demogen builds the demo blade). It is placed in the part frame
// at chord Chord (mm), twisted Twist degrees nose-up.
type RoundedBlade struct {
	Foil  shape.NACA4
	R     float64 // radius of the rounded end, chord units
	Chord float64 // mm
	Twist float64 // degrees nose-up
}

// DefaultBlade is the blade of the rounded-edge tests: 136 mm chord, 12°
// twist, a 0.6 mm radius.
func DefaultBlade() RoundedBlade {
	return RoundedBlade{Foil: shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.15}, R: 0.6 / 136, Chord: 136, Twist: 12}
}

func (b RoundedBlade) half(x float64) float64 {
	return b.Foil.HalfThickness(x) + x*(b.R-b.Foil.HalfThickness(1))
}

func (b RoundedBlade) surf(x float64, upper bool) geometry.Point {
	yt := b.half(x)
	yc, dy := b.Foil.CamberLine(x)
	th := math.Atan(dy)
	if upper {
		return geometry.Point{X: x - yt*math.Sin(th), Y: yc + yt*math.Cos(th)}
	}
	return geometry.Point{X: x + yt*math.Sin(th), Y: yc - yt*math.Cos(th)}
}

// toPart maps a section point to the part frame (mm).
func (b RoundedBlade) toPart(p geometry.Point) geometry.Point {
	return p.Scale(b.Chord).Rotate(-b.Twist * math.Pi / 180)
}

// Loop returns the outline in the part frame, counter-clockwise from the
// upper end of the rounding: perSurface cosine-spaced stations per surface
// and capPts − 1 points on the half circle.
func (b RoundedBlade) Loop(perSurface, capPts int) []geometry.Point {
	var pts []geometry.Point
	for i := perSurface; i >= 1; i-- {
		pts = append(pts, b.surf(shape.CosineStation(i, perSurface), true))
	}
	pts = append(pts, geometry.Point{})
	for i := 1; i <= perSurface; i++ {
		pts = append(pts, b.surf(shape.CosineStation(i, perSurface), false))
	}
	_, dy := b.Foil.CamberLine(1)
	th := math.Atan(dy)
	yc, _ := b.Foil.CamberLine(1)
	for i := 1; i < capPts; i++ {
		a := th - math.Pi/2 + math.Pi*float64(i)/float64(capPts)
		pts = append(pts, geometry.Point{X: 1, Y: yc}.Add(geometry.Point{X: math.Cos(a), Y: math.Sin(a)}.Scale(b.R)))
	}
	for i := range pts {
		pts[i] = b.toPart(pts[i])
	}
	return pts
}

// Tip returns the point of the rounding farthest from the leading edge
// (part frame), the trailing-edge point of a rounded edge (common practice).
func (b RoundedBlade) Tip() geometry.Point {
	yc, dy := b.Foil.CamberLine(1)
	th := math.Atan(dy)
	var best geometry.Point
	bd := -1.0
	for k := 0; k <= 20000; k++ {
		a := th - math.Pi/2 + math.Pi*float64(k)/20000
		p := geometry.Point{X: 1, Y: yc}.Add(geometry.Point{X: math.Cos(a), Y: math.Sin(a)}.Scale(b.R))
		if d := p.Norm(); d > bd {
			best, bd = p, d
		}
	}
	return b.toPart(best)
}

// Sharp returns the intersection of the tangents of both surfaces where
// they meet the rounding (part frame) and their included angle (degrees):
// exact geometry, the lines p − a·dᵤ and q + b·dₗ solved by Cramer's rule.
func (b RoundedBlade) Sharp() (geometry.Point, float64) {
	const h = 1e-7
	pu, pl := b.surf(1, true), b.surf(1, false)
	du := pu.Sub(b.surf(1-h, true))
	dl := pl.Sub(b.surf(1-h, false))
	du, dl = du.Scale(1/du.Norm()), dl.Scale(1/dl.Norm())
	// pu + a·du = pl + c·dl.
	r := pl.Sub(pu)
	det := du.Cross(dl)
	a := r.Cross(dl) / det
	p := pu.Add(du.Scale(a))
	return b.toPart(p), math.Acos(du.Dot(dl)) * 180 / math.Pi
}

// Cut turns an outline into the points a plane cuts from a scanned mesh
// (CutAt with f = 0.37).
func Cut(loop []geometry.Point, sigma float64, seed uint64) *geometry.Contour {
	return CutAt(loop, sigma, seed, 0.37)
}

// CutAt turns an outline into the points a plane cuts from a scanned mesh:
// two rings of the outline, each vertex with independent Gaussian noise of
// standard deviation sigma on each coordinate, joined by the triangles
// a[i] a[j] b[j] and a[i] b[j] b[i]; the plane crosses each ring-to-ring
// edge at the same fraction f. Neighbouring cut points share vertices, so
// their noise is correlated along the outline; with f near 1 the cuts of
// a[i] b[j] and a[j] b[j] nearly coincide and share nearly all their noise,
// as in the demo scan cut close to a ring.
func CutAt(loop []geometry.Point, sigma float64, seed uint64, f float64) *geometry.Contour {
	rng := rand.New(rand.NewPCG(seed, 9))
	n := len(loop)
	noisy := func() []geometry.Point {
		out := make([]geometry.Point, n)
		for i, p := range loop {
			out[i] = p.Add(geometry.Point{X: sigma * rng.NormFloat64(), Y: sigma * rng.NormFloat64()})
		}
		return out
	}
	a, b := noisy(), noisy()
	c := &geometry.Contour{Units: geometry.Millimetre}
	for i := range n {
		j := (i + 1) % n
		for _, p := range []geometry.Point{a[i].Add(b[i].Sub(a[i]).Scale(f)), a[i].Add(b[j].Sub(a[i]).Scale(f))} {
			c.Points = append(c.Points, p)
			c.Origins = append(c.Origins, geometry.Origin{File: "cut.stl", Entity: len(c.Points)})
		}
	}
	return c
}

// Truncated returns the NACA 0012 outline (NACA Report 824 equations) cut
// off at x = xEnd and closed by a straight base with points about every
// 0.0025 chord, in the node order of package geometry (upper corner first,
// base last).
func Truncated(xEnd float64, perSurface int) []geometry.Point {
	n := shape.NACA4{Thickness: 0.12}
	var pts []geometry.Point
	for i := perSurface; i >= 1; i-- {
		pts = append(pts, n.Upper(xEnd*shape.CosineStation(i, perSurface)))
	}
	pts = append(pts, geometry.Point{})
	for i := 1; i <= perSurface; i++ {
		pts = append(pts, n.Lower(xEnd*shape.CosineStation(i, perSurface)))
	}
	lo, up := n.Lower(xEnd), n.Upper(xEnd)
	m := int(up.Dist(lo) / 0.0025)
	for k := 1; k < m; k++ {
		pts = append(pts, lo.Add(up.Sub(lo).Scale(float64(k)/float64(m))))
	}
	return pts
}
