package frame

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// TestLastCrossingPrunes checks lastCrossing, which skips the pairs of
// segments whose boxes do not meet, against testing every pair (the
// reference: the plain double loop) on wavy polylines that cross each
// other several times, once, or not at all.
func TestLastCrossingPrunes(t *testing.T) {
	rng := rand.New(rand.NewPCG(18, 3))
	every := func(up []geometry.Point, su []float64, lo []geometry.Point, sl []float64) (float64, float64) {
		bu, bl := -1.0, -1.0
		for i := 1; i < len(up)-1; i++ {
			for j := 1; j < len(lo)-1; j++ {
				if tt, u, ok := segmentsCross(up[i], up[i+1], lo[j], lo[j+1]); ok {
					if s1 := su[i] + tt*(su[i+1]-su[i]); s1 > bu {
						bu, bl = s1, sl[j]+u*(sl[j+1]-sl[j])
					}
				}
			}
		}
		return bu, bl
	}
	crossed := 0
	for trial := range 200 {
		n := 20 + rng.IntN(400)
		amp, gap := 0.01*rng.Float64(), 0.03*rng.Float64()-0.005
		wave := func(sign float64) ([]geometry.Point, []float64) {
			ps, ss := make([]geometry.Point, n+1), make([]float64, n+1)
			ph := rng.Float64() * 2 * math.Pi
			for k := range ps {
				x := float64(k) / float64(n)
				ps[k] = geometry.Point{X: x, Y: sign * (gap + amp*math.Sin(40*x+ph) + 2e-4*rng.NormFloat64())}
				ss[k] = x
			}
			return ps, ss
		}
		up, su := wave(1)
		lo, sl := wave(-1)
		wu, wl := every(up, su, lo, sl)
		gu, gl := lastCrossing(up, su, lo, sl, 1e-9)
		if gu != wu || gl != wl {
			t.Fatalf("trial %d (%d segments): lastCrossing %v, %v; every pair %v, %v", trial, n, gu, gl, wu, wl)
		}
		if wu >= 0 {
			crossed++
		}
	}
	if crossed < 20 || crossed > 180 {
		t.Errorf("%d of 200 trials crossed: the cases do not test both outcomes", crossed)
	}
}
