package curve

import (
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

func TestFitBandFeetTogether(t *testing.T) {
	// A band's points carry their positions along the loop (Contour.Along),
	// and points that lie across the band from each other share one:
	// every tenth point here is moved to 0.03 mm across the outline from
	// the point before it, at the same position along. The fit must
	// still solve (it failed "spline system not positive definite" when
	// their parameter step was 1e-12) and stay within 0.0005 chord of the
	// analytic contour (NACA Report 824 equations) away from the open
	// trailing edge's ends, as TestFitNoiseMatchesRMS holds points spread
	// along.
	n, _ := shape.ParseNACA4("2412")
	part := testfoil.Part{Chord: 152.4, RotDeg: 7, Shift: geometry.Point{X: 37, Y: -12}, Noise: 0.02, Seed: 11}
	c := testfoil.Contour(testfoil.Loop(n, 400), part)
	c.Along = make([]float64, c.Len())
	for i := 1; i < c.Len(); i++ {
		if i%10 == 0 && i+1 < c.Len() {
			d := c.Points[i+1].Sub(c.Points[i-2])
			across := geometry.Point{X: d.Y, Y: -d.X}.Scale(0.03 / d.Norm())
			c.Points[i] = c.Points[i-1].Add(across)
			c.Along[i] = c.Along[i-1]
			continue
		}
		c.Along[i] = c.Along[i-1] + c.Points[i].Dist(c.Points[i-1])
	}
	cv, _, err := Fit(c, FitOptions{Noise: 0.02})
	if err != nil {
		t.Fatal(err)
	}
	fp := newFitPoints(c.Points, onesOf(c.Len()), c.Along, true, false)
	for i := 1; i < len(fp.ts); i++ {
		if step, chord := fp.ts[i]-fp.ts[i-1], fp.pts[i].Dist(fp.pts[i-1]); step < minStep*chord*(1-1e-9) {
			t.Fatalf("parameter step %d is %.3g, less than %g of its chord %.3g", i, step, minStep, chord)
		}
	}
	dense := testfoil.Dense(n)
	for i := range dense {
		dense[i] = part.ToPart(dense[i])
	}
	L := cv.Length()
	if d := testfoil.MaxDist(cv.Sub(0.005*L, 0.995*L).Samples(6000), dense); d > 0.001*152.4/2 {
		t.Errorf("curve departs %.4f mm from the analytic contour", d)
	} else {
		t.Logf("curve departs %.4f mm from the analytic contour", d)
	}
}

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

func onesOf(n int) []float64 {
	ws := make([]float64, n)
	for i := range ws {
		ws[i] = 1
	}
	return ws
}
