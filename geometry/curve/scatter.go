package curve

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
)

// scatterHalf is the half-width, in points, of the window of the
// local scatter estimate.
const scatterHalf = 5

// localScatter estimates the measurement noise of the closed loop pts (a
// standard deviation normal to the outline, input units) from the data
// alone, before any fit: every point is predicted from its
// 2·scatterHalf neighbours by a least-squares parabola in the frame
// of the chord across the window, and the robust standard deviation (1.4826
// × median) of the prediction errors, each divided by its own standard
// error factor √(1 + x₀ᵀ(XᵀX)⁻¹x₀) so that white noise of standard deviation
// σ gives σ, is returned. The median ignores the few windows that wrap
// round a nose or a corner. It returns 0 for fewer than 4·scatterHalf
// points.
//
// Unlike a cross-validated fit it is not fooled by noise that is correlated
// along the outline (points cut from a noisy mesh lie on straight edges
// between noisy vertices, so neighbours share their noise): the window is
// wider than the correlation length, so the estimate only falls short by the
// part of the noise that the parabola itself absorbs.
func localScatter(pts []geometry.Point) float64 {
	n := len(pts)
	const m = scatterHalf
	if n < 4*m {
		return 0
	}
	at := func(i int) geometry.Point { return pts[((i%n)+n)%n] }
	rs := make([]float64, 0, n)
	for i := 0; i < n; i++ {
		d := at(i + m).Sub(at(i - m))
		l := d.Norm()
		if l == 0 {
			continue
		}
		d = d.Scale(1 / l)
		p0 := at(i)
		// The distinct sums of the normal equations, each formed once
		// (x·y = y·x and 1·y = y: the sums of the full 3×3 loop, added in
		// the same order).
		var a00, a01, a02, a11, a12, a22, b0, b1, b2 float64
		for j := -m; j <= m; j++ {
			if j == 0 {
				continue
			}
			q := at(i + j).Sub(p0)
			u, v := q.Dot(d), d.Cross(q)
			u2 := u * u
			b0 += v
			b1 += u * v
			b2 += u2 * v
			a00++
			a01 += u
			a02 += u2
			a11 += u * u
			a12 += u * u2
			a22 += u2 * u2
		}
		a := [3][3]float64{{a00, a01, a02}, {a01, a11, a12}, {a02, a12, a22}}
		b := [3]float64{b0, b1, b2}
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
	return 1.4826 * numeric.Nth(rs, len(rs)/2)
}
