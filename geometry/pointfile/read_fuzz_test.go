package pointfile

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/planar"
)

// The seeds include whole fixtures (up to 37 kB); with them the fuzzer
// spends long stretches minimizing new inputs, so run each target with a
// short minimize time, e.g.
//
//	go test ./geometry/pointfile -run '^$' -fuzz '^FuzzReadSTL$' -fuzztime=40s -fuzzminimizetime=2s

// readFuzzMax skips inputs larger than this: the readers are linear, and
// big inputs only slow the fuzzer down.
const readFuzzMax = 1 << 16

// readFuzzSeed adds the named fixtures and the given strings to the corpus.
func readFuzzSeed(f *testing.F, files []string, extra ...string) {
	for _, name := range files {
		data, err := os.ReadFile(filepath.Join("testdata", name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	for _, s := range extra {
		f.Add([]byte(s))
	}
}

// readFuzzCheck checks the invariants of any cloud a reader returns.
func readFuzzCheck(t *testing.T, c *geometry.Cloud) {
	t.Helper()
	if c.Len() == 0 || len(c.Origins) != c.Len() {
		t.Fatalf("%d points, %d origins", c.Len(), len(c.Origins))
	}
	if c.Dim != 2 && c.Dim != 3 {
		t.Fatalf("dim %d", c.Dim)
	}
	for i, p := range c.Points {
		if !p.IsFinite() || (c.Dim == 2 && p.Z != 0) {
			t.Fatalf("point %d = %v in a %dD cloud", i, p, c.Dim)
		}
	}
	if c.Segments != nil {
		if !c.Ordered || len(c.Segments) < 2 || c.Segments[0] != 0 {
			t.Fatalf("segments %v (ordered %v)", c.Segments, c.Ordered)
		}
		for i := 1; i < len(c.Segments); i++ {
			if c.Segments[i] <= c.Segments[i-1] || c.Segments[i] >= c.Len() {
				t.Fatalf("segments %v of %d points", c.Segments, c.Len())
			}
		}
	}
	if len(c.Notes) > geometry.MaxNotes+16 {
		t.Fatalf("%d notes", len(c.Notes))
	}
}

// readFuzzParseError checks that a reader error is a *ParseError for file.
func readFuzzParseError(t *testing.T, err error, file string) {
	t.Helper()
	var pe *geometry.ParseError
	if !errors.As(err, &pe) || pe.File != file || pe.Err == nil || pe.Line < 0 {
		t.Fatalf("error %v is not a *ParseError for %s", err, file)
	}
}

// FuzzReadDelimited reads any input as delimited text; what it reads must
// round-trip through WriteCSV and Read with Columns "x,y" to the same
// points.
func FuzzReadDelimited(f *testing.F) {
	readFuzzSeed(f, []string{"naca2412-semicolon.csv", "naca2412-tab.txt", "naca2412-probe-z240.csv",
		"invalid-one-coordinate.csv", "invalid-nan.csv", "invalid-unit.csv"},
		"1 2\n3 4\n", "x;y\n1,5;2,5\n", "3\n1 2\n3 4\n5 6\n", "\"x\",\"y\"\n\"1\",\"2\"\n", "1\t2,5\n")
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > readFuzzMax {
			t.Skip()
		}
		c, err := Read(bytes.NewReader(data), "fuzz", Options{Format: FormatDelimited})
		if err != nil {
			readFuzzParseError(t, err, "fuzz")
			return
		}
		readFuzzCheck(t, c)
		var buf bytes.Buffer
		if err := WriteCSV(&buf, readTestPlanar(c), c.Origins); err != nil {
			t.Fatal(err)
		}
		back, err := Read(bytes.NewReader(buf.Bytes()), "back", Options{Columns: "x,y"})
		if err != nil {
			t.Fatalf("re-reading the written points: %v\n%s", err, buf.String())
		}
		if d := readTestMaxDist(readTestPlanar(back), readTestPlanar(c)); d != 0 && !math.IsNaN(d) {
			t.Fatalf("round trip moved the points by %g", d)
		}
		for i, p := range back.Points {
			if q := c.Points[i]; p.X != q.X || p.Y != q.Y || math.Signbit(p.X) != math.Signbit(q.X) {
				t.Fatalf("point %d: %v back, %v written", i, p, q)
			}
		}
	})
}

// FuzzReadListing reads any input with format detection, and as each
// listing: never a panic, only *ParseErrors, valid clouds.
func FuzzReadListing(f *testing.F) {
	readFuzzSeed(f, []string{"naca2412-loop.dat", "naca2412-surfaces.dat", "invalid-no-numbers.txt"},
		"N\n1 0\n0 0.1\n0 0\n0 -0.1\n1 0\n", "N\n2. 2.\n0 0\n1 1\n0 0\n1 -1\n", "N\n1. 1.\n0 0\n\n0 0\n")
	cut := &planar.Spec{Normal: geometry.Vec3{Z: 1}}
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > readFuzzMax {
			t.Skip()
		}
		for _, format := range []string{"", FormatLoop, FormatSurfaces} {
			c, err := Read(bytes.NewReader(data), "fuzz", Options{Format: format, Cut: cut})
			if err != nil {
				if format != "" {
					readFuzzParseError(t, err, "fuzz")
				}
				continue
			}
			readFuzzCheck(t, c)
			if format != "" && (!c.Ordered || c.Dim != 2 || c.Format != format) {
				t.Fatalf("%s: ordered %v dim %d format %q", format, c.Ordered, c.Dim, c.Format)
			}
		}
	})
}

// FuzzReadDXF reads any input as ASCII DXF.
func FuzzReadDXF(f *testing.F) {
	readFuzzSeed(f, []string{"naca2412-lwpolyline.dxf", "naca2412-lines.dxf", "naca2412-polyline.dxf",
		"naca2412-spline.dxf", "invalid-no-entities.dxf"},
		readTestDXF(dxfTestLine(geometry.Point{X: 0, Y: 0}, geometry.Point{X: 1, Y: 0})+dxfTestLine(geometry.Point{X: 1, Y: 0}, geometry.Point{X: 0, Y: 0})),
		readTestDXF(dxfTestLW([]geometry.Point{{X: 1, Y: 2}, {X: 3, Y: 4}, {X: 1, Y: 2}}, 1, "210\n0\n220\n0.5\n230\n-1\n")),
		readTestDXF("  0\nPOINT\n 10\n1\n 20\n2\n  0\nPOLYLINE\n 70\n64\n  0\nVERTEX\n 10\n1\n  0\nSEQEND\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > readFuzzMax {
			t.Skip()
		}
		c, err := Read(bytes.NewReader(data), "fuzz", Options{Format: FormatDXF})
		if err != nil {
			readFuzzParseError(t, err, "fuzz")
			return
		}
		readFuzzCheck(t, c)
		for i, o := range c.Origins {
			if o.Entity < 1 || o.Line < 1 {
				t.Fatalf("origin %d = %+v", i, o)
			}
		}
	})
}

// FuzzReadSTL reads any input as STL and cuts it through the middle of its
// vertices with a tilted plane and with a plane through a vertex.
func FuzzReadSTL(f *testing.F) {
	readFuzzSeed(f, []string{"wing-binary.stl", "wing-ascii.stl", "invalid-truncated.stl", "invalid-not-stl.bin"},
		"solid t\nfacet normal 0 0 1\nouter loop\nvertex 0 0 0\nvertex 1 0 1\nvertex 0 1 2\nendloop\nendfacet\nendsolid t\n")
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > readFuzzMax {
			t.Skip()
		}
		m, err := ReadSTL(bytes.NewReader(data), "fuzz")
		if err != nil {
			readFuzzParseError(t, err, "fuzz")
			return
		}
		for _, f := range m.Facets {
			for _, k := range f {
				if k < 0 || k >= len(m.Vertices) {
					t.Fatalf("facet %v with %d vertices", f, len(m.Vertices))
				}
			}
		}
		if len(m.Vertices) == 0 {
			return
		}
		var mid geometry.Vec3
		for _, v := range m.Vertices {
			mid = mid.Add(v.Scale(1 / float64(len(m.Vertices))))
		}
		for _, cut := range []planar.Spec{{Point: mid, Normal: geometry.Vec3{X: 0.3, Y: -0.2, Z: 1}}, {Point: m.Vertices[0], Normal: geometry.Vec3{X: 0, Y: 0, Z: 1}}} {
			if !cut.Point.IsFinite() {
				continue
			}
			c, err := m.Slice(cut)
			if err != nil {
				if !errors.Is(err, geometry.ErrNoLoop) {
					t.Fatalf("cut %v: %v", cut, err)
				}
				continue
			}
			readFuzzCheck(t, c)
			for i, o := range c.Origins {
				if o.Entity < 1 || o.Entity > len(m.Facets) {
					t.Fatalf("origin %d = %+v of %d facets", i, o, len(m.Facets))
				}
			}
		}
	})
}
