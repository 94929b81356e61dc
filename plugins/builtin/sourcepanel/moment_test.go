package sourcepanel

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// ellipse returns an ellipse of chord 1 about (0.5, 0) with thickness ratio
// tk in node order, starting at (1, 0), with `panels` panels uniform in the
// parametric angle.
func ellipse(tk float64, panels int) []geometry.Point {
	pts := make([]geometry.Point, panels+1)
	for k := range pts {
		s, c := math.Sincos(2 * math.Pi * float64(k) / float64(panels))
		pts[k] = geometry.Point{X: 0.5 + 0.5*c, Y: 0.5 * tk * s}
	}
	pts[panels] = pts[0]
	return pts
}

// Exact: an elliptic cylinder of semi-axes a (along x) and b in a uniform
// stream without circulation feels no force but the moment
// M = −½πρV²(a² − b²) sin 2α, counter-clockwise (Blasius theorem with the
// Joukowski map; Milne-Thomson, Theoretical Hydrodynamics, 5th ed., 1968,
// ch. 6). With chord 2a this is the nose-up Cm = (π/4)(1 − (b/a)²) sin 2α
// about any point, (0.25, 0) included. Measured, largest error over the
// angles: 6.5e-5 and 8.2e-5 at 128 panels (12% and 30% thick), 1.6e-5 and
// 2.1e-5 at 256, falling by 4 per doubling; the bound at 128 panels is the
// largest error rounded up, and the error must at least halve at 256.
func TestMomentEllipse(t *testing.T) {
	const cmTol = 2e-4 // absolute, at 128 panels
	alphas := []float64{-8, 0, 4, 12}
	for i := range alphas {
		alphas[i] *= math.Pi / 180
	}
	for _, tk := range []float64{0.12, 0.3} {
		var worst [2]float64
		for p, panels := range []int{128, 256} {
			_, cs := solve(t, ellipse(tk, panels), alphas...)
			for i, c := range cs {
				exact := math.Pi / 4 * (1 - tk*tk) * math.Sin(2*alphas[i])
				worst[p] = math.Max(worst[p], math.Abs(c.Cm-exact))
				if alphas[i] == 0 && math.Abs(c.Cm) > 1e-12 {
					t.Errorf("ellipse %g, %d panels, α = 0: Cm %g, want 0", tk, panels, c.Cm)
				}
			}
		}
		t.Logf("ellipse t/c = %g: largest Cm error %.2e at 128 panels, %.2e at 256", tk, worst[0], worst[1])
		if worst[0] > cmTol {
			t.Errorf("ellipse %g: Cm error %.3g at 128 panels > %g", tk, worst[0], cmTol)
		}
		if worst[1] > worst[0]/2 {
			t.Errorf("ellipse %g: Cm error %.3g at 256 panels did not halve from %.3g", tk, worst[1], worst[0])
		}
	}
}

// A symmetric section at 0° has no moment by symmetry; at ±α the moments
// are opposite.
func TestMomentSymmetricSection(t *testing.T) {
	n, err := shape.ParseNACA4("0012")
	if err != nil {
		t.Fatal(err)
	}
	n.SharpTE = true
	_, cs := solve(t, n.Loop(80), -0.1, 0, 0.1)
	t.Logf("NACA 0012, 160 panels: Cm(−0.1) = %.4f, Cm(0) = %.1e, Cm(0.1) = %.4f", cs[0].Cm, cs[1].Cm, cs[2].Cm)
	if math.Abs(cs[1].Cm) > 1e-12 || math.Abs(cs[0].Cm+cs[2].Cm) > 1e-12 || cs[2].Cm <= 0 {
		t.Errorf("NACA 0012: Cm(−0.1) = %g, Cm(0) = %g, Cm(0.1) = %g; want 0 at 0°, opposite and nose-up at +α", cs[0].Cm, cs[1].Cm, cs[2].Cm)
	}
}
