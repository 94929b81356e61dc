package frame_test

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/geometry/shape"
)

// A NACA 2412 with the open Report 824 trailing edge, placed at 150 mm
// chord, twisted 3° nose-up and shifted, goes through the fit, the
// normalisation and the properties. The chord line runs from the point
// farthest from the trailing edge, which for this cambered section lies
// 0.09° off the Report 824 chord line.
func ExampleNormalize() {
	n, _ := shape.ParseNACA4("2412")
	c := &geometry.Contour{Units: geometry.Millimetre}
	for _, p := range n.Loop(60) {
		q := p.Scale(150).Rotate(-3 * math.Pi / 180).Add(geometry.Point{X: 20, Y: 5})
		c.Points = append(c.Points, q)
		c.Origins = append(c.Origins, geometry.Origin{File: "demo.csv", Line: len(c.Points)})
	}
	cv, rep, err := curve.Fit(c, curve.FitOptions{Exact: true})
	if err != nil {
		panic(err)
	}
	nz, err := frame.Normalize(cv, frame.Options{})
	if err != nil {
		panic(err)
	}
	sp, _, err := props.Compute(nz.Path, nz.SLE, props.Options{})
	if err != nil {
		panic(err)
	}
	fmt.Printf("fit %s, %s ends\n", rep.Method, rep.Ends)
	fmt.Printf("chord %.2f mm, twist %.2f°, mirrored %v\n", nz.Frame.Chord, nz.Frame.TwistDeg, nz.Frame.Mirrored)
	fmt.Printf("trailing edge %s (%s), thickness %.4f\n", nz.TE.Kind, nz.TE.Action, nz.TE.Thickness)
	fmt.Printf("thickness %.3f at %.2f\n", sp.Thickness, sp.ThicknessAt)
	// Output:
	// fit interpolate, open ends
	// chord 150.01 mm, twist 3.09°, mirrored false
	// trailing edge blunt (kept), thickness 0.0025
	// thickness 0.120 at 0.30
}
