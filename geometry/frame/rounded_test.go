package frame

import (
	"slices"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

func TestNoisyCornersNotRounded(t *testing.T) {
	// Sharp and blunt NACA 0012 edges (NACA Report 824 equations) cut from
	// a mesh with 0.04 mm noise on a 136 mm chord keep their corners: the
	// scatter-scale turning finds them and the rounded-end test rejects
	// them. The thin base of the open 0012 (0.34 mm) is as short as the
	// reach of the turning (ten scatters), so it may read as sharp, but it
	// must not read as rounded; a 4 mm base (the 0012 cut at 90 % chord)
	// is blunt.
	for _, tc := range []struct {
		name  string
		loop  []geometry.Point
		kinds []string // acceptable kinds
	}{
		{"sharp", testfoil.Loop(shape.NACA4{Thickness: 0.12, SharpTE: true}, 90), []string{TESharp}},
		{"thin base", testfoil.Loop(shape.NACA4{Thickness: 0.12}, 90), []string{TESharp, TEBlunt}},
		{"thick base", testfoil.Truncated(0.9, 90), []string{TEBlunt}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for i := range tc.loop {
				tc.loop[i] = tc.loop[i].Scale(136)
			}
			for seed := uint64(1); seed <= 4; seed++ {
				c := testfoil.Cut(tc.loop, 0.04, seed)
				cv, rep, err := curve.Fit(c, curve.FitOptions{})
				if err != nil {
					t.Fatal(err)
				}
				if rep.Ends != curve.FitEndsOpen {
					t.Errorf("seed %d: fit ends %q, want open (a corner)", seed, rep.Ends)
					continue
				}
				nz, err := Normalize(cv, Options{})
				if err != nil {
					t.Fatal(err)
				}
				if !slices.Contains(tc.kinds, nz.TE.Kind) {
					t.Errorf("seed %d: kind %q, want one of %q", seed, nz.TE.Kind, tc.kinds)
				}
			}
		})
	}
}
