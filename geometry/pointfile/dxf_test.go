package pointfile

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// dxfTestLine writes one LINE entity.
func dxfTestLine(a, b geometry.Point) string {
	return fmt.Sprintf("  0\nLINE\n  8\n0\n 10\n%g\n 20\n%g\n 30\n0\n 11\n%g\n 21\n%g\n 31\n0\n", a.X, a.Y, b.X, b.Y)
}

// dxfTestLW writes one LWPOLYLINE entity with the given flags and extra groups.
func dxfTestLW(pts []geometry.Point, flags int, extra string) string {
	var b strings.Builder
	fmt.Fprintf(&b, "  0\nLWPOLYLINE\n  8\n0\n 90\n%d\n 70\n%d\n%s", len(pts), flags, extra)
	for _, p := range pts {
		fmt.Fprintf(&b, " 10\n%g\n 20\n%g\n", p.X, p.Y)
	}
	return b.String()
}

func TestReadDXF(t *testing.T) {
	sq := []geometry.Point{{X: 0, Y: 0}, {X: 1, Y: 0}, {X: 1, Y: 1}, {X: 0, Y: 1}}
	for _, tc := range []struct {
		name     string
		entities string
		want     []geometry.Vec3
		segments []int
		ordered  bool
		note     string // a note reason must contain this
	}{
		{"lines out of order and reversed",
			dxfTestLine(sq[2], sq[1]) + dxfTestLine(sq[0], sq[1]) + dxfTestLine(sq[3], sq[2]),
			[]geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 0, Z: 0}, {X: 1, Y: 1, Z: 0}, {X: 0, Y: 1, Z: 0}}, nil, true, ""},
		{"lines closing a loop",
			dxfTestLine(sq[0], sq[1]) + dxfTestLine(sq[1], sq[2]) + dxfTestLine(sq[2], sq[3]) + dxfTestLine(sq[3], sq[0]),
			[]geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 0, Z: 0}, {X: 1, Y: 1, Z: 0}, {X: 0, Y: 1, Z: 0}}, nil, true, ""},
		{"closed polyline with repeated end", dxfTestLW(append(sq, sq[0]), 1, ""),
			[]geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 0, Z: 0}, {X: 1, Y: 1, Z: 0}, {X: 0, Y: 1, Z: 0}}, nil, true, ""},
		{"two polylines", dxfTestLW(sq[:2], 0, "") + dxfTestLW(sq[2:], 0, ""),
			[]geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 0, Z: 0}, {X: 1, Y: 1, Z: 0}, {X: 0, Y: 1, Z: 0}}, []int{0, 2}, true, ""},
		{"elevation", dxfTestLW(sq[:2], 0, " 38\n240\n"), []geometry.Vec3{{X: 0, Y: 0, Z: 240}, {X: 1, Y: 0, Z: 240}}, nil, true, ""},
		// Extrusion (0, 0, −1): by the arbitrary-axis rule of the DXF format,
		// Ax = Wy × N = (−1, 0, 0) and Ay = N × Ax = (0, 1, 0): x is mirrored.
		{"mirrored by extrusion", dxfTestLW([]geometry.Point{{X: 1, Y: 2}, {X: 3, Y: 4}}, 0, "210\n0\n220\n0\n230\n-1\n"),
			[]geometry.Vec3{{X: -1, Y: 2, Z: 0}, {X: -3, Y: 4, Z: 0}}, nil, true, ""},
		{"bulges", dxfTestLW(sq[:2], 0, " 42\n0.5\n"), []geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 0, Z: 0}}, nil, true, "bulges"},
		{"spline control points only",
			"  0\nSPLINE\n 70\n8\n 71\n3\n 10\n0\n 20\n0\n 30\n0\n 10\n1\n 20\n2\n 30\n0\n 10\n2\n 20\n0\n 30\n0\n",
			[]geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 2, Z: 0}, {X: 2, Y: 0, Z: 0}}, nil, true, "control points"},
		{"polyline skips spline frame vertices",
			"  0\nPOLYLINE\n 66\n1\n 70\n12\n  0\nVERTEX\n 10\n9\n 20\n9\n 30\n9\n 70\n16\n  0\nVERTEX\n 10\n1\n 20\n2\n 30\n3\n 70\n8\n  0\nVERTEX\n 10\n4\n 20\n5\n 30\n6\n 70\n8\n  0\nSEQEND\n",
			[]geometry.Vec3{{X: 1, Y: 2, Z: 3}, {X: 4, Y: 5, Z: 6}}, nil, true, ""},
		{"points", "  0\nPOINT\n 10\n1\n 20\n2\n 30\n0\n  0\nPOINT\n 10\n3\n 20\n4\n 30\n0\n",
			[]geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}}, nil, false, ""},
		{"points and a polyline", dxfTestLW(sq[:2], 0, "") + "  0\nPOINT\n 10\n5\n 20\n6\n 30\n0\n",
			[]geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 0, Z: 0}, {X: 5, Y: 6, Z: 0}}, nil, false, "order of the runs is not kept"},
		{"ignored entities", "  0\nCIRCLE\n 10\n0\n 20\n0\n 40\n1\n  0\nCIRCLE\n 10\n0\n 20\n0\n 40\n2\n" + dxfTestLW(sq[:2], 0, ""),
			[]geometry.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 0, Z: 0}}, nil, true, "2 CIRCLE entities not read"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, err := Read(strings.NewReader(readTestDXF(tc.entities)), "in.dxf", Options{})
			if err != nil {
				t.Fatal(err)
			}
			if c.Format != FormatDXF || c.Units != geometry.Millimetre {
				t.Errorf("format %q units %q, want dxf mm", c.Format, c.Units)
			}
			if fmt.Sprint(c.Points) != fmt.Sprint(tc.want) || fmt.Sprint(c.Segments) != fmt.Sprint(tc.segments) || c.Ordered != tc.ordered {
				t.Errorf("points %v segments %v ordered %v, want %v %v %v", c.Points, c.Segments, c.Ordered, tc.want, tc.segments, tc.ordered)
			}
			wantDim := 2
			for _, p := range tc.want {
				if p.Z != 0 {
					wantDim = 3
				}
			}
			if c.Dim != wantDim {
				t.Errorf("dim %d, want %d", c.Dim, wantDim)
			}
			if tc.note != "" {
				found := false
				for _, n := range c.Notes {
					found = found || strings.Contains(n.Reason, tc.note)
				}
				if !found {
					t.Errorf("no note mentions %q: %+v", tc.note, c.Notes)
				}
			}
		})
	}
}

func TestReadDXFUnits(t *testing.T) {
	body := "  0\nSECTION\n  2\nHEADER\n  9\n$INSUNITS\n 70\n%d\n  0\nENDSEC\n  0\nSECTION\n  2\nENTITIES\n" +
		dxfTestLW([]geometry.Point{{X: 0, Y: 0}, {X: 1, Y: 0}}, 0, "") + "  0\nENDSEC\n  0\nEOF\n"
	for _, tc := range []struct {
		code  int
		given geometry.Unit
		want  geometry.Unit
		err   error
	}{
		{0, "", "", nil},
		{1, "", geometry.Inch, nil},
		{4, "", geometry.Millimetre, nil},
		{6, "", geometry.Metre, nil},
		{5, "", "", geometry.ErrUnknownUnit}, // centimetres: not a foilwright unit
		{5, geometry.Millimetre, geometry.Millimetre, nil},
	} {
		c, err := Read(strings.NewReader(fmt.Sprintf(body, tc.code)), "u.dxf", Options{Units: tc.given})
		if tc.err != nil {
			var pe *geometry.ParseError
			if !errors.Is(err, tc.err) || !errors.As(err, &pe) || pe.Line != 8 {
				t.Errorf("$INSUNITS %d: error %v, want %v at line 8", tc.code, err, tc.err)
			}
			continue
		}
		if err != nil || c.Units != tc.want {
			t.Errorf("$INSUNITS %d given %q: units %v, error %v; want %q", tc.code, tc.given, c.Units, err, tc.want)
		}
	}
}

func TestReadDXFBad(t *testing.T) {
	for _, tc := range []struct {
		name string
		in   string
		want error
		line int
	}{
		{"group code not a number", "  0\nSECTION\n  2\nENTITIES\nxx\nLINE\n", ErrFormat, 5},
		{"group code without value", "  0\nSECTION\n  2\nENTITIES\n  0\n", ErrTruncated, 5},
		{"coordinate not a number", readTestDXF(dxfTestLW([]geometry.Point{{X: 0, Y: 0}}, 0, "")[:len(dxfTestLW([]geometry.Point{{X: 0, Y: 0}}, 0, ""))-2] + "x\n"), ErrNotNumeric, 28},
		{"NaN", readTestDXF("  0\nPOINT\n 10\nnan\n 20\n0\n"), geometry.ErrNonFinite, 20},
		{"no entities section", "  0\nSECTION\n  2\nHEADER\n  0\nENDSEC\n  0\nEOF\n", ErrNoEntities, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Read(strings.NewReader(tc.in), "bad.dxf", Options{Format: "dxf"})
			var pe *geometry.ParseError
			if !errors.Is(err, tc.want) || !errors.As(err, &pe) || pe.File != "bad.dxf" || pe.Line != tc.line {
				t.Errorf("error %v, want %v at bad.dxf:%d", err, tc.want, tc.line)
			}
		})
	}
}
