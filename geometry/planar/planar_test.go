package planar

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

func TestParsePlane(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want Spec
		ok   bool
	}{
		{"z=240", Spec{geometry.Vec3{Z: 240}, geometry.Vec3{Z: 1}}, true},
		{" X = -3.5 ", Spec{geometry.Vec3{X: -3.5}, geometry.Vec3{X: 1}}, true},
		{"y=0", Spec{geometry.Vec3{}, geometry.Vec3{Y: 1}}, true},
		{"1,2,3:0,0,2", Spec{geometry.Vec3{X: 1, Y: 2, Z: 3}, geometry.Vec3{X: 0, Y: 0, Z: 2}}, true},
		{"1, 2, 3 : 0.1, -0.2, 1", Spec{geometry.Vec3{X: 1, Y: 2, Z: 3}, geometry.Vec3{X: 0.1, Y: -0.2, Z: 1}}, true},
		{"w=3", Spec{}, false},
		{"z=", Spec{}, false},
		{"z=NaN", Spec{}, false},
		{"z=inf", Spec{}, false},
		{"1,2,3:0,0,0", Spec{}, false},
		{"1,2:0,0,1", Spec{}, false},
		{"1,2,3:0,0,x", Spec{}, false},
		{"240", Spec{}, false},
	} {
		got, err := ParseSpec(tc.in)
		if (err == nil) != tc.ok || got != tc.want {
			t.Errorf("ParseSpec(%q) = %v, %v; want %v (ok %v)", tc.in, got, err, tc.want, tc.ok)
		}
		if tc.ok {
			back, err := ParseSpec(got.String())
			if err != nil || back != got {
				t.Errorf("ParseSpec(%q.String() = %q) = %v, %v", tc.in, got.String(), back, err)
			}
		}
	}
}

// TestPlaneThrough checks the in-plane axes: orthonormal, right-handed, and
// the user's own axes for planes facing a global axis.
func TestPlaneThrough(t *testing.T) {
	const tol = 1e-15
	for _, tc := range []struct {
		n    geometry.Vec3
		u, v geometry.Vec3 // 0: only check the basis
	}{
		{geometry.Vec3{Z: 1}, geometry.Vec3{X: 1}, geometry.Vec3{Y: 1}},
		{geometry.Vec3{Z: -3}, geometry.Vec3{X: 1}, geometry.Vec3{Y: 1}},
		{geometry.Vec3{X: 1}, geometry.Vec3{Y: 1}, geometry.Vec3{Z: 1}},
		{geometry.Vec3{X: -1}, geometry.Vec3{Y: 1}, geometry.Vec3{Z: 1}},
		{geometry.Vec3{Y: 1}, geometry.Vec3{X: 1}, geometry.Vec3{Z: 1}},
		{geometry.Vec3{X: 1e-9, Y: -2e-9, Z: 1}, geometry.Vec3{}, geometry.Vec3{}},
		{geometry.Vec3{X: 0.6, Y: 0, Z: 0.8}, geometry.Vec3{}, geometry.Vec3{}},
		{geometry.Vec3{X: 1, Y: 1, Z: 1}, geometry.Vec3{}, geometry.Vec3{}},
	} {
		pl := Through(geometry.Vec3{X: 1, Y: 2, Z: 3}, tc.n)
		u, v, n := vec(pl.U), vec(pl.V), vec(pl.N)
		if math.Abs(u.Norm()-1) > tol || math.Abs(v.Norm()-1) > tol || math.Abs(u.Dot(v)) > tol ||
			u.Cross(v).Sub(n).Norm() > tol || math.Abs(math.Abs(n.Dot(tc.n.Unit()))-1) > tol {
			t.Errorf("normal %v: U %v V %v N %v is not a right-handed orthonormal frame", tc.n, u, v, n)
		}
		if tc.u != (geometry.Vec3{}) && (u != tc.u || v != tc.v) {
			t.Errorf("normal %v: U %v V %v, want %v %v", tc.n, u, v, tc.u, tc.v)
		}
		if tc.n.Y == 0 && tc.n.X == 0 {
			// z = const: (u, v) = (x − x0, y − y0) exactly.
			p := geometry.Vec3{X: 123.456789, Y: -0.1, Z: 7}
			if uv, _ := mapTo(pl, p); uv != (geometry.Point{X: p.X - 1, Y: p.Y - 2}) {
				t.Errorf("normal %v: (u, v) of %v = %v, want (x − 1, y − 2) exactly", tc.n, p, uv)
			}
		}
		if tc.n == (geometry.Vec3{X: 1e-9, Y: -2e-9, Z: 1}) && (u.X < 0.999 || v.Y < 0.999) {
			t.Errorf("near-z normal %v: U %v V %v, want close to x and y", tc.n, u, v)
		}
	}
}

// TestFlattenBand reads the invented probe file (NACA 2412 at z = 240 mm
// with uniform noise of ±0.05 mm) with the cut z=240 and a band of 0.1 mm:
// all points are kept, (u, v) are exactly (x, y), and the flatness is the
// noise: its RMS is within 20 % of the RMS of the uniform distribution,
// 0.05/√3 = 0.0289 mm (exact for the distribution; 60 samples).
// TestFlattenFit puts the NACA 2412 loop on a tilted plane and checks that
// the best fit recovers the normal to 1e-6 (exact data: the SVD of gonum
// gives it to rounding) and that the map to (u, v) keeps every distance.
func TestFlattenFit(t *testing.T) {
	n0 := geometry.Vec3{X: 0.1, Y: -0.2, Z: 0.97}.Unit()
	pl := Through(geometry.Vec3{X: 30, Y: -40, Z: 250}, n0)
	loop := flattenTestLoop()
	c := &geometry.Cloud{Dim: 3, Ordered: true, Segments: []int{0, 30}}
	for i, p := range loop {
		c.Points = append(c.Points, vec(pl.Origin).Add(vec(pl.U).Scale(p.X)).Add(vec(pl.V).Scale(p.Y)))
		c.Origins = append(c.Origins, geometry.Origin{File: "tilt", Line: i + 1})
	}
	flat, fl, err := Flatten(c, FlattenOptions{})
	if err != nil {
		t.Fatal(err)
	}
	n := vec(fl.Plane.N)
	if d := math.Min(n.Sub(n0).Norm(), n.Add(n0).Norm()); d > 1e-6 {
		t.Errorf("fitted normal %v, want ±%v (off by %g)", n, n0, d)
	}
	if fl.Max > 1e-9 || !flat.Ordered || len(flat.Segments) != 2 || flat.Segments[1] != 30 {
		t.Errorf("max %g ordered %v segments %v", fl.Max, flat.Ordered, flat.Segments)
	}
	for i := range loop {
		j := (i + 7) % len(loop)
		want := loop[i].Dist(loop[j])
		got := geometry.Point{X: flat.Points[i].X, Y: flat.Points[i].Y}.Dist(geometry.Point{X: flat.Points[j].X, Y: flat.Points[j].Y})
		if math.Abs(got-want) > 1e-9 {
			t.Fatalf("distance %d–%d: %g in the plane, %g in the section", i, j, got, want)
		}
	}
	// The fitted frame keeps the orientation of the section: the loop
	// stays counter-clockwise.
	if geometry.SignedArea(flattenTestXY(flat)) <= 0 {
		t.Error("fitted plane mirrored the section")
	}
}

// TestFlattenRefuses checks the refusals: far from planar (with the
// figure), too few points, collinear points, a band that keeps nothing.
func TestFlattenRefuses(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 7))
	c := &geometry.Cloud{Dim: 3}
	for i := range 50 {
		a := 2 * math.Pi * float64(i) / 50
		c.Points = append(c.Points, geometry.Vec3{X: 100 * math.Cos(a), Y: 100 * math.Sin(a), Z: 10 * math.Sin(3*a) * (0.9 + 0.2*r.Float64())})
		c.Origins = append(c.Origins, geometry.Origin{File: "warped", Line: i + 1})
	}
	_, fl, err := Flatten(c, FlattenOptions{})
	if !errors.Is(err, ErrNotPlanar) || fl.Max < 8 || !strings.Contains(err.Error(), "rms") {
		t.Errorf("warped ring: error %v, max %g; want ErrNotPlanar with max ≈ 10", err, fl.Max)
	}
	if _, _, err := Flatten(&geometry.Cloud{Dim: 3, Points: c.Points[:2]}, FlattenOptions{}); !errors.Is(err, geometry.ErrTooFewPoints) {
		t.Errorf("2 points: error %v, want ErrTooFewPoints", err)
	}
	line := &geometry.Cloud{Dim: 3, Points: []geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 1, Z: 1}, {X: 2, Y: 2, Z: 2}, {X: 3, Y: 3, Z: 3}}}
	if _, _, err := Flatten(line, FlattenOptions{}); !errors.Is(err, geometry.ErrCollinear) {
		t.Errorf("collinear: error %v, want ErrCollinear", err)
	}
	far := Spec{Point: geometry.Vec3{Z: 500}, Normal: geometry.Vec3{Z: 1}}
	if _, _, err := Flatten(c, FlattenOptions{Plane: &far, Band: 1}); !errors.Is(err, geometry.ErrTooFewPoints) {
		t.Errorf("band keeping nothing: error %v, want ErrTooFewPoints", err)
	}
	if _, _, err := Flatten(c, FlattenOptions{Plane: &Spec{}}); err == nil {
		t.Error("zero normal: no error")
	}
}

// flattenTestLoop returns the NACA 2412 loop (NACA Report 824 equations,
// 30 points per surface, open trailing edge) at a chord of 150 mm.
func flattenTestLoop() []geometry.Point {
	loop := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}.Loop(30)
	for i := range loop {
		loop[i] = loop[i].Scale(150)
	}
	return loop
}

// flattenTestXY returns the (x, y) of the cloud's points.
func flattenTestXY(c *geometry.Cloud) []geometry.Point {
	out := make([]geometry.Point, len(c.Points))
	for i, p := range c.Points {
		out[i] = geometry.Point{X: p.X, Y: p.Y}
	}
	return out
}

// TestFlattenNoisyPlane checks that the default tolerance makes room for
// the measured out-of-plane scatter of a noisy scan (its largest residual
// is beyond a plain share of the extent), that the scatter comes back
// near the noise drawn, and that a smooth warp of the same points beyond
// the tolerance is still refused with the figure.
func TestFlattenNoisyPlane(t *testing.T) {
	const n, sigma = 3000, 0.05 // a 100 mm thin ellipse, 0.05 mm noise (a laser scan)
	r := rand.New(rand.NewPCG(3, 9))
	noisy := &geometry.Cloud{Dim: 3}
	warped := &geometry.Cloud{Dim: 3}
	for i := range n {
		a := 2 * math.Pi * r.Float64()
		x, y := 50*math.Cos(a), 6*math.Sin(a)
		z := sigma * r.NormFloat64()
		noisy.Points = append(noisy.Points, geometry.Vec3{X: x, Y: y, Z: 240 + z})
		warped.Points = append(warped.Points, geometry.Vec3{X: x, Y: y, Z: 240 + z + 0.8*(x/50)*(x/50)*(y/6)})
		o := geometry.Origin{File: "scan", Line: i + 1}
		noisy.Origins = append(noisy.Origins, o)
		warped.Origins = append(warped.Origins, o)
	}
	_, fl, err := Flatten(noisy, FlattenOptions{})
	if err != nil {
		t.Fatalf("noisy plane refused: %v", err)
	}
	if base := DefaultFlatTolerance * 100; fl.Max <= base {
		t.Fatalf("max %g within the plain tolerance %g: the test does not test the allowance", fl.Max, base)
	}
	if fl.Scatter < 0.8*sigma || fl.Scatter > 1.2*sigma {
		t.Errorf("scatter %g, want %g ± 20 %%", fl.Scatter, sigma)
	}
	_, fl, err = Flatten(warped, FlattenOptions{})
	if !errors.Is(err, ErrNotPlanar) || !strings.Contains(err.Error(), "scatter") {
		t.Errorf("warped: error %v (max %g, scatter %g); want ErrNotPlanar with the scatter", err, fl.Max, fl.Scatter)
	}
}

// TestFlattenSteppedPlane: a voxelised scan writes its coordinates on a
// grid (here 0.15 mm, three times the noise), so most neighbours share
// their z and the median of the neighbour errors is 0; the scatter must
// still come out near the spread the grid leaves (the noise and the
// rounding, σ² + step²/12 at most) and the points pass, while the same
// points warped beyond the tolerance are still refused.
func TestFlattenSteppedPlane(t *testing.T) {
	const n, sigma, step = 3000, 0.05, 0.15
	r := rand.New(rand.NewPCG(5, 11))
	grid := func(v float64) float64 { return math.Round(v/step) * step }
	stepped := &geometry.Cloud{Dim: 3}
	warped := &geometry.Cloud{Dim: 3}
	for i := range n {
		a := 2 * math.Pi * r.Float64()
		x, y := 50*math.Cos(a), 6*math.Sin(a)
		z := 240 + sigma*r.NormFloat64()
		stepped.Points = append(stepped.Points, geometry.Vec3{X: grid(x), Y: grid(y), Z: grid(z)})
		warped.Points = append(warped.Points, geometry.Vec3{X: grid(x), Y: grid(y), Z: grid(z + 0.8*(x/50)*(x/50)*(y/6))})
		o := geometry.Origin{File: "scan", Line: i + 1}
		stepped.Origins = append(stepped.Origins, o)
		warped.Origins = append(warped.Origins, o)
	}
	_, fl, err := Flatten(stepped, FlattenOptions{})
	if err != nil {
		t.Fatalf("stepped plane refused: %v", err)
	}
	if top := math.Sqrt(sigma*sigma + step*step/12); fl.Scatter < 0.5*sigma || fl.Scatter > 1.5*top {
		t.Errorf("scatter %g, want between %g and %g", fl.Scatter, 0.5*sigma, 1.5*top)
	}
	if _, _, err = Flatten(warped, FlattenOptions{}); !errors.Is(err, ErrNotPlanar) {
		t.Errorf("warped: error %v, want ErrNotPlanar", err)
	}
}

// TestFlattenStrays: a noisy scan in a plane with a few points thrown off
// it alone (a speck the beam caught) is flattened with those points
// dropped as strays, each listed; a smooth warp beyond the tolerance, and a
// scan with too many points off the plane (2 %), are still refused.
func TestFlattenStrays(t *testing.T) {
	const n, sigma = 3000, 0.05 // a 100 mm thin ellipse, 0.05 mm noise
	r := rand.New(rand.NewPCG(7, 13))
	make3 := func(off map[int]float64, warp float64) *geometry.Cloud {
		c := &geometry.Cloud{Dim: 3}
		r := rand.New(rand.NewPCG(7, 13))
		for i := range n {
			a := 2 * math.Pi * r.Float64()
			x, y := 50*math.Cos(a), 6*math.Sin(a)
			z := 240 + sigma*r.NormFloat64() + off[i] + warp*(x/50)*(x/50)*(y/6)
			c.Points = append(c.Points, geometry.Vec3{X: x, Y: y, Z: z})
			c.Origins = append(c.Origins, geometry.Origin{File: "scan", Line: i + 1})
		}
		return c
	}
	few := map[int]float64{100: 1.5, 1700: -2, 2900: 1.2}
	_, fl, err := Flatten(make3(few, 0), FlattenOptions{})
	if err != nil {
		t.Fatalf("a plane with %d strays refused: %v", len(few), err)
	}
	if len(fl.Strays) != len(few) {
		t.Fatalf("strays %v, want lines 101, 1701, 2901", fl.Strays)
	}
	for _, st := range fl.Strays {
		if want := few[st.Origin.Line-1]; math.Abs(st.Distance-want) > 5*sigma {
			t.Errorf("stray at line %d: distance %g, want %g within the noise", st.Origin.Line, st.Distance, want)
		}
	}
	if fl.Kept != n-len(few) || fl.Max > fl.Tolerance {
		t.Errorf("kept %d (want %d), max %g beyond the tolerance %g", fl.Kept, n-len(few), fl.Max, fl.Tolerance)
	}
	if _, _, err := Flatten(make3(nil, 2), FlattenOptions{}); !errors.Is(err, ErrNotPlanar) {
		t.Errorf("warped: error %v, want ErrNotPlanar", err)
	}
	many := map[int]float64{}
	for len(many) < n/50 {
		many[r.IntN(n)] = 1.5
	}
	if _, _, err := Flatten(make3(many, 0), FlattenOptions{}); !errors.Is(err, ErrNotPlanar) {
		t.Errorf("%d points off the plane: error %v, want ErrNotPlanar", len(many), err)
	}
	// A tolerance the user gives is theirs: nothing is dropped.
	if _, _, err := Flatten(make3(few, 0), FlattenOptions{Tolerance: 0.5}); !errors.Is(err, ErrNotPlanar) {
		t.Errorf("given tolerance: error %v, want ErrNotPlanar", err)
	}
}

// TestFlattenCoarseGrid: a scan at constant z with 0.04 mm of noise,
// written on a 0.19 mm grid (a voxelised scan), puts most points on one
// level and a few on the next, a whole step off the plane fitted between
// them; the grid's step is allowed for, and the same points warped by
// 2 mm are still refused.
func TestFlattenCoarseGrid(t *testing.T) {
	const n, sigma, step = 650, 0.04, 0.19
	r := rand.New(rand.NewPCG(11, 5))
	grid := func(v float64) float64 { return math.Round(v/step) * step }
	flat := &geometry.Cloud{Dim: 3}
	warped := &geometry.Cloud{Dim: 3}
	for i := range n {
		a := 2 * math.Pi * r.Float64()
		x, y := 47*math.Cos(a), 6*math.Sin(a)
		z := 82.1 + sigma*r.NormFloat64()
		flat.Points = append(flat.Points, geometry.Vec3{X: x, Y: y, Z: grid(z)})
		warped.Points = append(warped.Points, geometry.Vec3{X: x, Y: y, Z: grid(z + 2*(x/47)*(x/47)*(y/6))})
		o := geometry.Origin{File: "vox", Line: i + 1}
		flat.Origins = append(flat.Origins, o)
		warped.Origins = append(warped.Origins, o)
	}
	levels := map[float64]int{}
	for _, p := range flat.Points {
		levels[p.Z]++
	}
	if len(levels) < 2 {
		t.Fatalf("all points on one level: the test does not make the case")
	}
	_, fl, err := Flatten(flat, FlattenOptions{})
	if err != nil {
		t.Fatalf("a flat scan on a coarse grid refused: %v", err)
	}
	if fl.Tolerance < step {
		t.Errorf("tolerance %g does not allow for the grid's step %g", fl.Tolerance, step)
	}
	if _, _, err = Flatten(warped, FlattenOptions{}); !errors.Is(err, ErrNotPlanar) {
		t.Errorf("warped: error %v, want ErrNotPlanar", err)
	}
}
