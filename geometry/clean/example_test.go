package clean_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/clean"
	"github.com/foilwright/foilwright/geometry/shape"
)

// Clean orders a shuffled cloud (here a NACA 2412, 152.4 mm chord, from
// the equations of NACA Report 824) with one probe hit that slipped, and
// starts it at the trailing edge.
func ExampleClean() {
	pts := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}.Loop(60)
	cloud := &geometry.Cloud{Dim: 2, Units: geometry.Millimetre}
	for i, p := range pts {
		cloud.Points = append(cloud.Points, geometry.Vec3{X: 152.4 * p.X, Y: 152.4 * p.Y})
		cloud.Origins = append(cloud.Origins, geometry.Origin{File: "probe.csv", Line: i + 2})
	}
	cloud.Points[30].Y += 2 // the slipped hit, 2 mm off the upper surface
	rng := rand.New(rand.NewPCG(1, 2))
	rng.Shuffle(len(pts), func(i, j int) {
		cloud.Points[i], cloud.Points[j] = cloud.Points[j], cloud.Points[i]
		cloud.Origins[i], cloud.Origins[j] = cloud.Origins[j], cloud.Origins[i]
	})
	ct, rep, err := clean.Clean(cloud, clean.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d points read, %d in the contour, %d loop(s)\n", rep.Read, ct.Len(), len(rep.Loops))
	for _, d := range rep.Dropped {
		fmt.Printf("dropped %s: %s, %.1f mm off\n", d.Origin, d.Reason, d.Distance)
	}
	fmt.Printf("starts at %s (%.1f, %.1f) mm\n", ct.Origins[0], ct.Points[0].X, ct.Points[0].Y)
	// Output:
	// 121 points read, 120 in the contour, 1 loop(s)
	// dropped probe.csv:32: outlier, 2.0 mm off
	// starts at probe.csv:2 (152.4, 0.2) mm
}
