package pointfile

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

func TestWriteNodes(t *testing.T) {
	for _, tc := range []struct {
		name  string
		nodes []geometry.Point
		want  string
	}{
		{"NACA 0012", []geometry.Point{{X: 1, Y: 0}, {X: 0.5, Y: 0.06}, {X: 0, Y: 0}}, "NACA 0012\n1 0\n0.5 0.06\n0 0\n"},
		// No exponents, −0 as 0, the shortest form that reads back.
		{"r040\nx", []geometry.Point{{X: 1, Y: math.Copysign(0, -1)}, {X: 1e-7, Y: -0.1}, {X: 0.30000000000000004, Y: 2}}, "r040 x\n1 0\n0.0000001 -0.1\n0.30000000000000004 2\n"},
		{"", []geometry.Point{{X: 7.82037111685477e-05, Y: 1e21}}, "section\n0.0000782037111685477 1000000000000000000000\n"},
	} {
		var b bytes.Buffer
		if err := WriteNodes(&b, tc.name, tc.nodes); err != nil {
			t.Fatal(err)
		}
		if got := b.String(); got != tc.want {
			t.Errorf("got %q, want %q", got, tc.want)
		}
	}
	var b bytes.Buffer
	if err := WriteNodes(&b, "x", []geometry.Point{{X: 0, Y: 1}, {X: math.Inf(1), Y: 0}}); err == nil || !strings.Contains(err.Error(), "not finite") || b.Len() != 0 {
		t.Errorf("infinite node: err = %v, wrote %q", err, b.String())
	}
}
