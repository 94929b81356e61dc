package dense

// Triangular solves with the triangles of an n×n row-major buffer a, on the
// n×k row-major x (k = 1 or 2 columns). unit means the diagonal is taken
// as 1 (and not read).

// lowerSolve overwrites x with T⁻¹x, T the lower triangle of a.
func lowerSolve(a []float64, n int, x []float64, k int, unit bool) {
	if k == 1 {
		for i := range n {
			x[i] -= dot(a[i*n:i*n+i], x[:i])
			if !unit {
				x[i] /= a[i*n+i]
			}
		}
		return
	}
	for i := range n {
		s0, s1 := dot2(a[i*n:i*n+i], x[:2*i])
		x[2*i] -= s0
		x[2*i+1] -= s1
		if !unit {
			d := a[i*n+i]
			x[2*i] /= d
			x[2*i+1] /= d
		}
	}
}

// upperSolve overwrites x with T⁻¹x, T the upper triangle of a.
func upperSolve(a []float64, n int, x []float64, k int, unit bool) {
	if k == 1 {
		for i := n - 1; i >= 0; i-- {
			x[i] -= dot(a[i*n+i+1:(i+1)*n], x[i+1:])
			if !unit {
				x[i] /= a[i*n+i]
			}
		}
		return
	}
	for i := n - 1; i >= 0; i-- {
		s0, s1 := dot2(a[i*n+i+1:(i+1)*n], x[2*(i+1):])
		x[2*i] -= s0
		x[2*i+1] -= s1
		if !unit {
			d := a[i*n+i]
			x[2*i] /= d
			x[2*i+1] /= d
		}
	}
}

// lowerSolveT overwrites x with T⁻ᵀx, T the lower triangle of a: Tᵀ is
// upper triangular, solved from the bottom by rows of a.
func lowerSolveT(a []float64, n int, x []float64, k int, unit bool) {
	for j := n - 1; j >= 0; j-- {
		if k == 1 {
			if !unit {
				x[j] /= a[j*n+j]
			}
			if v := x[j]; v != 0 {
				axpy(-v, a[j*n:j*n+j], x[:j])
			}
			continue
		}
		if !unit {
			d := a[j*n+j]
			x[2*j] /= d
			x[2*j+1] /= d
		}
		axpy2(x[2*j], x[2*j+1], a[j*n:j*n+j], x[:2*j])
	}
}

// upperSolveT overwrites x with T⁻ᵀx, T the upper triangle of a: Tᵀ is
// lower triangular, solved from the top by rows of a.
func upperSolveT(a []float64, n int, x []float64, k int, unit bool) {
	for j := range n {
		if k == 1 {
			if !unit {
				x[j] /= a[j*n+j]
			}
			if v := x[j]; v != 0 {
				axpy(-v, a[j*n+j+1:(j+1)*n], x[j+1:])
			}
			continue
		}
		if !unit {
			d := a[j*n+j]
			x[2*j] /= d
			x[2*j+1] /= d
		}
		axpy2(x[2*j], x[2*j+1], a[j*n+j+1:(j+1)*n], x[2*(j+1):])
	}
}
