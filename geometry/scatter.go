package geometry

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/internal/numeric"
)

// roundedScatterHalf is the half-width, in points, of the window of the
// local scatter estimate.
const roundedScatterHalf = 5

// roundedScatter estimates the measurement noise of the closed loop pts (a
// standard deviation normal to the outline, input units) from the data
// alone, before any fit: every point is predicted from its
// 2·roundedScatterHalf neighbours by a least-squares parabola in the frame
// of the chord across the window, and the robust standard deviation (1.4826
// × median) of the prediction errors, each divided by its own standard
// error factor √(1 + x₀ᵀ(XᵀX)⁻¹x₀) so that white noise of standard deviation
// σ gives σ, is returned. The median ignores the few windows that wrap
// round a nose or a corner. It returns 0 for fewer than 4·roundedScatterHalf
// points.
//
// Unlike a cross-validated fit it is not fooled by noise that is correlated
// along the outline (points cut from a noisy mesh lie on straight edges
// between noisy vertices, so neighbours share their noise): the window is
// wider than the correlation length, so the estimate only falls short by the
// part of the noise that the parabola itself absorbs.
func roundedScatter(pts []Point) float64 {
	n := len(pts)
	const m = roundedScatterHalf
	if n < 4*m {
		return 0
	}
	at := func(i int) Point { return pts[((i%n)+n)%n] }
	rs := make([]float64, 0, n)
	for i := 0; i < n; i++ {
		d := at(i + m).Sub(at(i - m))
		l := d.Norm()
		if l == 0 {
			continue
		}
		d = d.Scale(1 / l)
		p0 := at(i)
		var a [3][3]float64
		var b [3]float64
		for j := -m; j <= m; j++ {
			if j == 0 {
				continue
			}
			q := at(i + j).Sub(p0)
			u, v := q.Dot(d), d.Cross(q)
			x := [3]float64{1, u, u * u}
			for r := range 3 {
				b[r] += x[r] * v
				for c := range 3 {
					a[r][c] += x[r] * x[c]
				}
			}
		}
		c, ok := numeric.Solve3(a, b)
		if !ok {
			continue
		}
		// (XᵀX)⁻¹[0][0] is the variance factor of the prediction at u = 0.
		e, ok := numeric.Solve3(a, [3]float64{1, 0, 0})
		if !ok || !(e[0] >= 0) {
			continue
		}
		rs = append(rs, math.Abs(c[0])/math.Sqrt(1+e[0]))
	}
	if len(rs) == 0 {
		return 0
	}
	slices.Sort(rs)
	return 1.4826 * rs[len(rs)/2]
}

// FitCircle fits a circle to pts: the algebraic fit of Kåsa (IEEE
// Trans. Instrum. Meas. 25 (1976) 8–14) as a start, refined by Gauss–Newton
// on the geometric distances (propCircle). It returns the centre, the
// radius and the RMS geometric residual, or false for fewer than 3 points
// or points on a line.
func FitCircle(pts []Point) (Point, float64, float64, bool) {
	if len(pts) < 3 {
		return Point{}, 0, 0, false
	}
	// Shift to the mean for conditioning.
	var o Point
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
	s, ok := numeric.Solve3(a, b)
	if !ok {
		return Point{}, 0, 0, false
	}
	c := Point{-s[0] / 2, -s[1] / 2}
	r2 := c.X*c.X + c.Y*c.Y - s[2]
	if !(r2 > 0) || math.IsInf(r2, 0) {
		return Point{}, 0, 0, false
	}
	c, r := RefineCircle(pts, c.Add(o), math.Sqrt(r2))
	if !(r > 0) || !c.IsFinite() {
		return Point{}, 0, 0, false
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
func RefineCircle(pts []Point, center Point, r float64) (Point, float64) {
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
		dx, ok := numeric.Solve3(a, b)
		if !ok {
			break
		}
		center = center.Add(Point{dx[0], dx[1]})
		r += dx[2]
		if math.Abs(dx[0])+math.Abs(dx[1])+math.Abs(dx[2]) < 1e-14 {
			break
		}
	}
	return center, r
}
