package geometry

import (
	"errors"
	"testing"
)

func TestCheckNodes(t *testing.T) {
	sharp := NACA4{Thickness: 0.12, SharpTE: true}.Nodes(40)
	open := NACA4{Thickness: 0.12}.Nodes(40)
	pulled := NACA4{Thickness: 0.12}.Nodes(40)
	pulled[10].Y = -0.2 // the upper surface dips through the lower one
	repeated := NACA4{Thickness: 0.12}.Nodes(40)
	repeated[5] = repeated[6]
	clockwise := make([]Point, len(open))
	for i, p := range open {
		clockwise[len(open)-1-i] = p
	}
	for _, tc := range []struct {
		name  string
		nodes []Point
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
	square := []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}}
	if !InsideLoop(square, Point{0.5, 0.5}) || InsideLoop(square, Point{1.5, 0.5}) {
		t.Error("InsideLoop of the unit square")
	}
	bowtie := []Point{{0, 0}, {1, 1}, {1, 0}, {0, 1}}
	if i, j, ok := LoopCrossing(bowtie); !ok || i != 0 || j != 2 {
		t.Errorf("bow tie: (%d, %d, %v), want (0, 2, true)", i, j, ok)
	}
}
