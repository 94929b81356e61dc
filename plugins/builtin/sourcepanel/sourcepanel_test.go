package sourcepanel

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// circle returns a circle of radius 0.5 about (0.5, 0) in node order,
// starting at (1, 0), with `panels` panels.
func circle(panels int) []geometry.Point {
	pts := make([]geometry.Point, panels+1)
	for k := range pts {
		s, c := math.Sincos(2 * math.Pi * float64(k) / float64(panels))
		pts[k] = geometry.Point{X: 0.5 + 0.5*c, Y: 0.5 * s}
	}
	pts[panels] = pts[0]
	return pts
}

func solve(t *testing.T, nodes []geometry.Point, alphas ...float64) (*Solver, []Case) {
	t.Helper()
	sv, err := New(nodes)
	if err != nil {
		t.Fatal(err)
	}
	cs, err := sv.Solve(alphas)
	if err != nil {
		t.Fatal(err)
	}
	return sv, cs
}

// Exact: Cp = 1 − 4 sin²θ on a circular cylinder in a uniform stream
// (Anderson, Fundamentals of Aerodynamics), with θ measured from the
// free-stream direction.
func TestCircularCylinder(t *testing.T) {
	const (
		cpTol      = 1e-2  // max |Cp − exact| at 64 panels (the brief's figure)
		closureTol = 1e-10 // relative
	)
	for _, alphaDeg := range []float64{0, 30} {
		alpha := alphaDeg * math.Pi / 180
		sv, cs := solve(t, circle(64), alpha)
		c := cs[0]
		var worst float64
		for i, p := range sv.ControlPoints() {
			th := math.Atan2(p.Y, p.X-0.5) - alpha
			exact := 1 - 4*math.Sin(th)*math.Sin(th)
			worst = math.Max(worst, math.Abs(c.Cp[i]-exact))
		}
		t.Logf("α = %g°: max |Cp − exact| = %.2e, closure %.1e, Cl %.1e, Cm %.1e", alphaDeg, worst, c.Closure, c.Cl, c.Cm)
		if worst > cpTol {
			t.Errorf("α = %g°: max Cp error %.3g > %g", alphaDeg, worst, cpTol)
		}
		if math.Abs(c.Closure) > closureTol || len(c.Warnings) > 0 {
			t.Errorf("α = %g°: closure %.3g, warnings %q", alphaDeg, c.Closure, c.Warnings)
		}
		// d'Alembert and symmetry: no force, and no moment about the centre,
		// which for a circle about (0.5, 0) is no moment about (0.25, 0) either.
		if math.Abs(c.Cl) > 1e-12 || math.Abs(c.CdPressure) > 1e-12 || math.Abs(c.Cm) > 1e-12 {
			t.Errorf("α = %g°: Cl %g, Cd %g, Cm %g, want 0", alphaDeg, c.Cl, c.CdPressure, c.Cm)
		}
	}
}

// Exact: the flow about a cylinder, w = V∞(e^{−iα} − R² e^{iα}/(z − z_c)²)
// and ψ = Im(V∞(z′e^{−iα} + R² e^{iα}/z′)) with z′ = z − z_c (Anderson,
// Fundamentals of Aerodynamics).
func TestCylinderField(t *testing.T) {
	alpha := 10 * math.Pi / 180
	_, cs := solve(t, circle(512), alpha)
	var pts []geometry.Point
	var want []complex128
	var psis []float64
	zc := complex(0.5, 0)
	e := cmplx.Exp(complex(0, alpha))
	for _, r := range []float64{0.6, 0.8, 2} {
		for _, th := range []float64{0.3, 1.5, 2.9, 3.3, 4.8, 6} {
			zp := cmplx.Rect(r, th)
			z := zc + zp
			pts = append(pts, geometry.Point{X: real(z), Y: imag(z)})
			want = append(want, cmplx.Conj(e)-0.25*e/(zp*zp))
			psis = append(psis, imag(zp*cmplx.Conj(e)+0.25*e/zp))
		}
	}
	got, err := cs[0].Field(pts)
	if err != nil {
		t.Fatal(err)
	}
	// Constant-strength panels converge like 1/N off the body (measured: the
	// doublet moment is 2.0%, 0.53% and 0.13% off at 64, 256 and 1024
	// panels); at 512 panels the largest error is 1.7e-3, rounded up.
	const tol = 3e-3
	for i, g := range got {
		w := geometry.Point{X: real(want[i]), Y: -imag(want[i])}
		if g.Velocity.Dist(w) > tol {
			t.Errorf("%v: velocity %v, exact %v", pts[i], g.Velocity, w)
		}
		if d := (g.StreamFunction - got[0].StreamFunction) - (psis[i] - psis[0]); math.Abs(d) > tol {
			t.Errorf("%v: ψ difference off by %.3g", pts[i], d)
		}
	}
	if _, err := cs[0].Field([]geometry.Point{{X: 0.5, Y: 0.1}}); !errors.Is(err, ErrInside) {
		t.Errorf("inside point: err = %v", err)
	}
}

// A source distribution has no circulation, so by Kutta–Joukowski a section
// gets no lift (Hess & Smith 1967); the pressure integral tends to zero as
// panels are added and the source sum closes.
func TestNoLiftOnSections(t *testing.T) {
	for _, code := range []string{"0012", "4415"} {
		n, err := shape.ParseNACA4(code)
		if err != nil {
			t.Fatal(err)
		}
		n.SharpTE = true
		var prev float64
		for i, half := range []int{50, 100, 200} { // 100, 200, 400 panels
			_, cs := solve(t, n.Loop(half), 5*math.Pi/180)
			c := cs[0]
			t.Logf("NACA %s, %d panels: Cl %.2e, closure %.1e", code, 2*half, c.Cl, c.Closure)
			if math.Abs(c.Closure) > ClosureTolerance || len(c.Warnings) > 0 {
				t.Errorf("NACA %s: closure %.3g, warnings %q", code, c.Closure, c.Warnings)
			}
			// Measured: |Cl| ≈ 0.04–0.07 at 100 panels, falling like 1/N
			// (ratio 0.55–0.58 per doubling); 0.65 and 0.08·100/N leave room.
			if math.Abs(c.Cl) > 0.08*100/float64(2*half) {
				t.Errorf("NACA %s, %d panels: Cl %.3g, want about 0", code, 2*half, c.Cl)
			}
			if i > 0 && math.Abs(c.Cl) > 0.65*math.Abs(prev) {
				t.Errorf("NACA %s: |Cl| went from %.3g to %.3g on doubling the panels", code, prev, c.Cl)
			}
			prev = c.Cl
		}
	}
}

// A section squashed to a thickness of 1e-14 chord has nearly coincident
// upper and lower panels: the matrix is numerically singular (measured
// condition 1e15) and New must say so rather than return numbers.
func TestIllConditioned(t *testing.T) {
	nodes := shape.NACA4{Thickness: 0.12, SharpTE: true}.Loop(20)
	for i := range nodes {
		nodes[i].Y *= 1e-13
	}
	_, err := New(nodes)
	var ce *ConditionError
	if !errors.Is(err, ErrIllConditioned) || !errors.As(err, &ce) || !(ce.Cond > MaxCondition) {
		t.Errorf("err = %v, want a *ConditionError above %g", err, MaxCondition)
	}
}

func TestBadInput(t *testing.T) {
	good := circle(32)
	open := append([]geometry.Point(nil), good[:32]...)
	crossed := append([]geometry.Point(nil), good...)
	crossed[3], crossed[20] = crossed[20], crossed[3]
	repeated := append([]geometry.Point(nil), good...)
	repeated[5] = repeated[4]
	nan := append([]geometry.Point(nil), good...)
	nan[9].X = math.Inf(-1)
	rev := make([]geometry.Point, len(good))
	for i, p := range good {
		rev[len(good)-1-i] = p
	}
	for _, tc := range []struct {
		name  string
		nodes []geometry.Point
		want  error
	}{
		{"too-few", circle(6), ErrTooFewNodes},
		{"open", open, ErrOpenContour},
		{"crossing", crossed, ErrCrossing},
		{"repeated", repeated, ErrRepeatedNode},
		{"non-finite", nan, ErrNonFinite},
		{"clockwise", rev, ErrClockwise},
	} {
		if _, err := New(tc.nodes); !errors.Is(err, tc.want) {
			t.Errorf("%s: err = %v, want %v", tc.name, err, tc.want)
		}
	}
	sv, err := New(good)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := sv.Solve([]float64{2}); !errors.Is(err, ErrAlphaRange) {
		t.Errorf("α = 2 rad: err = %v", err)
	}
	if _, err := sv.Solve([]float64{math.NaN()}); !errors.Is(err, ErrNonFinite) {
		t.Errorf("α = NaN: err = %v", err)
	}
}
