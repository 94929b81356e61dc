package vortexpanel

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/dense"
	"gonum.org/v1/gonum/mat"
)

// A buildPath is a way the influence matrix can be built: the Go
// formulas (the portable path, the only one off amd64 or with the purego
// tag), the four-lane assembly rows (AVX2) or the eight-lane ones
// (AVX-512).
type buildPath struct {
	name        string
	asm, asm512 bool
}

// buildPaths returns the build paths this CPU runs, the portable one first.
func buildPaths() []buildPath {
	p := []buildPath{{name: "Go formulas"}}
	if haveAVX2 {
		p = append(p, buildPath{name: "AVX2 rows", asm: true})
	}
	if haveAVX512 {
		p = append(p, buildPath{name: "AVX-512 rows", asm: true, asm512: true})
	}
	return p
}

// use makes the build take path b until the returned function restores
// the previous one.
func (b buildPath) use() (restore func()) {
	a, a512 := useAsm, use512
	useAsm, use512 = b.asm, b.asm512
	return func() { useAsm, use512 = a, a512 }
}

// referenceCases solves the section with the influence matrix (built by
// path b) factored by gonum's mat.LU, a general-purpose reference library.
func referenceCases(t *testing.T, nodes []geometry.Point, alphas []float64, b buildPath) ([]Case, float64) {
	t.Helper()
	defer b.use()()
	sv, err := New(nodes)
	if err != nil {
		t.Fatal(err)
	}
	m := sv.size()
	var lu mat.LU
	lu.Factorize(mat.NewDense(m, m, sv.build(1)))
	var x mat.Dense
	if err := lu.SolveTo(&x, false, mat.NewDense(m, 2, sv.rhs())); err != nil {
		t.Fatal(err)
	}
	cases := make([]Case, len(alphas))
	for k, alpha := range alphas {
		sa, ca := math.Sincos(alpha)
		v := make([]float64, m)
		for i := range v {
			v[i] = ca*x.At(i, 0) + sa*x.At(i, 1)
		}
		c := sv.result(alpha, v, make([]float64, sv.n+1))
		// The coefficients from this solution, panel by panel (result
		// takes them from the solver's own solutions for 0 and 90°).
		c.Cl, c.ClPressure, c.CdPressure, c.Cm = integrate(sv, alpha, v)
		c.ClDiff = c.Cl - c.ClPressure
		cases[k] = c
	}
	return cases, lu.Cond()
}

// integrate returns Cl (Kutta–Joukowski), the lift and pressure drag from
// the surface pressure and Cm about c/4 of the solution γ = v[:n+1] at α,
// integrating Cp = 1 − γ² panel by panel, γ linear on each panel: the
// exact integrals ∫Cp ds = s(1 − (a² + ab + b²)/3) and ∫Cp·ξ ds =
// s²(1/2 − (a²/12 + ab/6 + b²/4)), a and b the panel's end values.
func integrate(sv *Solver, alpha float64, v []float64) (cl, clp, cdp, cm float64) {
	var circ, fx, fy float64
	for j := range sv.n {
		s, a, b := sv.s[j], v[j], v[j+1]
		circ += 0.5 * s * (a + b)
		icp := s * (1 - (a*a+a*b+b*b)/3)
		ixcp := s * s * (0.5 - (a*a/12 + a*b/6 + b*b/4))
		nx, ny := sv.ty[j], -sv.tx[j]
		fx -= icp * nx
		fy -= icp * ny
		rx, ry := sv.x0[j]-0.25, sv.y0[j]
		cm += (rx*ny-ry*nx)*icp - ixcp
	}
	sa, ca := math.Sincos(alpha)
	return -2 * circ, fy*ca - fx*sa, fx*ca + fy*sa, cm
}

// TestSweepForms checks the coefficients Solve takes from the quadratic
// forms (sweepForms) against the pressure integrated panel by panel from
// each angle's own γ, on a sharp, a blunt and a cusped section over the
// whole range of angles.
func TestSweepForms(t *testing.T) {
	kt, err := shape.KarmanTrefftz{Centre: geometry.Point{X: -0.08, Y: 0.06}}.Normalized(160)
	if err != nil {
		t.Fatal(err)
	}
	sections := map[string][]geometry.Point{
		"sharp": shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Nodes(201),
		"blunt": shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.15}.Nodes(161),
		"cusp":  kt,
	}
	var alphas []float64
	for d := -30.0; d <= 30; d += 2.5 {
		alphas = append(alphas, d*math.Pi/180)
	}
	for name, nodes := range sections {
		sv, err := New(nodes)
		if err != nil {
			t.Fatal(err)
		}
		cases, err := sv.Solve(alphas)
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range cases {
			cl, clp, cdp, cm := integrate(sv, c.Alpha, c.x0)
			for _, q := range []struct {
				what      string
				got, want float64
			}{{"Cl", c.Cl, cl}, {"ClPressure", c.ClPressure, clp}, {"CdPressure", c.CdPressure, cdp}, {"Cm", c.Cm, cm}} {
				// Absolute, on the scale of the coefficients (Cl is up to
				// about 3 here; Cd and Cl at α = 0 of a symmetric section
				// are rounding).
				if d := math.Abs(q.got - q.want); d > 1e-12 {
					t.Errorf("%s, α %.1f°: %s %.15g, integrated %.15g (%.2g)", name, c.Alpha*180/math.Pi, q.what, q.got, q.want, d)
				}
			}
		}
	}
}

// TestPathsAgree checks that the results do not depend on how the system
// is built and solved: the factorisation by every path of package dense
// this build offers (pure Go, AVX2 kernels, AVX-512 kernels, OpenBLAS with
// -tags openblas) against the reference of gonum's mat.LU, with the matrix
// built by every build path (the Go formulas, which every CPU runs, the
// four-lane AVX2 rows and the eight-lane AVX-512 rows where the CPU has
// them; the same matrix: TestBuildMatchesScalar, TestBuild512MatchesAVX2),
// each pair of paths in turn, against the reference built by the Go
// formulas. The purego build tag runs the Go paths alone. Cl, Cm
// agree to 1e-10, relative; Cp, relative to its largest magnitude, to
// 1e-10 or 4κε if larger (κ the condition number); the condition estimates
// agree.
func TestPathsAgree(t *testing.T) {
	kt, err := shape.KarmanTrefftz{Centre: geometry.Point{X: -0.08, Y: 0.06}}.Normalized(160)
	if err != nil {
		t.Fatal(err)
	}
	naca := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	blunt := shape.NACA4{Camber: 0.04, CamberPos: 0.4, Thickness: 0.15}
	sections := []struct {
		name  string
		nodes []geometry.Point
	}{
		{"sharp 100", naca.Nodes(100)},
		{"sharp 161", naca.Nodes(161)},
		{"sharp 400", naca.Nodes(400)},
		{"blunt 400", blunt.Nodes(400)},
		{"cusp 160", kt},
	}
	if testing.Short() {
		sections = sections[:2]
	}
	alphas := []float64{-0.15, 0, 0.07, 0.2}
	for _, sec := range sections {
		// The reference: the portable build, factored by gonum.
		want, wantCond := referenceCases(t, sec.nodes, alphas, buildPaths()[0])
		for _, bp := range buildPaths() {
			for _, p := range dense.Paths() {
				func() {
					defer dense.Use(p)()
					defer bp.use()()
					sv, err := New(sec.nodes)
					if err != nil {
						t.Fatal(err)
					}
					got, err := sv.Solve(alphas)
					if err != nil {
						t.Fatal(err)
					}
					if c := sv.Cond(); math.Abs(c-wantCond) > 1e-6*wantCond {
						t.Errorf("%s, build %s, %v: Cond %.8g, gonum %.8g", sec.name, bp.name, p, c, wantCond)
					}
					for k := range got {
						g, w := got[k], want[k]
						if d := math.Abs(g.Cl-w.Cl) / math.Abs(w.Cl); d > 1e-10 {
							t.Errorf("%s, build %s, %v, α %g: Cl %.15g, reference %.15g (%.2g)", sec.name, bp.name, p, g.Alpha, g.Cl, w.Cl, d)
						}
						if d := math.Abs(g.Cm-w.Cm) / math.Abs(w.Cm); d > 1e-10 {
							t.Errorf("%s, build %s, %v, α %g: Cm %.15g, reference %.15g (%.2g)", sec.name, bp.name, p, g.Alpha, g.Cm, w.Cm, d)
						}
						scale, worst := 0.0, 0.0
						for i := range w.Cp {
							scale = max(scale, math.Abs(w.Cp[i]))
						}
						for i := range w.Cp {
							worst = max(worst, math.Abs(g.Cp[i]-w.Cp[i])/scale)
						}
						// γ at the nodes of a sharp trailing edge carries
						// the rounding of the factorisation times the
						// condition number (5.7e6 at 400 panels): two
						// correct factorisations differ there by up to a
						// few κ·ε. Below κ = 2e5 that is within 1e-10.
						if worst > max(1e-10, 4*wantCond*0x1p-52) {
							t.Errorf("%s, build %s, %v, α %g: Cp differs by %.2g of its largest magnitude", sec.name, bp.name, p, g.Alpha, worst)
						}
					}
				}()
			}
		}
	}
}
