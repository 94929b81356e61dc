package geometry

import (
	"errors"
	"math"
	"sort"
)

// ErrSelfIntersecting means a contour or a set of nodes crosses itself.
var ErrSelfIntersecting = errors.New("the contour crosses itself")

// FirstCrossing reports whether the polyline through pts crosses itself, and
// if so the indices i < j of two crossing segments (segment k joins pts[k]
// and pts[k+1]). Neighbouring segments, which share a node, never count; nor
// do the first and last segment when the polyline is closed (its first and
// last point coincide to 1e-12 of its size). Segments are swept in order of their smallest x, so
// the cost is close to O(n log n) for a section.
func FirstCrossing(pts []Point) (i, j int, crossed bool) {
	n := len(pts) - 1
	if n < 3 {
		return 0, 0, false
	}
	var size float64
	for _, p := range pts {
		size = math.Max(size, math.Max(math.Abs(p.X-pts[0].X), math.Abs(p.Y-pts[0].Y)))
	}
	closed := pts[0].Dist(pts[n]) <= 1e-12*size
	type seg struct {
		k      int
		lo, hi float64
	}
	segs := make([]seg, n)
	for k := range n {
		a, b := pts[k].X, pts[k+1].X
		segs[k] = seg{k, math.Min(a, b), math.Max(a, b)}
	}
	sort.Slice(segs, func(a, b int) bool { return segs[a].lo < segs[b].lo })
	for a := range segs {
		for b := a + 1; b < n && segs[b].lo <= segs[a].hi; b++ {
			p, q := segs[a].k, segs[b].k
			if p > q {
				p, q = q, p
			}
			if q == p+1 || (closed && p == 0 && q == n-1) {
				continue
			}
			if crossingSegments(pts[p], pts[p+1], pts[q], pts[q+1]) {
				return p, q, true
			}
		}
	}
	return 0, 0, false
}

// crossingSegments reports whether segments ab and cd share a point.
func crossingSegments(a, b, c, d Point) bool {
	d1 := b.Sub(a).Cross(c.Sub(a))
	d2 := b.Sub(a).Cross(d.Sub(a))
	d3 := d.Sub(c).Cross(a.Sub(c))
	d4 := d.Sub(c).Cross(b.Sub(c))
	if ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0)) {
		return true
	}
	on := func(p, q, r Point) bool { // r on segment pq, given collinear
		return math.Min(p.X, q.X) <= r.X && r.X <= math.Max(p.X, q.X) && math.Min(p.Y, q.Y) <= r.Y && r.Y <= math.Max(p.Y, q.Y)
	}
	return (d1 == 0 && on(a, b, c)) || (d2 == 0 && on(a, b, d)) || (d3 == 0 && on(c, d, a)) || (d4 == 0 && on(c, d, b))
}
