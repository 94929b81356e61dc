package geometry

import (
	"math"
	"slices"
)

// LoopCrossing looks for two segments of the closed polygon pts (segment k
// joins pts[k] and pts[k+1 mod len]) that cross or touch, other than
// neighbours meeting at their common node; neighbours that fold back onto
// each other count as crossing. Segments are swept in order of their least
// x, so the cost is O(m log m) plus the pairs whose x ranges overlap.
func LoopCrossing(pts []Point) (i, j int, found bool) {
	m := len(pts)
	seg := func(k int) (Point, Point) { return pts[k], pts[(k+1)%m] }
	for k := range m {
		a, b := seg(k)
		_, c := seg((k + 1) % m)
		d1, d2 := b.Sub(a), c.Sub(b)
		if d1.Cross(d2) == 0 && d1.Dot(d2) < 0 {
			return k, (k + 1) % m, true
		}
	}
	order := make([]int, m)
	minX := make([]float64, m)
	for k := range m {
		a, b := seg(k)
		order[k], minX[k] = k, math.Min(a.X, b.X)
	}
	slices.SortFunc(order, func(p, q int) int {
		switch {
		case minX[p] < minX[q]:
			return -1
		case minX[p] > minX[q]:
			return 1
		}
		return 0
	})
	for oi, p := range order {
		a, b := seg(p)
		maxX := math.Max(a.X, b.X)
		for _, q := range order[oi+1:] {
			if minX[q] > maxX {
				break
			}
			if d := (p - q + m) % m; d == 1 || d == m-1 {
				continue
			}
			c, e := seg(q)
			if crossingSegments(a, b, c, e) {
				return min(p, q), max(p, q), true
			}
		}
	}
	return 0, 0, false
}

// InsideLoop reports whether p lies inside the closed polygon pts (even-odd
// rule).
func InsideLoop(pts []Point, p Point) bool {
	in := false
	m := len(pts)
	for k := range m {
		a, b := pts[k], pts[(k+1)%m]
		if (a.Y > p.Y) != (b.Y > p.Y) {
			x := a.X + (p.Y-a.Y)*(b.X-a.X)/(b.Y-a.Y)
			if p.X < x {
				in = !in
			}
		}
	}
	return in
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
