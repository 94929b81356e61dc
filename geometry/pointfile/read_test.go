package pointfile

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/planar"
)

// TestReadSameSection reads the NACA 2412 section (equations of NACA Report
// 824, via shape.NACA4) from every plain listing, every DXF entity kind
// and the delimited fixtures, and checks that all give the same points in
// the package node order, exactly: all fixtures write the same 6-decimal
// numbers, so any difference is a reader error.
func TestReadSameSection(t *testing.T) {
	want := readTestSection()
	for _, tc := range []struct {
		file    string
		format  string
		ordered bool
		units   geometry.Unit
		name    string
	}{
		{"naca2412-loop.dat", FormatLoop, true, "", readTestName},
		{"naca2412-surfaces.dat", FormatSurfaces, true, "", readTestName},
		{"naca2412-lwpolyline.dxf", FormatDXF, true, geometry.Millimetre, ""},
		{"naca2412-lines.dxf", FormatDXF, true, geometry.Millimetre, ""},
		{"naca2412-polyline.dxf", FormatDXF, true, geometry.Millimetre, ""},
		{"naca2412-spline.dxf", FormatDXF, true, geometry.Millimetre, ""},
		{"naca2412-semicolon.csv", FormatDelimited, false, geometry.Millimetre, ""},
		{"naca2412-tab.txt", FormatDelimited, false, geometry.Millimetre, "Section export"},
	} {
		t.Run(tc.file, func(t *testing.T) {
			c, err := readTestOpen(t, tc.file, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if d := readTestMaxDist(readTestPlanar(c), want); d != 0 {
				t.Errorf("%d points, max distance from the NACA 2412 points %g, want 61 and 0", c.Len(), d)
			}
			if c.Format != tc.format || c.Ordered != tc.ordered || c.Units != tc.units || c.Dim != 2 || c.Name != tc.name {
				t.Errorf("format %q ordered %v units %q dim %d name %q, want %q %v %q 2 %q",
					c.Format, c.Ordered, c.Units, c.Dim, c.Name, tc.format, tc.ordered, tc.units, tc.name)
			}
			if c.Segments != nil {
				t.Errorf("segments %v, want one run", c.Segments)
			}
			if len(c.Origins) != c.Len() {
				t.Fatalf("%d origins for %d points", len(c.Origins), c.Len())
			}
			for i, o := range c.Origins {
				if o.File != tc.file || o.Line <= 0 {
					t.Fatalf("origin %d = %+v: want file %q and a line", i, o, tc.file)
				}
			}
		})
	}
}

// TestReadOrigins checks that origins point at the lines holding each
// point's coordinates.
func TestReadOrigins(t *testing.T) {
	for _, file := range []string{"naca2412-loop.dat", "naca2412-surfaces.dat", "naca2412-lwpolyline.dxf", "naca2412-lines.dxf", "naca2412-tab.txt"} {
		text := string(readTestFixtures()[file])
		lines := strings.Split(text, "\n")
		c, err := readTestOpen(t, file, Options{})
		if err != nil {
			t.Fatal(err)
		}
		for i, o := range c.Origins {
			x := readTestF(c.Points[i].X)
			if line := lines[o.Line-1]; !strings.Contains(strings.ReplaceAll(line, ",", "."), x) {
				t.Errorf("%s: point %d (x = %s) has origin line %d, which reads %q", file, i, x, o.Line, line)
				break
			}
		}
		if strings.HasSuffix(file, ".dxf") {
			// Entities: 1 LWPOLYLINE, or a TEXT then 60 LINEs (the TEXT is entity 1).
			first, last := c.Origins[0].Entity, c.Origins[len(c.Origins)-1].Entity
			if file == "naca2412-lwpolyline.dxf" && (first != 1 || last != 1) {
				t.Errorf("%s: entities %d..%d, want 1..1", file, first, last)
			}
			if file == "naca2412-lines.dxf" && (first != 2 || last != 61) {
				t.Errorf("%s: entities %d..%d, want 2..61", file, first, last)
			}
		}
	}
}

func TestReadDelimited(t *testing.T) {
	for _, tc := range []struct {
		name    string
		in      string
		opts    Options
		want    []geometry.Vec3
		dim     int
		units   geometry.Unit
		reasons []string // reasons of the notes, in order
	}{
		{"blanks", "1 2\n  3\t4 \n5 6\n", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}, {X: 5, Y: 6, Z: 0}}, 2, "", nil},
		{"3D", "1 2 3\n4 5 6\n7 8 9\n", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 3}, {X: 4, Y: 5, Z: 6}, {X: 7, Y: 8, Z: 9}}, 3, "", nil},
		{"first 3 of 4", "1 2 3 10\n4 5 6 11\n", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 3}, {X: 4, Y: 5, Z: 6}}, 3, "", nil},
		{"comma with blanks", "1.5, 2.5\n-3e-1, +4E2\n", Options{}, []geometry.Vec3{{X: 1.5, Y: 2.5, Z: 0}, {X: -0.3, Y: 400, Z: 0}}, 2, "", nil},
		{"semicolon decimal comma", "1,5;2,5\n3;4,25\n", Options{}, []geometry.Vec3{{X: 1.5, Y: 2.5, Z: 0}, {X: 3, Y: 4.25, Z: 0}}, 2, "", nil},
		{"tab decimal comma", "1,5\t2,5\n3\t4,25\n", Options{}, []geometry.Vec3{{X: 1.5, Y: 2.5, Z: 0}, {X: 3, Y: 4.25, Z: 0}}, 2, "", nil},
		{"tab decimal point", "1.5\t2.5\n3\t4.25\n", Options{}, []geometry.Vec3{{X: 1.5, Y: 2.5, Z: 0}, {X: 3, Y: 4.25, Z: 0}}, 2, "", nil},
		{"comments", "# probe run 3\n// exported\n; old style\n1 2\n3 4\n", Options{},
			[]geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}}, 2, "", []string{"comment", "comment", "comment"}},
		{"count line", "3\n1 2\n3 4\n5 6\n", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}, {X: 5, Y: 6, Z: 0}}, 2, "", []string{"point count line"}},
		{"title and header with units", "Probe run 3\nx (in) y (in)\n1 2\n3 4\n", Options{},
			[]geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}}, 2, geometry.Inch, []string{"text line before the data", "column header"}},
		{"trailing text", "1 2\n3 4\nEND\n", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}}, 2, "", []string{"text line among the data"}},
		{"CRLF and BOM", "\xef\xbb\xbfx,y\r\n1,2\r\n3,4\r\n", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}}, 2, "", []string{"column header"}},
		{"CR only", "1 2\r3 4\r", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}}, 2, "", nil},
		{"quoted", "\"x\",\"y\"\n\"1.5\",\"2.5\"\n", Options{}, []geometry.Vec3{{X: 1.5, Y: 2.5, Z: 0}}, 2, "", []string{"column header"}},
		{"columns by index", "id x y\nP1 1 2\nP2 3 4\n", Options{Columns: "2,3"}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}}, 2, "", []string{"column header"}},
		{"columns by index 3D", "1 2 3 4\n5 6 7 8\n", Options{Columns: "4,2,1"}, []geometry.Vec3{{X: 4, Y: 2, Z: 1}, {X: 8, Y: 6, Z: 5}}, 3, "", nil},
		{"columns by name", "t;Y [mm];X [mm]\n0;1,5;2\n1;3;4\n", Options{Columns: "x,y"}, []geometry.Vec3{{X: 2, Y: 1.5, Z: 0}, {X: 4, Y: 3, Z: 0}}, 2, geometry.Millimetre, []string{"column header"}},
		{"units comment", "# units: mm\n1 2\n3 4\n", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}}, 2, geometry.Millimetre, []string{"comment"}},
		{"units inside a comment", "# scanner export, units: mm, 0.05 mm grid\n1 2\n", Options{}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}}, 2, geometry.Millimetre, []string{"comment"}},
		{"no units in a subunit", "# subunit: 3\n# probe units 2\n1 2\n", Options{Units: "in"}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}}, 2, geometry.Inch, []string{"comment", "comment"}},
		{"units option wins", "# unit = mm\n1 2\n", Options{Units: "in"}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}}, 2, geometry.Inch, []string{"comment", "the file says mm; using in as asked"}},
		{"unknown unit overridden", "# units: furlong\n1 2\n", Options{Units: "mm"}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}}, 2, geometry.Millimetre, []string{"comment"}},
		{"format forced", "Name\n1 2\n3 4\n1 2.1\n", Options{Format: "delimited"}, []geometry.Vec3{{X: 1, Y: 2, Z: 0}, {X: 3, Y: 4, Z: 0}, {X: 1, Y: 2.1, Z: 0}}, 2, "", []string{"text line before the data"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, err := Read(strings.NewReader(tc.in), "in.txt", tc.opts)
			if err != nil {
				t.Fatal(err)
			}
			if c.Columns == "" {
				t.Errorf("the columns read are not described")
			}
			if c.Format != FormatDelimited {
				t.Errorf("format %q, want delimited", c.Format)
			}
			if len(c.Points) != len(tc.want) {
				t.Fatalf("points %v, want %v", c.Points, tc.want)
			}
			for i := range tc.want {
				if c.Points[i] != tc.want[i] {
					t.Errorf("point %d = %v, want %v", i, c.Points[i], tc.want[i])
				}
			}
			if c.Dim != tc.dim || c.Units != tc.units {
				t.Errorf("dim %d units %q, want %d %q", c.Dim, c.Units, tc.dim, tc.units)
			}
			var reasons []string
			for _, n := range c.Notes {
				reasons = append(reasons, n.Reason)
			}
			if strings.Join(reasons, "|") != strings.Join(tc.reasons, "|") {
				t.Errorf("notes %q, want %q", reasons, tc.reasons)
			}
		})
	}
}

// TestReadColumnsByHeader checks that a header naming the coordinate
// columns among others (an index, a point label) decides which columns
// are read, that the cloud says which, and that a guess is flagged.
func TestReadColumnsByHeader(t *testing.T) {
	for _, tc := range []struct {
		name    string
		in      string
		want    []geometry.Vec3
		dim     int
		units   geometry.Unit
		columns string
		guessed bool
	}{
		{"idx,x,y,z", "idx,x,y,z\n1,10,20,30\n2,11,21,31\n", []geometry.Vec3{{X: 10, Y: 20, Z: 30}, {X: 11, Y: 21, Z: 31}}, 3, "", "2, 3, 4 (named x, y, z by the header)", false},
		{"point,x,y", "# units: mm\npoint,x,y\n1,10,20\n2,11,21\n", []geometry.Vec3{{X: 10, Y: 20}, {X: 11, Y: 21}}, 2, geometry.Millimetre, "2, 3 (named x, y by the header)", false},
		{"any order, units", "n;Y [in];X [in];Z [in]\n1;2,5;1,5;0\n2;3;4;0\n", []geometry.Vec3{{X: 1.5, Y: 2.5}, {X: 4, Y: 3}}, 3, geometry.Inch, "3, 2, 4 (named x, y, z by the header)", false},
		{"unit suffixes", "id x_mm y_mm\n7 1 2\n8 3 4\n", []geometry.Vec3{{X: 1, Y: 2}, {X: 3, Y: 4}}, 2, "", "2, 3 (named x, y by the header)", false},
		{"coord words", "label X-coord Y-coord Z-coord\nP1 1 2 3\nP2 4 5 6\n", []geometry.Vec3{{X: 1, Y: 2, Z: 3}, {X: 4, Y: 5, Z: 6}}, 3, "", "2, 3, 4 (named x, y, z by the header)", false},
		{"label column, no header", "P1 1 2 3\nP2 4 5 6\n", []geometry.Vec3{{X: 1, Y: 2, Z: 3}, {X: 4, Y: 5, Z: 6}}, 3, "", "2, 3, 4 (the numbers of each line)", false},
		{"unnamed extra columns", "a b c d\n1 2 3 4\n5 6 7 8\n", []geometry.Vec3{{X: 1, Y: 2, Z: 3}, {X: 5, Y: 6, Z: 7}}, 3, "", "1, 2, 3 (the first numbers of each line; no header names x, y, z)", true},
		{"two x columns", "x,x,y\n1,2,3\n4,5,6\n", []geometry.Vec3{{X: 1, Y: 2, Z: 3}, {X: 4, Y: 5, Z: 6}}, 3, "", "1, 2, 3 (the numbers of each line)", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, err := Read(strings.NewReader(tc.in), "in.txt", Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(c.Points) != len(tc.want) {
				t.Fatalf("points %v, want %v", c.Points, tc.want)
			}
			for i := range tc.want {
				if c.Points[i] != tc.want[i] {
					t.Errorf("point %d = %v, want %v", i, c.Points[i], tc.want[i])
				}
			}
			if c.Dim != tc.dim || c.Units != tc.units {
				t.Errorf("dim %d units %q, want %d %q", c.Dim, c.Units, tc.dim, tc.units)
			}
			if c.Columns != tc.columns || c.ColumnsGuessed != tc.guessed {
				t.Errorf("columns %q (guessed %v), want %q (%v)", c.Columns, c.ColumnsGuessed, tc.columns, tc.guessed)
			}
		})
	}
}

// TestReadBadInput checks that each kind of bad input gives its sentinel in
// a *ParseError naming the file and line.
func TestReadBadInput(t *testing.T) {
	for _, tc := range []struct {
		name string
		in   string
		opts Options
		want error
		line int // 0: the error has no line
	}{
		{"empty", "", Options{}, geometry.ErrEmpty, 0},
		{"blank", "  \n\t\n", Options{}, geometry.ErrEmpty, 0},
		{"no numbers", "Section export\nnothing here\n", Options{}, ErrNoNumbers, 0},
		{"comments only", "# a\n# b\n", Options{}, ErrNoNumbers, 0},
		{"one coordinate", "1 2\n3\n", Options{}, ErrColumnCount, 2},
		{"one coordinate first", "1.5\n2.5\n", Options{}, ErrColumnCount, 1},
		{"second count line", "3\n4\n", Options{}, ErrColumnCount, 2},
		{"short 3D line", "1 2 3\n4 5\n", Options{}, ErrColumnCount, 2},
		{"NaN", "1 2\nnan 3\n", Options{}, geometry.ErrNonFinite, 2},
		{"Inf", "x,y\n1,Inf\n", Options{}, geometry.ErrNonFinite, 2},
		{"overflow", "1 2\n1e999 2\n", Options{}, geometry.ErrNonFinite, 2},
		{"not a number", "1 2\n3 x4\n", Options{}, ErrNotNumeric, 2},
		{"typo in first column", "1 2\nl2 3\n", Options{}, ErrNotNumeric, 2},
		{"column out of range", "1 2 3\n4 5 6\n", Options{Columns: "2,5"}, ErrColumnRange, 1},
		{"column name missing", "a,b\n1,2\n", Options{Columns: "x,y"}, ErrColumnRange, 2},
		{"unknown unit comment", "# units: furlong\n1 2\n", Options{}, geometry.ErrUnknownUnit, 1},
		{"unknown unit header", "x [ft],y [ft]\n1,2\n", Options{}, geometry.ErrUnknownUnit, 1},
		{"two units", "# units: mm\n# units: in\n1 2\n", Options{}, ErrFormat, 2},
		{"loop forced, 3 fields", "Name\n1 2\n3 4 5\n", Options{Format: "loop"}, ErrColumnCount, 3},
		{"surfaces forced, no counts", "Name\n0.5 0.2\n3 4\n", Options{Format: "surfaces"}, ErrFormat, 2},
		{"surfaces short", "Name\n2 2\n0 0\n1 1\n0 0\n", Options{Format: "surfaces"}, ErrTruncated, 5},
		{"surfaces long", "Name\n1 1\n0 0\n1 1\n2 2\n", Options{Format: "surfaces"}, ErrFormat, 5},
		{"loop NaN", "Name\n1 2\nNaN 4\n", Options{Format: "loop"}, geometry.ErrNonFinite, 3},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Read(strings.NewReader(tc.in), "bad.txt", tc.opts)
			if !errors.Is(err, tc.want) {
				t.Fatalf("error %v, want %v", err, tc.want)
			}
			var pe *geometry.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("error %v is not a *ParseError", err)
			}
			if pe.File != "bad.txt" || pe.Line != tc.line {
				t.Errorf("error at %s:%d, want bad.txt:%d (%v)", pe.File, pe.Line, tc.line, err)
			}
		})
	}
}

// TestReadBadOptions checks option errors, which are not about the file.
func TestReadBadOptions(t *testing.T) {
	for _, tc := range []struct {
		opts Options
		want error // nil: any error
	}{
		{Options{Columns: "1"}, ErrColumnCount},
		{Options{Columns: "1,2,3,4"}, ErrColumnCount},
		{Options{Columns: "0,1"}, ErrColumnRange},
		{Options{Columns: "1,x"}, nil},
		{Options{Columns: "x,x"}, nil},
		{Options{Units: "furlong"}, geometry.ErrUnknownUnit},
		{Options{Format: "spreadsheet"}, nil},
	} {
		_, err := Read(strings.NewReader("1 2\n3 4\n"), "in.txt", tc.opts)
		if err == nil || (tc.want != nil && !errors.Is(err, tc.want)) {
			t.Errorf("%+v: error %v, want %v", tc.opts, err, tc.want)
		}
	}
}

// TestReadFixtureErrors reads the invalid-* fixtures.
func TestReadFixtureErrors(t *testing.T) {
	cut := &planar.Spec{Point: geometry.Vec3{Z: 150}, Normal: geometry.Vec3{Z: 1}}
	for _, tc := range []struct {
		file string
		want error
		line int
	}{
		{"invalid-empty.csv", geometry.ErrEmpty, 0},
		{"invalid-no-numbers.txt", ErrNoNumbers, 0},
		{"invalid-one-coordinate.csv", ErrColumnCount, 3},
		{"invalid-nan.csv", geometry.ErrNonFinite, 3},
		{"invalid-not-stl.bin", ErrNotSTL, 0},
		{"invalid-truncated.stl", ErrTruncated, 0},
		{"invalid-no-entities.dxf", ErrNoEntities, 0},
		{"invalid-unit.csv", geometry.ErrUnknownUnit, 1},
	} {
		_, err := readTestOpen(t, tc.file, Options{Cut: cut})
		var pe *geometry.ParseError
		if !errors.Is(err, tc.want) || !errors.As(err, &pe) || pe.File != tc.file || pe.Line != tc.line {
			t.Errorf("%s: error %v, want %v at line %d", tc.file, err, tc.want, tc.line)
		}
	}
}

// TestReadDetect checks that the format is found from the content alone.
func TestReadDetect(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want string
	}{
		{"NACA 0012\n1 0\n0.5 0.06\n0 0\n0.5 -0.06\n1 0\n", FormatLoop},
		{"NACA 0012\n2. 2.\n0 0\n1 0.01\n0 0\n1 -0.01\n", FormatSurfaces},
		{"x y\n1 0\n0.5 0.06\n0 0\n0.5 -0.06\n1 0\n", FormatDelimited},              // a header, not a name
		{"Probe run\n0 0\n10 10\n0.1 0.2\n9 9.5\n0.2 0.1\n10 9\n", FormatDelimited}, // points in no order
		{"1 0\n0.5 0.06\n0 0\n", FormatDelimited},
		{"# probe run\n1 0\n0.5 0.06\n0 0\n0.5 -0.06\n1 0\n", FormatDelimited}, // a comment, not a name
		{"  0\nSECTION\n  2\nENTITIES\n  0\nENDSEC\n  0\nEOF\n", FormatDXF},
		{"solid x\nendsolid x\n", FormatSTL},
		{"solid state physics\n1 2\n", FormatDelimited},
	} {
		if got := detect(tc.in); got != tc.want {
			t.Errorf("detect(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// TestReadNoteCap checks that a file of many comments does not flood the
// notes.
func TestReadNoteCap(t *testing.T) {
	in := strings.Repeat("# comment\n", 3*geometry.MaxNotes) + "1 2\n3 4\n"
	c, err := Read(strings.NewReader(in), "in.txt", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Notes) != geometry.MaxNotes+1 || !strings.Contains(c.Notes[geometry.MaxNotes].Reason, "2000 more") {
		t.Errorf("%d notes, last %q; want %d and a count of 2000 more", len(c.Notes), c.Notes[len(c.Notes)-1].Reason, geometry.MaxNotes+1)
	}
}

// TestReadPointNumbersAndLabels checks two ways probe programs and
// spreadsheets write points: a first column that numbers them (1, 2, 3, …,
// no header) is not read as x, and a label before the numbers of every
// line ("PNT1,x,y,z") is skipped with any separator. The coordinates must
// come back exactly as written, and a first column that does not count by
// one, or counts over too few lines, stays a coordinate.
func TestReadPointNumbersAndLabels(t *testing.T) {
	const n = 24
	xs, ys, zs := make([]string, n), make([]string, n), make([]string, n)
	want2, want3 := make([]geometry.Vec3, n), make([]geometry.Vec3, n)
	for i := range n {
		a := 2 * math.Pi * float64(i) / n
		x, y, z := math.Round(1e4*(1500+50*math.Cos(a)))/1e4, math.Round(1e4*(200+6*math.Sin(a)))/1e4, 35.0
		xs[i], ys[i], zs[i] = strconv.FormatFloat(x, 'g', -1, 64), strconv.FormatFloat(y, 'g', -1, 64), strconv.FormatFloat(z, 'g', -1, 64)
		want2[i], want3[i] = geometry.Vec3{X: x, Y: y}, geometry.Vec3{X: x, Y: y, Z: z}
	}
	rows := func(f func(i int) string) string {
		var b strings.Builder
		for i := range n {
			b.WriteString(f(i) + "\n")
		}
		return b.String()
	}
	numbered := " (column 1 numbers the points 1, 2, 3, …; the numbers after it)"
	for _, tc := range []struct {
		name    string
		in      string
		want    []geometry.Vec3
		columns string
	}{
		{"numbered, comma", rows(func(i int) string { return fmt.Sprintf("%d,%s,%s", i+1, xs[i], ys[i]) }), want2, "2, 3" + numbered},
		{"numbered from 0, blanks, z", rows(func(i int) string { return fmt.Sprintf("%d  %s  %s  %s", i, xs[i], ys[i], zs[i]) }), want3, "2, 3, 4" + numbered},
		{"labels, comma", rows(func(i int) string { return fmt.Sprintf("PNT%d,%s,%s,%s", i+1, xs[i], ys[i], zs[i]) }), want3, "2, 3, 4 (the numbers of each line)"},
		{"labels, tab", rows(func(i int) string { return fmt.Sprintf("P_%03d\t%s\t%s", i+1, xs[i], ys[i]) }), want2, "2, 3 (the numbers of each line)"},
		{"labels, semicolon, decimal comma", rows(func(i int) string {
			return fmt.Sprintf("pt%d;%s;%s", i+1, strings.Replace(xs[i], ".", ",", 1), strings.Replace(ys[i], ".", ",", 1))
		}), want2, "2, 3 (the numbers of each line)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, err := Read(strings.NewReader(tc.in), "in.txt", Options{})
			if err != nil {
				t.Fatal(err)
			}
			dim := 2
			if tc.want[0].Z != 0 {
				dim = 3
			}
			if len(c.Points) != len(tc.want) || c.Dim != dim {
				t.Fatalf("%d points of dim %d (%s), want %d of dim %d", len(c.Points), c.Dim, c.Columns, len(tc.want), dim)
			}
			for i := range tc.want {
				if c.Points[i] != tc.want[i] {
					t.Fatalf("point %d = %v, want %v", i, c.Points[i], tc.want[i])
				}
			}
			if c.Columns != tc.columns || c.ColumnsGuessed {
				t.Errorf("columns %q (guessed %v), want %q", c.Columns, c.ColumnsGuessed, tc.columns)
			}
		})
	}
	// Not point numbers: a step of 2, a gap, or fewer lines than minCounted.
	for _, tc := range []struct {
		name string
		rows int
		num  func(i int) int
	}{
		{"step 2", n, func(i int) int { return 2 * i }},
		{"a gap", n, func(i int) int { return i + i/12 }},
		{"too few lines", minCounted - 1, func(i int) int { return i + 1 }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var b strings.Builder
			for i := range tc.rows {
				fmt.Fprintf(&b, "%d,%s,%s\n", tc.num(i), xs[i], ys[i])
			}
			c, err := Read(strings.NewReader(b.String()), "in.txt", Options{})
			if err != nil {
				t.Fatal(err)
			}
			if c.Dim != 3 || c.Points[1].X != float64(tc.num(1)) || c.Columns != "1, 2, 3 (the numbers of each line)" {
				t.Errorf("dim %d, point 1 %v, columns %q: want the first column read as x", c.Dim, c.Points[1], c.Columns)
			}
		})
	}
}
