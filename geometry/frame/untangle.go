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
// meet) whose two surfaces cross near the edge, made untangled, the
// distance from the corner to the crossing, the crossing itself and whether
// the corner was kept; ok is false when the surfaces do not cross. Near a thin edge whose surfaces are
// within the noise of each other, each smoothed surface wanders by its own
// share of the noise, and a systematic offset of the points (a probe-radius
// compensation off by d moves a corner of half-angle θ by d/sin θ) makes the
// two cross ahead of the corner: the section then loops over itself there.
// Of several crossings the one farthest from the corner counts. The points
// that run on beyond the crossing say the part does too (reached, given
// the crossing's place along each surface, tells): the surfaces are then
// carried on straight to the corner from as far ahead of the crossing as
// it lies ahead of the corner (carryToCorner), a wedge whose thickness
// there is what the surfaces show. Where no point lies beyond the crossing
// (the corner is the fit's guess beyond the points: a blunt end read as
// sharp) or the wedge would still cross the outline, the curve is cut at
// the crossing instead, the arc aft of it dropped on both sides (the edge
// put where they cross).
func untangle(cv *curve.Curve, reached func(su, sl float64) bool) (out *curve.Curve, moved float64, at geometry.Point, cornered, ok bool) {
	if cv.Closed() {
		return cv, 0, geometry.Point{}, false, false
	}
	su, sl, found := crossingOf(cv)
	if !found {
		return cv, 0, geometry.Point{}, false, false
	}
	corner, at := cv.Start(), cv.At(su)
	if !reached(su, sl) {
		out = cv.Sub(su, sl)
		return out, out.Start().Dist(corner), at, false, true
	}
	if w, ok := carryToCorner(cv, su, sl); ok {
		return w, at.Dist(corner), at, true, true
	}
	out = cv.Sub(su, sl)
	return out, out.Start().Dist(corner), at, false, true
}

// crossingOf returns where, along the open curve cv, its two surfaces cross
// within untangleReach of the edge: the crossing farthest from the edge,
// su along the upper surface and sl along the lower (su < sl), and whether
// they cross.
func crossingOf(cv *curve.Curve) (su, sl float64, ok bool) {
	L := cv.Length()
	reach := untangleReach * L
	if !(reach > 0) {
		return 0, 0, false
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
	up, su0 := sample(0, reach)   // from the corner forward along the upper surface
	lo, sl0 := sample(L, L-reach) // from the corner back along the lower surface
	bestU, bestL := lastCrossing(up, su0, lo, sl0, 1e-9*reach)
	if bestU < 0 || !(bestL > bestU) {
		return 0, 0, false
	}
	return bestU, bestL, true
}

// carryToCorner returns cv with the arcs from its corner (the shared ends)
// to twice as far along each surface as the crossing at su and sl replaced
// by straight segments to the corner, and whether that untangled it: the
// wedge crosses neither itself nor the rest of the outline.
func carryToCorner(cv *curve.Curve, su, sl float64) (*curve.Curve, bool) {
	L := cv.Length()
	a, b := 2*su, L-2*(L-sl)
	if !(a > 0 && b > a && a < L/2 && b > L/2) {
		return nil, false
	}
	var bld curve.Builder
	bld.AddLine(cv.Start(), cv.At(a))
	bld.AddArc(cv, a, b)
	bld.AddLine(cv.At(b), cv.End())
	w := bld.Curve(false)
	if _, _, again := crossingOf(w); again {
		return nil, false
	}
	return w, true
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

// beyond returns whether a point of the fit, at the places support along
// the open curve cv, lies aft of the crossing at su and sl along it: ahead
// of su from the start or beyond sl towards the end.
func beyond(support []float64) func(su, sl float64) bool {
	return func(su, sl float64) bool {
		for _, s := range support {
			if s < su || s > sl {
				return true
			}
		}
		return false
	}
}
