package curve

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The per-entry assembly used by fit must give exactly the band of the
// row-by-row assembly, open and periodic, and fit must be repeatable on one
// problem (its work space is reused).
func TestSplineAssembleIntoMatches(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, periodic := range []bool{false, true} {
		for _, n := range []int{8, 9, 13, 100} {
			ts := make([]float64, n)
			ws := make([]float64, n)
			for i := range ts {
				if i > 0 {
					ts[i] = ts[i-1] + 0.1 + rng.Float64()
				}
				ws[i] = 0.5 + rng.Float64()
			}
			p := splineNewProblem(ts, ws, periodic, ts[n-1]+0.7)
			for _, lambda := range []float64{0, 1e-3, 2.5, 1e4} {
				_, want := p.assemble(lambda)
				got := splineNewBand(p.m, periodic)
				p.assembleInto(p.fixedPart(), lambda, got, make([]float64, n))
				for k := range want.all {
					if math.Float64bits(got.all[k]) != math.Float64bits(want.all[k]) && got.all[k] != want.all[k] {
						t.Fatalf("periodic=%v n=%d λ=%g: band entry %d = %v, want %v", periodic, n, lambda, k, got.all[k], want.all[k])
					}
				}
			}
			ys := make([]float64, n)
			for i := range ys {
				ys[i] = rng.NormFloat64()
			}
			f1, err := p.fit(0.3, [][]float64{ys}, true)
			if err != nil {
				t.Fatal(err)
			}
			f2, err := p.fit(0.3, [][]float64{ys}, true)
			if err != nil {
				t.Fatal(err)
			}
			if f1.trace != f2.trace {
				t.Errorf("periodic=%v n=%d: trace %v then %v", periodic, n, f1.trace, f2.trace)
			}
			for i := range ys {
				if f1.gs[0][i] != f2.gs[0][i] || f1.gams[0][i] != f2.gams[0][i] {
					t.Fatalf("periodic=%v n=%d: refit differs at %d", periodic, n, i)
				}
			}
		}
	}
}
