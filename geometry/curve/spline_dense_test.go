package curve

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// splineDenseFit solves the smoothing problem of p (Green and Silverman,
// ch. 2) with dense matrices by gonum/mat (general-purpose reference
// library): γ = (R + λQᵀW⁻¹Q)⁻¹Qᵀy, g = y − λW⁻¹Qγ, and the trace of the hat
// matrix H = I − λW⁻¹Q(R + λQᵀW⁻¹Q)⁻¹Qᵀ.
func splineDenseFit(t *testing.T, p *splineProblem, lambda float64, y []float64) (g, gam []float64, trace float64) {
	t.Helper()
	n, m := p.n(), p.m
	q := mat.NewDense(n, m, nil)
	for i := 0; i < n; i++ {
		cs, qs := p.qRow(i)
		for x := 0; x < 3; x++ {
			if u := p.unknown(cs[x]); u >= 0 {
				q.Set(i, u, q.At(i, u)+qs[x])
			}
		}
	}
	r := mat.NewDense(m, m, nil)
	for i, h := range p.hs {
		u0, u1 := p.unknown(i), p.unknown(i+1)
		if u0 >= 0 {
			r.Set(u0, u0, r.At(u0, u0)+h/3)
		}
		if u1 >= 0 {
			r.Set(u1, u1, r.At(u1, u1)+h/3)
		}
		if u0 >= 0 && u1 >= 0 {
			r.Set(u0, u1, r.At(u0, u1)+h/6)
			r.Set(u1, u0, r.At(u1, u0)+h/6)
		}
	}
	winv := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		winv.Set(i, i, lambda/p.ws[i])
	}
	var wq, a, qt mat.Dense
	wq.Mul(winv, q)
	a.Mul(q.T(), &wq)
	a.Add(&a, r)
	qt.CloneFrom(q.T())
	var ainvQt mat.Dense
	if err := ainvQt.Solve(&a, &qt); err != nil {
		t.Fatal(err)
	}
	var gv mat.VecDense
	gv.MulVec(&ainvQt, mat.NewVecDense(n, append([]float64(nil), y...)))
	gam = make([]float64, n)
	for c := 0; c < n; c++ {
		if u := p.unknown(c); u >= 0 {
			gam[c] = gv.AtVec(u)
		}
	}
	var wqg mat.VecDense
	wqg.MulVec(&wq, &gv)
	g = make([]float64, n)
	for i := range g {
		g[i] = y[i] - wqg.AtVec(i)
	}
	var h mat.Dense
	h.Mul(&wq, &ainvQt)
	trace = float64(n) - mat.Trace(&h)
	return g, gam, trace
}

// fit (band solver, reused work space, the trace on a second goroutine or
// not) must agree with the dense solve.
func TestSplineFitMatchesDense(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	defer func(k int) { splineParallelKnots = k }(splineParallelKnots)
	for _, par := range []int{math.MaxInt, 8} {
		splineParallelKnots = par
		splineFitDenseCases(t, rng)
	}
}

func splineFitDenseCases(t *testing.T, rng *rand.Rand) {
	for _, periodic := range []bool{false, true} {
		for _, n := range []int{8, 31, 150} {
			ts := make([]float64, n)
			ws := make([]float64, n)
			ys := [2][]float64{make([]float64, n), make([]float64, n)}
			for i := range ts {
				if i > 0 {
					ts[i] = ts[i-1] + 0.2 + rng.Float64()
				}
				ws[i] = 1
				if rng.IntN(5) == 0 {
					ws[i] = 0.01 + rng.Float64()
				}
				ys[0][i] = math.Sin(ts[i]/7) + 0.1*rng.NormFloat64()
				ys[1][i] = math.Cos(ts[i]/5) + 0.1*rng.NormFloat64()
			}
			p := splineNewProblem(ts, ws, periodic, ts[n-1]+0.9)
			for _, lambda := range []float64{0, 0.05, 30} {
				f, err := p.fit(lambda, ys[:], true)
				if err != nil {
					t.Fatal(err)
				}
				q := p
				if periodic {
					q = p.open
				}
				_, _, trace := splineDenseFit(t, q, lambda, ys[0])
				if math.Abs(f.trace-trace) > 1e-8*float64(n) {
					t.Errorf("periodic=%v n=%d λ=%g: trace %.12g, dense %.12g (gonum/mat)", periodic, n, lambda, f.trace, trace)
				}
				for k, y := range ys {
					g, gam, _ := splineDenseFit(t, p, lambda, y)
					for i := range g {
						if math.Abs(f.gs[k][i]-g[i]) > 1e-9 || math.Abs(f.gams[k][i]-gam[i]) > 1e-8*(1+math.Abs(gam[i])) {
							t.Fatalf("periodic=%v n=%d λ=%g column %d: g[%d] = %.12g, γ = %.12g; dense %.12g, %.12g (gonum/mat)", periodic, n, lambda, k, i, f.gs[k][i], f.gams[k][i], g[i], gam[i])
						}
					}
				}
			}
		}
	}
}
