package vortexpanel

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/dense"
	"gonum.org/v1/gonum/mat"
)

// referenceCases solves the section with the influence matrix (built by
// the assembly rows if asm, else by the Go formulas) factored by gonum's
// mat.LU, a general-purpose reference library.
func referenceCases(t *testing.T, nodes []geometry.Point, alphas []float64, asm bool) ([]Case, float64) {
	t.Helper()
	defer func(a bool) { useAsm = a }(useAsm)
	useAsm = asm
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
		cases[k] = sv.result(alpha, v, make([]float64, sv.n+1))
	}
	return cases, lu.Cond()
}

// TestPathsAgree checks that the results do not depend on how the system
// is solved: the factorisation by every path of package dense this build
// offers (pure Go, AVX2 kernels, OpenBLAS with -tags openblas) against the
// reference of gonum's mat.LU, with the matrix built by the assembly rows
// and by the Go formulas (the same matrix: TestBuildMatchesScalar). Cl, Cm
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
		for _, asm := range []bool{false, true} {
			if asm && !haveAVX2 {
				continue
			}
			want, wantCond := referenceCases(t, sec.nodes, alphas, asm)
			for _, p := range dense.Paths() {
				func() {
					defer dense.Use(p)()
					defer func(a bool) { useAsm = a }(useAsm)
					useAsm = asm
					sv, err := New(sec.nodes)
					if err != nil {
						t.Fatal(err)
					}
					got, err := sv.Solve(alphas)
					if err != nil {
						t.Fatal(err)
					}
					if c := sv.Cond(); math.Abs(c-wantCond) > 1e-6*wantCond {
						t.Errorf("%s, build asm %v, %v: Cond %.8g, gonum %.8g", sec.name, asm, p, c, wantCond)
					}
					for k := range got {
						g, w := got[k], want[k]
						if d := math.Abs(g.Cl-w.Cl) / math.Abs(w.Cl); d > 1e-10 {
							t.Errorf("%s, build asm %v, %v, α %g: Cl %.15g, reference %.15g (%.2g)", sec.name, asm, p, g.Alpha, g.Cl, w.Cl, d)
						}
						if d := math.Abs(g.Cm-w.Cm) / math.Abs(w.Cm); d > 1e-10 {
							t.Errorf("%s, build asm %v, %v, α %g: Cm %.15g, reference %.15g (%.2g)", sec.name, asm, p, g.Alpha, g.Cm, w.Cm, d)
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
							t.Errorf("%s, build asm %v, %v, α %g: Cp differs by %.2g of its largest magnitude", sec.name, asm, p, g.Alpha, worst)
						}
					}
				}()
			}
		}
	}
}
