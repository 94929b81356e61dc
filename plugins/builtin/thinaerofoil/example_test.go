package thinaerofoil_test

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/plugins/builtin/thinaerofoil"
)

// The camber line of a NACA 2412 taken from its nodes.
func Example() {
	nodes := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}.Loop(100)
	xs, ycs, err := thinaerofoil.CamberFromNodes(nodes)
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := thinaerofoil.New(xs, ycs)
	if err != nil {
		fmt.Println(err)
		return
	}
	cases, err := c.Solve([]float64{4 * math.Pi / 180})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("α_L0 %.2f°  Cm_c/4 %.4f  Cl(4°) %.3f  x_cp %.3f\n", c.ZeroLiftAngle()*180/math.Pi, c.CmQuarter(), cases[0].Cl, cases[0].XCP)
	// Output:
	// α_L0 -2.12°  Cm_c/4 -0.0528  Cl(4°) 0.671  x_cp 0.329
}
