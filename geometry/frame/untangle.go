package frame

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
)

// Sizes of the search for crossed surfaces at a sharp trailing edge
// (untangle).
const (
	untangleReach   = 0.05 // each surface is searched over this share of the curve's length from the edge
	untangleSamples = 400  // samples of each surface
)

// untangle returns the open curve cv of a sharp trailing edge (its ends
// meet) cut where its two surfaces cross near the edge, with the arc from
// the edge to that crossing dropped on both sides, and the distance from
// the old corner to the crossing; ok is false when the surfaces do not
// cross. Near a thin edge whose surfaces are within the noise of each
// other, each smoothed surface wanders by its own share of the noise and
// the two can cross a little ahead of the corner: the section then loops
// over itself there. The surfaces meet, for every purpose, where they
// cross; of several crossings the one farthest from the corner counts.
func untangle(cv *curve.Curve) (*curve.Curve, float64, bool) {
	if cv.Closed() {
		return cv, 0, false
	}
	L := cv.Length()
	reach := untangleReach * L
	if !(reach > 0) {
		return cv, 0, false
	}
	sample := func(from, to float64) ([]geometry.Point, []float64) {
		ps := make([]geometry.Point, untangleSamples+1)
		ss := make([]float64, untangleSamples+1)
		for k := range ps {
			ss[k] = from + (to-from)*float64(k)/untangleSamples
			ps[k] = cv.At(ss[k])
		}
		return ps, ss
	}
	up, su := sample(0, reach)   // from the corner forward along the upper surface
	lo, sl := sample(L, L-reach) // from the corner back along the lower surface
	bestU, bestL := -1.0, -1.0
	for i := 1; i < len(up)-1; i++ { // skip the shared corner segment's start
		a, b := up[i], up[i+1]
		for j := 1; j < len(lo)-1; j++ {
			c, d := lo[j], lo[j+1]
			if t, u, ok := segmentsCross(a, b, c, d); ok {
				s1 := su[i] + t*(su[i+1]-su[i])
				if s1 > bestU {
					bestU, bestL = s1, sl[j]+u*(sl[j+1]-sl[j])
				}
			}
		}
	}
	if bestU < 0 || !(bestL > bestU) {
		return cv, 0, false
	}
	corner := cv.Start()
	out := cv.Sub(bestU, bestL)
	return out, out.Start().Dist(corner), true
}

// segmentsCross reports whether the segments a–b and c–d cross, and where
// along each (0 to 1).
func segmentsCross(a, b, c, d geometry.Point) (t, u float64, ok bool) {
	r, s := b.Sub(a), d.Sub(c)
	den := r.Cross(s)
	if math.Abs(den) < 1e-300 {
		return 0, 0, false
	}
	q := c.Sub(a)
	t, u = q.Cross(s)/den, q.Cross(r)/den
	return t, u, t >= 0 && t <= 1 && u >= 0 && u <= 1
}
