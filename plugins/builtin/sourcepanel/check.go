package sourcepanel

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// MinNodes is the smallest number of nodes a section may have.
const MinNodes = 8

// Errors returned for bad input, wrapped with figures in the message.
// Callers test them with errors.Is.
var (
	// ErrTooFewNodes means the section has fewer than MinNodes nodes.
	ErrTooFewNodes = errors.New("too few nodes")
	// ErrNonFinite means a coordinate or an angle is NaN or infinite.
	ErrNonFinite = errors.New("value is NaN or infinite")
	// ErrRepeatedNode means two consecutive nodes coincide (a zero-length panel).
	ErrRepeatedNode = errors.New("repeated node")
	// ErrCrossing means two panels of the contour cross or touch.
	ErrCrossing = errors.New("panels cross")
	// ErrClockwise means the nodes run clockwise, against the node order of
	// package geometry.
	ErrClockwise = errors.New("nodes run clockwise")
	// ErrAlphaRange means an angle of attack is outside [−90°, 90°].
	ErrAlphaRange = errors.New("angle of attack outside [-90°, 90°]")
	// ErrOpenContour means the first and last node differ: the source panel
	// method needs a closed body.
	ErrOpenContour = errors.New("contour is not closed")
	// ErrIllConditioned means the influence matrix is too close to singular
	// to trust its solution; see ConditionError.
	ErrIllConditioned = errors.New("influence matrix is ill-conditioned")
	// ErrInside means a flow-field point lies inside the body.
	ErrInside = errors.New("point inside the body")
)

// chkCoincide is the distance, relative to the size of the contour, below
// which two nodes count as the same point.
const chkCoincide = 1e-12

// checkNodes validates a contour in node order and reports whether its first
// and last node coincide (a sharp trailing edge). The contour is checked as
// a closed loop: for an open one, the segment from the last node back to the
// first is part of it.
func checkNodes(nodes []geometry.Point) (sharp bool, err error) {
	if len(nodes) < MinNodes {
		return false, fmt.Errorf("sourcepanel: %w: %d node(s), want at least %d", ErrTooFewNodes, len(nodes), MinNodes)
	}
	lo, hi := geometry.Point{X: math.Inf(1), Y: math.Inf(1)}, geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for i, p := range nodes {
		if !p.IsFinite() {
			return false, fmt.Errorf("sourcepanel: %w: node %d is (%g, %g)", ErrNonFinite, i, p.X, p.Y)
		}
		lo = geometry.Point{X: math.Min(lo.X, p.X), Y: math.Min(lo.Y, p.Y)}
		hi = geometry.Point{X: math.Max(hi.X, p.X), Y: math.Max(hi.Y, p.Y)}
	}
	tol := chkCoincide * hi.Sub(lo).Norm()
	n := len(nodes) - 1
	for i := range n {
		if nodes[i].Dist(nodes[i+1]) <= tol {
			return false, fmt.Errorf("sourcepanel: %w: nodes %d and %d are both (%g, %g)", ErrRepeatedNode, i, i+1, nodes[i].X, nodes[i].Y)
		}
	}
	sharp = nodes[0].Dist(nodes[n]) <= tol
	loop := nodes
	if sharp {
		loop = nodes[:n]
	}
	if i, j, ok := chkFindCrossing(loop); ok {
		return false, fmt.Errorf("sourcepanel: %w: panels %d and %d (panel k joins nodes k and k+1)", ErrCrossing, i, j)
	}
	if a := geometry.SignedArea(loop); a <= 0 {
		return false, fmt.Errorf("sourcepanel: %w: signed area %g, want > 0 (trailing edge, upper surface, leading edge, lower surface)", ErrClockwise, a)
	}
	return sharp, nil
}

// chkFindCrossing looks for two segments of the closed polygon pts (segment
// k joins pts[k] and pts[k+1 mod len]) that cross or touch, other than
// neighbours meeting at their common node. Neighbours that fold back onto
// each other count as crossing. Segments are swept in order of their least x,
// so the cost is O(m log m) plus the pairs whose x ranges overlap.
func chkFindCrossing(pts []geometry.Point) (i, j int, found bool) {
	m := len(pts)
	seg := func(k int) (geometry.Point, geometry.Point) { return pts[k], pts[(k+1)%m] }
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
			if chkSegmentsMeet(a, b, c, e) {
				return min(p, q), max(p, q), true
			}
		}
	}
	return 0, 0, false
}

// chkSegmentsMeet reports whether segments ab and cd share a point.
func chkSegmentsMeet(a, b, c, d geometry.Point) bool {
	o1 := chkOrient(a, b, c)
	o2 := chkOrient(a, b, d)
	o3 := chkOrient(c, d, a)
	o4 := chkOrient(c, d, b)
	if o1*o2 < 0 && o3*o4 < 0 {
		return true
	}
	return (o1 == 0 && chkOnSegment(a, b, c)) || (o2 == 0 && chkOnSegment(a, b, d)) ||
		(o3 == 0 && chkOnSegment(c, d, a)) || (o4 == 0 && chkOnSegment(c, d, b))
}

func chkOrient(a, b, c geometry.Point) float64 {
	v := b.Sub(a).Cross(c.Sub(a))
	switch {
	case v > 0:
		return 1
	case v < 0:
		return -1
	}
	return 0
}

// chkOnSegment reports whether p, collinear with ab, lies within its box.
func chkOnSegment(a, b, p geometry.Point) bool {
	return p.X >= math.Min(a.X, b.X) && p.X <= math.Max(a.X, b.X) &&
		p.Y >= math.Min(a.Y, b.Y) && p.Y <= math.Max(a.Y, b.Y)
}

// checkAlphas returns an error for an angle that is not finite or whose
// magnitude exceeds π/2.
func checkAlphas(alphas []float64) error {
	for i, a := range alphas {
		if math.IsNaN(a) || math.IsInf(a, 0) {
			return fmt.Errorf("sourcepanel: %w: angle %d is %g", ErrNonFinite, i, a)
		}
		if math.Abs(a) > math.Pi/2*(1+1e-15) {
			return fmt.Errorf("sourcepanel: %w: angle %d is %.6g°", ErrAlphaRange, i, a*180/math.Pi)
		}
	}
	return nil
}

// insideLoop reports whether p lies inside the closed polygon pts (even-odd rule).
func insideLoop(pts []geometry.Point, p geometry.Point) bool {
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
