package clean

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// A base tilted square to the surfaces' mean direction (baseAt) has its
// corners on the surfaces and runs square to their mean direction at the
// station where it crosses the middle between them; the square one runs
// across the chord. The surfaces are the parabolas through a NACA 6412's
// open trailing edge and two stations ahead of it (NACA Report 824
// equations), whose base, laid off square to the 6 % camber line, leans
// by the camber line's slope there, 0.24 (13°).
func TestBaseAtTilt(t *testing.T) {
	foil := shape.NACA4{Camber: 0.06, CamberPos: 0.4, Thickness: 0.12}
	through := func(pts [3][2]float64) quadFit {
		// The parabola y = c0 + c1 x + c2 x² through three points.
		var q quadFit
		x0, x1, x2 := pts[0][0], pts[1][0], pts[2][0]
		y0, y1, y2 := pts[0][1], pts[1][1], pts[2][1]
		d := (x0 - x1) * (x0 - x2) * (x1 - x2)
		q.c[2] = (x2*(y1-y0) + x1*(y0-y2) + x0*(y2-y1)) / d
		q.c[1] = (x2*x2*(y0-y1) + x1*x1*(y2-y0) + x0*x0*(y1-y2)) / d
		q.c[0] = y0 - q.c[1]*x0 - q.c[2]*x0*x0
		q.ok = true
		return q
	}
	surf := func(at func(float64) [2]float64) quadFit {
		return through([3][2]float64{at(0.9), at(0.95), at(1)})
	}
	u := surf(func(x float64) [2]float64 { p := foil.Upper(x); return [2]float64{p.X, p.Y} })
	l := surf(func(x float64) [2]float64 { p := foil.Lower(x); return [2]float64{p.X, p.Y} })
	xb := 0.999
	_, camberSlope := foil.CamberLine(1)
	for _, tilt := range []bool{false, true} {
		lo, hi, ok := baseAt(u, l, xb, tilt)
		if !ok {
			t.Fatalf("tilt %v: no base", tilt)
		}
		if e := math.Max(math.Abs(hi.Y-u.at(hi.X)), math.Abs(lo.Y-l.at(lo.X))); e > 1e-12 {
			t.Errorf("tilt %v: corners %.3g off the surfaces", tilt, e)
		}
		c := geometry.Point{X: xb, Y: (u.at(xb) + l.at(xb)) / 2}
		b := hi.Sub(lo)
		if d := math.Abs(b.Cross(c.Sub(lo))) / b.Norm(); d > 1e-9 {
			t.Errorf("tilt %v: the base passes %.3g from the middle between the surfaces at the station", tilt, d)
		}
		// Along the base per unit across: 0 square to the chord, the
		// negated mean slope (−0.24 against the camber line's) tilted.
		lean := (hi.X - lo.X) / (hi.Y - lo.Y)
		want := 0.0
		if tilt {
			want = -(u.c[1] + l.c[1] + 2*(u.c[2]+l.c[2])*xb) / 2
			if math.Abs(want+camberSlope) > 0.02 {
				t.Errorf("mean slope %.3f of the fits, camber line's %.3f", -want, camberSlope)
			}
		}
		if math.Abs(lean-want) > 1e-3 {
			t.Errorf("tilt %v: the base leans %.4f along per unit across, want %.4f", tilt, lean, want)
		}
	}
}
