package pointfile

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/planar"
)

// sliceTol is "floating-point accuracy" for the cut of a 150 mm section:
// the cut points are single products and sums of float64 values, so they
// are within a few ulps; 1e-12 of the chord allows that with room to spare.
const sliceTol = 1e-12 * readTestChord

// sliceTestNearest returns the distance from p to the nearest of pts.
func sliceTestNearest(p geometry.Point, pts []geometry.Point) float64 {
	d := math.Inf(1)
	for _, q := range pts {
		d = math.Min(d, p.Dist(q))
	}
	return d
}

// TestSliceExtrudedMidSpan extrudes a NACA 2412 loop (shape.NACA4, NACA
// Report 824 equations) along a swept axis, writes the mesh as binary and
// as ASCII STL, reads it back and cuts it at mid-span. Exact answer: each
// side edge from ring point b_i to the far-end point b_i + s is cut at
// b_i + s/2, and each diagonal from b_i to b_{i+1} + s at the midpoint
// (b_i + b_{i+1})/2 + s/2, so the cut is the section shifted by half the
// sweep, with the midpoints of its sides between.
func TestSliceExtrudedMidSpan(t *testing.T) {
	ring := readTestWingRing()
	sweep := geometry.Vec3{X: 20, Y: 5, Z: 300} // invented: the far end is 20 mm aft, 5 mm up
	facets := readTestExtrude(ring, sweep)
	for _, tc := range []struct {
		name  string
		data  []byte
		line  bool                  // origins carry lines
		round func(float64) float64 // how the file stores a coordinate
	}{
		{"binary", readTestSTLBinary(facets), false, func(x float64) float64 { return float64(float32(x)) }},
		{"ascii", []byte(readTestSTLASCII(facets)), true, func(x float64) float64 { return x }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			// The far-end ring as the file holds it (the near ring is
			// exact in both).
			far := make([]geometry.Point, len(ring))
			for i, p := range ring {
				far[i] = geometry.Point{X: tc.round(p.X + sweep.X), Y: tc.round(p.Y + sweep.Y)}
			}
			var want, mids []geometry.Point
			for i, p := range ring {
				j := (i + 1) % len(ring)
				want = append(want, p.Add(far[i]).Scale(0.5))
				mids = append(mids, p.Add(far[j]).Scale(0.5))
			}
			cut, err := planar.ParseSpec("z=150")
			if err != nil {
				t.Fatal(err)
			}
			c, err := Read(bytes.NewReader(tc.data), "wing.stl", Options{Cut: &cut})
			if err != nil {
				t.Fatal(err)
			}
			if c.Format != FormatSTL || c.Dim != 3 || !c.Ordered || c.Segments != nil || c.Len() != 2*len(ring) {
				t.Fatalf("format %q dim %d ordered %v segments %v, %d points; want stl 3 true nil %d",
					c.Format, c.Dim, c.Ordered, c.Segments, c.Len(), 2*len(ring))
			}
			got := make([]geometry.Point, c.Len())
			for i, p := range c.Points {
				if math.Abs(p.Z-150) > sliceTol {
					t.Fatalf("point %d at z = %.17g, want 150", i, p.Z)
				}
				got[i] = geometry.Point{X: p.X, Y: p.Y}
				o := c.Origins[i]
				if o.Entity < 1 || o.Entity > len(facets) || (o.Line > 0) != tc.line {
					t.Fatalf("origin %d = %+v", i, o)
				}
			}
			var worst float64
			for _, p := range want {
				worst = math.Max(worst, sliceTestNearest(p, got))
			}
			for _, p := range got {
				worst = math.Max(worst, math.Min(sliceTestNearest(p, want), sliceTestNearest(p, mids)))
			}
			if worst > sliceTol {
				t.Errorf("cut departs from the exact section by %g mm, want ≤ %g", worst, sliceTol)
			}
			// The loop runs around the section: consecutive points are a
			// ring point and a side midpoint, half a side apart.
			for i := range got {
				d := got[i].Dist(got[(i+1)%len(got)])
				if d > 0.51*readTestChord*math.Pi/float64(len(ring)) {
					t.Fatalf("points %d and %d are %g mm apart: the loop is not in order", i, i+1, d)
				}
			}
			t.Logf("%s: max departure from the exact cut %.3g mm", tc.name, worst)
		})
	}
}

// TestSliceThroughVertices cuts a two-storey prism exactly at the ring of
// vertices between the storeys, where every cut point is a vertex on the
// plane: the symbolic perturbation must give the ring itself, each point
// once.
func TestSliceThroughVertices(t *testing.T) {
	ring := readTestWingRing()
	lower := readTestExtrude(ring, geometry.Vec3{X: 0, Y: 0, Z: 150})
	var facets [][3]geometry.Vec3
	for _, f := range lower {
		facets = append(facets, f)
		facets = append(facets, [3]geometry.Vec3{f[0].Add(geometry.Vec3{Z: 150}), f[1].Add(geometry.Vec3{Z: 150}), f[2].Add(geometry.Vec3{Z: 150})})
	}
	m, err := ReadSTL(bytes.NewReader(readTestSTLBinary(facets)), "two.stl")
	if err != nil {
		t.Fatal(err)
	}
	c, err := m.Slice(planar.Spec{Point: geometry.Vec3{Z: 150}, Normal: geometry.Vec3{Z: 1}})
	if err != nil {
		t.Fatal(err)
	}
	if c.Len() != len(ring) || c.Segments != nil {
		t.Fatalf("%d points in runs %v, want the %d ring points in one run", c.Len(), c.Segments, len(ring))
	}
	for i, p := range c.Points {
		if d := sliceTestNearest(geometry.Point{X: p.X, Y: p.Y}, ring); d != 0 || p.Z != 150 {
			t.Errorf("point %d = %v is not a ring vertex", i, p)
		}
	}
}

func TestSliceLoopsAndHoles(t *testing.T) {
	ring := readTestWingRing()
	a := readTestExtrude(ring, geometry.Vec3{X: 0, Y: 0, Z: 300})
	var shifted []geometry.Point
	for _, p := range ring {
		shifted = append(shifted, p.Add(geometry.Point{X: 400, Y: 0}))
	}
	b := readTestExtrude(shifted, geometry.Vec3{X: 0, Y: 0, Z: 300})
	cut := planar.Spec{Point: geometry.Vec3{Z: 100}, Normal: geometry.Vec3{Z: 2}}

	m, err := ReadSTL(bytes.NewReader(readTestSTLBinary(append(a, b...))), "two.stl")
	if err != nil {
		t.Fatal(err)
	}
	c, err := m.Slice(cut)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Segments) != 2 || c.Segments[0] != 0 || c.Segments[1] != 2*len(ring) || c.Len() != 4*len(ring) {
		t.Errorf("segments %v of %d points, want [0 %d] of %d", c.Segments, c.Len(), 2*len(ring), 4*len(ring))
	}

	// Drop the two facets of one side quad: the cut becomes an open chain.
	holed := append(append([][3]geometry.Vec3{}, a[:4]...), a[6:]...)
	m, err = ReadSTL(bytes.NewReader(readTestSTLBinary(holed)), "holed.stl")
	if err != nil {
		t.Fatal(err)
	}
	c, err = m.Slice(cut)
	if err != nil {
		t.Fatal(err)
	}
	if c.Len() != 2*len(ring)-1 || len(c.Notes) != 1 || !strings.Contains(c.Notes[0].Reason, "open chain") {
		t.Errorf("%d points, notes %+v; want %d and an open-chain note", c.Len(), c.Notes, 2*len(ring)-1)
	}

	if _, err := m.Slice(planar.Spec{Point: geometry.Vec3{Z: 400}, Normal: geometry.Vec3{Z: 1}}); !errors.Is(err, geometry.ErrNoLoop) {
		t.Errorf("plane beyond the mesh: error %v, want ErrNoLoop", err)
	}
	if _, err := m.Slice(planar.Spec{Point: geometry.Vec3{Z: 1}}); err == nil {
		t.Error("zero normal: no error")
	}
}

func TestReadSTLBad(t *testing.T) {
	facets := readTestExtrude(readTestWingRing(), geometry.Vec3{X: 0, Y: 0, Z: 300})
	bin := readTestSTLBinary(facets)
	ascii := readTestSTLASCII(facets)
	nanBin := append([]byte{}, bin...)
	copy(nanBin[84+12:], []byte{0, 0, 0xc0, 0x7f}) // a float32 NaN as the first vertex x
	cut := &planar.Spec{Point: geometry.Vec3{Z: 150}, Normal: geometry.Vec3{Z: 1}}
	for _, tc := range []struct {
		name string
		data []byte
		opts Options
		want error
		line int
	}{
		{"short binary", []byte("\x00\x01\x02 not a mesh"), Options{Cut: cut}, ErrTruncated, 0},
		{"truncated binary", bin[:len(bin)-120], Options{Cut: cut}, ErrTruncated, 0},
		{"binary not STL", readTestFixtures()["invalid-not-stl.bin"], Options{Cut: cut}, ErrNotSTL, 0},
		{"binary NaN", nanBin, Options{Cut: cut}, geometry.ErrNonFinite, 0},
		{"text not STL", []byte("1 2 3\n"), Options{Format: "stl", Cut: cut}, ErrNotSTL, 0},
		{"ASCII cut off", []byte(strings.Join(strings.SplitAfter(ascii, "\n")[:8], "")), Options{Cut: cut}, ErrTruncated, 8},
		{"ASCII bad vertex", []byte("solid s\nfacet normal 0 0 1\nouter loop\nvertex 0 0 0\nvertex 1 x 0\n"), Options{Cut: cut}, ErrNotNumeric, 5},
		{"ASCII NaN", []byte("solid s\nfacet normal 0 0 1\nouter loop\nvertex 0 0 NaN\n"), Options{Cut: cut}, geometry.ErrNonFinite, 4},
		{"ASCII two coordinates", []byte("solid s\nfacet normal 0 0 1\nouter loop\nvertex 0 0\n"), Options{Cut: cut}, ErrColumnCount, 4},
		{"ASCII stray keyword", []byte("solid s\nfacet normal 0 0 1\nvertex 0 0 0\n"), Options{Cut: cut}, ErrFormat, 3},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Read(bytes.NewReader(tc.data), "m.stl", tc.opts)
			var pe *geometry.ParseError
			if !errors.Is(err, tc.want) || !errors.As(err, &pe) || pe.File != "m.stl" || pe.Line != tc.line {
				t.Errorf("error %v, want %v at line %d", err, tc.want, tc.line)
			}
		})
	}
	if _, err := Read(bytes.NewReader(bin), "m.stl", Options{}); err == nil || !strings.Contains(err.Error(), "cut plane") {
		t.Errorf("STL without a cut: error %v, want one asking for the cut plane", err)
	}
	// Trailing bytes after the last facet are noted, not fatal.
	m, err := ReadSTL(bytes.NewReader(append(append([]byte{}, bin...), make([]byte, 7)...)), "pad.stl")
	if err != nil || len(m.Notes) != 1 || len(m.Facets) != len(facets) {
		t.Errorf("padded binary: error %v, notes %+v, %d facets", err, m.Notes, len(m.Facets))
	}
}

// TestReadSTLWelds checks that the vertices shared by facets are welded.
func TestReadSTLWelds(t *testing.T) {
	ring := readTestWingRing()
	facets := readTestExtrude(ring, geometry.Vec3{X: 0, Y: 0, Z: 300})
	for _, data := range [][]byte{readTestSTLBinary(facets), []byte(readTestSTLASCII(facets))} {
		m, err := ReadSTL(bytes.NewReader(data), "w.stl")
		if err != nil {
			t.Fatal(err)
		}
		if len(m.Vertices) != 2*len(ring)+2 || len(m.Facets) != len(facets) {
			t.Errorf("%d vertices, %d facets; want %d and %d", len(m.Vertices), len(m.Facets), 2*len(ring)+2, len(facets))
		}
	}
}

// TestSliceTouching cuts simple solids where the plane only touches them or
// runs through vertices (exact answers by construction).
func TestSliceTouching(t *testing.T) {
	// Octahedron with its equator vertices on z = 0: the cut is exactly
	// those four vertices, each once.
	eq := []geometry.Vec3{{X: 1, Y: 0, Z: 0}, {X: 0, Y: 1, Z: 0}, {X: -1, Y: 0, Z: 0}, {X: 0, Y: -1, Z: 0}}
	top, bot := geometry.Vec3{X: 0, Y: 0, Z: 1}, geometry.Vec3{X: 0, Y: 0, Z: -1}
	var octa [][3]geometry.Vec3
	for i := range eq {
		j := (i + 1) % len(eq)
		octa = append(octa, [3]geometry.Vec3{eq[i], eq[j], top}, [3]geometry.Vec3{eq[j], eq[i], bot})
	}
	m, err := ReadSTL(strings.NewReader(readTestSTLASCII(octa)), "octa.stl")
	if err != nil {
		t.Fatal(err)
	}
	c, err := m.Slice(planar.Spec{Normal: geometry.Vec3{Z: 1}})
	if err != nil {
		t.Fatal(err)
	}
	if c.Len() != 4 {
		t.Fatalf("cut %v, want the 4 equator vertices", c.Points)
	}
	for _, p := range c.Points {
		found := false
		for _, q := range eq {
			found = found || p == q
		}
		if !found {
			t.Errorf("cut point %v is not an equator vertex", p)
		}
	}
	// Planes touching the solid only at an apex: the perturbed cut is a
	// loop of one repeated point, which is no loop.
	for _, cut := range []planar.Spec{{Point: top, Normal: geometry.Vec3{Z: 1}}, {Point: bot, Normal: geometry.Vec3{Z: -1}}} {
		if c, err := m.Slice(cut); !errors.Is(err, geometry.ErrNoLoop) {
			t.Errorf("plane %v touching the apex: %v, %v; want ErrNoLoop", cut, c, err)
		}
	}
}
