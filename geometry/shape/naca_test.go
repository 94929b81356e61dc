package shape

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// Values from the NACA 4-digit equations of NACA Report 824 (Abbott, von
// Doenhoff and Stivers 1945), evaluated by hand.
func TestNACA4Equations(t *testing.T) {
	const tol = 1e-5
	n, err := ParseNACA4("0012")
	if err != nil {
		t.Fatal(err)
	}
	// Open trailing edge: 2·yt(1) = 2·0.6·0.0021 = 0.00252 (NACA Report 824 equation).
	if got := 2 * n.HalfThickness(1); math.Abs(got-0.00252) > tol {
		t.Errorf("0012 TE thickness = %.6f, want 0.00252", got)
	}
	// Maximum thickness 0.12 near x = 0.30.
	if got := 2 * n.HalfThickness(0.3); math.Abs(got-0.12) > 2e-4 {
		t.Errorf("0012 thickness at 0.3 = %.6f, want 0.1200", got)
	}
	n.SharpTE = true
	if got := n.HalfThickness(1); math.Abs(got) > 1e-12 {
		t.Errorf("closed 0012 TE half-thickness = %g, want 0", got)
	}
	c, err := ParseNACA4("2412")
	if err != nil {
		t.Fatal(err)
	}
	if yc, slope := c.CamberLine(0.4); math.Abs(yc-0.02) > 1e-12 || math.Abs(slope) > 1e-12 {
		t.Errorf("2412 camber at p = (%g, %g), want (0.02, 0)", yc, slope)
	}
	loop := c.Loop(40)
	if len(loop) != 81 || loop[40] != (geometry.Point{X: 0, Y: 0}) {
		t.Fatalf("loop: %d points, LE %v", len(loop), loop[40])
	}
	if a := geometry.SignedArea(loop); a <= 0 {
		t.Errorf("loop area %g: want counter-clockwise (positive)", a)
	}
	for _, bad := range []string{"241", "24a2", "2012", "0400", "0000"} {
		if _, err := ParseNACA4(bad); err == nil {
			t.Errorf("ParseNACA4(%q): no error", bad)
		}
	}
}

func TestNACA4NodesOddCount(t *testing.T) {
	n := NACA4{Thickness: 0.12, SharpTE: true}
	pts := n.Nodes(161)
	if len(pts) != 162 {
		t.Fatalf("%d nodes, want 162", len(pts))
	}
	if pts[81] != (geometry.Point{}) {
		t.Errorf("node 81 = %v, want the leading edge", pts[81])
	}
	if pts[0].Dist(pts[161]) > 1e-12 {
		t.Errorf("sharp trailing edge not closed: %v, %v", pts[0], pts[161])
	}
}
