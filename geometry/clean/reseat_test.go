package clean

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// pass returns one probe pass round a NACA 2412 of chord 100 (NACA Report
// 824 equations, sharp edge): k points evenly along the outline starting
// a fraction start of the way round, with normal-ish noise of sd, each
// point moved by the rigid move (shift at the origin, turn about it).
func pass(rng *rand.Rand, k int, start, sd float64, shift geometry.Point, turn float64) []geometry.Point {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	st := nacaArcStations(foil, 4*k+1)
	st = st[:len(st)-1] // the loop, its corner once
	out := make([]geometry.Point, 0, k)
	off := int(start * float64(len(st)))
	for i := range k {
		p := st[(off+4*i+rng.IntN(3))%len(st)].Scale(100)
		p = p.Add(geometry.Point{X: sd * rng.NormFloat64(), Y: sd * rng.NormFloat64()})
		out = append(out, p.Rotate(turn).Add(shift))
	}
	return out
}

// Two whole passes round a section, the part re-clamped between them
// (moved 0.02-0.1 mm on a 100 mm chord, turned up to 0.02°; sizes common
// practice): the move found is the one applied (the exact answer) within
// a few standard errors, and each pass is moved half the way so that the
// passes meet midway. One pass alone, two passes that agree, two
// passes in shuffled order, and a loop with its nose measured again are
// left as they are.
func TestReseatTwoPasses(t *testing.T) {
	const sd = 0.002
	for i, tc := range []struct {
		shift geometry.Point
		turn  float64 // degrees
	}{
		{geometry.Point{X: 0.05, Y: -0.03}, 0},
		{geometry.Point{X: -0.02, Y: 0.01}, 0.01},
		{geometry.Point{X: 0, Y: 0.1}, -0.02},
	} {
		t.Run(fmt.Sprintf("move %d", i), func(t *testing.T) {
			rng := rand.New(rand.NewPCG(uint64(i), 26))
			turn := tc.turn * math.Pi / 180
			a := pass(rng, 300, 0.1, sd, geometry.Point{}, 0)
			b := pass(rng, 340, 0.6, sd, tc.shift, turn)
			pts := append(append([]geometry.Point{}, a...), b...)
			orig := append([]geometry.Point{}, pts...)
			r := reseat(pts, origins(len(pts)), diagOf(pts))
			if r == nil {
				t.Fatalf("two passes %v apart not found", tc.shift)
			}
			if r.Second.Line != 301 {
				t.Errorf("second pass starts at %v, want line 301", r.Second)
			}
			// The applied move at the fit's centre.
			want := r.Centre.Rotate(turn).Add(tc.shift).Sub(r.Centre)
			if d := r.Shift.Dist(want); d > 4*r.Spread+1e-4 {
				t.Errorf("shift %v, want %v (off %.2g, spread %.2g)", r.Shift, want, d, r.Spread)
			}
			if d := math.Abs(r.Turn - turn); d > 2e-5 {
				t.Errorf("turn %.3g°, want %.3g°", r.Turn*180/math.Pi, tc.turn)
			}
			// Each pass moved half the way (to first order in the turn:
			// the first by half the turn and half the shift, the second
			// back by as much), so that the passes meet midway.
			for _, i := range []int{0, 150, 400, 600} {
				want := orig[i].Rotate(turn / 2).Add(tc.shift.Scale(0.5))
				if i >= 300 {
					want = orig[i].Rotate(-turn / 2).Sub(tc.shift.Scale(0.5))
				}
				if d := pts[i].Dist(want); d > 2e-3 {
					t.Errorf("point %d moved %v, want %v (off %.2g)", i, pts[i].Sub(orig[i]), want.Sub(orig[i]), d)
				}
			}
		})
	}
	t.Run("left alone", func(t *testing.T) {
		rng := rand.New(rand.NewPCG(5, 26))
		one := pass(rng, 600, 0.3, sd, geometry.Point{}, 0)
		agree := append(pass(rng, 300, 0.1, sd, geometry.Point{}, 0), pass(rng, 300, 0.7, sd, geometry.Point{}, 0)...)
		shuffled := append(pass(rng, 300, 0.1, sd, geometry.Point{}, 0), pass(rng, 300, 0.7, sd, geometry.Point{X: 0.1}, 0)...)
		rng.Shuffle(len(shuffled), func(i, j int) { shuffled[i], shuffled[j] = shuffled[j], shuffled[i] })
		// The loop from the trailing edge with the nose measured again
		// (a piece of the nose first, two passes over it after): split
		// at the nose, each part closes on itself and spans the chord,
		// but each jumps from nose to edge, so neither is a pass.
		loop := pass(rng, 300, 0, sd, geometry.Point{}, 0)
		nose := func(start float64, k int) []geometry.Point {
			return pass(rng, 500, start, sd, geometry.Point{}, 0)[:k]
		}
		noseAgain := append(append(append(nose(0.5, 20), loop...), nose(0.46, 40)...), nose(0.47, 25)...)
		for name, pts := range map[string][]geometry.Point{"one pass": one, "passes that agree": agree, "shuffled": shuffled, "nose measured again": noseAgain} {
			if r := reseat(pts, origins(len(pts)), diagOf(pts)); r != nil {
				t.Errorf("%s: moved by %v", name, r.Shift)
			}
		}
	})
}

func origins(n int) []geometry.Origin {
	o := make([]geometry.Origin, n)
	for i := range o {
		o[i] = geometry.Origin{Line: i + 1}
	}
	return o
}

func diagOf(p []geometry.Point) float64 {
	lo, hi := bounds(p)
	return hi.Dist(lo)
}
