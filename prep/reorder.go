package prep

import (
	"math"
	"slices"
	"sort"

	"github.com/foilwright/foilwright/geometry"
)

// Retaking the points in the order of a fitted outline.
//
// The fit runs through the points in the order the cleaning step gave
// them, with their positions along the loop as its parameter. Where that
// order runs back and forth along the outline (a band of dense points
// whose positions were measured on a curve that itself doubled back, or a
// stretch of points taken out of turn), the fitted curve follows it and
// folds: small loops, zigzags across the band, panels that cross. The
// outline the fold leaves when its loops are cut out still runs the right
// way round the section; each point's foot on it gives the order and the
// position along the loop that the points should have had. The fit made
// on them no longer has a reason to fold. A fold whose points lie off the
// section (a cluster of outliers kept) is not helped and fails its gate
// again.

// untangled returns the closed polyline through nodes (the first node
// repeated at the end when nodes do not end where they start) with every
// loop cut out: where two of its segments cross, the shorter way round
// between them is dropped and the crossing point joins the rest. The
// result has no crossing segments and at least 3 vertices, or is nil
// when nothing of it would be left.
func untangled(nodes []geometry.Point) []geometry.Point {
	ring := append([]geometry.Point(nil), nodes...)
	if ring[0].Dist(ring[len(ring)-1]) > 0 {
		ring = append(ring, ring[0])
	}
	ring = ring[:len(ring)-1] // the ring's vertices, the closing one implied
	for range len(nodes) {
		if len(ring) < 3 {
			return nil
		}
		i, j, ok := geometry.LoopCrossing(ring)
		if !ok {
			return ring
		}
		m := len(ring)
		a, b := ring[i], ring[(i+1)%m]
		c, d := ring[j], ring[(j+1)%m]
		x, ok := crossPoint(a, b, c, d)
		if !ok {
			// Collinear segments that overlap: drop the later vertex.
			x = b
		}
		inner := j - i // vertices i+1 … j form the loop one way round
		if inner <= m-inner {
			next := append([]geometry.Point(nil), ring[:i+1]...)
			next = append(next, x)
			ring = append(next, ring[j+1:]...)
		} else {
			next := []geometry.Point{x}
			ring = append(next, ring[i+1:j+1]...)
		}
	}
	return nil
}

// crossPoint returns where the segments a–b and c–d cross, false for
// parallel segments.
func crossPoint(a, b, c, d geometry.Point) (geometry.Point, bool) {
	r, s := b.Sub(a), d.Sub(c)
	den := r.Cross(s)
	if math.Abs(den) <= 1e-300 {
		return geometry.Point{}, false
	}
	t := c.Sub(a).Cross(s) / den
	return a.Add(r.Scale(t)), true
}

// footsOn returns, for every point of pts, the arc length along the closed
// polyline ring (its vertices; the closing segment implied) of its
// nearest point, measured from ring[0].
func footsOn(ring []geometry.Point, pts []geometry.Point) []float64 {
	m := len(ring)
	cum := make([]float64, m+1)
	for k := range m {
		cum[k+1] = cum[k] + ring[k].Dist(ring[(k+1)%m])
	}
	// Segments sorted by their lowest x, and the longest segment's
	// reach, bound the search for each point's nearest segment: a segment
	// whose lowest x lies beyond the point by more than the best distance
	// so far cannot be nearer.
	order := make([]int, m)
	lo := make([]float64, m)
	for k := range m {
		order[k] = k
		lo[k] = math.Min(ring[k].X, ring[(k+1)%m].X)
	}
	sort.Slice(order, func(p, q int) bool { return lo[order[p]] < lo[order[q]] })
	los := make([]float64, m)
	var span float64
	for k, o := range order {
		los[k] = lo[o]
		span = math.Max(span, math.Abs(ring[o].X-ring[(o+1)%m].X))
	}
	out := make([]float64, len(pts))
	for pi, p := range pts {
		best, bestS := math.Inf(1), 0.0
		try := func(k int) {
			a, b := ring[k], ring[(k+1)%m]
			ab := b.Sub(a)
			l2 := ab.Dot(ab)
			t := 0.0
			if l2 > 0 {
				t = min(max(p.Sub(a).Dot(ab)/l2, 0), 1)
			}
			if d := p.Dist(a.Add(ab.Scale(t))); d < best {
				best, bestS = d, cum[k]+t*(cum[k+1]-cum[k])
			}
		}
		// Start from the segments whose lowest x is nearest the point's,
		// then widen both ways while a nearer segment remains possible.
		start := sort.SearchFloat64s(los, p.X)
		for k := start; k < m && los[k] <= p.X+best; k++ {
			try(order[k])
		}
		for k := start - 1; k >= 0 && los[k] >= p.X-span-best; k-- {
			try(order[k])
		}
		out[pi] = bestS
	}
	return out
}

// alongOutline returns a copy of the contour c with its points taken in
// the order of their feet on the closed polyline ring (part coordinates,
// running the way c does), counted from the foot of te (the outline's
// start: its trailing edge, or the upper surface's end of a blunt one,
// where the contour starts too), and those feet's arc lengths as the
// positions along the loop (Contour.Along). Points whose feet coincide
// keep their order in c, a hair apart, so that the positions increase
// strictly. It returns nil when ring is too short to order by.
func alongOutline(c *geometry.Contour, ring []geometry.Point, te geometry.Point) *geometry.Contour {
	if len(ring) < 3 || c.Len() < 3 {
		return nil
	}
	if geometry.SignedArea(ring)*geometry.SignedArea(c.Points) < 0 {
		ring = append([]geometry.Point(nil), ring...)
		slices.Reverse(ring)
	}
	s := footsOn(ring, c.Points)
	var L float64
	for k := range ring {
		L += ring[k].Dist(ring[(k+1)%len(ring)])
	}
	if !(L > 0) {
		return nil
	}
	s0 := footsOn(ring, []geometry.Point{te})[0]
	for i := range s {
		s[i] -= s0
		if s[i] < 0 {
			s[i] += L
		}
	}
	idx := make([]int, c.Len())
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(p, q int) bool { return s[idx[p]] < s[idx[q]] })
	hair := 1e-9 * L
	out := &geometry.Contour{Units: c.Units,
		Points:  make([]geometry.Point, len(idx)),
		Origins: make([]geometry.Origin, len(idx)),
		Along:   make([]float64, len(idx))}
	for k, i := range idx {
		out.Points[k], out.Along[k] = c.Points[i], s[i]
		if i < len(c.Origins) {
			out.Origins[k] = c.Origins[i]
		}
		if k > 0 && out.Along[k] <= out.Along[k-1] {
			out.Along[k] = out.Along[k-1] + hair
		}
	}
	return out
}
