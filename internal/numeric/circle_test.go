package numeric

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// TestFitCircle fits circles to points on exact circular arcs (exact
// geometry): the centre and radius come back to rounding, and a refinement
// started off the circle converges to it.
func TestFitCircle(t *testing.T) {
	const tol = 1e-9 // relative to the radius; exact data
	for _, tc := range []struct {
		c      geometry.Point
		r      float64
		a0, a1 float64 // arc, radians
	}{
		{geometry.Point{X: 0, Y: 0}, 1, 0, 2 * math.Pi},
		{geometry.Point{X: 412.3, Y: -118.9}, 0.6, 0.3, 2.1},
		{geometry.Point{X: 0.0071, Y: 0.0002}, 0.0071, 2.5, 3.8},
	} {
		var pts []geometry.Point
		for k := range 41 {
			a := tc.a0 + (tc.a1-tc.a0)*float64(k)/40
			pts = append(pts, tc.c.Add(geometry.Point{X: math.Cos(a), Y: math.Sin(a)}.Scale(tc.r)))
		}
		c, r, rms, ok := FitCircle(pts)
		if !ok || c.Dist(tc.c) > tol*tc.r || math.Abs(r-tc.r) > tol*tc.r || rms > tol*tc.r {
			t.Errorf("circle %v r %g: got %v r %g rms %g ok %v", tc.c, tc.r, c, r, rms, ok)
		}
		c, r = RefineCircle(pts, tc.c.Add(geometry.Point{X: 0.1 * tc.r, Y: -0.05 * tc.r}), 1.2*tc.r)
		if c.Dist(tc.c) > tol*tc.r || math.Abs(r-tc.r) > tol*tc.r {
			t.Errorf("refine %v r %g: got %v r %g", tc.c, tc.r, c, r)
		}
	}
	line := []geometry.Point{{X: 0, Y: 0}, {X: 1, Y: 1}, {X: 2, Y: 2}, {X: 3, Y: 3}}
	if _, _, _, ok := FitCircle(line); ok {
		t.Error("points on a line gave a circle")
	}
	if _, _, _, ok := FitCircle(line[:2]); ok {
		t.Error("two points gave a circle")
	}
}
