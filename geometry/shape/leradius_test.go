package shape

import (
	"math"
	"math/cmplx"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// circumradius returns the radius of the circle through a, b and c.
func circumradius(a, b, c geometry.Point) float64 {
	return a.Dist(b) * b.Dist(c) * c.Dist(a) / (2 * math.Abs(b.Sub(a).Cross(c.Sub(a))))
}

// NACA Report 824 (Abbott, von Doenhoff and Stivers 1945, p. 5): the
// leading-edge radius of a NACA 4-digit section is 1.1019 t². The exact
// value of the equations is (5t · 0.2969)²/2 = 1.10187 t².
func TestNACA4LERadiusReport824(t *testing.T) {
	for _, n := range []NACA4{
		{Thickness: 0.06}, {Thickness: 0.12}, {Thickness: 0.24},
		{Thickness: 0.12, SharpTE: true}, {Thickness: 0.40, SharpTE: true},
	} {
		got, want := n.LERadius(), 1.1019*n.Thickness*n.Thickness
		if math.Abs(got/want-1) > 1e-4 {
			t.Errorf("NACA %s (sharp %v): LE radius %.7f, want 1.1019 t² = %.7f within 0.01 %%", n, n.SharpTE, got, want)
		}
	}
}

// The exact radius against the circle through three points of the outline
// a small step either side of its leading edge, the points from the
// section's public equations (Upper, Lower) and the leading edge found on
// them as the point farthest from the trailing-edge midpoint: a check of
// the derivatives, by a route that shares none of them. The step (1e-4 in
// √x) straddles the corner of the curvature's slope on cambered noses;
// measured agreement better than 1e-4, tolerance 1e-3.
func TestNACA4LERadiusThreePoints(t *testing.T) {
	for _, n := range []NACA4{
		{Thickness: 0.12},
		{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12},
		{Camber: 0.04, CamberPos: 0.4, Thickness: 0.24, SharpTE: true},
		{Camber: 0.06, CamberPos: 0.2, Thickness: 0.09},
		{Camber: 0.06, CamberPos: 0.6, Thickness: 0.06, SharpTE: true},
	} {
		at := func(xi float64) geometry.Point {
			if xi < 0 {
				return n.Lower(xi * xi)
			}
			return n.Upper(xi * xi)
		}
		mid := n.Upper(1).Add(n.Lower(1)).Scale(0.5)
		xi := maximise(func(xi float64) float64 { return at(xi).Dist(mid) }, -0.5, 0.5)
		const h = 1e-4
		want := circumradius(at(xi-h), at(xi), at(xi+h)) / at(xi).Dist(mid)
		got := n.LERadius()
		t.Logf("NACA %s: LE radius %.6f, three points %.6f (%.1e), 1.1019 t² %.6f", n, got, want, got/want-1, 1.1019*n.Thickness*n.Thickness)
		if math.Abs(got/want-1) > 1e-3 {
			t.Errorf("NACA %s: LE radius %.6f, the circle through three points of the outline %.6f", n, got, want)
		}
	}
}

// The exact radius of Kármán–Trefftz sections (from the map's derivatives)
// against the circle through the images of three points of the circle a
// small step either side of the leading edge: the same curvature by a
// route that uses only the map. Measured agreement better than 3e-7,
// tolerance 1e-6.
func TestKarmanTrefftzLERadius(t *testing.T) {
	for _, k := range []KarmanTrefftz{
		{Centre: geometry.Point{X: -0.1}},
		{Centre: geometry.Point{X: -0.1, Y: 0.1}, TEAngle: 10 * math.Pi / 180},
		{Centre: geometry.Point{X: -0.05, Y: 0.05}, TEAngle: 0.5 * math.Pi / 180},
		{Centre: geometry.Point{X: -0.2, Y: 0.02}, TEAngle: 20 * math.Pi / 180},
	} {
		got, err := k.LERadius()
		if err != nil {
			t.Fatal(err)
		}
		phi := k.lePhi()
		te := complex(k.exponent(), 0)
		z := func(p float64) geometry.Point {
			w := k.mapZeta(k.circle(p))
			return geometry.Point{X: real(w), Y: imag(w)}
		}
		const h = 1e-4
		want := circumradius(z(phi-h), z(phi), z(phi+h)) / cmplx.Abs(te-k.mapZeta(k.circle(phi)))
		t.Logf("Kármán–Trefftz %+v: LE radius %.8f, three points %.8f (%.1e)", k, got, want, got/want-1)
		if math.Abs(got/want-1) > 1e-6 {
			t.Errorf("Kármán–Trefftz %+v: LE radius %.8f, the circle through three points of the section %.8f", k, got, want)
		}
	}
	if _, err := (KarmanTrefftz{Centre: geometry.Point{X: 0.1}}).LERadius(); err == nil {
		t.Error("LE radius of a circle that does not enclose ζ = −b: want an error")
	}
}
