package section

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

func TestEncode(t *testing.T) {
	le := 1
	s := &Section{
		Name:    "demo",
		Units:   geometry.Millimetre,
		Frame:   &Frame{Chord: 152.4, TwistDeg: -7},
		Nodes:   []geometry.Point{{X: 1, Y: 0}, {X: 0, Y: 0.1}, {X: 0, Y: 0}, {X: 1e-21, Y: -0.1}, {X: 1, Y: 0}},
		LEIndex: &le,
	}
	b, err := Encode(s)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(b), "\n")
	var nodeLines int
	for _, l := range lines {
		if strings.HasPrefix(strings.TrimSpace(l), "[") && strings.Count(l, ",") >= 1 && !strings.Contains(l, ":") {
			nodeLines++
		}
	}
	if nodeLines != len(s.Nodes) {
		t.Errorf("%d node lines, want %d:\n%s", nodeLines, len(s.Nodes), b)
	}
	if !strings.Contains(string(b), "    [1e-21, -0.1],\n") {
		t.Errorf("node not written in shortest form:\n%s", b)
	}
	got, err := Read(bytes.NewReader(b), "section.json")
	if err != nil {
		t.Fatal(err)
	}
	if got.Name != s.Name || got.Frame.Chord != 152.4 || len(got.Nodes) != len(s.Nodes) || *got.LEIndex != 1 {
		t.Fatalf("round trip: %+v", got)
	}
	for i := range s.Nodes {
		if got.Nodes[i] != s.Nodes[i] {
			t.Errorf("node %d: %v, want %v (exact round trip)", i, got.Nodes[i], s.Nodes[i])
		}
	}
	b2, _ := Encode(got)
	if !bytes.Equal(b, b2) {
		t.Error("encoding is not deterministic")
	}
	empty, err := Encode(&Section{Nodes: []geometry.Point{}})
	if err != nil || !strings.HasSuffix(string(empty), "\"nodes\": []\n}\n") {
		t.Errorf("empty nodes: %q, %v", empty, err)
	}
	if _, err := Encode(&Section{Nodes: []geometry.Point{{X: 1, Y: 2}, {X: math.NaN(), Y: 0}}}); !errors.Is(err, geometry.ErrNonFinite) {
		t.Errorf("NaN node: err = %v, want ErrNonFinite", err)
	}
}
