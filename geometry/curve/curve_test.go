package curve

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

func TestCurveCircle(t *testing.T) {
	// Exact solution: a circle of radius R has length 2πR, curvature 1/R,
	// and the nearest point to p is R(p − c)/|p − c| from the centre.
	const (
		R        = 3.0
		valueTol = 1e-6 // interpolation error of 64 knots, measured, rounded up
		curvTol  = 1e-3
	)
	center := geometry.Point{X: 1, Y: -2}
	var pts []geometry.Point
	for i := range 64 {
		a := 2 * math.Pi * float64(i) / 64
		pts = append(pts, center.Add(geometry.Point{X: R * math.Cos(a), Y: R * math.Sin(a)}))
	}
	c := Interpolate(pts, true)
	if !c.Closed() {
		t.Fatal("not closed")
	}
	if got := c.Length(); math.Abs(got-2*math.Pi*R) > valueTol*R {
		t.Errorf("length %.9f, want %.9f", got, 2*math.Pi*R)
	}
	L := c.Length()
	for k := range 50 {
		s := L * float64(k) / 50
		p := c.At(s)
		if d := math.Abs(p.Dist(center) - R); d > valueTol*R {
			t.Errorf("At(%g) is %g off the circle", s, d)
		}
		// Arc length parameter: the angle grows as s/R.
		a := math.Atan2(p.Y-center.Y, p.X-center.X)
		if d := math.Abs(math.Remainder(a-s/R, 2*math.Pi)); d > 1e-5 {
			t.Errorf("At(%g) at angle %g, want %g", s, a, s/R)
		}
		if k := c.Curvature(s); math.Abs(k*R-1) > curvTol {
			t.Errorf("Curvature(%g) = %g, want %g", s, k, 1/R)
		}
		if n := c.Normal(s); n.Dist(p.Sub(center).Scale(1/R)) > 1e-5 {
			t.Errorf("Normal(%g) = %v, want outward", s, n)
		}
	}
	for _, p := range []geometry.Point{{X: 5, Y: 5}, {X: 1, Y: -2.5}, {X: -10, Y: 0}} {
		s, d := c.Project(p)
		want := math.Abs(p.Dist(center) - R)
		if math.Abs(d-want) > valueTol*R {
			t.Errorf("Project(%v): distance %g, want %g", p, d, want)
		}
		if q := c.At(s); math.Abs(q.Dist(p)-d) > 1e-12 {
			t.Errorf("Project(%v): At(s) is %g away, reported %g", p, q.Dist(p), d)
		}
	}
}

func TestCurveOperations(t *testing.T) {
	// Transform, Reverse and Sub keep the geometry (exact polynomial
	// identities, so to rounding error).
	const tol = 1e-9
	n, _ := shape.ParseNACA4("2412")
	c := Interpolate(testfoil.Loop(n, 40), false)
	L := c.Length()
	r := c.Reverse()
	if math.Abs(r.Length()-L) > tol {
		t.Errorf("reverse length %g, want %g", r.Length(), L)
	}
	for k := 0; k <= 20; k++ {
		s := L * float64(k) / 20
		if d := c.At(s).Dist(r.At(L - s)); d > tol {
			t.Errorf("reverse: At(%g) differs by %g", s, d)
		}
		if d := c.Curvature(s) + r.Curvature(L-s); math.Abs(d) > 1e-6*(1+math.Abs(c.Curvature(s))) {
			t.Errorf("reverse: curvature at %g: %g vs %g", s, c.Curvature(s), r.Curvature(L-s))
		}
	}
	// The map of a section frame back to the part, chord 152.4, twist 7°,
	// leading edge (37, −12): p = LE + c·R(−τ)·q.
	const chord = 152.4
	tw := 7 * math.Pi / 180
	inv := [2][2]float64{{chord * math.Cos(tw), chord * math.Sin(tw)}, {-chord * math.Sin(tw), chord * math.Cos(tw)}}
	toPart := func(q geometry.Point) geometry.Point {
		return q.Rotate(-tw).Scale(chord).Add(geometry.Point{X: 37, Y: -12})
	}
	p := c.Transform(inv, geometry.Point{X: 37, Y: -12})
	if math.Abs(p.Length()-152.4*L) > 1e-9*152.4 {
		t.Errorf("transform length %g, want %g", p.Length(), 152.4*L)
	}
	for k := 0; k <= 20; k++ {
		s := L * float64(k) / 20
		if d := p.At(152.4 * s).Dist(toPart(c.At(s))); d > 1e-9*152.4 {
			t.Errorf("transform: At differs by %g", d)
		}
	}
	sub := c.Sub(0.2*L, 0.7*L)
	if math.Abs(sub.Length()-0.5*L) > tol {
		t.Errorf("sub length %g, want %g", sub.Length(), 0.5*L)
	}
	if d := sub.At(0.1 * L).Dist(c.At(0.3 * L)); d > tol {
		t.Errorf("sub: At differs by %g", d)
	}
}

func TestCurveDerivatives(t *testing.T) {
	// Exact solution: on a circle of radius R travelled counter-clockwise,
	// d²C/ds² = −(C − centre)/R².
	const R = 2.0
	var pts []geometry.Point
	for i := range 80 {
		a := 2 * math.Pi * float64(i) / 80
		pts = append(pts, geometry.Point{X: R * math.Cos(a), Y: R * math.Sin(a)})
	}
	c := Interpolate(pts, true)
	for k := range 10 {
		s := c.Length() * (float64(k) + 0.3) / 10
		d1, d2 := c.Derivatives(s)
		p := c.At(s)
		if math.Abs(d1.Norm()-1) > 1e-12 || math.Abs(d1.Dot(p)) > 1e-5 {
			t.Errorf("tangent at %g: %v", s, d1)
		}
		if d := d2.Add(p.Scale(1 / (R * R))); d.Norm() > 1e-3/R {
			t.Errorf("second derivative at %g: %v, want %v", s, d2, p.Scale(-1/(R*R)))
		}
	}
}
