package curve

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

// A sharp trailing edge given off the true corner (as a corner found by
// short fits near the edge is, by a few times the noise): the smoothed
// fit places the corner itself from both surfaces, so its ends come out
// nearer the true corner (NACA Report 824 equations, NACA 2412 with the
// closed edge, 100 mm chord, 0.02 mm noise, the corner unsampled) than the
// corner it was given, and the curve still departs from the true outline
// by no more than a few noise widths near the edge.
func TestFitPlacesGivenCorner(t *testing.T) {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	part := testfoil.Part{Chord: 100, RotDeg: 7, Noise: 0.02}
	truth := part.ToPart(geometry.Point{X: 1})
	dense := testfoil.Dense(foil)
	for i := range dense {
		dense[i] = part.ToPart(dense[i])
	}
	for _, seed := range []uint64{1, 2, 3} {
		for _, off := range []float64{-0.06, 0.06} {
			part.Seed = seed
			loop := testfoil.Loop(foil, 200)[1:] // the corner itself unsampled
			c := testfoil.Contour(loop, part)
			across := geometry.Point{X: 0, Y: 1}.Rotate(part.RotDeg * math.Pi / 180)
			given := truth.Add(across.Scale(off))
			cv, rep, err := Fit(c, FitOptions{Edge: &Edge{Upper: given, Lower: given}})
			if err != nil {
				t.Fatal(err)
			}
			if rep.Method != FitAuto {
				t.Fatalf("seed %d: method %s", seed, rep.Method)
			}
			end := cv.Start().Add(cv.End()).Scale(0.5)
			// Measured 0.011–0.026 mm from the true corner against the
			// 0.06 mm given; bound at half what was given.
			if d := end.Dist(truth); d > math.Abs(off)/2 {
				t.Errorf("seed %d, corner given %+.2f mm across: the curve ends %.4f mm from the true corner", seed, off, d)
			}
			if d := cv.Start().Dist(cv.End()); d > 1e-4 {
				t.Errorf("seed %d: the curve's ends are %.3g mm apart, want one corner", seed, d)
			}
			if d := testfoil.MaxDist(cv.Samples(4000), dense); d > 0.05 {
				t.Errorf("seed %d, corner given %+.2f mm across: curve departs %.4f mm from the true outline", seed, off, d)
			}
		}
	}
}

// Dips of the curvature round the nose are counted, a curvature that rises
// to one maximum and falls away is not, and the flat surfaces are not
// searched (constructed curvature samples).
func TestRipples(t *testing.T) {
	mk := func(f func(s float64) float64) []curvatureSample {
		var ks []curvatureSample
		for j := 0; j <= 400; j++ {
			s := float64(j) / 400
			ks = append(ks, curvatureSample{s, f(s)})
		}
		return ks
	}
	nose := func(s float64) float64 { return 2 + 60/(1+math.Pow((s-0.5)/0.03, 2)) }
	if r := ripples(mk(nose), 10); len(r) != 0 {
		t.Errorf("a clean nose: %d dips %v, want none", len(r), r)
	}
	dipped := func(s float64) float64 {
		return nose(s) - 20*math.Exp(-math.Pow((s-0.52)/0.003, 2))
	}
	r := ripples(mk(dipped), 10)
	if len(r) != 1 || r[0][0] > 0.52 || r[0][1] < 0.52 {
		t.Errorf("a dip at 0.52 on the nose: dips %v, want one about it", r)
	}
	flat := func(s float64) float64 { return 1 + 0.5*math.Sin(60*s) }
	if r := ripples(mk(flat), 10); len(r) != 0 {
		t.Errorf("curvature below the floor: dips %v, want none", r)
	}
}
