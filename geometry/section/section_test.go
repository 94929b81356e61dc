package section

import (
	"bytes"
	"errors"
	"math"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

func TestRoundTrip(t *testing.T) {
	le := 40
	s := &Section{
		Name:    "NACA 0012",
		Units:   geometry.ChordUnit,
		LEIndex: &le,
		Frame:   &Frame{Chord: 152.4, TwistDeg: 7, LE: [2]float64{37, -2}},
		Nodes:   shape.NACA4{Thickness: 0.12}.Loop(40),
	}
	var buf bytes.Buffer
	if err := Write(&buf, s); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	if !regexp.MustCompile(`\n    \[1, 0\.00125\d*\],\n`).MatchString(out) || !strings.Contains(out, `"le": [37, -2]`) || !strings.HasSuffix(out, "]\n}\n") {
		t.Errorf("nodes not written one per line:\n%s", out[:min(len(out), 400)])
	}
	got, err := Read(strings.NewReader(out), "s.json")
	if err != nil {
		t.Fatal(err)
	}
	s.Format = Format
	if !reflect.DeepEqual(got, s) {
		t.Errorf("round trip changed the section:\n got %+v\nwant %+v", got, s)
	}
	var again bytes.Buffer
	Write(&again, got)
	if again.String() != out {
		t.Error("writing is not deterministic")
	}
}

func TestReadErrors(t *testing.T) {
	for _, tc := range []struct {
		name, doc string
		line      int
	}{
		{"syntax", "{\n \"format\": \"foilwright.section/1\",\n \"nodes\": [[0, 0],]\n}", 3},
		{"format", `{"format": "other/1", "nodes": []}`, 0},
		{"no nodes", `{"format": "foilwright.section/1"}`, 0},
		{"bad node", `{"format": "foilwright.section/1", "nodes": [[1, 2, 3]]}`, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Read(strings.NewReader(tc.doc), "s.json")
			var pe *geometry.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("err = %v, want *ParseError", err)
			}
			if tc.line > 0 && pe.Line != tc.line {
				t.Errorf("line = %d, want %d (%v)", pe.Line, tc.line, err)
			}
		})
	}
	if err := Write(&bytes.Buffer{}, &Section{Nodes: []geometry.Point{{X: math.NaN(), Y: 0}}}); err == nil {
		t.Error("NaN node written")
	}
}
