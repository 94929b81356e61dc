package props

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/shape"
)

// The leading-edge radius of exact NACA 4-digit outlines (the Report 824
// equations at 8001 cosine-spaced nodes, interpolated), read as noise of
// 0.02 mm at a 152 mm chord would have it read (the window widened to
// its largest): the radius of curvature of the outline at the leading
// edge (the chord convention's point) is the truth, and for the
// symmetric section it is NACA Report 824's 1.1019 t². The circle over
// the widened arc read these +2 % (0012) to +18 % (6606, whose curvature
// changes fast round the nose). Measured: without noise within 0.2 % of
// the truth on all five; with the widest window +0.9 % (0012), +0.5 %
// (2412), +0.7 % (4424), 0 % (6606) and −1.4 % (6209, 6 % camber at 20 %
// of the chord); the form with the corner searched apart from the axis
// read +1.5 %, −0.3 %, 0 %, −0.7 % and −3.8 %.
func TestLERadiusExactNoses(t *testing.T) {
	for _, n := range []shape.NACA4{
		{Thickness: 0.12, SharpTE: true},
		{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true},
		{Camber: 0.04, CamberPos: 0.4, Thickness: 0.24, SharpTE: true},
		{Camber: 0.06, CamberPos: 0.6, Thickness: 0.06, SharpTE: true},
		{Camber: 0.06, CamberPos: 0.2, Thickness: 0.09, SharpTE: true},
	} {
		nz, err := frame.Normalize(curve.Interpolate(n.Nodes(8000), false), frame.Options{})
		if err != nil {
			t.Fatal(err)
		}
		c := nz.Path.(*curve.Curve)
		truth := 1 / c.Curvature(nz.SLE)
		for _, noise := range []float64{0, 0.02 / 152} {
			sp, _, err := Compute(c, nz.SLE, Options{Noise: noise})
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("NACA %s, noise %.2g c: LE radius %.5f, truth %.5f (%.4f), 1.1019 t² %.5f", n, noise, sp.LERadius, truth, sp.LERadius/truth, 1.1019*n.Thickness*n.Thickness)
			tol := 0.005
			if noise > 0 {
				tol = 0.02
			}
			if math.Abs(sp.LERadius/truth-1) > tol {
				t.Errorf("NACA %s, noise %.2g c: LE radius %.5f, want the outline's radius of curvature %.5f within %.1f %%", n, noise, sp.LERadius, truth, 100*tol)
			}
			if n.Camber == 0 {
				// NACA Report 824: leading-edge radius 1.1019 t².
				if want := 1.1019 * n.Thickness * n.Thickness; math.Abs(sp.LERadius/want-1) > math.Max(tol, 0.02) {
					t.Errorf("NACA %s, noise %.2g c: LE radius %.5f, want %.5f (1.1019 t², NACA Report 824) within %.1f %%", n, noise, sp.LERadius, want, 100*math.Max(tol, 0.02))
				}
			}
		}
	}
}
