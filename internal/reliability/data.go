package reliability

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"math"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
)

// The good files the bad inputs are made from: NACA 2412 (NACA Report 824
// equations, shape.NACA4), 40 points per surface, scaled to an invented
// chord of 150 mm. Invented data, never measured.

const chordMM = 150.0

func naca() []geometry.Point {
	n, err := shape.ParseNACA4("2412")
	if err != nil {
		panic(err)
	}
	return n.Loop(40)
}

func scaled() []geometry.Point {
	pts := naca()
	for i := range pts {
		pts[i].X *= chordMM
		pts[i].Y *= chordMM
	}
	return pts
}

// goodCSV is a comma-separated file with a units comment and a header.
func goodCSV() string {
	var b strings.Builder
	b.WriteString("# NACA 2412, invented chord 150 mm (campaign data, not measured)\n# units: mm\nx,y\n")
	for _, p := range scaled() {
		fmt.Fprintf(&b, "%.6f,%.6f\n", p.X, p.Y)
	}
	return b.String()
}

// csvRows are the data rows of goodCSV.
func csvRows() []string {
	var rows []string
	for _, p := range scaled() {
		rows = append(rows, fmt.Sprintf("%.6f,%.6f", p.X, p.Y))
	}
	return rows
}

// goodLoop is the listing of a name line and one loop of x y pairs.
func goodLoop() string {
	var b strings.Builder
	b.WriteString("NACA 2412 campaign section\n")
	for _, p := range naca() {
		fmt.Fprintf(&b, "  %.6f  %.6f\n", p.X, p.Y)
	}
	return b.String()
}

// goodSurfaces is the listing of a name line, the counts line, then each
// surface from leading to trailing edge.
func goodSurfaces(counts string) string {
	pts := naca()
	le := len(pts) / 2
	var b strings.Builder
	b.WriteString("NACA 2412 campaign section\n" + counts + "\n\n")
	for i := le; i >= 0; i-- {
		fmt.Fprintf(&b, "%.6f %.6f\n", pts[i].X, pts[i].Y)
	}
	b.WriteString("\n")
	for i := le; i < len(pts); i++ {
		fmt.Fprintf(&b, "%.6f %.6f\n", pts[i].X, pts[i].Y)
	}
	return b.String()
}

// dxfHeader opens an ASCII DXF in millimetres at its entities.
const dxfHeader = "  0\nSECTION\n  2\nHEADER\n  9\n$INSUNITS\n 70\n4\n  0\nENDSEC\n  0\nSECTION\n  2\nENTITIES\n"

// dxfFooter closes it.
const dxfFooter = "  0\nENDSEC\n  0\nEOF\n"

// goodDXF is one closed LWPOLYLINE.
func goodDXF() string {
	pts := scaled()
	var b strings.Builder
	b.WriteString(dxfHeader)
	fmt.Fprintf(&b, "  0\nLWPOLYLINE\n  8\nsection\n 90\n%d\n 70\n1\n", len(pts))
	for _, p := range pts {
		fmt.Fprintf(&b, " 10\n%.6f\n 20\n%.6f\n", p.X, p.Y)
	}
	b.WriteString(dxfFooter)
	return b.String()
}

// dxfPoints is the DXF of one POINT entity per point, each made by entity.
func dxfPoints(entity func(i int, p geometry.Point) string) string {
	var b strings.Builder
	b.WriteString(dxfHeader)
	for i, p := range scaled() {
		b.WriteString(entity(i, p))
	}
	b.WriteString(dxfFooter)
	return b.String()
}

// triangle is one facet of an extruded section.
type triangle [3][3]float64

// extrusion is the section extruded 300 mm along z, side faces only.
func extrusion() []triangle {
	pts := scaled()
	var ts []triangle
	for i := 0; i+1 < len(pts); i++ {
		a, b := pts[i], pts[i+1]
		ts = append(ts,
			triangle{{a.X, a.Y, 0}, {b.X, b.Y, 0}, {b.X, b.Y, 300}},
			triangle{{a.X, a.Y, 0}, {b.X, b.Y, 300}, {a.X, a.Y, 300}})
	}
	return ts
}

// asciiSTL writes triangles as ASCII STL, each facet through facet (which
// may change it).
func asciiSTL(ts []triangle, facet func(i int, s string) string) string {
	var b strings.Builder
	b.WriteString("solid campaign\n")
	for i, t := range ts {
		var f strings.Builder
		f.WriteString("  facet normal 0 0 0\n    outer loop\n")
		for _, v := range t {
			fmt.Fprintf(&f, "      vertex %g %g %g\n", v[0], v[1], v[2])
		}
		f.WriteString("    endloop\n  endfacet\n")
		s := f.String()
		if facet != nil {
			s = facet(i, s)
		}
		b.WriteString(s)
	}
	b.WriteString("endsolid campaign\n")
	return b.String()
}

// binarySTL writes triangles as binary STL with the facet count given (the
// true count when count < 0).
func binarySTL(ts []triangle, count int64) []byte {
	var b bytes.Buffer
	header := make([]byte, 80)
	copy(header, "campaign binary stl (invented data)")
	b.Write(header)
	if count < 0 {
		count = int64(len(ts))
	}
	binary.Write(&b, binary.LittleEndian, uint32(count))
	for _, t := range ts {
		binary.Write(&b, binary.LittleEndian, [3]float32{})
		for _, v := range t {
			binary.Write(&b, binary.LittleEndian, [3]float32{float32(v[0]), float32(v[1]), float32(v[2])})
		}
		binary.Write(&b, binary.LittleEndian, uint16(0))
	}
	return b.Bytes()
}

// goodSection is a section document of NACA 2412 with 161 nodes.
func goodSection() string {
	n, _ := shape.ParseNACA4("2412")
	var b bytes.Buffer
	section.Write(&b, &section.Section{Format: section.Format, Name: "campaign 2412", Units: "chord", Nodes: n.Nodes(160)})
	return b.String()
}

// sectionNodes is a section document with the nodes given as JSON text.
func sectionNodes(nodes string) string {
	return `{"format": "foilwright.section/1", "name": "campaign", "units": "chord", "nodes": ` + nodes + "}\n"
}

// manyNodes is the JSON array of n nodes round an ellipse of thickness
// 0.12, trailing edge first, counter-clockwise, closed.
func manyNodes(n int) string {
	var b strings.Builder
	b.WriteByte('[')
	for i := 0; i <= n; i++ {
		th := 2 * math.Pi * float64(i) / float64(n)
		if i > 0 {
			b.WriteByte(',')
		}
		fmt.Fprintf(&b, "[%.9f,%.9f]", 0.5+0.5*math.Cos(th), 0.06*math.Sin(th))
	}
	b.WriteByte(']')
	return b.String()
}

// utf16 encodes s as UTF-16 with a byte-order mark.
func utf16(s string, bigEndian bool) []byte {
	var b bytes.Buffer
	put := func(u uint16) {
		if bigEndian {
			b.WriteByte(byte(u >> 8))
			b.WriteByte(byte(u))
		} else {
			b.WriteByte(byte(u))
			b.WriteByte(byte(u >> 8))
		}
	}
	put(0xfeff)
	for _, r := range s {
		put(uint16(r))
	}
	return b.Bytes()
}

// nested is n opening brackets, then n closing ones.
func nested(n int) string { return strings.Repeat("[", n) + strings.Repeat("]", n) }

// nestedObjects is an object nested n levels deep, {"a":{"a":…{}…}}.
func nestedObjects(n int) string {
	return strings.Repeat(`{"a":`, n) + "{}" + strings.Repeat("}", n)
}
