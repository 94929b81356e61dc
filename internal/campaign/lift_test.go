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
			// The tail put back on the truth where it already lies:
			// nothing changes (nodes moved by rounding only).
			if lf.ClErrTail == nil || math.Abs(*lf.ClErrTail-lf.ClErr) > 1e-4 {
				t.Errorf("ClErrTail %v, ClErr %.3e", lf.ClErrTail, lf.ClErr)
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

// ClErrTail puts the last 3 % of the chord back on the true outline. A
// perfect section keeps only the solver's error there. A section whose
// tail is turned up as a plain flap over its last 1.5 % (the hinge at
// x = 0.985, nodes aft of it raised by δ·(x − 0.985), δ = 0.02 rad) loses
// lift as thin-aerofoil theory has it for a flap of chord share E,
//
//	ΔCl = −2 (π − θ_h + sin θ_h) δ,  cos θ_h = 2E − 1
//
// (Abbott, I. H. and von Doenhoff, A. E., Theory of Wing Sections, Dover,
// 1959, section 4.3), about −0.0195 here; ClErr sees it and ClErrTail,
// with the tail back on the truth, does not.
func TestLiftTail(t *testing.T) {
	c := caseOf(t, 1, func(s scangen.Spec) bool { return s.Category == "lift" && s.Shape.KT.CentreY > 0.05 })
	tr := c.Scan.Truth
	const hinge, delta = 0.985, 0.02
	for _, tc := range []struct {
		name string
		flap bool
	}{{"perfect", false}, {"flap", true}} {
		t.Run(tc.name, func(t *testing.T) {
			sec, err := decodeSection(perfectDoc(t, c, LiftPanels, func(d map[string]any) {
				if !tc.flap {
					return
				}
				nodes := d["nodes"].([][2]float64)
				for i, q := range nodes {
					if q[0] > hinge {
						nodes[i][1] += delta * (q[0] - hinge)
					}
				}
			}))
			if err != nil {
				t.Fatal(err)
			}
			lf := liftCheck(c.Spec, tr, sec)
			if lf.Err != "" || lf.ClErrTail == nil {
				t.Fatalf("%+v", lf)
			}
			tail := *lf.ClErrTail
			t.Logf("Cl error %.3e, with the tail exact %.3e", lf.ClErr, tail)
			// Measured 1.7e-4 at most for the perfect section (the
			// solver's own error), rounded up.
			if math.Abs(tail) > 1e-3 {
				t.Errorf("with the tail exact, Cl error %.3e", tail)
			}
			if !tc.flap {
				if math.Abs(lf.ClErr-tail) > 1e-4 {
					t.Errorf("perfect section: ClErr %.3e and ClErrTail %.3e differ", lf.ClErr, tail)
				}
				return
			}
			thetaH := math.Acos(2*(1-hinge) - 1)
			want := -2 * (math.Pi - thetaH + math.Sin(thetaH)) * delta
			flow := newKTFlow(*c.Spec.Shape.KT, tr.Section.Shape)
			got := lf.ClErr * flow.cl(LiftAlphaDeg*math.Pi/180)
			t.Logf("flap: ΔCl %.4f, thin-aerofoil theory %.4f", got, want)
			// Thin-aerofoil theory for a short flap on a thick section:
			// measured 3 % apart (−0.0200 against −0.0195); within 10 %,
			// our choice.
			if got > 0.9*want || got < 1.1*want {
				t.Errorf("flap: ΔCl %.4f, thin-aerofoil theory %.4f", got, want)
			}
		})
	}
}
