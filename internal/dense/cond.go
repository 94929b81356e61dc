package dense

import "math"

// condEst returns the ∞-norm condition number estimate of the factored
// matrix: ‖A‖∞ times Higham's estimate of ‖A⁻¹‖∞ = ‖A⁻ᵀ‖₁ (N. J. Higham,
// FORTRAN codes for estimating the one-norm of a real or complex matrix,
// ACM TOMS 14 (1988) 381–396; LAPACK dlacn2 and dgecon, which gonum's
// LU.Cond runs too).
func (lu *LU) condEst() float64 {
	n := lu.n
	if lu.anorm == 0 {
		return math.Inf(1)
	}
	if math.IsNaN(lu.anorm) {
		return lu.anorm
	}
	if math.IsInf(lu.anorm, 1) {
		return math.Inf(1)
	}
	// ‖A⁻¹‖∞ = ‖A⁻ᵀ‖₁; the interchanges permute the rows of A⁻ᵀ (or the
	// columns of its transpose), which changes no norm.
	apply := func(x []float64) { lu.solveFactorsT(x, 1) }
	applyT := func(x []float64) { lu.solveFactors(x, 1) }
	apply2 := func(x []float64) { lu.solveFactorsT(x, 2) }
	ainv := normInvEst(n, apply, applyT, apply2)
	if !(ainv > 0) || math.IsInf(ainv, 0) {
		if math.IsNaN(ainv) {
			return ainv
		}
		return math.Inf(1)
	}
	return lu.anorm * ainv
}

// normInvEst estimates ‖B‖₁ of an n×n matrix B given x ↦ Bx (apply),
// x ↦ Bᵀx (applyT) and x ↦ Bx on the two columns of a row-major n×2 x
// (apply2), following dlacn2 step by step, except that the alternating
// vector of its last step, which does not depend on the others, is
// multiplied in the first step, with the first vector.
func normInvEst(n int, apply, applyT, apply2 func([]float64)) float64 {
	const itmax = 5
	x := make([]float64, n)
	if n == 1 {
		x[0] = 1
		apply(x)
		return math.Abs(x[0])
	}
	// The first vector, 1/n everywhere, and the alternating vector.
	x2 := make([]float64, 2*n)
	alt := 1.0
	for i := range n {
		x2[2*i] = 1 / float64(n)
		x2[2*i+1] = alt * (1 + float64(i)/float64(n-1))
		alt = -alt
	}
	apply2(x2)
	altEst, est := 0.0, 0.0
	isgn := make([]float64, n)
	for i := range n {
		v := x2[2*i]
		est += math.Abs(v)
		altEst += math.Abs(x2[2*i+1])
		x[i] = math.Copysign(1, v)
		isgn[i] = x[i]
	}
	applyT(x)
	j := iamax(x)
	for iter := 2; ; iter++ {
		clear(x)
		x[j] = 1
		apply(x)
		estold := est
		est = asum(x)
		same := true
		for i, v := range x {
			if math.Copysign(1, v) != isgn[i] {
				same = false
				break
			}
		}
		if same || est <= estold {
			break
		}
		for i, v := range x {
			x[i] = math.Copysign(1, v)
			isgn[i] = x[i]
		}
		applyT(x)
		jlast := j
		j = iamax(x)
		if x[jlast] == math.Abs(x[j]) || iter >= itmax {
			break
		}
	}
	// The alternating-sign vector guards against the cases the power
	// method misses.
	if t := 2 * altEst / float64(3*n); t > est {
		est = t
	}
	return est
}

// iamax returns the index of the first entry of largest magnitude.
func iamax(x []float64) int {
	j, m := 0, -1.0
	for i, v := range x {
		if a := math.Abs(v); a > m {
			j, m = i, a
		}
	}
	return j
}
