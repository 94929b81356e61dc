package numeric

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestGolden checks the minimiser of functions whose minimum is known
// exactly (calculated by hand).
func TestGolden(t *testing.T) {
	// After 60 reductions the bracket is 0.618^60 ≈ 3e-13 of its width, but
	// near a quadratic minimum f changes by less than its rounding within
	// about √ε of the minimiser, so that is as close as any comparison of
	// values can get.
	for _, tc := range []struct {
		name string
		f    func(float64) float64
		a, b float64
		want float64
		tol  float64
	}{
		{"parabola", func(x float64) float64 { return (x - 0.3) * (x - 0.3) }, -2, 5, 0.3, 1e-8},
		{"cosine", math.Cos, 2, 4, math.Pi, 3e-8},
		{"at the end", func(x float64) float64 { return x }, 1, 2, 1, 1e-12},
	} {
		if got := Golden(tc.f, tc.a, tc.b, 60); math.Abs(got-tc.want) > tc.tol {
			t.Errorf("%s: Golden = %.15g, want %.15g", tc.name, got, tc.want)
		}
	}
}

// TestSolve3 compares Solve3 with gonum's LU solve on random systems.
func TestSolve3(t *testing.T) {
	const tol = 1e-10 // relative to the solution's size; systems are well conditioned
	rng := rand.New(rand.NewPCG(1, 2))
	for k := range 200 {
		var a [3][3]float64
		var b [3]float64
		for i := range 3 {
			b[i] = rng.NormFloat64()
			for j := range 3 {
				a[i][j] = rng.NormFloat64()
			}
			a[i][i] += 4 // diagonally dominant enough to be well conditioned
		}
		got, ok := Solve3(a, b)
		if !ok {
			t.Fatalf("system %d: Solve3 says singular", k)
		}
		m := mat.NewDense(3, 3, []float64{a[0][0], a[0][1], a[0][2], a[1][0], a[1][1], a[1][2], a[2][0], a[2][1], a[2][2]})
		var x mat.VecDense
		if err := x.SolveVec(m, mat.NewVecDense(3, b[:])); err != nil {
			t.Fatal(err)
		}
		for i := range 3 {
			if d := math.Abs(got[i] - x.AtVec(i)); d > tol*(1+math.Abs(x.AtVec(i))) {
				t.Errorf("system %d: x[%d] = %g, gonum %g", k, i, got[i], x.AtVec(i))
			}
		}
	}
	if _, ok := Solve3([3][3]float64{{1, 2, 3}, {2, 4, 6}, {0, 0, 1}}, [3]float64{1, 2, 3}); ok {
		t.Error("singular system solved")
	}
}

// TestSolveSPD4 compares SolveSPD4 with gonum's Cholesky solve on random
// normal equations of least-squares fits, and checks that it refuses
// systems that are not positive definite.
func TestSolveSPD4(t *testing.T) {
	const tol = 1e-10 // relative to the solution's size; measured ~1e-14, condition numbers to ~1e4
	rng := rand.New(rand.NewPCG(3, 4))
	for k := range 200 {
		// Normal equations AᵀA of a 30×4 design, and a right-hand side.
		var a [4][4]float64
		var b [4]float64
		for range 30 {
			var row [4]float64
			for j := range 4 {
				row[j] = rng.NormFloat64()
			}
			y := rng.NormFloat64()
			for i := range 4 {
				b[i] += row[i] * y
				for j := range 4 {
					a[i][j] += row[i] * row[j]
				}
			}
		}
		got, ok := SolveSPD4(a, b)
		if !ok {
			t.Fatalf("system %d: SolveSPD4 says not positive definite", k)
		}
		s := mat.NewSymDense(4, nil)
		for i := range 4 {
			for j := i; j < 4; j++ {
				s.SetSym(i, j, a[i][j])
			}
		}
		var ch mat.Cholesky
		if !ch.Factorize(s) {
			t.Fatalf("system %d: gonum says not positive definite", k)
		}
		var x mat.VecDense
		if err := ch.SolveVecTo(&x, mat.NewVecDense(4, b[:])); err != nil {
			t.Fatal(err)
		}
		for i := range 4 {
			if d := math.Abs(got[i] - x.AtVec(i)); d > tol*(1+math.Abs(x.AtVec(i))) {
				t.Errorf("system %d: x[%d] = %g, gonum %g", k, i, got[i], x.AtVec(i))
			}
		}
	}
	for _, a := range [][4][4]float64{
		{{1, 2, 0, 0}, {2, 4, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 1}},         // singular
		{{1, 0, 0, 0}, {0, -1, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 1}},        // indefinite
		{{1, 0, 0, 0}, {0, 1, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 0}},         // a zero column
		{{1, 1, 0, 0}, {1, 1 + 1e-17, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 1}}, // singular to working precision
	} {
		if _, ok := SolveSPD4(a, [4]float64{1, 1, 1, 1}); ok {
			t.Errorf("SolveSPD4 solved %v", a)
		}
	}
}
