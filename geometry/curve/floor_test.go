package curve

import (
	"testing"

	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

// Noise-free points (a CAD export of a NACA 2412, NACA Report 824
// equations, 200 mm chord) leave residuals of round-off size; none of them
// is listed as far from the curve, and the tolerance is at least the
// floor (the perimeter is about 406 mm).
func TestToleranceFloorNoiseFree(t *testing.T) {
	n, _ := shape.ParseNACA4("2412")
	for _, per := range []int{60, 150, 400} {
		c := testfoil.Contour(testfoil.Loop(n, per), testfoil.Part{Chord: 200, RotDeg: 3})
		_, rep, err := Fit(c, FitOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if len(rep.Beyond) > 0 || rep.Tolerance < ToleranceFloor*400 {
			t.Errorf("%d points per surface: %d listed (tolerance %.3g, RMS %.3g, max %.3g), warnings %q", per, len(rep.Beyond), rep.Tolerance, rep.RMS, rep.Max, rep.Warnings)
		}
	}
}
