package geometry

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

func TestParsePlane(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want PlaneSpec
		ok   bool
	}{
		{"z=240", PlaneSpec{Vec3{Z: 240}, Vec3{Z: 1}}, true},
		{" X = -3.5 ", PlaneSpec{Vec3{X: -3.5}, Vec3{X: 1}}, true},
		{"y=0", PlaneSpec{Vec3{}, Vec3{Y: 1}}, true},
		{"1,2,3:0,0,2", PlaneSpec{Vec3{1, 2, 3}, Vec3{0, 0, 2}}, true},
		{"1, 2, 3 : 0.1, -0.2, 1", PlaneSpec{Vec3{1, 2, 3}, Vec3{0.1, -0.2, 1}}, true},
		{"w=3", PlaneSpec{}, false},
		{"z=", PlaneSpec{}, false},
		{"z=NaN", PlaneSpec{}, false},
		{"z=inf", PlaneSpec{}, false},
		{"1,2,3:0,0,0", PlaneSpec{}, false},
		{"1,2:0,0,1", PlaneSpec{}, false},
		{"1,2,3:0,0,x", PlaneSpec{}, false},
		{"240", PlaneSpec{}, false},
	} {
		got, err := ParsePlane(tc.in)
		if (err == nil) != tc.ok || got != tc.want {
			t.Errorf("ParsePlane(%q) = %v, %v; want %v (ok %v)", tc.in, got, err, tc.want, tc.ok)
		}
		if tc.ok {
			back, err := ParsePlane(got.String())
			if err != nil || back != got {
				t.Errorf("ParsePlane(%q.String() = %q) = %v, %v", tc.in, got.String(), back, err)
			}
		}
	}
}

// TestPlaneThrough checks the in-plane axes: orthonormal, right-handed, and
// the user's own axes for planes facing a global axis.
func TestPlaneThrough(t *testing.T) {
	const tol = 1e-15
	for _, tc := range []struct {
		n    Vec3
		u, v Vec3 // 0: only check the basis
	}{
		{Vec3{Z: 1}, Vec3{X: 1}, Vec3{Y: 1}},
		{Vec3{Z: -3}, Vec3{X: 1}, Vec3{Y: 1}},
		{Vec3{X: 1}, Vec3{Y: 1}, Vec3{Z: 1}},
		{Vec3{X: -1}, Vec3{Y: 1}, Vec3{Z: 1}},
		{Vec3{Y: 1}, Vec3{X: 1}, Vec3{Z: 1}},
		{Vec3{1e-9, -2e-9, 1}, Vec3{}, Vec3{}},
		{Vec3{0.6, 0, 0.8}, Vec3{}, Vec3{}},
		{Vec3{1, 1, 1}, Vec3{}, Vec3{}},
	} {
		pl := PlaneThrough(Vec3{1, 2, 3}, tc.n)
		u, v, n := planeVec(pl.U), planeVec(pl.V), planeVec(pl.N)
		if math.Abs(u.Norm()-1) > tol || math.Abs(v.Norm()-1) > tol || math.Abs(u.Dot(v)) > tol ||
			u.Cross(v).Sub(n).Norm() > tol || math.Abs(math.Abs(n.Dot(tc.n.Unit()))-1) > tol {
			t.Errorf("normal %v: U %v V %v N %v is not a right-handed orthonormal frame", tc.n, u, v, n)
		}
		if tc.u != (Vec3{}) && (u != tc.u || v != tc.v) {
			t.Errorf("normal %v: U %v V %v, want %v %v", tc.n, u, v, tc.u, tc.v)
		}
		if tc.n.Y == 0 && tc.n.X == 0 {
			// z = const: (u, v) = (x − x0, y − y0) exactly.
			p := Vec3{123.456789, -0.1, 7}
			if uv, _ := planeMap(pl, p); uv != (Point{p.X - 1, p.Y - 2}) {
				t.Errorf("normal %v: (u, v) of %v = %v, want (x − 1, y − 2) exactly", tc.n, p, uv)
			}
		}
		if tc.n == (Vec3{1e-9, -2e-9, 1}) && (u.X < 0.999 || v.Y < 0.999) {
			t.Errorf("near-z normal %v: U %v V %v, want close to x and y", tc.n, u, v)
		}
	}
}

// TestFlattenBand reads the invented probe file (NACA 2412 at z = 240 mm
// with uniform noise of ±0.05 mm) with the cut z=240 and a band of 0.1 mm:
// all points are kept, (u, v) are exactly (x, y), and the flatness is the
// noise: its RMS is within 20 % of the RMS of the uniform distribution,
// 0.05/√3 = 0.0289 mm (exact for the distribution; 60 samples).
func TestFlattenBand(t *testing.T) {
	c, err := readTestOpen(t, "naca2412-probe-z240.csv", ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if c.Dim != 3 || c.Units != Millimetre {
		t.Fatalf("dim %d units %q, want 3 mm", c.Dim, c.Units)
	}
	cut, _ := ParsePlane("z=240")
	flat, fl, err := Flatten(c, FlattenOptions{Plane: &cut, Band: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	if fl.Kept != c.Len() || fl.Outside != 0 || flat.Dim != 2 || flat.Units != Millimetre {
		t.Errorf("kept %d outside %d dim %d units %q, want %d 0 2 mm", fl.Kept, fl.Outside, flat.Dim, flat.Units, c.Len())
	}
	if want := 0.05 / math.Sqrt(3); math.Abs(fl.RMS-want) > 0.2*want || fl.Max > 0.05 || fl.Max < 0.04 {
		t.Errorf("flatness rms %.4g max %.4g, want rms ≈ %.4g and max just under 0.05", fl.RMS, fl.Max, want)
	}
	for i, p := range flat.Points {
		if p.X != c.Points[i].X || p.Y != c.Points[i].Y || p.Z != 0 || flat.Origins[i] != c.Origins[i] {
			t.Fatalf("point %d: %v from %v, want (x, y, 0) with its origin", i, p, c.Points[i])
		}
	}

	// Two stray points 0.5 mm off the plane fall outside the band and are
	// noted; without the band they are refused with the figures.
	c.Points = append(c.Points, Vec3{10, 1, 240.5}, Vec3{20, 2, 239.5})
	c.Origins = append(c.Origins, Origin{File: "p.csv", Line: 90}, Origin{File: "p.csv", Line: 91})
	flat, fl, err = Flatten(c, FlattenOptions{Plane: &cut, Band: 0.1})
	if err != nil || fl.Outside != 2 || flat.Len() != c.Len()-2 {
		t.Fatalf("with strays: error %v, outside %d, %d points", err, fl.Outside, flat.Len())
	}
	if n := flat.Notes[len(flat.Notes)-1]; n.Origin.Line != 91 || !strings.Contains(n.Reason, "outside the band") {
		t.Errorf("last note %+v, want the stray at line 91", n)
	}
	_, fl, err = Flatten(c, FlattenOptions{Plane: &cut, Tolerance: 0.1})
	if !errors.Is(err, ErrNotPlanar) || !strings.Contains(err.Error(), "0.5") || !strings.Contains(err.Error(), "p.csv:90") || fl.Max != 0.5 {
		t.Errorf("strays without a band: error %v, max %g; want ErrNotPlanar naming 0.5 at p.csv:90", err, fl.Max)
	}
}

// TestFlattenFit puts the NACA 2412 loop on a tilted plane and checks that
// the best fit recovers the normal to 1e-6 (exact data: the SVD of gonum
// gives it to rounding) and that the map to (u, v) keeps every distance.
func TestFlattenFit(t *testing.T) {
	n0 := Vec3{0.1, -0.2, 0.97}.Unit()
	pl := PlaneThrough(Vec3{30, -40, 250}, n0)
	loop := readTestSection()
	c := &Cloud{Dim: 3, Ordered: true, Segments: []int{0, 30}}
	for i, p := range loop {
		c.Points = append(c.Points, planeVec(pl.Origin).Add(planeVec(pl.U).Scale(p.X)).Add(planeVec(pl.V).Scale(p.Y)))
		c.Origins = append(c.Origins, Origin{File: "tilt", Line: i + 1})
	}
	flat, fl, err := Flatten(c, FlattenOptions{})
	if err != nil {
		t.Fatal(err)
	}
	n := planeVec(fl.Plane.N)
	if d := math.Min(n.Sub(n0).Norm(), n.Add(n0).Norm()); d > 1e-6 {
		t.Errorf("fitted normal %v, want ±%v (off by %g)", n, n0, d)
	}
	if fl.Max > 1e-9 || !flat.Ordered || len(flat.Segments) != 2 || flat.Segments[1] != 30 {
		t.Errorf("max %g ordered %v segments %v", fl.Max, flat.Ordered, flat.Segments)
	}
	for i := range loop {
		j := (i + 7) % len(loop)
		want := loop[i].Dist(loop[j])
		got := Point{flat.Points[i].X, flat.Points[i].Y}.Dist(Point{flat.Points[j].X, flat.Points[j].Y})
		if math.Abs(got-want) > 1e-9 {
			t.Fatalf("distance %d–%d: %g in the plane, %g in the section", i, j, got, want)
		}
	}
	// The fitted frame keeps the orientation of the section: the loop
	// stays counter-clockwise.
	if SignedArea(readTestPlanar(flat)) <= 0 {
		t.Error("fitted plane mirrored the section")
	}
}

// TestFlattenRefuses checks the refusals: far from planar (with the
// figure), too few points, collinear points, a band that keeps nothing.
func TestFlattenRefuses(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 7))
	c := &Cloud{Dim: 3}
	for i := range 50 {
		a := 2 * math.Pi * float64(i) / 50
		c.Points = append(c.Points, Vec3{100 * math.Cos(a), 100 * math.Sin(a), 10 * math.Sin(3*a) * (0.9 + 0.2*r.Float64())})
		c.Origins = append(c.Origins, Origin{File: "warped", Line: i + 1})
	}
	_, fl, err := Flatten(c, FlattenOptions{})
	if !errors.Is(err, ErrNotPlanar) || fl.Max < 8 || !strings.Contains(err.Error(), "rms") {
		t.Errorf("warped ring: error %v, max %g; want ErrNotPlanar with max ≈ 10", err, fl.Max)
	}
	if _, _, err := Flatten(&Cloud{Dim: 3, Points: c.Points[:2]}, FlattenOptions{}); !errors.Is(err, ErrTooFewPoints) {
		t.Errorf("2 points: error %v, want ErrTooFewPoints", err)
	}
	line := &Cloud{Dim: 3, Points: []Vec3{{0, 0, 0}, {1, 1, 1}, {2, 2, 2}, {3, 3, 3}}}
	if _, _, err := Flatten(line, FlattenOptions{}); !errors.Is(err, ErrCollinear) {
		t.Errorf("collinear: error %v, want ErrCollinear", err)
	}
	far := PlaneSpec{Point: Vec3{Z: 500}, Normal: Vec3{Z: 1}}
	if _, _, err := Flatten(c, FlattenOptions{Plane: &far, Band: 1}); !errors.Is(err, ErrTooFewPoints) {
		t.Errorf("band keeping nothing: error %v, want ErrTooFewPoints", err)
	}
	if _, _, err := Flatten(c, FlattenOptions{Plane: &PlaneSpec{}}); err == nil {
		t.Error("zero normal: no error")
	}
}

// TestFlatten2D checks that a 2D cloud passes through unchanged.
func TestFlatten2D(t *testing.T) {
	c, err := readTestOpen(t, "naca2412-loop.dat", ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	flat, fl, err := Flatten(c, FlattenOptions{})
	if err != nil || fl.Max != 0 || readTestMaxDist(readTestPlanar(flat), readTestPlanar(c)) != 0 || flat.Name != c.Name || !flat.Ordered {
		t.Errorf("2D cloud changed: error %v, %+v", err, fl)
	}
}
