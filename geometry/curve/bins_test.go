package curve

import (
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

func TestFitBinsNoisierThanGiven(t *testing.T) {
	// 20000 points with 0.01 mm noise (NACA 2412, 152.4 mm chord), fitted
	// through bins with a noise given four times too small: the bins
	// scatter by far more than that noise over √count, and the fit takes
	// their measured scatter for their noise rather than following it.
	// The curve keeps no wiggles of noise and stays within 0.01 mm of the
	// analytic contour (NACA Report 824 equations) away from its pinned
	// ends, as with no noise given (TestFitDenseBinned).
	n, _ := shape.ParseNACA4("2412")
	part := testfoil.Part{Chord: 152.4, RotDeg: 7, Shift: geometry.Point{X: 37, Y: -12}, Noise: 0.01, Seed: 8}
	c := testfoil.Contour(testfoil.Loop(n, 10000), part)
	cv, rep, err := Fit(c, FitOptions{Noise: 0.0025})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Fairness.Wiggles > 0 {
		t.Errorf("%d wiggles of the curvature left in the curve", rep.Fairness.Wiggles)
	}
	dense := testfoil.Dense(n)
	for i := range dense {
		dense[i] = part.ToPart(dense[i])
	}
	L := cv.Length()
	if d := testfoil.MaxDist(cv.Sub(0.005*L, 0.995*L).Samples(6000), dense); d > 0.01 {
		t.Errorf("curve departs %.4f mm from the analytic contour", d)
	}
	t.Logf("smoothing %.3g, wiggles %d, roughness %.3g", rep.Smoothing, rep.Fairness.Wiggles, rep.Fairness.Roughness)
}
