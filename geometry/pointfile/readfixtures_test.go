package pointfile

import (
	"bytes"
	"encoding/binary"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// The reader fixtures under testdata/ are all generated here, from the NACA
// 4-digit equations of NACA Report 824 (shape.NACA4) with invented
// scales and invented noise; none is measured. Regenerate them with
//
//	go test ./geometry/pointfile -run TestReadFixturesCurrent -update-read-fixtures
var readUpdateFixtures = flag.Bool("update-read-fixtures", false, "rewrite the reader fixtures in testdata/")

// readTestChord is the invented chord of the demo section, in mm.
const readTestChord = 150.0

// readTestF formats a coordinate as the fixtures write it: 6 decimals.
func readTestF(x float64) string { return strconv.FormatFloat(x, 'f', 6, 64) }

// readTestSection returns the NACA 2412 loop (30 points per surface, open
// trailing edge, chord 150 mm) as the fixtures hold it: each coordinate
// rounded to 6 decimals.
func readTestSection() []geometry.Point {
	n, err := shape.ParseNACA4("2412")
	if err != nil {
		panic(err)
	}
	loop := n.Loop(30)
	for i, p := range loop {
		x, _ := strconv.ParseFloat(readTestF(p.X*readTestChord), 64)
		y, _ := strconv.ParseFloat(readTestF(p.Y*readTestChord), 64)
		loop[i] = geometry.Point{X: x, Y: y}
	}
	return loop
}

const readTestName = "NACA 2412, chord 150 mm, generated from the NACA Report 824 equations"

func readTestLoopListing() string {
	var b strings.Builder
	b.WriteString(readTestName + "\n")
	for _, p := range readTestSection() {
		fmt.Fprintf(&b, "%12s %12s\n", readTestF(p.X), readTestF(p.Y))
	}
	return b.String()
}

func readTestSurfacesListing() string {
	loop := readTestSection()
	le := len(loop) / 2
	var b strings.Builder
	b.WriteString(readTestName + "\n")
	fmt.Fprintf(&b, "%d. %d.\n\n", le+1, le+1)
	for i := le; i >= 0; i-- { // upper: leading to trailing edge
		fmt.Fprintf(&b, "%s %s\n", readTestF(loop[i].X), readTestF(loop[i].Y))
	}
	b.WriteString("\n")
	for i := le; i < len(loop); i++ { // lower: leading to trailing edge
		fmt.Fprintf(&b, "%s %s\n", readTestF(loop[i].X), readTestF(loop[i].Y))
	}
	return b.String()
}

// readTestDXF wraps entity text in a DXF file with $INSUNITS = 4 (mm).
func readTestDXF(entities string) string {
	return "999\nfoilwright test fixture, generated\n  0\nSECTION\n  2\nHEADER\n  9\n$INSUNITS\n 70\n4\n  0\nENDSEC\n" +
		"  0\nSECTION\n  2\nENTITIES\n" + entities + "  0\nENDSEC\n  0\nEOF\n"
}

func readTestDXFLWPolyline() string {
	loop := readTestSection()
	var b strings.Builder
	fmt.Fprintf(&b, "  0\nLWPOLYLINE\n  8\nsection\n 90\n%d\n 70\n0\n", len(loop))
	for _, p := range loop {
		fmt.Fprintf(&b, " 10\n%s\n 20\n%s\n", readTestF(p.X), readTestF(p.Y))
	}
	return readTestDXF(b.String())
}

func readTestDXFLines() string {
	loop := readTestSection()
	var b strings.Builder
	b.WriteString("  0\nTEXT\n  8\nnotes\n 10\n0.0\n 20\n-20.0\n 30\n0.0\n 40\n2.5\n  1\nNACA 2412\n")
	for i := 0; i+1 < len(loop); i++ {
		p, q := loop[i], loop[i+1]
		fmt.Fprintf(&b, "  0\nLINE\n  8\nsection\n 10\n%s\n 20\n%s\n 30\n0.0\n 11\n%s\n 21\n%s\n 31\n0.0\n",
			readTestF(p.X), readTestF(p.Y), readTestF(q.X), readTestF(q.Y))
	}
	return readTestDXF(b.String())
}

func readTestDXFPolyline() string {
	var b strings.Builder
	b.WriteString("  0\nPOLYLINE\n  8\nsection\n 66\n1\n 10\n0.0\n 20\n0.0\n 30\n0.0\n 70\n0\n")
	for _, p := range readTestSection() {
		fmt.Fprintf(&b, "  0\nVERTEX\n  8\nsection\n 10\n%s\n 20\n%s\n 30\n0.0\n", readTestF(p.X), readTestF(p.Y))
	}
	b.WriteString("  0\nSEQEND\n  8\nsection\n")
	return readTestDXF(b.String())
}

func readTestDXFSpline() string {
	loop := readTestSection()
	var b strings.Builder
	fmt.Fprintf(&b, "  0\nSPLINE\n  8\nsection\n210\n0.0\n220\n0.0\n230\n1.0\n 70\n8\n 71\n3\n 72\n0\n 73\n0\n 74\n%d\n", len(loop))
	for _, p := range loop {
		fmt.Fprintf(&b, " 11\n%s\n 21\n%s\n 31\n0.0\n", readTestF(p.X), readTestF(p.Y))
	}
	return readTestDXF(b.String())
}

func readTestSemicolon() string {
	var b strings.Builder
	b.WriteString("# units: mm\n# decimal comma, as a spreadsheet in a comma locale writes it\nx;y\n")
	for _, p := range readTestSection() {
		fmt.Fprintf(&b, "%s;%s\n", strings.ReplaceAll(readTestF(p.X), ".", ","), strings.ReplaceAll(readTestF(p.Y), ".", ","))
	}
	return b.String()
}

func readTestTab() string {
	var b strings.Builder
	b.WriteString("Section export\nX [mm]\tY [mm]\n")
	for _, p := range readTestSection() {
		fmt.Fprintf(&b, "%s\t%s\n", readTestF(p.X), readTestF(p.Y))
	}
	return b.String()
}

// readTestProbe returns the section as a 3D probe file: the points shuffled,
// at z = 240 mm with invented uniform noise of ±0.05 mm across the plane
// (fixed seed), as comma-separated text with a header.
func readTestProbe() (string, []geometry.Vec3) {
	r := rand.New(rand.NewPCG(2412, 240))
	loop := readTestSection()
	loop = loop[:len(loop)-1]
	r.Shuffle(len(loop), func(i, j int) { loop[i], loop[j] = loop[j], loop[i] })
	var b strings.Builder
	b.WriteString("# invented probe points for tests: NACA 2412 at z = 240 mm with +-0.05 mm noise\nx [mm],y [mm],z [mm]\n")
	pts := make([]geometry.Vec3, len(loop))
	for i, p := range loop {
		z := 240 + 0.1*(r.Float64()-0.5)
		zs := readTestF(z)
		z, _ = strconv.ParseFloat(zs, 64)
		pts[i] = geometry.Vec3{X: p.X, Y: p.Y, Z: z}
		fmt.Fprintf(&b, "%s,%s,%s\n", readTestF(p.X), readTestF(p.Y), zs)
	}
	return b.String(), pts
}

// readTestExtrude returns the facets of a prism: the closed loop ring
// (points not repeated) at z = 0 and shifted by top at the far end, with
// fan caps. The facets wind so that their normals point outwards for a
// counter-clockwise ring.
func readTestExtrude(ring []geometry.Point, top geometry.Vec3) [][3]geometry.Vec3 {
	n := len(ring)
	bot := make([]geometry.Vec3, n)
	up := make([]geometry.Vec3, n)
	var c geometry.Point
	for i, p := range ring {
		bot[i] = geometry.Vec3{X: p.X, Y: p.Y, Z: 0}
		up[i] = bot[i].Add(top)
		c = c.Add(p)
	}
	c = c.Scale(1 / float64(n))
	cb, ct := geometry.Vec3{X: c.X, Y: c.Y, Z: 0}, geometry.Vec3{X: c.X, Y: c.Y, Z: 0}.Add(top)
	var f [][3]geometry.Vec3
	for i := range n {
		j := (i + 1) % n
		f = append(f, [3]geometry.Vec3{bot[i], bot[j], up[j]}, [3]geometry.Vec3{bot[i], up[j], up[i]})
		f = append(f, [3]geometry.Vec3{cb, bot[j], bot[i]}, [3]geometry.Vec3{ct, up[i], up[j]})
	}
	return f
}

// readTestSTLBinary writes facets as a binary STL (float32 coordinates).
func readTestSTLBinary(facets [][3]geometry.Vec3) []byte {
	var b bytes.Buffer
	hdr := make([]byte, 80)
	copy(hdr, "solid wing (generated test fixture)")
	b.Write(hdr)
	binary.Write(&b, binary.LittleEndian, uint32(len(facets)))
	for _, f := range facets {
		nrm := f[1].Sub(f[0]).Cross(f[2].Sub(f[0])).Unit()
		vals := []float64{nrm.X, nrm.Y, nrm.Z}
		for _, v := range f {
			vals = append(vals, v.X, v.Y, v.Z)
		}
		for _, v := range vals {
			binary.Write(&b, binary.LittleEndian, float32(v))
		}
		b.Write([]byte{0, 0})
	}
	return b.Bytes()
}

// readTestSTLASCII writes facets as ASCII STL, coordinates in full.
func readTestSTLASCII(facets [][3]geometry.Vec3) string {
	var b strings.Builder
	g := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	b.WriteString("solid wing\n")
	for _, f := range facets {
		nrm := f[1].Sub(f[0]).Cross(f[2].Sub(f[0])).Unit()
		fmt.Fprintf(&b, "  facet normal %s %s %s\n    outer loop\n", g(nrm.X), g(nrm.Y), g(nrm.Z))
		for _, v := range f {
			fmt.Fprintf(&b, "      vertex %s %s %s\n", g(v.X), g(v.Y), g(v.Z))
		}
		b.WriteString("    endloop\n  endfacet\n")
	}
	b.WriteString("endsolid wing\n")
	return b.String()
}

// readTestWingRing returns the ring of the STL fixtures: NACA 2412 with a
// closed trailing edge, 20 points per surface, chord 150 mm, coordinates
// rounded to float32 so that a binary STL holds them exactly.
func readTestWingRing() []geometry.Point {
	n := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	loop := n.Loop(20)
	loop = loop[:len(loop)-1] // first and last coincide
	for i, p := range loop {
		loop[i] = geometry.Point{X: float64(float32(p.X * readTestChord)), Y: float64(float32(p.Y * readTestChord))}
	}
	return loop
}

// readTestFixtures returns every fixture file by name.
func readTestFixtures() map[string][]byte {
	probe, _ := readTestProbe()
	wing := readTestExtrude(readTestWingRing(), geometry.Vec3{X: 0, Y: 0, Z: 300})
	bin := readTestSTLBinary(wing)
	notSTL := make([]byte, 600)
	r := rand.New(rand.NewPCG(1, 2))
	for i := range notSTL {
		notSTL[i] = byte(r.UintN(256))
	}
	copy(notSTL, "\x89PNG\r\n\x1a\n") // a binary that starts like an image
	return map[string][]byte{
		"naca2412-loop.dat":          []byte(readTestLoopListing()),
		"naca2412-surfaces.dat":      []byte(readTestSurfacesListing()),
		"naca2412-lwpolyline.dxf":    []byte(readTestDXFLWPolyline()),
		"naca2412-lines.dxf":         []byte(readTestDXFLines()),
		"naca2412-polyline.dxf":      []byte(readTestDXFPolyline()),
		"naca2412-spline.dxf":        []byte(readTestDXFSpline()),
		"naca2412-semicolon.csv":     []byte(readTestSemicolon()),
		"naca2412-tab.txt":           []byte(readTestTab()),
		"naca2412-probe-z240.csv":    []byte(probe),
		"wing-binary.stl":            bin,
		"wing-ascii.stl":             []byte(readTestSTLASCII(wing)),
		"invalid-empty.csv":          {},
		"invalid-no-numbers.txt":     []byte("Section export\nno coordinates were written\n"),
		"invalid-one-coordinate.csv": []byte("x,y\n1.5,2.5\n3.5\n"),
		"invalid-nan.csv":            []byte("x,y\n1.5,2.5\nNaN,2.5\n"),
		"invalid-not-stl.bin":        notSTL,
		"invalid-truncated.stl":      bin[:len(bin)-75],
		"invalid-no-entities.dxf":    []byte(readTestDXF("  0\nCIRCLE\n  8\n0\n 10\n0.0\n 20\n0.0\n 30\n0.0\n 40\n5.0\n")),
		"invalid-unit.csv":           []byte("# units: furlongs\nx,y\n1,2\n3,4\n"),
	}
}

// TestReadFixturesCurrent checks that testdata/ holds exactly what the
// generators above make (or rewrites it with -update-read-fixtures).
func TestReadFixturesCurrent(t *testing.T) {
	for name, want := range readTestFixtures() {
		path := filepath.Join("testdata", name)
		if *readUpdateFixtures {
			if err := os.WriteFile(path, want, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		got, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%v (run with -update-read-fixtures)", err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("testdata/%s is stale: run go test ./geometry/pointfile -run TestReadFixturesCurrent -update-read-fixtures", name)
		}
	}
}

// readTestOpen reads a fixture with opts.
func readTestOpen(t testing.TB, name string, opts Options) (*geometry.Cloud, error) {
	t.Helper()
	f, err := os.Open(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	return Read(f, name, opts)
}

// readTestPlanar returns the (x, y) of the cloud's points.
func readTestPlanar(c *geometry.Cloud) []geometry.Point {
	out := make([]geometry.Point, len(c.Points))
	for i, p := range c.Points {
		out[i] = geometry.Point{X: p.X, Y: p.Y}
	}
	return out
}

// readTestMaxDist returns the largest distance between matching points,
// or +Inf when the lengths differ.
func readTestMaxDist(a, b []geometry.Point) float64 {
	if len(a) != len(b) {
		return math.Inf(1)
	}
	var m float64
	for i := range a {
		m = math.Max(m, a[i].Dist(b[i]))
	}
	return m
}
