package curve

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

// A blunt trailing edge given by its corners, with two noisy points on
// its base (NACA Report 824 equations, NACA 2412 with the open edge,
// 0.0025 c thick, 100 mm chord, 0.02 mm noise): the two base points lie
// apart along the chord as well as across it, as noisy points a third of
// the base apart do, so the line through them alone leans by some 30°
// from square to the chord, and by more with the noise. The fit's ends are where the surfaces meet the base given
// (through its corners), square across the chord as the true base is,
// not staggered along the chord by the lean of the two points' line
// (which made the edge read as open: campaign seeds 309, 2279, 5874).
func TestFitBaseThroughGivenCorners(t *testing.T) {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	part := testfoil.Part{Chord: 100, RotDeg: 7, Noise: 0.02}
	along := geometry.Point{X: 1}.Rotate(part.RotDeg * math.Pi / 180)
	up, lo := foil.Upper(1), foil.Lower(1)
	thick := up.Dist(lo)
	for _, seed := range []uint64{1, 2, 3} {
		for _, lean := range []float64{-0.4, 0.4} {
			part.Seed = seed
			loop := testfoil.Loop(foil, 200)
			// Two base points a sixth of the base either side of its
			// middle, each off it along the chord by a tenth of its width
			// (0.025 mm, about the noise), in opposite directions.
			mid := up.Add(lo).Scale(0.5)
			base := []geometry.Point{
				mid.Add(geometry.Point{X: -lean * thick / 4, Y: -thick / 6}),
				mid.Add(geometry.Point{X: lean * thick / 4, Y: thick / 6}),
			}
			c := testfoil.Contour(append(loop, base...), part)
			cv, _, err := Fit(c, FitOptions{Edge: &Edge{Base: 2, Upper: part.ToPart(up), Lower: part.ToPart(lo)}})
			if err != nil {
				t.Fatal(err)
			}
			d := cv.End().Sub(cv.Start())
			stagger, across := math.Abs(d.Dot(along)), math.Abs(along.Cross(d))
			// Measured 0.067 of the width across (the true base's own
			// lean: square to the camber line, whose slope is that at
			// the edge), 0.97-1.2 of the base across; through the two
			// points, 0.04-1.34 of the width.
			if stagger > 0.1*across || math.Abs(across/(thick*part.Chord)-1) > 0.25 {
				t.Errorf("seed %d, lean %+.1f: the curve's ends lie %.4f mm apart along the chord and %.4f mm across (base %.4f mm)", seed, lean, stagger, across, thick*part.Chord)
			}
		}
	}
}
