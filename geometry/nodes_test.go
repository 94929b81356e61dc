package geometry

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

func TestNodeCurveProperties(t *testing.T) {
	// Leading-edge radius of a NACA 4-digit section: 1.1019 t² (NACA Report
	// 824); maximum thickness t at x = 0.30 (NACA Report 824).
	for _, sharp := range []bool{false, true} {
		nodes := NACA4{Thickness: 0.12, SharpTE: sharp}.Nodes(160)
		cv, sle, err := NodeCurve(nodes)
		if err != nil {
			t.Fatal(err)
		}
		if le := cv.At(sle); le.Norm() > 1e-9 {
			t.Errorf("sharp=%v: leading edge at %v, want (0, 0)", sharp, le)
		}
		pr, _, err := ComputeProperties(cv, sle, PropertyOptions{})
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
	if _, _, err := NodeCurve([]Point{{1, 0}, {0, 0}, {1, 0}}); err == nil {
		t.Error("three nodes: no error")
	}
}

func TestWriteNodes(t *testing.T) {
	var b bytes.Buffer
	if err := WriteNodes(&b, "NACA 0012", []Point{{1, 0}, {0.5, 0.06}, {0, 0}}); err != nil {
		t.Fatal(err)
	}
	if got, want := b.String(), "NACA 0012\n1 0\n0.5 0.06\n0 0\n"; got != want {
		t.Errorf("got %q, want %q", got, want)
	}
	if err := WriteNodes(&b, "x", []Point{{math.Inf(1), 0}}); err == nil || !strings.Contains(err.Error(), "not finite") {
		t.Errorf("infinite node: err = %v", err)
	}
}
