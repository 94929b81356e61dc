package curve

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// curveTablesRough returns an interpolating spline through a noisy ellipse
// with unevenly spaced points: many of its pieces nearly fold back, so the
// arc-length quadrature bisects them deeply.
func curveTablesRough() *Curve {
	rng := rand.New(rand.NewPCG(7, 8))
	pts := make([]geometry.Point, 400)
	for i := range pts {
		t := 2 * math.Pi * (float64(i) + 0.4*rng.Float64()) / float64(len(pts))
		pts[i] = geometry.Point{X: 100 * math.Cos(t), Y: 12 * math.Sin(t)}.Add(geometry.Point{X: 0.5 * rng.NormFloat64(), Y: 0.5 * rng.NormFloat64()})
	}
	return Interpolate(pts, true)
}

// curveTablesRef is the arc length of piece i from 0 to u by a composite
// 8-point Gauss–Legendre rule on 2048 equal parts.
func curveTablesRef(c *Curve, i int, u float64) float64 {
	const k = 2048
	var l float64
	for j := 0; j < k; j++ {
		l += c.glOn(i, u*float64(j)/k, u*float64(j+1)/k)
	}
	return l
}

// Partial lengths from the quadrature leaves must agree with a fine
// composite rule, also inside the pieces that needed bisection.
func TestCurvePartialMatchesFineRule(t *testing.T) {
	c := curveTablesRough()
	rng := rand.New(rand.NewPCG(9, 10))
	deep := 0
	for i := 0; i < c.Pieces(); i += 3 {
		if c.leafAt[i+1]-c.leafAt[i] > 2 {
			deep++
		}
		for _, f := range []float64{rng.Float64(), 0.5, 1} {
			u := f * c.Span(i)
			got, want := c.partial(i, u), curveTablesRef(c, i, u)
			if math.Abs(got-want) > 1e-13*c.pl[i] {
				t.Fatalf("piece %d, u = %g h: partial %.17g, fine rule %.17g", i, f, got, want)
			}
		}
	}
	if deep == 0 {
		t.Fatal("no piece needed bisection; the test curve is too smooth to test it")
	}
}

// Transform (by a similarity) and Reverse carry the quadrature over instead
// of measuring again; the result must agree with measuring again.
func TestCurveCarriedTablesMatchRemeasure(t *testing.T) {
	c := curveTablesRough()
	th, f := 0.3, 1/152.4
	cs, sn := math.Cos(th), math.Sin(th)
	for name, cv := range map[string]*Curve{
		"rotate-scale": c.Transform([2][2]float64{{f * cs, -f * sn}, {f * sn, f * cs}}, geometry.Point{X: 1, Y: 2}),
		"reflect":      c.Transform([2][2]float64{{cs, sn}, {sn, -cs}}, geometry.Point{}),
		"reverse":      c.Reverse(),
		"both":         c.Transform([2][2]float64{{-f, 0}, {0, f}}, geometry.Point{}).Reverse(),
	} {
		fresh := newCurve(cv.ts, cv.xs, cv.ys, cv.closed)
		for i := range cv.pl {
			if math.Abs(cv.pl[i]-fresh.pl[i]) > 1e-13*fresh.pl[i] {
				t.Errorf("%s: piece %d length %.17g, measured again %.17g", name, i, cv.pl[i], fresh.pl[i])
			}
			u := 0.37 * cv.Span(i)
			if a, b := cv.partial(i, u), fresh.partial(i, u); math.Abs(a-b) > 1e-13*fresh.pl[i] {
				t.Errorf("%s: piece %d partial %.17g, measured again %.17g", name, i, a, b)
			}
		}
		if math.Abs(cv.Length()-fresh.Length()) > 1e-13*fresh.Length() {
			t.Errorf("%s: length %.17g, measured again %.17g", name, cv.Length(), fresh.Length())
		}
	}
	// A shear is not a similarity: measured afresh.
	sh := c.Transform([2][2]float64{{1, 0.5}, {0, 1}}, geometry.Point{})
	fresh := newCurve(sh.ts, sh.xs, sh.ys, sh.closed)
	if sh.Length() != fresh.Length() {
		t.Errorf("shear: length %.17g, measured again %.17g", sh.Length(), fresh.Length())
	}
}
