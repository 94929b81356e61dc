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

// A problem renewed in the storage of another (splineRenewProblem), of
// any size and either kind, fits exactly as a new problem on the same
// knots: every buffer it takes over, dirty from the old problem's fits, is
// cleared or overwritten. A buffer left dirty (a band entry, a column,
// the open problem of a periodic one) changes a bit of some fit below.
func TestSplineRenewMatchesNew(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	var old *splineProblem
	for step, c := range []struct {
		n        int
		periodic bool
		weights  bool
	}{
		{100, true, false}, {40, true, false}, {130, false, true}, {9, false, false},
		{60, true, true}, {61, true, false}, {2100, false, false}, {300, true, false},
		{2050, true, false}, {12, false, false}, {80, false, false},
	} {
		n := c.n
		ts := make([]float64, n)
		ys := [][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
		var ws []float64
		if c.weights {
			ws = make([]float64, n)
		}
		for i := range ts {
			if i > 0 {
				ts[i] = ts[i-1] + 0.1 + rng.Float64()
			}
			if ws != nil {
				ws[i] = 0.5 + rng.Float64()
			}
			for _, y := range ys {
				y[i] = rng.NormFloat64()
			}
		}
		period := ts[n-1] + 0.8
		fresh := splineNewProblem(ts, ws, c.periodic, period)
		renewed := splineRenewProblem(old, ts, ws, c.periodic, period)
		for _, lambda := range []float64{0, 0.3, 40} {
			want, err := fresh.fit(lambda, ys, lambda > 0)
			if err != nil {
				t.Fatal(err)
			}
			got, err := renewed.fit(lambda, ys, lambda > 0)
			if err != nil {
				t.Fatal(err)
			}
			if math.Float64bits(got.trace) != math.Float64bits(want.trace) {
				t.Errorf("step %d (%+v) λ=%g: trace %v, want %v", step, c, lambda, got.trace, want.trace)
			}
			for k := range ys {
				for i := range n {
					if math.Float64bits(got.gs[k][i]) != math.Float64bits(want.gs[k][i]) || math.Float64bits(got.gams[k][i]) != math.Float64bits(want.gams[k][i]) {
						t.Fatalf("step %d (%+v) λ=%g column %d: knot %d gives (%v, %v), want (%v, %v)",
							step, c, lambda, k, i, got.gs[k][i], got.gams[k][i], want.gs[k][i], want.gams[k][i])
					}
				}
			}
			renewed.release(got)
		}
		old = renewed
	}
}
