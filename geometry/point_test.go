package geometry

import (
	"math"
	"testing"
)

// TestMajorAxis checks MajorAxis against exact values: points on the line
// y = 2x + 1 have their mean as centroid and the line's direction
// (1, 2)/√5 as axis (up to sign); points spread more along y than along x
// about a centre have the y axis as their major axis.
func TestMajorAxis(t *testing.T) {
	var line []Point
	for _, x := range []float64{-1, 0, 0.5, 2, 3.5} {
		line = append(line, Point{X: x, Y: 2*x + 1})
	}
	c, d := MajorAxis(line)
	if want := (Point{X: 1, Y: 3}); c.Dist(want) > 1e-12 {
		t.Errorf("centroid %v, want %v", c, want)
	}
	if math.Abs(math.Abs(d.Dot(Point{X: 1, Y: 2}.Scale(1/math.Sqrt(5))))-1) > 1e-12 || math.Abs(d.Norm()-1) > 1e-12 {
		t.Errorf("axis %v, want ±(1, 2)/√5", d)
	}
	cross := []Point{{X: 4.5, Y: 7}, {X: 5.5, Y: 7}, {X: 5, Y: 4}, {X: 5, Y: 10}}
	c, d = MajorAxis(cross)
	if c.Dist(Point{X: 5, Y: 7}) > 1e-12 || math.Abs(math.Abs(d.Y)-1) > 1e-12 {
		t.Errorf("cross: centroid %v axis %v, want (5, 7) and ±(0, 1)", c, d)
	}
}

// SegmentFoot: the foot inside the segment is the perpendicular's, beyond
// either end the end itself, and a segment of no length is its point.
func TestSegmentFoot(t *testing.T) {
	a, b := Point{1, 1}, Point{5, 1}
	for _, tc := range []struct{ p, want Point }{
		{Point{3, 4}, Point{3, 1}},
		{Point{-2, 0}, a},
		{Point{9, -3}, b},
	} {
		if got := SegmentFoot(tc.p, a, b); got.Dist(tc.want) > 1e-15 {
			t.Errorf("SegmentFoot(%v) = %v, want %v", tc.p, got, tc.want)
		}
	}
	if got := SegmentFoot(Point{7, 7}, a, a); got != a {
		t.Errorf("foot on a point segment %v, want %v", got, a)
	}
}
