package campaign

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/scangen"
	"github.com/foilwright/foilwright/plugins/builtin/vortexpanel"
)

// Exact: the Kármán–Trefftz flow of this package (Milne-Thomson, by
// conformal mapping) against the vortex-panel solver on the exact outline
// at 400 panels, which its own package tests against the same solution:
// Cl within 0.2 %, Cp RMS within 0.005 for x < 0.95 (measured about 1e-4
// and 1e-3, rounded up).
func TestExactFlow(t *testing.T) {
	for _, k := range []scangen.KTSpec{
		{CentreX: -0.08, CentreY: 0.06, TEAngleDeg: 12},
		{CentreX: -0.15, TEAngleDeg: 3},
	} {
		sec, err := scangen.ShapeSpec{Family: scangen.FamilyKT, KT: &k}.Build()
		if err != nil {
			t.Fatal(err)
		}
		sh := sec.Shape
		const panels = 400
		nodes := make([]geometry.Point, panels+1)
		for i := range nodes {
			nodes[i] = sh.At(2 * float64(i) / panels)
		}
		sv, err := vortexpanel.New(nodes)
		if err != nil {
			t.Fatal(err)
		}
		flow := newKTFlow(k, sh)
		for _, deg := range []float64{-2, 4, 8} {
			a := deg * math.Pi / 180
			cs, err := sv.Solve([]float64{a})
			if err != nil {
				t.Fatal(err)
			}
			if e := math.Abs(cs[0].Cl/flow.cl(a) - 1); e > 2e-3 {
				t.Errorf("%+v at %g°: Cl %.5f, exact %.5f", k, deg, cs[0].Cl, flow.cl(a))
			}
			var sum float64
			var n int
			for i, p := range nodes {
				if p.X >= 0.95 {
					continue
				}
				phi, _ := sh.CircleAngle(2 * float64(i) / panels)
				d := cs[0].Cp[i] - flow.cp(phi, a)
				sum += d * d
				n++
			}
			if rms := math.Sqrt(sum / float64(n)); rms > 5e-3 {
				t.Errorf("%+v at %g°: Cp RMS error %.3g", k, deg, rms)
			}
		}
	}
}

// The lift check of a section that is the truth finds only the solver's
// own error, in any orientation, and also when a symmetric section comes
// back with the other mirror flag (its lift then points the other way in
// its own frame).
func TestLiftCheckPerfect(t *testing.T) {
	check := func(name string, c *Case, edit func(map[string]any)) {
		t.Run(name, func(t *testing.T) {
			sec, err := decodeSection(perfectDoc(t, c, LiftPanels, edit))
			if err != nil {
				t.Fatal(err)
			}
			lf := liftCheck(c.Spec, c.Scan.Truth, sec)
			t.Logf("Cl error %.2e (true frame %.2e), Cp RMS %.2e", lf.ClErr, lf.ClErrFrame, lf.CpRMS)
			// Measured 1.7e-4 and 2.7e-4 at most, rounded up.
			if lf.Err != "" || math.Abs(lf.ClErr) > 1e-3 || math.Abs(lf.ClErrFrame) > 1e-3 || lf.CpRMS > 2e-3 {
				t.Errorf("%+v", lf)
			}
		})
	}
	lift := func(s scangen.Spec) bool { return s.Category == "lift" }
	check("cambered", caseOf(t, 1, func(s scangen.Spec) bool { return lift(s) && s.Shape.KT.CentreY > 0.05 }), nil)
	check("upside down", caseOf(t, 1, func(s scangen.Spec) bool {
		return lift(s) && s.Shape.KT.CentreY > 0 && s.Placement.Orientation == "upside-down"
	}), nil)
	sym := caseOf(t, 1, func(s scangen.Spec) bool { return lift(s) && s.Shape.KT.CentreY == 0 })
	check("symmetric", sym, nil)
	tr := sym.Scan.Truth
	check("symmetric, other mirror flag", sym, func(d map[string]any) {
		f := d["frame"].(map[string]any)
		f["mirrored"], f["twist_deg"] = !tr.Mirrored, -tr.TwistDeg-180
	})
}
