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
	bestU, bestL := lastCrossing(up, su, lo, sl, 1e-9*reach)
	if bestU < 0 || !(bestL > bestU) {
		return cv, 0, false
	}
	corner := cv.Start()
	out := cv.Sub(bestU, bestL)
	return out, out.Start().Dist(corner), true
}

// lastCrossing returns where the polylines up and lo (their points at the
// places su and sl along the curve) cross, the crossing farthest along up
// (the first found of equals, up's segments and then lo's taken in order),
// or −1, −1 when they do not; the first segment of each is left out (the
// shared corner's). The segments of lo are taken in runs of crossRun, each
// run's box widened by margin (far above rounding): a segment of up is
// tested against the segments of the runs whose box its own box meets (two
// segments that cross lie in both boxes), in the same order as against all
// of them, so the answer is that of testing every pair.
func lastCrossing(up []geometry.Point, su []float64, lo []geometry.Point, sl []float64, margin float64) (bestU, bestL float64) {
	boxes := make([]box, 0, (len(lo)+crossRun-1)/crossRun)
	for j0 := 1; j0 < len(lo)-1; j0 += crossRun {
		boxes = append(boxes, boxOf(lo[j0:min(j0+crossRun+1, len(lo))], margin))
	}
	bestU, bestL = -1.0, -1.0
	for i := 1; i < len(up)-1; i++ {
		a, b := up[i], up[i+1]
		ab := boxOf(up[i:i+2], margin)
		for r, bx := range boxes {
			if !ab.meets(bx) {
				continue
			}
			j0 := 1 + r*crossRun
			for j := j0; j < min(j0+crossRun, len(lo)-1); j++ {
				if t, u, ok := segmentsCross(a, b, lo[j], lo[j+1]); ok {
					if s1 := su[i] + t*(su[i+1]-su[i]); s1 > bestU {
						bestU, bestL = s1, sl[j]+u*(sl[j+1]-sl[j])
					}
				}
			}
		}
	}
	return bestU, bestL
}

// crossRun is the number of segments of the lower surface whose common
// box untangle tests before the segments themselves.
const crossRun = 16

// box is an axis-aligned bounding box.
type box struct{ x0, y0, x1, y1 float64 }

// boxOf returns the box of ps widened by margin on every side.
func boxOf(ps []geometry.Point, margin float64) box {
	b := box{x0: ps[0].X, y0: ps[0].Y, x1: ps[0].X, y1: ps[0].Y}
	for _, p := range ps[1:] {
		b.x0, b.y0 = min(b.x0, p.X), min(b.y0, p.Y)
		b.x1, b.y1 = max(b.x1, p.X), max(b.y1, p.Y)
	}
	return box{b.x0 - margin, b.y0 - margin, b.x1 + margin, b.y1 + margin}
}

// meets reports whether the boxes a and b overlap.
func (a box) meets(b box) bool {
	return a.x0 <= b.x1 && b.x0 <= a.x1 && a.y0 <= b.y1 && b.y0 <= a.y1
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
