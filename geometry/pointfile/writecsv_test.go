package pointfile

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// TestWriteCSVRoundTrip writes points with awkward values and file names
// and reads them back with Columns "x,y": the same float64 values, and the
// origins in the file and line columns.
func TestWriteCSVRoundTrip(t *testing.T) {
	pts := []geometry.Point{{X: 0, Y: 0}, {X: -0.0, Y: 1e-300}, {X: 123456.789012345, Y: -2.5e-7}, {X: 0.1 + 0.2, Y: 1.0 / 3}, {X: -1e300, Y: 5}}
	origins := []geometry.Origin{
		{File: "a.csv", Line: 1},
		{File: "with,comma.csv", Line: 2},
		{File: "semi;colon\ttab.txt", Line: 3},
		{File: "quote\"and\nnewline.dat", Line: 4},
		{File: "mesh.stl", Entity: 9},
	}
	var buf bytes.Buffer
	if err := WriteCSV(&buf, pts, origins); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(buf.String(), "x,y,file,line\n") || strings.Count(buf.String(), "\n") != len(pts)+1 {
		t.Fatalf("output:\n%s", buf.String())
	}
	c, err := Read(bytes.NewReader(buf.Bytes()), "back.csv", Options{Columns: "x,y"})
	if err != nil {
		t.Fatal(err)
	}
	if c.Len() != len(pts) {
		t.Fatalf("%d points back, want %d", c.Len(), len(pts))
	}
	for i, p := range pts {
		if got := (geometry.Point{X: c.Points[i].X, Y: c.Points[i].Y}); got != p || c.Origins[i].Line != i+2 {
			t.Errorf("point %d: %v at line %d, want %v at line %d", i, got, c.Origins[i].Line, p, i+2)
		}
	}
	lines := strings.Split(buf.String(), "\n")
	if lines[2] != `0,1e-300,"with,comma.csv",2` || lines[5] != `-1e+300,5,"mesh.stl",` {
		t.Errorf("rows %q and %q", lines[2], lines[5])
	}
	if err := WriteCSV(&buf, []geometry.Point{{X: 0, Y: 1}, {X: math.NaN(), Y: 0}}, nil); err == nil {
		t.Error("NaN point written")
	}
}
