package curve

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// TestEndStretch checks the spacing that may hide a blunt edge's unseen
// end (endStretch) against values calculated by hand: the spacing itself
// for evenly spaced points, and Σg²/Σg over the endSpan gaps at each end
// for stations measured two or three times a hair apart, close to the
// stations' spacing, where endSpacing's median is the hair's breadth.
func TestEndStretch(t *testing.T) {
	const tol = 1e-12
	line := func(n int, steps ...float64) []geometry.Point {
		pts := []geometry.Point{{}}
		for k := range n {
			last := pts[len(pts)-1]
			pts = append(pts, geometry.Point{X: last.X + steps[k%len(steps)]})
		}
		return pts
	}
	for _, tc := range []struct {
		name string
		pts  []geometry.Point
		want float64 // calculated by hand
	}{
		{"even", line(30, 0.02), 0.02},
		// Gaps 0.001 and 0.019 alternate, ten of each among the 20 taken:
		// (0.001² + 0.019²) / 0.02.
		{"pairs a hair apart", line(30, 0.001, 0.019), (0.001*0.001 + 0.019*0.019) / 0.02},
		// Gaps 0.001, 0.001, 0.019 repeat over 30 gaps: the first ten
		// hold seven of 0.001 and three of 0.019, the last ten (the
		// pattern read backwards from gap 30, a 0.019) six and four.
		{"triples a hair apart", line(30, 0.001, 0.001, 0.019), (13*0.001*0.001 + 7*0.019*0.019) / (13*0.001 + 7*0.019)},
	} {
		got := endStretch(tc.pts)
		if math.Abs(got-tc.want) > tol {
			t.Errorf("%s: endStretch %.6g, want %.6g", tc.name, got, tc.want)
		}
		// The median (endSpacing) of the triples is the hair's breadth:
		// the stretch that may hide an end is the stations' spacing.
		if tc.name == "triples a hair apart" && !(got > 10*endSpacing(tc.pts)) {
			t.Errorf("%s: endStretch %.6g not well above the median spacing %.6g", tc.name, got, endSpacing(tc.pts))
		}
	}
	if got := endStretch([]geometry.Point{{}, {}}); got != 0 {
		t.Errorf("two points at one place: endStretch %g, want 0", got)
	}
}
