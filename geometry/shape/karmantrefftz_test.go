package shape

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// For τ = 0 the Kármán–Trefftz map is the Joukowski map z = ζ + b²/ζ
// (Milne-Thomson, Theoretical Hydrodynamics), evaluated here directly.
func TestKarmanTrefftzJoukowskiLimit(t *testing.T) {
	const tol = 1e-12
	k := KarmanTrefftz{Centre: geometry.Point{X: -0.1, Y: 0.08}}
	const panels = 64
	pts, err := k.Points(panels)
	if err != nil {
		t.Fatal(err)
	}
	r := cmplx.Abs(complex(1-k.Centre.X, -k.Centre.Y))
	phi0 := math.Atan2(-k.Centre.Y, 1-k.Centre.X)
	for i, p := range pts {
		zeta := complex(k.Centre.X, k.Centre.Y) + cmplx.Rect(r, phi0+2*math.Pi*float64(i)/panels)
		z := zeta + 1/zeta
		if d := cmplx.Abs(z - complex(p.X, p.Y)); d > tol {
			t.Errorf("point %d = %v, Joukowski map gives %v (|diff| %g)", i, p, z, d)
		}
	}
	if a := geometry.SignedArea(pts); a <= 0 {
		t.Errorf("signed area %g: want counter-clockwise", a)
	}
	// Upper surface first: the node a quarter of the way round is above the chord.
	if pts[panels/4].Y <= 0 || pts[3*panels/4].Y >= pts[panels/4].Y {
		t.Errorf("node order: quarter %v, three quarters %v", pts[panels/4], pts[3*panels/4])
	}
}

// A circle centred on the real axis gives a section symmetric about the
// chord; its leading edge, the farthest point from the trailing edge (common
// practice), is then the image of the circle's leftmost point ζ = ζ_c − R.
func TestKarmanTrefftzSymmetricAndNormalized(t *testing.T) {
	const tol = 1e-9
	k := KarmanTrefftz{Centre: geometry.Point{X: -0.08, Y: 0}, TEAngle: 10 * math.Pi / 180}
	const panels = 100
	pts, err := k.Points(panels)
	if err != nil {
		t.Fatal(err)
	}
	for i := 1; i < panels; i++ {
		p, q := pts[i], pts[panels-i]
		if math.Abs(p.X-q.X) > tol || math.Abs(p.Y+q.Y) > tol {
			t.Errorf("nodes %d and %d not mirror images: %v %v", i, panels-i, p, q)
		}
	}
	le, te, err := k.Edges()
	if err != nil {
		t.Fatal(err)
	}
	// On the axis the leading edge is the image of ζ = ζ_c − R.
	r := 1 - k.Centre.X
	want := k.mapZeta(complex(k.Centre.X-r, 0))
	// The search is in a stationary distance: the point is good to ~1e-8.
	if math.Abs(le.X-real(want)) > 1e-7 || math.Abs(le.Y) > 1e-7 {
		t.Errorf("LE = %v, want %v", le, want)
	}
	for i, p := range pts {
		if p.Dist(te) > le.Dist(te)+tol {
			t.Errorf("node %d farther from the TE than the LE", i)
		}
	}
	norm, err := k.Normalized(panels)
	if err != nil {
		t.Fatal(err)
	}
	if norm[0] != (geometry.Point{X: 1, Y: 0}) || norm[panels] != (geometry.Point{X: 1, Y: 0}) {
		t.Errorf("TE = %v, %v; want (1, 0)", norm[0], norm[panels])
	}
	minX := math.Inf(1)
	for _, p := range norm {
		minX = math.Min(minX, p.X)
	}
	if math.Abs(minX) > 1e-3 {
		t.Errorf("min x = %g, want about 0 (LE at origin)", minX)
	}
}

// The map turns the smooth point ζ = b of the circle into a corner of
// interior angle τ (Milne-Thomson, Theoretical Hydrodynamics): the angle between the two panels
// at the trailing edge tends to τ as the panels shrink.
func TestKarmanTrefftzTrailingEdgeAngle(t *testing.T) {
	for _, deg := range []float64{5, 15, 30} {
		k := KarmanTrefftz{Centre: geometry.Point{X: -0.1, Y: 0.05}, TEAngle: deg * math.Pi / 180}
		const panels = 20000
		pts, err := k.Points(panels)
		if err != nil {
			t.Fatal(err)
		}
		u, l := pts[1].Sub(pts[0]), pts[panels-1].Sub(pts[0])
		got := math.Acos(u.Dot(l)/(u.Norm()*l.Norm())) * 180 / math.Pi
		if math.Abs(got-deg) > 0.05*deg {
			t.Errorf("τ = %g°: angle between the TE panels %.3f°", deg, got)
		}
	}
}

func TestKarmanTrefftzBadParameters(t *testing.T) {
	for _, k := range []KarmanTrefftz{
		{Centre: geometry.Point{X: 0, Y: 0.1}},
		{Centre: geometry.Point{X: 0.1, Y: 0}},
		{Centre: geometry.Point{X: -0.1, Y: 0}, TEAngle: math.Pi},
		{Centre: geometry.Point{X: -0.1, Y: 0}, TEAngle: -0.1},
		{Centre: geometry.Point{X: math.NaN(), Y: 0}},
	} {
		if _, err := k.Points(40); !errors.Is(err, ErrKarmanTrefftz) {
			t.Errorf("%+v: err = %v, want ErrKarmanTrefftz", k, err)
		}
	}
	if _, err := (KarmanTrefftz{Centre: geometry.Point{X: -0.1, Y: 0}}).Points(3); !errors.Is(err, ErrKarmanTrefftz) {
		t.Errorf("3 panels: err = %v", err)
	}
}
