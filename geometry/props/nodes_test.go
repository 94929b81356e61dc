package props

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/shape"
)

func TestNodeCurveProperties(t *testing.T) {
	// Leading-edge radius of a NACA 4-digit section: 1.1019 t² (NACA Report
	// 824); maximum thickness t at x = 0.30 (NACA Report 824).
	for _, sharp := range []bool{false, true} {
		nodes := shape.NACA4{Thickness: 0.12, SharpTE: sharp}.Nodes(160)
		cv, sle, err := curve.NodeCurve(nodes)
		if err != nil {
			t.Fatal(err)
		}
		if le := cv.At(sle); le.Norm() > 1e-9 {
			t.Errorf("sharp=%v: leading edge at %v, want (0, 0)", sharp, le)
		}
		pr, _, err := Compute(cv, sle, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if want := 1.1019 * 0.12 * 0.12; math.Abs(pr.LERadius-want)/want > 0.02 {
			t.Errorf("sharp=%v: LE radius %.5f, want %.5f within 2%%", sharp, pr.LERadius, want)
		}
		if math.Abs(pr.Thickness-0.12) > 5e-4 || math.Abs(pr.ThicknessAt-0.30) > 0.01 {
			t.Errorf("sharp=%v: thickness %.4f at %.3f, want 0.120 at 0.30", sharp, pr.Thickness, pr.ThicknessAt)
		}
	}
	if _, _, err := curve.NodeCurve([]geometry.Point{{X: 1, Y: 0}, {X: 0, Y: 0}, {X: 1, Y: 0}}); err == nil {
		t.Error("three nodes: no error")
	}
}
