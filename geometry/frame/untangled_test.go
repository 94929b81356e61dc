package frame

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/testfoil"
)

// TestNormalizeUntangledDistance checks that a section whose surfaces
// cross ahead of its sharp corner says how far the edge was moved
// (Normalized.Untangled), the distance package accuracy adds to the
// chord's bound. The outline is made so (calculated by hand): half
// thickness h(x) = 0.3 √x (1 − x)(xc − x), upper surface at +h, lower at
// −h, so the surfaces cross at x = xc and meet again at the corner x = 1;
// the crossing lies (1 − xc) chords ahead of the corner. Without the
// crossing (xc = 1) nothing is moved.
func TestNormalizeUntangledDistance(t *testing.T) {
	const chord = 100.0
	const tol = 0.1 // share of the distance; the cut lands on the fitted curve's crossing
	for _, xc := range []float64{1, 0.985, 0.97} {
		h := func(x float64) float64 { return 0.3 * math.Sqrt(x) * (1 - x) * (xc - x) }
		const n = 200
		var loop []geometry.Point
		for k := 0; k <= n; k++ { // trailing edge over the upper surface to the nose
			x := (1 + math.Cos(math.Pi*float64(k)/n)) / 2
			loop = append(loop, geometry.Point{X: x, Y: h(x)})
		}
		for k := n - 1; k >= 0; k-- { // and back along the lower one
			x := (1 + math.Cos(math.Pi*float64(k)/n)) / 2
			loop = append(loop, geometry.Point{X: x, Y: -h(x)})
		}
		c := testfoil.Contour(loop, testfoil.Part{Chord: chord, RotDeg: 5})
		nz := normalizeExact(t, c)
		want := (1 - xc) * chord
		t.Logf("crossing at x = %g: Untangled %.4g, want %.4g", xc, nz.Untangled, want)
		if math.Abs(nz.Untangled-want) > tol*math.Max(want, 1) {
			t.Errorf("crossing at x = %g: Untangled %.4g, want %.4g (warnings %q)", xc, nz.Untangled, want, nz.Warnings)
		}
	}
}
