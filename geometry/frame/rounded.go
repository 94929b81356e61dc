package frame

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/internal/numeric"
)

// Arc windows of the rounded-end analysis (AnalyseRounded), as fractions of
// the chord unless said otherwise.
const (
	farFrom      = 0.02 // the far surfaces are fitted from this arc from the tip ...
	farTo        = 0.05 // ... to this one
	roundDone    = 0.9  // fraction of its turning after which the end is done
	roundGap     = 2    // gap past the end of the rounding, in end arcs
	roundSpan    = 8    // length of the surface fit, in end arcs ...
	roundMinSpan = 0.08 // ... but at least this
)

// RoundedEnd describes the rounded end of a closed curve: where the
// rounding gives way to the surfaces, and the straight lines that continue
// the surfaces just ahead of it.
type RoundedEnd struct {
	eu, el     float64        // arc from the tip to the end of the rounding, upper and lower side
	su, sl     float64        // arc lengths on the curve where the surface lines start (near ends of their fits)
	pu, pl     geometry.Point // curve points at su and sl
	du, dl     geometry.Point // unit directions of the surface lines, pointing aft (towards the tip)
	radius     float64        // radius of the circle fitted to the rounding ...
	center     geometry.Point // ... and its centre
	Thickness  float64        // distance between the ends of the rounding
	Angle      float64        // included angle between the surface lines, radians
	sharp      geometry.Point // intersection of the surface lines
	sharpValid bool           // the lines meet behind the edge
}

// surfaceLine fits the curve between arc lengths a and b (wrapped on the
// closed curve), 41 samples, by a least-squares parabola in the frame of
// their principal axis and returns the unit tangent of the parabola at the
// sample at a, pointing from b towards a. The parabola keeps the slight
// curvature of a convex surface from tilting the direction (a straight
// line would give the mean slope over the window, not the slope at its
// near end) while still averaging out what wiggles are left.
// Sharp returns where the straight continuations of both surfaces, just
// ahead of the rounding, meet (the point a sharpen extends them to), and
// whether they meet behind the edge.
func (e RoundedEnd) Sharp() (geometry.Point, bool) { return e.sharp, e.sharpValid }

func surfaceLine(cv *curve.Curve, a, b float64) geometry.Point {
	L := cv.Length()
	wrap := func(s float64) float64 { return math.Mod(math.Mod(s, L)+L, L) }
	const m = 41
	pts := make([]geometry.Point, m)
	for k := range pts {
		pts[k] = cv.At(wrap(a + (b-a)*float64(k)/(m-1)))
	}
	o, d := geometry.MajorAxis(pts)
	if d.Dot(pts[0].Sub(pts[m-1])) < 0 {
		d = d.Scale(-1)
	}
	nrm := geometry.Point{X: -d.Y, Y: d.X}
	var am [3][3]float64
	var bv [3]float64
	scale := pts[0].Dist(pts[m-1])
	if scale == 0 {
		return d
	}
	for _, p := range pts {
		q := p.Sub(o)
		u, v := q.Dot(d)/scale, q.Dot(nrm)/scale
		x := [3]float64{1, u, u * u}
		for r := range 3 {
			bv[r] += x[r] * v
			for c := range 3 {
				am[r][c] += x[r] * x[c]
			}
		}
	}
	c, ok := numeric.Solve3(am, bv)
	if !ok {
		return d
	}
	u0 := pts[0].Sub(o).Dot(d) / scale
	slope := c[1] + 2*c[2]*u0
	t := d.Add(nrm.Scale(slope))
	return t.Scale(1 / t.Norm())
}

// AnalyseRounded finds where the rounded end of the closed,
// counter-clockwise curve cv around the tip at arc length sTip gives way to
// the surfaces, for a section of the given chord (cv's units).
//
// The surfaces far from the end (farFrom to farTo chord of arc
// from the tip) give the directions the end turns between; on each side the
// rounding ends where the tangent has made roundDone of its turn from the
// tip's direction to the surface's. The surfaces just ahead of the rounding
// are continued by the tangents at the near ends of parabolas
// (surfaceLine) fitted over roundSpan end arcs (at least roundMinSpan
// chord) of each surface, starting roundGap end arcs past the rounding:
// the smoothing spline spreads the end's curvature, and rings a little,
// about one end arc into the surfaces. The constants were tuned on the
// offset NACA 0012 of the tests and the demo scan. Their included
// angle is the trailing-edge angle and their intersection the sharpened
// edge; the thickness is the distance between the ends of the rounding, and
// the radius that of the circle fitted (Kåsa, then geometric) to the curve
// between them. It returns false when the curve does not turn the right way
// round the tip.
func AnalyseRounded(cv *curve.Curve, sTip, chord float64) (RoundedEnd, bool) {
	L := cv.Length()
	wrap := func(s float64) float64 { return math.Mod(math.Mod(s, L)+L, L) }
	var e RoundedEnd
	a, b := farFrom*chord, farTo*chord
	if !(b < L/4) {
		return e, false
	}
	t0 := cv.Tangent(wrap(sTip))
	fu := surfaceLine(cv, sTip+a, sTip+b) // aft along the upper surface
	fl := surfaceLine(cv, sTip-a, sTip-b) // aft along the lower surface
	// Travelling counter-clockwise, the tangent turns from fl through t0 to
	// −fu, left (positive) all the way for a convex end.
	phiU, phiL := geometry.Turn(t0, fu.Scale(-1)), geometry.Turn(fl, t0)
	if !(phiU > 0 && phiL > 0) {
		return e, false
	}
	ds := chord * 1e-4
	end := func(sign, phi float64) (float64, bool) {
		for d := ds; d < b; d += ds {
			t := cv.Tangent(wrap(sTip + sign*d))
			var turned float64
			if sign > 0 {
				turned = geometry.Turn(t0, t)
			} else {
				turned = geometry.Turn(t, t0)
			}
			if turned >= roundDone*phi {
				return d, true
			}
		}
		return 0, false
	}
	var ok1, ok2 bool
	e.eu, ok1 = end(1, phiU)
	e.el, ok2 = end(-1, phiL)
	if !ok1 || !ok2 {
		return e, false
	}
	span := func(ee float64) (float64, float64) {
		from := ee * (1 + roundGap)
		return from, from + math.Max(roundSpan*ee, roundMinSpan*chord)
	}
	fromU, toU := span(e.eu)
	fromL, toL := span(e.el)
	if !(toU < L/4 && toL < L/4) {
		return e, false
	}
	e.su, e.sl = wrap(sTip+fromU), wrap(sTip-fromL)
	e.pu, e.pl = cv.At(e.su), cv.At(e.sl)
	e.du = surfaceLine(cv, sTip+fromU, sTip+toU)
	e.dl = surfaceLine(cv, sTip-fromL, sTip-toL)
	e.Angle = math.Acos(math.Max(-1, math.Min(1, e.du.Dot(e.dl))))
	e.Thickness = cv.At(wrap(sTip + e.eu)).Dist(cv.At(wrap(sTip - e.el)))
	const m = 41
	arc := make([]geometry.Point, m)
	for k := range arc {
		arc[k] = cv.At(wrap(sTip - e.el + (e.eu+e.el)*float64(k)/(m-1)))
	}
	if c, r, _, ok := numeric.FitCircle(arc); ok {
		e.center, e.radius = c, r
	} else {
		e.radius = e.Thickness / 2
		e.center = cv.At(wrap(sTip + e.eu)).Add(cv.At(wrap(sTip - e.el))).Scale(0.5)
	}
	e.sharp, e.sharpValid = meet(e.pu, e.du.Scale(-1), e.pl, e.dl, 0.5*chord)
	return e, true
}
