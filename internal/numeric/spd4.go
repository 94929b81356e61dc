package numeric

import "math"

// SolveSPD4 solves the 4×4 symmetric positive definite system a·x = b by
// the Cholesky factorisation a = L·Lᵀ and two triangular solves (Golub &
// Van Loan, Matrix Computations, 4th ed., Johns Hopkins, 2013, §4.2). Only
// the lower triangle of a is read. It returns false when a is not
// positive definite to working precision: a pivot L[k][k]² at most
// spdPivot times the diagonal entry a[k][k] it came from (a nearly
// singular system, whose normal equations hold no digits).
//
// It is meant for the normal equations of small least-squares fits, which
// it solves with no allocation, a hundred times faster than a general
// factorisation of the design.
func SolveSPD4(a [4][4]float64, b [4]float64) ([4]float64, bool) {
	c, ok := FactorSPD4(a)
	if !ok {
		return [4]float64{}, false
	}
	return c.Solve(b), true
}

// Cholesky4 is the Cholesky factor L of a 4×4 symmetric positive definite
// matrix a = L·Lᵀ, kept to solve several right-hand sides (the columns of
// an inverse among them).
type Cholesky4 struct {
	l [4][4]float64
}

// FactorSPD4 factors a as SolveSPD4 does (only its lower triangle is
// read); ok is false when a is not positive definite to working precision.
func FactorSPD4(a [4][4]float64) (c Cholesky4, ok bool) {
	l := &c.l
	for j := range 4 {
		d := a[j][j]
		for k := range j {
			d -= l[j][k] * l[j][k]
		}
		if !(d > spdPivot*a[j][j]) {
			return Cholesky4{}, false
		}
		l[j][j] = math.Sqrt(d)
		for i := j + 1; i < 4; i++ {
			s := a[i][j]
			for k := range j {
				s -= l[i][k] * l[j][k]
			}
			l[i][j] = s / l[j][j]
		}
	}
	return c, true
}

// Solve returns x with L·Lᵀ·x = b: L·y = b, then Lᵀ·x = y.
func (c *Cholesky4) Solve(b [4]float64) [4]float64 {
	l := &c.l
	var x [4]float64
	for i := range 4 {
		s := b[i]
		for k := range i {
			s -= l[i][k] * x[k]
		}
		x[i] = s / l[i][i]
	}
	for i := 3; i >= 0; i-- {
		s := x[i]
		for k := i + 1; k < 4; k++ {
			s -= l[k][i] * x[k]
		}
		x[i] = s / l[i][i]
	}
	return x
}

// spdPivot is the least share of a diagonal entry its Cholesky pivot keeps
// for SolveSPD4 to go on: below it the entry's own rounding (relative
// 1e-16 per term summed) is a tenth of what is left.
const spdPivot = 1e-14
