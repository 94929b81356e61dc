package shape

import (
	"math"
	"testing"
)

// The 230 mean line of NACA Report 824 (m = 0.2025, k₁ = 15.957) has its
// maximum camber at 15 % of the chord, 0.0184 c there (calculated by hand
// from the report's constants); it and the reflexed 231 line run from
// (0, 0) to (1, 0) with continuous value and slope at m, and the reflexed
// line ends with a slope nearer zero than the plain one (the reflex).
func TestNACA5MeanLine(t *testing.T) {
	plain := NACA5{L: 2, P: 3}
	yc, dy := plain.CamberLine(0.15)
	if math.Abs(dy) > 1e-3 || math.Abs(yc-0.01839) > 2e-4 {
		t.Errorf("230 line at x = 0.15: yc %.5f slope %.2g, want 0.0184 and 0", yc, dy)
	}
	for _, s := range []NACA5{plain, {L: 2, P: 3, Reflex: true}, {L: 2, P: 5}, {L: 3, P: 2, Reflex: true}} {
		y0, _ := s.CamberLine(0)
		y1, _ := s.CamberLine(1)
		if math.Abs(y0) > 1e-12 || math.Abs(y1) > 1e-12 {
			t.Errorf("%+v: ends at %g and %g, want 0", s, y0, y1)
		}
		m := naca5Lines[s.P].m
		if s.Reflex {
			m = naca5Lines[s.P].rm
		}
		a, da := s.CamberLine(m - 1e-9)
		b, db := s.CamberLine(m + 1e-9)
		if math.Abs(a-b) > 1e-8 || math.Abs(da-db) > 1e-6 {
			t.Errorf("%+v: jumps at m = %g: %g → %g, slope %g → %g", s, m, a, b, da, db)
		}
	}
	_, endPlain := plain.CamberLine(1)
	_, endReflex := NACA5{L: 2, P: 3, Reflex: true}.CamberLine(1)
	if !(math.Abs(endReflex) < math.Abs(endPlain)) {
		t.Errorf("trailing-edge slope: reflexed %g, plain %g", endReflex, endPlain)
	}
}
