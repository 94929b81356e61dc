package frame

import (
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// A section turned round (its nose pointing +x) has a twist of 180°, never
// −180°: twists lie in (−180°, 180°].
func TestTwistRange(t *testing.T) {
	for _, tc := range []struct {
		le, te geometry.Point
		want   float64
	}{
		{geometry.Point{X: 1}, geometry.Point{}, 180},
		{geometry.Point{X: 1, Y: 1e-300}, geometry.Point{}, 180},
		{geometry.Point{}, geometry.Point{X: 1}, 0},
		{geometry.Point{}, geometry.Point{Y: -1}, 90},
	} {
		if got := fromEdges(tc.le, tc.te, false).TwistDeg; got != tc.want && !(got == 0 && tc.want == 0) {
			t.Errorf("leading edge %v, trailing edge %v: twist %v, want %v", tc.le, tc.te, got, tc.want)
		}
	}
}
