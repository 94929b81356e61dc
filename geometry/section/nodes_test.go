package section

import (
	"errors"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

func TestCheckNodes(t *testing.T) {
	sharp := shape.NACA4{Thickness: 0.12, SharpTE: true}.Nodes(40)
	open := shape.NACA4{Thickness: 0.12}.Nodes(40)
	pulled := shape.NACA4{Thickness: 0.12}.Nodes(40)
	pulled[10].Y = -0.2 // the upper surface dips through the lower one
	repeated := shape.NACA4{Thickness: 0.12}.Nodes(40)
	repeated[5] = repeated[6]
	clockwise := make([]geometry.Point, len(open))
	for i, p := range open {
		clockwise[len(open)-1-i] = p
	}
	for _, tc := range []struct {
		name  string
		nodes []geometry.Point
		sharp bool
		want  error
	}{
		{"sharp NACA 0012", sharp, true, nil},
		{"open NACA 0012", open, false, nil},
		{"crossing", pulled, false, ErrCrossing},
		{"repeated", repeated, false, ErrRepeatedNode},
		{"clockwise", clockwise, false, ErrClockwise},
		{"too few", open[:5], false, ErrTooFewNodes},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, err := CheckNodes(tc.nodes)
			if !errors.Is(err, tc.want) || (err == nil && got != tc.sharp) {
				t.Errorf("got (%v, %v), want (%v, %v)", got, err, tc.sharp, tc.want)
			}
		})
	}
}
