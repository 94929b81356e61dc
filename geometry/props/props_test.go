package props

import (
	"errors"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
	"gonum.org/v1/gonum/integrate/quad"
)

// testSection fits and normalises a NACA 4-digit contour (NACA Report
// 824 equations) placed with 152.4 mm chord, 7° rotation, a shift and
// 0.02 mm noise (fixed seed), or noise-free when noise is 0.
func testSection(t *testing.T, code string, sharp bool, noise float64, opts frame.Options) (*frame.Normalized, shape.NACA4) {
	t.Helper()
	c, part, n, err := testfoil.Placed(code, sharp, noise)
	if err != nil {
		t.Fatal(err)
	}
	cv, _, err := curve.Fit(c, curve.FitOptions{Noise: noise, Exact: noise == 0})
	if err != nil {
		t.Fatal(err)
	}
	if opts.LEAt != nil {
		p := part.ToPart(*opts.LEAt)
		opts.LEAt = &p
	}
	nz, err := frame.Normalize(cv, opts)
	if err != nil {
		t.Fatal(err)
	}
	return nz, n
}

func TestPropertiesNACA(t *testing.T) {
	for _, code := range []string{"0012", "2412"} {
		// The 2412 chord line is set at the Report 824 nose so that camber
		// is measured from the Report 824 chord line.
		var opts frame.Options
		if code == "2412" {
			opts.LEAt = &geometry.Point{}
		}
		nz, n := testSection(t, code, false, 0.02, opts)
		sp, cl, err := Compute(nz.Path, nz.SLE, Options{})
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%s: t %.5f at %.4f, camber %.5f at %.4f, LE radius %.5f (want %.5f), TE angle %.2f°, area %.5f",
			code, sp.Thickness, sp.ThicknessAt, sp.Camber, sp.CamberAt, sp.LERadius, 1.1019*n.Thickness*n.Thickness, sp.TEAngleDeg, sp.Area)
		// NACA Report 824: maximum thickness t = 0.12 at x = 0.30.
		if math.Abs(sp.Thickness-0.12) > 0.001 || math.Abs(sp.ThicknessAt-0.30) > 0.01 {
			t.Errorf("%s: thickness %.5f at %.4f, want 0.120 ± 0.001 at 0.30 ± 0.01", code, sp.Thickness, sp.ThicknessAt)
		}
		// NACA Report 824: maximum camber m at p (0 for 0012; 0.02 at 0.4 for 2412).
		if code == "2412" {
			if math.Abs(sp.Camber-0.02) > 0.001 || math.Abs(sp.CamberAt-0.40) > 0.02 {
				t.Errorf("%s: camber %.5f at %.4f, want 0.020 ± 0.001 at 0.40 ± 0.02", code, sp.Camber, sp.CamberAt)
			}
		} else if math.Abs(sp.Camber) > 0.0005 {
			t.Errorf("%s: camber %.5f, want 0", code, sp.Camber)
		}
		// NACA Report 824: leading-edge radius 1.1019 t².
		if want := 1.1019 * n.Thickness * n.Thickness; math.Abs(sp.LERadius/want-1) > 0.10 {
			t.Errorf("%s: LE radius %.5f, want %.5f within 10%%", code, sp.LERadius, want)
		}
		// Trailing-edge angle from the slope of the Report 824 thickness
		// equation at x = 1: dyt/dx = t/0.2·(0.2969/2 − 0.126 − 2·0.3516 + 3·0.2843 − 4·0.1015),
		// plus the camber-line slopes, which are equal and opposite in effect (none).
		slope := n.Thickness / 0.2 * (0.2969/2 - 0.126 - 2*0.3516 + 3*0.2843 - 4*0.1015)
		if want := 2 * math.Atan(-slope) * 180 / math.Pi; math.Abs(sp.TEAngleDeg-want) > 1 {
			t.Errorf("%s: TE angle %.2f°, want %.2f° ± 1°", code, sp.TEAngleDeg, want)
		}
		if len(cl.X) != 201 || cl.X[0] != 0 {
			t.Errorf("%s: camber line of %d stations from %g", code, len(cl.X), cl.X[0])
		}
	}
}

// nacaAreaExact is the area of a NACA 4-digit section with the open
// (standard) edge: ∫₀¹ 2 yt dx in closed form from the Report 824 thickness
// equation (exact integral of each term), which camber does not change.
func nacaAreaExact(t float64) float64 {
	return 2 * t / 0.2 * (0.2969*2/3 - 0.1260/2 - 0.3516/3 + 0.2843/4 - 0.1015/5)
}

func TestPropertiesAreaAndMoments(t *testing.T) {
	// Noise-free NACA 0012 interpolated: area against the closed-form
	// integral of the thickness equation (NACA Report 824); centroid and
	// second moments against gonum quad (Gauss–Legendre, x = u² to remove
	// the square-root singularity) applied to the same equation.
	nz, n := testSection(t, "0012", false, 0, frame.Options{})
	sp, _, err := Compute(nz.Path, nz.SLE, Options{})
	if err != nil {
		t.Fatal(err)
	}
	const tol = 2e-5 // relative; the interpolated outline has 301 points
	area := nacaAreaExact(n.Thickness)
	// Check the closed form itself with gonum quad.
	yt := func(u float64) float64 { return n.HalfThickness(u * u) }
	integ := func(f func(u float64) float64) float64 { return quad.Fixed(f, 0, 1, 40, quad.Legendre{}, 0) }
	if q := integ(func(u float64) float64 { return 2 * yt(u) * 2 * u }); math.Abs(q-area) > 1e-12 {
		t.Fatalf("closed-form area %.12f, gonum quad %.12f", area, q)
	}
	sx := integ(func(u float64) float64 { return u * u * 2 * yt(u) * 2 * u })
	ixx := integ(func(u float64) float64 { return 2 * math.Pow(yt(u), 3) / 3 * 2 * u })
	iyy := integ(func(u float64) float64 { return u * u * u * u * 2 * yt(u) * 2 * u })
	cx := sx / area
	iyy -= area * cx * cx
	// The normalised chord is the farthest-point distance, slightly shorter
	// than 1 because of the open edge: scale the references.
	c := 1 / nz.Frame.Chord * 152.4
	for _, tc := range []struct {
		name      string
		got, want float64
	}{
		{"area", sp.Area, area * c * c},
		{"centroid x", sp.Centroid[0], cx * c},
		{"Ixx", sp.Ixx, ixx * c * c * c * c},
		{"Iyy", sp.Iyy, iyy * c * c * c * c},
	} {
		if math.Abs(tc.got/tc.want-1) > tol {
			t.Errorf("%s = %.8g, want %.8g", tc.name, tc.got, tc.want)
		}
	}
	// Symmetric to round-off and quadrature (measured 1e-9 of the chord).
	if math.Abs(sp.Centroid[1]) > 1e-8 || math.Abs(sp.Ixy) > 1e-9 || math.Abs(sp.PrincipalDeg) > 1e-5 {
		t.Errorf("symmetric section: centroid y %g, Ixy %g, principal %g°", sp.Centroid[1], sp.Ixy, sp.PrincipalDeg)
	}
	if math.Abs(sp.Imin-sp.Ixx) > 1e-12 || math.Abs(sp.Imax-sp.Iyy) > 1e-12 {
		t.Errorf("principal moments %g %g, want Ixx %g, Iyy %g", sp.Imin, sp.Imax, sp.Ixx, sp.Iyy)
	}
	if want := nz.Path.Length() + sp.TEThickness; math.Abs(sp.Perimeter-want) > 1e-12 {
		t.Errorf("perimeter %g, want %g", sp.Perimeter, want)
	}
}

func TestPropertiesEllipse(t *testing.T) {
	// Exact solution: the ellipse x = ½(1 + cos θ), y = b sin θ has area
	// πab, Ixx = πab³/4, Iyy = πa³b/4 (a = ½), thickness 2b at x = ½, and
	// radius of curvature b²/a at the vertex (the leading edge).
	const b = 0.06
	var pts []geometry.Point
	for i := range 400 {
		th := 2 * math.Pi * float64(i) / 400
		pts = append(pts, geometry.Point{X: 0.5 * (1 + math.Cos(th)), Y: b * math.Sin(th)})
	}
	cv := curve.Interpolate(pts, true)
	sLE, _ := cv.Project(geometry.Point{})
	sp, _, err := Compute(cv, sLE, Options{})
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-6
	for _, tc := range []struct {
		name      string
		got, want float64
	}{
		{"area", sp.Area, math.Pi * 0.5 * b},
		{"Ixx", sp.Ixx, math.Pi * 0.5 * b * b * b / 4},
		{"Iyy", sp.Iyy, math.Pi * 0.125 * b / 4},
		{"centroid x", sp.Centroid[0], 0.5},
		{"thickness", sp.Thickness, 2 * b},
		{"thickness at", sp.ThicknessAt, 0.5},
		{"perimeter", sp.Perimeter, ellipsePerimeter(0.5, b)},
	} {
		if math.Abs(tc.got-tc.want) > tol*math.Max(1, math.Abs(tc.want)) {
			t.Errorf("%s = %.9g, want %.9g (exact)", tc.name, tc.got, tc.want)
		}
	}
	// The circle fit of the nose spans ±0.15 osculating radii of arc, over
	// which the radius of curvature of this ellipse grows by about 1%.
	if want := b * b / 0.5; math.Abs(sp.LERadius/want-1) > 0.01 {
		t.Errorf("LE radius %.6f, want %.6f (b²/a, exact) within 1%%", sp.LERadius, want)
	}
}

// ellipsePerimeter integrates the ellipse perimeter with gonum quad.
func ellipsePerimeter(a, b float64) float64 {
	return quad.Fixed(func(th float64) float64 { return math.Hypot(a*math.Sin(th), b*math.Cos(th)) }, 0, 2*math.Pi, 200, quad.Legendre{}, 0)
}

func TestPropertiesModes(t *testing.T) {
	// The Report 824 thickness is laid off normal to the camber line, so
	// thickness normal to the camber line is again 0.12; the inscribed-circle
	// camber line of a section this thin stays within 0.001 of the mean one.
	nz, _ := testSection(t, "2412", false, 0, frame.Options{LEAt: &geometry.Point{}})
	mean, _, err := Compute(nz.Path, nz.SLE, Options{})
	if err != nil {
		t.Fatal(err)
	}
	sp, cl, err := Compute(nz.Path, nz.SLE, Options{Thickness: ThicknessCamber, Camber: CamberInscribed})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("camber-normal thickness %.5f at %.4f; inscribed camber %.5f at %.4f", sp.Thickness, sp.ThicknessAt, sp.Camber, sp.CamberAt)
	if math.Abs(sp.Thickness-0.12) > 0.001 {
		t.Errorf("thickness normal to camber %.5f, want 0.120 ± 0.001 (NACA Report 824)", sp.Thickness)
	}
	if math.Abs(sp.Camber-mean.Camber) > 0.001 || math.Abs(sp.CamberAt-0.4) > 0.03 {
		t.Errorf("inscribed camber %.5f at %.4f, mean-line camber %.5f at %.4f", sp.Camber, sp.CamberAt, mean.Camber, mean.CamberAt)
	}
	var maxD float64
	for _, d := range cl.Thickness {
		maxD = math.Max(maxD, d)
	}
	if math.Abs(maxD-0.12) > 0.002 {
		t.Errorf("largest inscribed diameter %.5f, want about 0.12", maxD)
	}
	if _, _, err := Compute(nz.Path, -1, Options{}); !errors.Is(err, ErrNotNormalized) {
		t.Errorf("sLE outside: err = %v", err)
	}
	if _, _, err := Compute(nz.Path, nz.SLE, Options{Thickness: "x"}); err == nil {
		t.Error("bad thickness mode: no error")
	}
}

func BenchmarkNormalizeAndProperties(b *testing.B) {
	n, _ := shape.ParseNACA4("2412")
	c := testfoil.Contour(testfoil.Loop(n, 150), testfoil.Part{Chord: 152.4, RotDeg: 7, Noise: 0.02, Seed: 1})
	cv, _, err := curve.Fit(c, curve.FitOptions{Noise: 0.02})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		nz, err := frame.Normalize(cv, frame.Options{})
		if err != nil {
			b.Fatal(err)
		}
		if _, _, err := Compute(nz.Path, nz.SLE, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// pathOnly hides every method of a Curve but those of Path.
type pathOnly struct{ c *curve.Curve }

func (p pathOnly) Length() float64             { return p.c.Length() }
func (p pathOnly) At(s float64) geometry.Point { return p.c.At(s) }
func (p pathOnly) Curvature(s float64) float64 { return p.c.Curvature(s) }

func TestPropertiesAnyPath(t *testing.T) {
	// A Path that is not a *Curve is resampled and interpolated; its
	// properties agree with those of the curve itself.
	for _, sharp := range []bool{false, true} {
		nz, _ := testSection(t, "2412", sharp, 0, frame.Options{})
		want, _, err := Compute(nz.Path, nz.SLE, Options{})
		if err != nil {
			t.Fatal(err)
		}
		got, _, err := Compute(pathOnly{nz.Path.(*curve.Curve)}, nz.SLE, Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, tc := range []struct {
			name      string
			got, want float64
		}{
			{"area", got.Area, want.Area},
			{"thickness", got.Thickness, want.Thickness},
			{"camber", got.Camber, want.Camber},
			{"LE radius", got.LERadius, want.LERadius},
			{"Iyy", got.Iyy, want.Iyy},
			{"TE angle", got.TEAngleDeg / 100, want.TEAngleDeg / 100},
		} {
			if math.Abs(tc.got/tc.want-1) > 1e-3 {
				t.Errorf("sharp=%v: %s %.6g via Path, %.6g via Curve", sharp, tc.name, tc.got, tc.want)
			}
		}
	}
}
