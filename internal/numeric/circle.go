package numeric

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// FitCircle fits a circle to pts: the algebraic fit of Kåsa (IEEE
// Trans. Instrum. Meas. 25 (1976) 8–14) as a start, refined by Gauss–Newton
// on the geometric distances (propCircle). It returns the centre, the
// radius and the RMS geometric residual, or false for fewer than 3 points
// or points on a line.
func FitCircle(pts []geometry.Point) (geometry.Point, float64, float64, bool) {
	if len(pts) < 3 {
		return geometry.Point{}, 0, 0, false
	}
	// Shift to the mean for conditioning.
	var o geometry.Point
	for _, p := range pts {
		o = o.Add(p)
	}
	o = o.Scale(1 / float64(len(pts)))
	var a [3][3]float64
	var b [3]float64
	for _, p := range pts {
		q := p.Sub(o)
		x := [3]float64{q.X, q.Y, 1}
		z := -(q.X*q.X + q.Y*q.Y)
		for r := range 3 {
			b[r] += x[r] * z
			for c := range 3 {
				a[r][c] += x[r] * x[c]
			}
		}
	}
	s, ok := Solve3(a, b)
	if !ok {
		return geometry.Point{}, 0, 0, false
	}
	c := geometry.Point{X: -s[0] / 2, Y: -s[1] / 2}
	r2 := c.X*c.X + c.Y*c.Y - s[2]
	if !(r2 > 0) || math.IsInf(r2, 0) {
		return geometry.Point{}, 0, 0, false
	}
	c, r := RefineCircle(pts, c.Add(o), math.Sqrt(r2))
	if !(r > 0) || !c.IsFinite() {
		return geometry.Point{}, 0, 0, false
	}
	var ss float64
	for _, p := range pts {
		d := p.Dist(c) - r
		ss += d * d
	}
	return c, r, math.Sqrt(ss / float64(len(pts))), true
}

// RefineCircle fits a circle to pts by Gauss–Newton on the geometric
// distances, from the given centre and radius.
func RefineCircle(pts []geometry.Point, center geometry.Point, r float64) (geometry.Point, float64) {
	for range 30 {
		// Unknowns: cx, cy, r. Residual dᵢ = |pᵢ − c| − r.
		var a [3][3]float64
		var b [3]float64
		for _, p := range pts {
			v := p.Sub(center)
			d := v.Norm()
			if d == 0 {
				continue
			}
			j := [3]float64{-v.X / d, -v.Y / d, -1}
			res := d - r
			for x := 0; x < 3; x++ {
				b[x] -= j[x] * res
				for y := 0; y < 3; y++ {
					a[x][y] += j[x] * j[y]
				}
			}
		}
		dx, ok := Solve3(a, b)
		if !ok {
			break
		}
		center = center.Add(geometry.Point{X: dx[0], Y: dx[1]})
		r += dx[2]
		if math.Abs(dx[0])+math.Abs(dx[1])+math.Abs(dx[2]) < 1e-14 {
			break
		}
	}
	return center, r
}
