package vortexpanel_test

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plugins/builtin/vortexpanel"
)

// A sweep over three angles of a NACA 2412 with 160 panels.
func Example() {
	nodes := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Loop(80)
	sv, err := vortexpanel.New(nodes)
	if err != nil {
		fmt.Println(err)
		return
	}
	cases, err := sv.Solve([]float64{-2 * math.Pi / 180, 0, 4 * math.Pi / 180})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range cases {
		fmt.Printf("α %5.1f°  Cl %.3f  Cm %.4f  stagnation x %.4f\n", c.Alpha*180/math.Pi, c.Cl, c.Cm, c.Stagnation.X)
	}
	// Output:
	// α  -2.0°  Cl 0.018  Cm -0.0527  stagnation x 0.0009
	// α   0.0°  Cl 0.260  Cm -0.0554  stagnation x 0.0000
	// α   4.0°  Cl 0.742  Cm -0.0612  stagnation x 0.0044
}
