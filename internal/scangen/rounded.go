package scangen

import (
	"errors"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// errRounding means no circle of the requested radius fits against both
// surfaces near the trailing edge.
var errRounding = errors.New("scangen: no rounding circle of that radius fits the trailing edge")

// roundEnd replaces the aft end of a section by a circular arc of radius r
// (raw units) tangent to both surfaces, as a 3D printer leaves a thin
// trailing edge. pieces[0] is the upper surface (u = 0 at the trailing
// edge), pieces[1] the lower (u = 1 at the trailing edge); a base piece is
// dropped. It returns the truncated surfaces and the arc, from the lower
// tangent point round the aft end to the upper one.
//
// The centre lies at distance r inward from the upper surface, C(uₐ) =
// f(uₐ) + r·n(uₐ); uₐ is found by bisection so that C is also at distance r
// from the lower surface. The tangent points are the feet of C on both
// surfaces, so the outline stays smooth (tangent-continuous).
func roundEnd(pieces []piece, r float64) ([]piece, error) {
	up, lo := pieces[0].at, pieces[1].at
	centre := func(u float64) geometry.Point {
		const h = 1e-7
		d := up(u + h).Sub(up(math.Max(u-h, 0)))
		d = d.Scale(1 / d.Norm())
		return up(u).Add(geometry.Point{X: -d.Y, Y: d.X}.Scale(r)) // left of travel: inward
	}
	footLower := func(c geometry.Point) (float64, float64) {
		const scan = 400
		best, bestD := 1.0, math.Inf(1)
		for i := 0; i <= scan; i++ {
			u := 0.5 + 0.5*float64(i)/scan
			if d := lo(u).Dist(c); d < bestD {
				best, bestD = u, d
			}
		}
		u := golden(math.Max(best-0.5/scan, 0.5), math.Min(best+0.5/scan, 1), func(u float64) float64 { return lo(u).Dist(c) })
		return u, lo(u).Dist(c)
	}
	g := func(u float64) float64 { _, d := footLower(centre(u)); return d - r }
	a, b := 0.0, 0.5
	if g(a) >= 0 || g(b) <= 0 {
		return nil, errRounding
	}
	for b-a > 1e-13 {
		m := (a + b) / 2
		if g(m) < 0 {
			a = m
		} else {
			b = m
		}
	}
	ua := (a + b) / 2
	c := centre(ua)
	ub, _ := footLower(c)
	pa, pb := up(ua), lo(ub)
	thA := math.Atan2(pa.Y-c.Y, pa.X-c.X)
	thB := math.Atan2(pb.Y-c.Y, pb.X-c.X)
	span := thA - thB
	if span <= 0 {
		span += 2 * math.Pi
	}
	arc := func(u float64) geometry.Point {
		s, co := math.Sincos(thB + u*span)
		return geometry.Point{X: c.X + r*co, Y: c.Y + r*s}
	}
	return []piece{
		{kind: Upper, at: func(u float64) geometry.Point { return up(ua + u*(1-ua)) }},
		{kind: Lower, at: func(u float64) geometry.Point { return lo(u * ub) }},
		{kind: Round, at: arc},
	}, nil
}
