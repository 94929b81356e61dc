package export

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/interp"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// The spline passes through every node, and each coordinate equals the
// not-a-knot cubic spline of that coordinate against the parameter, as
// gonum's interp.NotAKnotCubic computes it (a general-purpose reference
// library), between the nodes too.
func TestInterpolateNotAKnot(t *testing.T) {
	const (
		nodeTol = 1e-13 // chord units; round-off of the band solve
		midTol  = 1e-11 // between nodes, against gonum
	)
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	for _, n := range []int{20, 151, 1000} {
		nodes := foil.Nodes(n)
		pts := make([]geometry.Vec3, len(nodes))
		for i, q := range nodes {
			pts[i] = geometry.Vec3{X: q.X, Y: q.Y, Z: 0.1 * q.X * q.X}
		}
		b, us, err := interpolate(pts)
		if err != nil {
			t.Fatal(err)
		}
		if len(b.ctrl) != len(pts) || len(b.knots) != len(pts)+4 {
			t.Fatalf("n=%d: %d control points, %d knots", n, len(b.ctrl), len(b.knots))
		}
		for i, u := range us {
			if d := b.at(u).Sub(pts[i]).Norm(); d > nodeTol {
				t.Errorf("n=%d: node %d missed by %g", n, i, d)
			}
		}
		var fits [3]interp.NotAKnotCubic
		for c := range fits {
			ys := make([]float64, len(pts))
			for i, p := range pts {
				ys[i] = [3]float64{p.X, p.Y, p.Z}[c]
			}
			if err := fits[c].Fit(us, ys); err != nil {
				t.Fatal(err)
			}
		}
		worst := 0.0
		for i := 0; i+1 < len(us); i++ {
			for _, f := range []float64{0.25, 0.5, 0.75} {
				u := us[i] + f*(us[i+1]-us[i])
				p := b.at(u)
				q := geometry.Vec3{X: fits[0].Predict(u), Y: fits[1].Predict(u), Z: fits[2].Predict(u)}
				worst = math.Max(worst, p.Sub(q).Norm())
			}
		}
		if worst > midTol {
			t.Errorf("n=%d: differs from gonum's not-a-knot spline by %g", n, worst)
		}
	}
}

// The basis functions of a span sum to one (partition of unity, Piegl and
// Tiller, The NURBS Book, property P2.4, from memory).
func TestBasisPartition(t *testing.T) {
	pts := []geometry.Vec3{{X: 0}, {X: 1, Y: 1}, {X: 2}, {X: 3, Y: 2}, {X: 4}, {X: 5, Y: -1}}
	b, _, err := interpolate(pts)
	if err != nil {
		t.Fatal(err)
	}
	for u := 0.0; u <= 1; u += 0.01 {
		sum := 0.0
		for _, v := range b.basis(b.span(u), u) {
			sum += v
		}
		if math.Abs(sum-1) > 1e-14 {
			t.Errorf("u=%g: basis sums to %v", u, sum)
		}
	}
	for _, bad := range [][]geometry.Vec3{pts[:3], {{X: 0}, {X: 1}, {X: 1}, {X: 2}}} {
		if _, _, err := interpolate(bad); err == nil {
			t.Errorf("%v: no error", bad)
		}
	}
}
