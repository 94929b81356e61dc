package curve

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// Exact polylines of open-edged NACA 4-digit sections (Report 824
// thickness law, geometry/shape) at cosine stations, with 1 to 3 points on
// the base between the surfaces' last points, 150 mm chord, rounded to
// 0.001 mm: Fit must find the base and its corners as the points draw
// them (the base's points left out, every other point interpolated), not
// take the two 90° turns for one corner at the reach of the scatter about
// parabolas, which on such points is the outline's own curvature. The
// same points with 0.3 mm of noise (above the interpolation error between
// them, which the sampling test then reads as noise) must still be smoothed.
func TestFitExactPolylineKeepsBase(t *testing.T) {
	const chordMM, noiseMM = 150.0, 0.3
	for _, tc := range []struct {
		code string
		per  int
	}{{"0013", 20}, {"2412", 28}} {
		for base := 1; base <= 3; base++ {
			t.Run(fmt.Sprintf("%s/%d-on-base", tc.code, base), func(t *testing.T) {
				n, err := shape.ParseNACA4(tc.code)
				if err != nil {
					t.Fatal(err)
				}
				pts := baseLoop(n, tc.per, base)
				exact := &geometry.Contour{}
				for i, q := range pts {
					p := geometry.Point{X: math.Round(q.X*chordMM*1000) / 1000, Y: math.Round(q.Y*chordMM*1000) / 1000}
					exact.Points = append(exact.Points, p)
					exact.Origins = append(exact.Origins, geometry.Origin{File: "exact.txt", Line: i + 1})
				}
				_, rep, err := Fit(exact, FitOptions{})
				if err != nil {
					t.Fatal(err)
				}
				if rep.Method != FitInterpolate || rep.Ends != FitEndsOpen || len(rep.Base) != base {
					t.Errorf("exact: method %s, ends %s, %d base points (sample ratio %.3g), want %s, %s, %d", rep.Method, rep.Ends, len(rep.Base), rep.SampleRatio, FitInterpolate, FitEndsOpen, base)
				}
				// The same points with noise, independent in x and y.
				rng := rand.New(rand.NewPCG(uint64(base), 7))
				noisy := &geometry.Contour{}
				for i, p := range exact.Points {
					noisy.Points = append(noisy.Points, p.Add(geometry.Point{X: noiseMM * rng.NormFloat64(), Y: noiseMM * rng.NormFloat64()}))
					noisy.Origins = append(noisy.Origins, exact.Origins[i])
				}
				if _, rep, err = Fit(noisy, FitOptions{}); err != nil {
					t.Fatal(err)
				}
				if rep.Method == FitInterpolate {
					t.Errorf("noisy: interpolated (%s)", rep.Interpolates)
				}
			})
		}
	}
}

// baseLoop returns the open-edged outline of n (chord 1) counter-clockwise
// from the upper surface's last point: per cosine stations a surface,
// then base points evenly spaced strictly between the lower and the upper
// surface's last points.
func baseLoop(n shape.NACA4, per, base int) []geometry.Point {
	var pts []geometry.Point
	for i := per; i >= 1; i-- {
		pts = append(pts, n.Upper(shape.CosineStation(i, per)))
	}
	pts = append(pts, geometry.Point{})
	for i := 1; i <= per; i++ {
		pts = append(pts, n.Lower(shape.CosineStation(i, per)))
	}
	lo, up := n.Lower(1), n.Upper(1)
	for j := 1; j <= base; j++ {
		pts = append(pts, lo.Add(up.Sub(lo).Scale(float64(j)/float64(base+1))))
	}
	return pts
}
