package export

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/pointfile"
)

// testStations returns three stations of a blade: sections cut at
// z = 300, 500 and 700 mm, each in its plane (origin on the z axis, U and
// V the x and y axes), with chords and twists that fall along the span.
func testStations(t *testing.T) []Station {
	t.Helper()
	var sts []Station
	for k, z := range []float64{300, 500, 700} {
		s := testSection(k == 1, false)
		s.Name = fmt.Sprintf("r%d", int(z))
		s.Frame.Chord, s.Frame.TwistDeg, s.Frame.LE = 160-30*float64(k), 12-3*float64(k), [2]float64{-40, 5}
		s.Frame.Plane = &geometry.Plane{Origin: [3]float64{0, 0, z}, U: [3]float64{1, 0, 0}, V: [3]float64{0, 1, 0}, N: [3]float64{0, 0, 1}}
		pos := z
		sts = append(sts, Station{Position: &pos, Section: place(t, s, PlaceOptions{})})
	}
	return sts
}

// The stations DXF reads back, station by station, through foilwright's
// reader: each layer gives its station's nodes in space.
func TestStationsDXFReadsBack(t *testing.T) {
	sts := testStations(t)
	var b bytes.Buffer
	if err := StationsDXF(&b, sts); err != nil {
		t.Fatal(err)
	}
	for _, st := range sts {
		c, err := pointfile.Read(bytes.NewReader(b.Bytes()), "blade.dxf", pointfile.Options{Layer: StationLayer(st.Section.Name)})
		if err != nil {
			t.Fatal(err)
		}
		if c.Dim != 3 || c.Units != geometry.Millimetre {
			t.Errorf("%s: %dD, units %q", st.Section.Name, c.Dim, c.Units)
		}
		checkPoints(t, st.Section.Name, c.Points, st.Section.space(st.Section.outline()), st.Section.Chord)
		if z := c.Points[0].Z; z != *st.Position {
			t.Errorf("%s: z = %g, want %g", st.Section.Name, z, *st.Position)
		}
	}
	edges, err := pointfile.Read(bytes.NewReader(b.Bytes()), "blade.dxf", pointfile.Options{Layer: LayerEdges})
	if err != nil || edges.Len() != 2*len(sts) {
		t.Errorf("guide lines: %v, %v", edges, err)
	}
	dup := []Station{sts[0], sts[0]}
	if err := StationsDXF(&b, dup); err == nil {
		t.Error("two stations of one name: no error")
	}
}

// The stations CSV reads back through foilwright's reader, columns x, y
// and z, every station in turn.
func TestStationsCSVReadsBack(t *testing.T) {
	sts := testStations(t)
	var b bytes.Buffer
	if err := StationsCSV(&b, sts); err != nil {
		t.Fatal(err)
	}
	c, err := pointfile.Read(bytes.NewReader(b.Bytes()), "blade.csv", pointfile.Options{Columns: "x,y,z"})
	if err != nil {
		t.Fatal(err)
	}
	var want []geometry.Vec3
	for _, st := range sts {
		want = append(want, st.Section.space(st.Section.outline())...)
	}
	if c.Units != geometry.Millimetre {
		t.Errorf("units %q", c.Units)
	}
	checkPoints(t, "stations CSV", c.Points, want, 100)
	chord := place(t, testSection(false, false), PlaceOptions{Frame: FrameChord})
	if err := StationsCSV(&b, []Station{{Section: chord}}); err == nil {
		t.Error("stations in chord units: no error")
	}
}

// A section with no plane is placed at z = its station.
func TestAtStation(t *testing.T) {
	p := place(t, testSection(false, false), PlaceOptions{})
	p.AtStation(900)
	if q := p.In3D(geometry.Point{X: 1, Y: 2}); q != (geometry.Vec3{X: 1, Y: 2, Z: 900}) {
		t.Errorf("in space: %v", q)
	}
}

const testResult = `{"format": "foilwright.result/1", "stage": "vortex-panel", "version": "0.1.0", "scalars": {"panels": 4},
 "cases": [
  {"alpha_deg": -2, "cl": 0.0123456789012345, "cm_c4": -0.05, "checks": {"cl_diff": 1e-5}, "cp": [{"x": 1, "y": 0, "cp": 0.2}, {"x": 0, "y": 0, "cp": 1}]},
  null,
  {"alpha_deg": 4, "cl": 0.7, "cm_c4": -0.06, "cp": [{"x": 1, "y": 0, "cp": 0.25}]}
 ], "warnings": []}`

// The polars and Cp tables read back as CSV to the numbers of the result
// documents, exactly.
func TestResultsCSV(t *testing.T) {
	r, err := ReadResult([]byte(testResult), "vortex.json", "mid, span")
	if err != nil {
		t.Fatal(err)
	}
	thin := &Result{Section: "mid, span", Stage: "thin-aerofoil", Cases: []Case{{AlphaDeg: 0, CL: 0.23, CMc4: -0.053}}}
	var b bytes.Buffer
	if err := PolarCSV(&b, []*Result{r, thin}); err != nil {
		t.Fatal(err)
	}
	rows := readCSV(t, b.String())
	if got := strings.Join(rows[0], ","); got != "section,stage,alpha_deg,cl,cm_c4,cl_diff" {
		t.Errorf("header %q", got)
	}
	if len(rows) != 4 || rows[1][0] != "mid, span" || rows[1][1] != "vortex-panel" || rows[3][5] != "" {
		t.Errorf("rows %q", rows)
	}
	if cl, _ := strconv.ParseFloat(rows[1][3], 64); cl != 0.0123456789012345 {
		t.Errorf("cl reads back as %v", cl)
	}
	b.Reset()
	if err := CpCSV(&b, []*Result{r, thin}); err != nil {
		t.Fatal(err)
	}
	rows = readCSV(t, b.String())
	if len(rows) != 4 || rows[3][0] != "mid, span" || strings.Join(rows[3][1:], ",") != "vortex-panel,4,1,0,0.25" {
		t.Errorf("Cp rows %q", rows)
	}
	if v, _ := strconv.ParseFloat(rows[1][5], 64); math.Abs(v-0.2) > 0 {
		t.Errorf("cp reads back as %v", v)
	}
	if _, err := ReadResult([]byte(`{"format": "foilwright.section/1"}`), "s.json", "s"); err == nil {
		t.Error("a section document read as a result")
	}
}

func readCSV(t *testing.T, s string) [][]string {
	t.Helper()
	r := csv.NewReader(strings.NewReader(s))
	r.Comment = '#'
	r.FieldsPerRecord = -1
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}
