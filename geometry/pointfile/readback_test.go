package pointfile

import (
	"bytes"
	"errors"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// layeredDXF holds a square section on layer SECTION and a LINE and a
// one-vertex POLYLINE on layer Chord.
var layeredDXF = strings.Join([]string{
	"  0", "SECTION", "  2", "ENTITIES",
	"  0", "LWPOLYLINE", "  8", "SECTION", " 70", "1", " 10", "0", " 20", "0", " 10", "1", " 20", "0", " 10", "1", " 20", "1",
	"  0", "LINE", "  8", "Chord", " 10", "0", " 20", "0", " 11", "5", " 21", "5",
	"  0", "POLYLINE", "  8", "Chord", " 66", "1", " 70", "0",
	"  0", "VERTEX", "  8", "Chord", " 10", "7", " 20", "7",
	"  0", "SEQEND",
	"  0", "ENDSEC", "  0", "EOF", ""}, "\n")

// Layer reads only the entities on the layer asked for.
func TestReadDXFLayer(t *testing.T) {
	all, err := Read(strings.NewReader(layeredDXF), "two.dxf", Options{Units: geometry.Millimetre})
	if err != nil || all.Len() != 6 {
		t.Fatalf("all layers: %v, %v", all, err)
	}
	c, err := Read(strings.NewReader(layeredDXF), "two.dxf", Options{Units: geometry.Millimetre, Layer: "section"})
	if err != nil {
		t.Fatal(err)
	}
	if c.Len() != 3 || c.Points[2] != (geometry.Vec3{X: 1, Y: 1}) {
		t.Errorf("layer SECTION: %v", c.Points)
	}
	var noted bool
	for _, n := range c.Notes {
		noted = noted || strings.Contains(n.Reason, `2 entities on layer "Chord" not read`)
	}
	if !noted {
		t.Errorf("notes %+v lack the entities passed over", c.Notes)
	}
	_, err = Read(strings.NewReader(layeredDXF), "two.dxf", Options{Units: geometry.Millimetre, Layer: "OUTLINE"})
	if !errors.Is(err, ErrNoEntities) || !strings.Contains(err.Error(), "Chord, SECTION") {
		t.Errorf("missing layer: %v", err)
	}
}

// A node listing normalised to unit chord reads in chord units; one that
// is not states no unit (common practice: such listings are normalised).
func TestListingChordUnits(t *testing.T) {
	var b bytes.Buffer
	nodes := []geometry.Point{{X: 1}, {X: 0.5, Y: 0.06}, {X: 0.1, Y: 0.04}, {}, {X: 0.1, Y: -0.03}, {X: 0.5, Y: -0.04}, {X: 1}}
	if err := WriteNodes(&b, "test section", nodes); err != nil {
		t.Fatal(err)
	}
	c, err := Read(bytes.NewReader(b.Bytes()), "nodes.dat", Options{})
	if err != nil || c.Units != geometry.ChordUnit || c.Format != FormatLoop {
		t.Fatalf("normalised listing: %+v, %v", c, err)
	}
	scaled := strings.Replace(b.String(), "\n1 0\n", "\n1.2 0\n", 1)
	if scaled == b.String() {
		t.Fatalf("listing has no line \"1 0\":\n%s", b.String())
	}
	c, err = Read(strings.NewReader(scaled), "nodes.dat", Options{})
	if err != nil || c.Units != "" {
		t.Errorf("listing to x = 1.2: units %q, %v; want none", c.Units, err)
	}
}
