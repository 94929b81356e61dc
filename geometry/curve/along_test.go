package curve

import (
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

func TestFitAlongTies(t *testing.T) {
	// A band whose positions along the loop were measured at the points'
	// feet on a curve (Contour.Along): points on one normal of that curve
	// share a foot, as the stair-stepped points of a voxel scan do, and
	// their positions tie. The fit must still solve its spline system
	// (a knot step of nothing left it singular in floating point:
	// campaign seed 419 exited 2, "spline system not positive definite")
	// and the curve stay within 0.001 of the chord of the analytic
	// contour (NACA Report 824 equations), as without the ties.
	const tol = 0.001 // of the chord; measured: 0.00008 without ties, 0.0002 with every 7th
	n, _ := shape.ParseNACA4("2412")
	part := testfoil.Part{Chord: 152.4, RotDeg: 7, Shift: geometry.Point{X: 37, Y: -12}, Noise: 0.02, Seed: 5}
	for _, every := range []int{0, 11, 7} {
		// Every every-th point is measured again at its neighbour's
		// place: its own noise puts it beside that neighbour, on about
		// the same normal, and its position along the loop ties.
		loop := testfoil.Loop(n, 700)
		for i := range loop {
			if every > 0 && i > 0 && i%every == 0 {
				loop[i] = loop[i-1]
			}
		}
		c := testfoil.Contour(loop, part)
		c.Along = make([]float64, c.Len())
		for i := 1; i < c.Len(); i++ {
			c.Along[i] = c.Along[i-1] + part.ToPart(loop[i]).Dist(part.ToPart(loop[i-1]))
		}
		cv, _, err := Fit(c, FitOptions{Noise: 0.02})
		if err != nil {
			t.Errorf("every %d tied: %v", every, err)
			continue
		}
		dense := testfoil.Dense(n)
		for i := range dense {
			dense[i] = part.ToPart(dense[i])
		}
		L := cv.Length()
		if d := testfoil.MaxDist(cv.Sub(0.005*L, 0.995*L).Samples(6000), dense); d > tol*part.Chord {
			t.Errorf("every %d tied: the curve departs %.4f mm from the analytic contour, more than %.3g mm", every, d, tol*part.Chord)
		}
	}
}
