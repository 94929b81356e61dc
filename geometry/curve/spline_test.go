package curve

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// The banded and cyclic solvers must agree with a dense solve by gonum/mat
// (general-purpose reference library).
func TestSplineSolverMatchesDense(t *testing.T) {
	const tol = 1e-10
	rng := rand.New(rand.NewPCG(1, 2))
	for _, cyclic := range []bool{false, true} {
		for _, m := range []int{6, 7, 12, 41} {
			b := splineNewBand(m, cyclic)
			dense := mat.NewDense(m, m, nil)
			set := func(j, k int, v float64) {
				b.add(j, k, v)
				dense.Set(j, k, dense.At(j, k)+v)
				if j != k {
					dense.Set(k, j, dense.At(k, j)+v)
				}
			}
			for j := 0; j < m; j++ {
				set(j, j, 6+rng.Float64())
				if cyclic || j+1 < m {
					set(j, (j+1)%m, rng.Float64()-0.5)
				}
				if cyclic || j+2 < m {
					set(j, (j+2)%m, rng.Float64()-0.5)
				}
			}
			rhs := make([]float64, m)
			for j := range rhs {
				rhs[j] = rng.NormFloat64()
			}
			var want mat.VecDense
			if err := want.SolveVec(dense, mat.NewVecDense(m, append([]float64(nil), rhs...))); err != nil {
				t.Fatal(err)
			}
			s, err := splineNewSolver(b)
			if err != nil {
				t.Fatal(err)
			}
			s.solve(rhs)
			for j := range rhs {
				if math.Abs(rhs[j]-want.AtVec(j)) > tol {
					t.Errorf("cyclic=%v m=%d: x[%d] = %g, want %g (gonum/mat)", cyclic, m, j, rhs[j], want.AtVec(j))
				}
			}
			if !cyclic {
				f, _ := splineFactor(b, m)
				s0, s1, s2 := f.inverseBand()
				var inv mat.Dense
				if err := inv.Inverse(dense); err != nil {
					t.Fatal(err)
				}
				for j := 0; j < m; j++ {
					if math.Abs(s0[j]-inv.At(j, j)) > tol || (j+1 < m && math.Abs(s1[j]-inv.At(j, j+1)) > tol) || (j+2 < m && math.Abs(s2[j]-inv.At(j, j+2)) > tol) {
						t.Errorf("m=%d: inverse band row %d differs from gonum/mat inverse", m, j)
					}
				}
			}
		}
	}
}
