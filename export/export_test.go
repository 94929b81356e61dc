package export

import (
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
)

// readbackTol is how close, as a fraction of the chord, every exported
// node must read back (the figure).
const readbackTol = 1e-9

// testSection returns a NACA 2412 section document (NACA Report 824
// equations, 151 panels) with a frame in the part: 200.01 mm chord,
// twisted 4.09° nose-up, leading edge at (412.36, 118.92) mm; sharp or
// with the blunt trailing edge of the equations, mirrored when asked.
func testSection(sharp, mirrored bool) *section.Section {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: sharp}
	return &section.Section{
		Format: section.Format, Name: "probe", Units: geometry.Millimetre,
		Frame: &section.Frame{Chord: 200.01, TwistDeg: 4.09, LE: [2]float64{412.36, 118.92}, Mirrored: mirrored},
		Nodes: foil.Nodes(151),
	}
}

// place places s in the part frame or fails the test.
func place(t *testing.T, s *section.Section, o PlaceOptions) *Placed {
	t.Helper()
	p, err := Place(s, o)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// checkPoints fails t unless got holds want, point by point, within
// readbackTol of chord.
func checkPoints(t *testing.T, what string, got []geometry.Vec3, want []geometry.Vec3, chord float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%s: %d points read back, want %d", what, len(got), len(want))
	}
	worst := 0.0
	for i := range got {
		worst = math.Max(worst, got[i].Sub(want[i]).Norm()/chord)
	}
	if worst > readbackTol {
		t.Errorf("%s: a point reads back %.3g chord off", what, worst)
	}
}

func flat(qs []geometry.Point) []geometry.Vec3 {
	out := make([]geometry.Vec3, len(qs))
	for i, q := range qs {
		out[i] = geometry.Vec3{X: q.X, Y: q.Y}
	}
	return out
}

func TestPlace(t *testing.T) {
	s := testSection(false, false)
	p := place(t, s, PlaceOptions{})
	// The frame maps the leading edge (0, 0) to LE and the trailing edge
	// (1, 0) a chord away at the twist (the frame's definition).
	if p.Nodes[151/2+1].Dist(geometry.Point{X: 412.36, Y: 118.92}) > 1e-9 {
		t.Errorf("leading-edge node at %v", p.Nodes[76])
	}
	if d := p.TE.Dist(p.LE); math.Abs(d-200.01) > 1e-9 {
		t.Errorf("chord %v", d)
	}
	if tw := -math.Atan2(p.TE.Y-p.LE.Y, p.TE.X-p.LE.X) * 180 / math.Pi; math.Abs(tw-4.09) > 1e-9 {
		t.Errorf("twist %v", tw)
	}
	mir := place(t, testSection(false, true), PlaceOptions{})
	if mir.TE.X > mir.LE.X {
		t.Errorf("mirrored: trailing edge %v not on the -x side of %v", mir.TE, mir.LE)
	}
	chord := place(t, s, PlaceOptions{Frame: FrameChord})
	if chord.Units != geometry.ChordUnit || chord.Nodes[10] != s.Nodes[10] {
		t.Errorf("chord frame: %s, %v", chord.Units, chord.Nodes[10])
	}
	scaled := place(t, s, PlaceOptions{Chord: geometry.Length{Value: 150, Unit: geometry.Millimetre}})
	if scaled.Units != geometry.Millimetre || scaled.Nodes[10] != s.Nodes[10].Scale(150) {
		t.Errorf("scaled: %s, %v", scaled.Units, scaled.Nodes[10])
	}
	shapeDoc := &section.Section{Name: "naca", Units: geometry.ChordUnit, Nodes: s.Nodes}
	if _, err := Place(shapeDoc, PlaceOptions{}); !errors.Is(err, ErrNoFrame) {
		t.Errorf("part frame of a chord-unit section: %v", err)
	}
	for _, o := range []PlaceOptions{{Frame: "wing"}, {Frame: FrameChord, Chord: geometry.Length{Value: 1, Unit: geometry.Millimetre}}, {Chord: geometry.Length{Value: 1}}, {Chord: geometry.Length{Value: -1, Unit: geometry.Inch}}} {
		if _, err := Place(s, o); err == nil {
			t.Errorf("%+v: no error", o)
		}
	}
}

// DXF reads back through foilwright's reader: layer SECTION gives the
// outline, layer SPLINE the fit points, both the nodes, in the unit the
// header declares.
func TestDXFReadsBack(t *testing.T) {
	for _, sharp := range []bool{false, true} {
		p := place(t, testSection(sharp, false), PlaceOptions{})
		var b bytes.Buffer
		if err := DXF(&b, p); err != nil {
			t.Fatal(err)
		}
		poly, err := pointfile.Read(bytes.NewReader(b.Bytes()), "s.dxf", pointfile.Options{Layer: LayerSection})
		if err != nil {
			t.Fatal(err)
		}
		if poly.Units != geometry.Millimetre {
			t.Errorf("units %q, want mm", poly.Units)
		}
		checkPoints(t, fmt.Sprintf("sharp %v, polyline", sharp), poly.Points, flat(p.outline()), p.Chord)
		spl, err := pointfile.Read(bytes.NewReader(b.Bytes()), "s.dxf", pointfile.Options{Layer: LayerSpline})
		if err != nil {
			t.Fatal(err)
		}
		fit := spl.Points
		if len(spl.Segments) > 1 {
			fit = fit[:spl.Segments[1]] // the base line of a blunt edge follows
		}
		checkPoints(t, fmt.Sprintf("sharp %v, spline fit points", sharp), fit, flat(p.Nodes), p.Chord)
		if sharp == (len(spl.Segments) > 1) {
			t.Errorf("sharp %v: %d runs on the spline layer", sharp, len(spl.Segments))
		}
		for _, want := range []string{"AC1009", "$INSUNITS\n 70\n4\n", "\nCHORD\n", "\nDATUM\n", "\nSPLINE\n"} {
			if !bytes.Contains(b.Bytes(), []byte(want)) {
				t.Errorf("sharp %v: DXF lacks %q", sharp, want)
			}
		}
	}
	// In inches the header says so.
	s := testSection(false, false)
	s.Units = geometry.Inch
	var b bytes.Buffer
	if err := DXF(&b, place(t, s, PlaceOptions{})); err != nil {
		t.Fatal(err)
	}
	c, err := pointfile.Read(&b, "s.dxf", pointfile.Options{Layer: LayerSection})
	if err != nil || c.Units != geometry.Inch {
		t.Errorf("inches: %v, %v", c.Units, err)
	}
}

// The spline of the DXF passes through the nodes between them smoothly: at
// the midpoints between nodes it lies within the panels' own departure
// from the curve (1e-4 chord at this count) of the section's equations.
func TestDXFSplineFollowsSection(t *testing.T) {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	nodes := foil.Nodes(151)
	pts := make([]geometry.Vec3, len(nodes))
	for i, q := range nodes {
		pts[i] = geometry.Vec3{X: q.X, Y: q.Y}
	}
	b, us, err := interpolate(pts)
	if err != nil {
		t.Fatal(err)
	}
	dense := foil.Nodes(20000)
	worst := 0.0
	for i := 0; i+1 < len(us); i++ {
		q := b.at((us[i] + us[i+1]) / 2)
		best := math.Inf(1)
		for _, d := range dense {
			best = math.Min(best, math.Hypot(q.X-d.X, q.Y-d.Y))
		}
		worst = math.Max(worst, best)
	}
	if worst > 1e-4 {
		t.Errorf("spline departs %.3g chord from the section between nodes", worst)
	}
	t.Logf("spline within %.2g chord of the NACA 2412 between nodes", worst)
}

// CSV reads back through foilwright's reader, in its unit.
func TestCSVReadsBack(t *testing.T) {
	for _, o := range []PlaceOptions{{}, {Frame: FrameChord}} {
		p := place(t, testSection(false, true), o)
		var b bytes.Buffer
		if err := CSV(&b, p); err != nil {
			t.Fatal(err)
		}
		c, err := pointfile.Read(bytes.NewReader(b.Bytes()), "s.csv", pointfile.Options{})
		if err != nil {
			t.Fatal(err)
		}
		if c.Units != p.Units {
			t.Errorf("%s frame: units %q, want %q", p.Frame, c.Units, p.Units)
		}
		checkPoints(t, p.Frame+" frame CSV", c.Points, flat(p.Nodes), p.Chord)
	}
}

// The SVG is 1:1: its width in mm equals the width of its view box in mm;
// the path of the outline reads back to the nodes (y pointing down the
// page).
func TestSVGReadsBack(t *testing.T) {
	p := place(t, testSection(false, false), PlaceOptions{})
	var b bytes.Buffer
	if err := SVG(&b, p); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Width   string `xml:"width,attr"`
		ViewBox string `xml:"viewBox,attr"`
		Paths   []struct {
			ID string `xml:"id,attr"`
			D  string `xml:"d,attr"`
		} `xml:"g>path"`
		Texts []string `xml:"g>g>text"`
	}
	if err := xml.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	vb := strings.Fields(doc.ViewBox)
	w, _ := strconv.ParseFloat(strings.TrimSuffix(doc.Width, "mm"), 64)
	vw, _ := strconv.ParseFloat(vb[2], 64)
	if !strings.HasSuffix(doc.Width, "mm") || w != vw {
		t.Errorf("width %s, view box %s: not 1:1 in mm", doc.Width, doc.ViewBox)
	}
	var got []geometry.Vec3
	for _, path := range doc.Paths {
		if path.ID != "section" {
			continue
		}
		for _, f := range strings.Fields(path.D) {
			if xy := strings.Split(f, ","); len(xy) == 2 {
				x, _ := strconv.ParseFloat(xy[0], 64)
				y, _ := strconv.ParseFloat(xy[1], 64)
				got = append(got, geometry.Vec3{X: x, Y: -y})
			}
		}
	}
	checkPoints(t, "SVG outline", got, flat(p.outline()), p.Chord)
	if len(doc.Texts) == 0 || !strings.Contains(doc.Texts[0], "mm: print at 100 %") {
		t.Errorf("scale bar label %q", doc.Texts)
	}
	chord := place(t, testSection(false, false), PlaceOptions{Frame: FrameChord})
	if err := SVG(&b, chord); !errors.Is(err, ErrNoScale) {
		t.Errorf("chord units: %v, want ErrNoScale", err)
	}
}

func TestScaleBar(t *testing.T) {
	for _, tc := range []struct{ width, want float64 }{{200, 50}, {130, 50}, {120, 20}, {9, 2}, {0.3, 0.1}} {
		if got := scaleBar(tc.width); math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("width %g: bar %g, want %g", tc.width, got, tc.want)
		}
	}
}

// geoScript is a .geo file parsed back: points with their mesh sizes,
// curves by kind with their point ids, loops, surfaces and physical groups.
type geoScript struct {
	points   map[int][4]float64
	curves   map[int][]int
	kinds    map[int]string
	loops    map[string][]int // "Curve Loop 1", "Plane Surface 1"
	physical map[string][]int
}

var geoStatement = regexp.MustCompile(`^(Point|Spline|Line|Circle|Curve Loop|Plane Surface)\((\d+)\) = \{([^}]*)\};`)
var geoPhysical = regexp.MustCompile(`^Physical (?:Curve|Surface)\("(\w+)", \d+\) = \{([^}]*)\};`)

func parseGeo(t *testing.T, text string) geoScript {
	t.Helper()
	g := geoScript{points: map[int][4]float64{}, curves: map[int][]int{}, kinds: map[int]string{}, loops: map[string][]int{}, physical: map[string][]int{}}
	numbers := func(s string) []float64 {
		var out []float64
		for _, f := range strings.Split(s, ",") {
			v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
			if err != nil {
				t.Fatalf("%q: %v", s, err)
			}
			out = append(out, v)
		}
		return out
	}
	ints := func(s string) []int {
		var out []int
		for _, v := range numbers(s) {
			out = append(out, int(v))
		}
		return out
	}
	for _, line := range strings.Split(text, "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "//") || strings.HasPrefix(line, "SetFactory") {
			continue
		}
		if m := geoPhysical.FindStringSubmatch(line); m != nil {
			g.physical[m[1]] = ints(m[2])
			continue
		}
		m := geoStatement.FindStringSubmatch(line)
		if m == nil {
			t.Fatalf("line not understood: %q", line)
		}
		id, _ := strconv.Atoi(m[2])
		switch m[1] {
		case "Point":
			v := numbers(m[3])
			g.points[id] = [4]float64{v[0], v[1], v[2], v[3]}
		case "Curve Loop", "Plane Surface":
			g.loops[m[1]+" "+m[2]] = ints(m[3])
		default:
			g.curves[id], g.kinds[id] = ints(m[3]), m[1]
		}
	}
	return g
}

// The .geo parses back: the splines of the physical group "section" run
// through the nodes in order, the loop closes, the far field lies at the
// radius asked for, and every mesh size is positive.
func TestGeoParsesBack(t *testing.T) {
	for _, sharp := range []bool{false, true} {
		p := place(t, testSection(sharp, false), PlaceOptions{})
		var b bytes.Buffer
		if err := Geo(&b, p, GeoOptions{Farfield: 15}); err != nil {
			t.Fatal(err)
		}
		g := parseGeo(t, b.String())
		var got []geometry.Vec3
		var prevEnd int
		for k, id := range g.physical["section"] {
			ids := g.curves[id]
			if k > 0 && ids[0] != prevEnd {
				t.Fatalf("sharp %v: curve %d starts at point %d, the previous ends at %d", sharp, id, ids[0], prevEnd)
			}
			prevEnd = ids[len(ids)-1]
			if g.kinds[id] != "Spline" {
				continue
			}
			for i, pid := range ids {
				if k > 0 && i == 0 {
					continue // the leading edge, shared
				}
				q := g.points[pid]
				got = append(got, geometry.Vec3{X: q[0], Y: q[1]})
				if !(q[3] > 0) {
					t.Errorf("point %d: mesh size %g", pid, q[3])
				}
			}
		}
		if first := g.curves[g.physical["section"][0]][0]; prevEnd != first {
			t.Errorf("sharp %v: the section's loop ends at point %d, not at its start %d", sharp, prevEnd, first)
		}
		checkPoints(t, fmt.Sprintf("sharp %v, splines", sharp), got, flat(p.Nodes), p.Chord)
		mid := p.LE.Add(p.TE).Scale(0.5)
		for _, id := range g.physical["farfield"] {
			if g.kinds[id] != "Circle" {
				t.Errorf("far-field curve %d is a %s", id, g.kinds[id])
			}
			for _, pid := range []int{g.curves[id][0], g.curves[id][2]} {
				q := g.points[pid]
				if r := math.Hypot(q[0]-mid.X, q[1]-mid.Y); math.Abs(r-15*p.Chord) > 1e-9*p.Chord {
					t.Errorf("far-field point %d at radius %g, want %g", pid, r, 15*p.Chord)
				}
			}
		}
		if len(g.physical["fluid"]) != 1 || len(g.loops) != 3 || len(g.loops["Plane Surface 1"]) != 2 {
			t.Errorf("fluid %v, loops and surfaces %v", g.physical["fluid"], g.loops)
		}
	}
	p := place(t, testSection(false, false), PlaceOptions{})
	for _, o := range []GeoOptions{{Farfield: 0.5}, {WallSize: -1}, {FarSize: -1}} {
		if err := Geo(&bytes.Buffer{}, p, o); err == nil {
			t.Errorf("%+v: no error", o)
		}
	}
}
