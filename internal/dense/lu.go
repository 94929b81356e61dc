package dense

import (
	"fmt"
	"math"
	"slices"

	"github.com/foilwright/foilwright/internal/par"
)

// ConditionTolerance is the condition number above which Solve reports the
// matrix as singular or near-singular: about 1/ε of float64 (gonum's
// mat.ConditionTolerance has the same value).
const ConditionTolerance = 1e16

// Condition is the error Solve returns for a matrix whose condition number
// estimate exceeds ConditionTolerance; its value is the estimate, +Inf for
// a matrix with an exactly zero pivot. It mirrors gonum's mat.Condition.
type Condition float64

func (c Condition) Error() string {
	return fmt.Sprintf("dense: matrix singular or near-singular with condition number %.4e", float64(c))
}

// LU is an LU factorisation with partial pivoting of a square matrix A. The
// zero value is ready for Factorize. Factorize must not run concurrently
// with other calls; Solve and Cond may run concurrently with each other.
type LU struct {
	n int
	// a holds the factors row-major. In the pure-Go factorisation, A = P·L·U
	// with row interchanges P: L (unit diagonal) below the diagonal of a, U
	// on and above it. The OpenBLAS factorisation (build tag openblas)
	// factors the buffer as the column-major matrix it also is, Aᵀ = P·L·U,
	// so that a holds Uᵀ on and below the diagonal and Lᵀ (unit diagonal)
	// above it, and A = Uᵀ·Lᵀ·Pᵀ: column interchanges (trans is true).
	a     []float64
	trans bool
	ipiv  []int   // row (column, if trans) i was swapped with ipiv[i] ≥ i, in order i = 0, 1, …
	anorm float64 // ∞-norm of A
	cond  float64
	ok    bool // no zero pivot
}

// Factorize factors the n×n matrix held row-major in a (len(a) ≥ n·n),
// in place: a is overwritten by the factors and kept by the LU until the
// next Factorize. It also estimates the condition number (Cond). An exactly
// singular matrix is factored too (a zero pivot is left in the factors);
// Solve then returns a Condition error. It panics if n < 1 or a is too
// short.
//
// The pure-Go factorisation runs on up to GOMAXPROCS goroutines when the
// matrix is large enough for it to pay; its factors do not depend on how
// many run. Built with the tag openblas, Factorize calls OpenBLAS instead
// (see Paths).
func (lu *LU) Factorize(n int, a []float64) {
	lu.factor(n, a)
	lu.cond = math.Inf(1)
	if lu.ok {
		lu.cond = lu.condEst()
	}
}

// factor factors a as Factorize does, without the condition estimate.
func (lu *LU) factor(n int, a []float64) {
	if n < 1 || len(a) < n*n {
		panic(fmt.Sprintf("dense: Factorize of a %d×%d matrix from %d entries", n, n, len(a)))
	}
	lu.n, lu.a = n, a[:n*n]
	if cap(lu.ipiv) < n {
		lu.ipiv = make([]int, n)
	}
	lu.ipiv = lu.ipiv[:n]
	lu.anorm = normInf(n, lu.a)
	if useBackend {
		lu.ok = backendFactor(n, lu.a, lu.ipiv)
		lu.trans = true
	} else {
		f := factorizer{n: n, a: lu.a, ipiv: lu.ipiv, workers: workersFor(n)}
		f.run()
		lu.ok = !f.singular.Load()
		lu.trans = false
	}
}

// FactorizeSolve is Factorize followed by Solve(b, nrhs), with the same
// results and errors. From parallelMin rows, with more than one goroutine
// allowed (GOMAXPROCS), the condition estimate runs on a goroutine of its
// own while the caller solves (both only read the factors, and the
// estimate takes several solves' time, the solve one), or on the caller
// after the solve if that goroutine has not begun by then (par.Task).
func (lu *LU) FactorizeSolve(n int, a []float64, b []float64, nrhs int) error {
	if nrhs < 1 || len(b) < n*nrhs {
		panic(fmt.Sprintf("dense: Solve with %d right-hand sides in %d entries for order %d", nrhs, len(b), n))
	}
	if n < parallelMin || workersFor(n) < 2 {
		lu.Factorize(n, a)
		return lu.Solve(b, nrhs)
	}
	lu.factor(n, a)
	lu.cond = math.Inf(1)
	if !lu.ok {
		return Condition(lu.cond)
	}
	// par.Task, not a bare goroutine: when the machine is shared and no
	// core takes the estimate up while the caller solves, the caller runs
	// it itself rather than wait for a core (a scheduler time slice).
	var cond float64
	est := par.Start(func() { cond = lu.condEst() })
	lu.solve(b, nrhs)
	est.Wait()
	lu.cond = cond
	if lu.cond > ConditionTolerance {
		return Condition(lu.cond)
	}
	return nil
}

// A Path is a way Factorize can run.
type Path int

const (
	GoPath       Path = iota // pure Go, Go micro-kernel
	AVX2Path                 // pure Go, assembly micro-kernels (amd64 with AVX2 and FMA)
	OpenBLASPath             // OpenBLAS dgetrf (build tag openblas)
	AVX512Path               // pure Go, assembly micro-kernels with AVX-512 products (amd64 with AVX-512F)
)

func (p Path) String() string {
	switch p {
	case GoPath:
		return "Go"
	case AVX2Path:
		return "Go with AVX2 kernels"
	case OpenBLASPath:
		return "OpenBLAS"
	case AVX512Path:
		return "Go with AVX2 and AVX-512 kernels"
	}
	return fmt.Sprintf("Path(%d)", int(p))
}

// Paths returns the paths this build offers on this CPU; the last is the
// one Factorize takes.
func Paths() []Path {
	p := []Path{GoPath}
	if haveAVX2 {
		p = append(p, AVX2Path)
	}
	if haveAVX512 {
		p = append(p, AVX512Path)
	}
	if haveBackend {
		p = append(p, OpenBLASPath)
	}
	return p
}

// Current returns the path Factorize takes.
func Current() Path {
	switch {
	case useBackend:
		return OpenBLASPath
	case useAsm && useAVX512:
		return AVX512Path
	case useAsm:
		return AVX2Path
	}
	return GoPath
}

// Use makes Factorize take path p (one of Paths) until the returned
// function restores the previous one: for tests and benchmarks that
// compare the paths. It must not run concurrently with Factorize.
func Use(p Path) (restore func()) {
	if !slices.Contains(Paths(), p) {
		panic(fmt.Sprintf("dense: path %v is not available", p))
	}
	asm, asm512, backend := useAsm, useAVX512, useBackend
	useAsm, useAVX512, useBackend = p == AVX2Path || p == AVX512Path, p == AVX512Path, p == OpenBLASPath
	return func() { useAsm, useAVX512, useBackend = asm, asm512, backend }
}

// Size returns the order of the factored matrix.
func (lu *LU) Size() int { return lu.n }

// Cond returns the estimate of the condition number of A in the ∞-norm,
// ‖A‖∞‖A⁻¹‖∞, the norm gonum's mat.LU.Cond uses, by Higham's refinement of
// Hager's method (LAPACK dgecon and dlacn2): a lower bound, usually within a
// factor of 3 of the true value and often equal to it. It is +Inf for a
// matrix with a zero pivot.
func (lu *LU) Cond() float64 { return lu.cond }

// Solve overwrites b, an n×nrhs matrix held row-major, with the solution X
// of A·X = b. It returns a Condition error, with b unchanged, if A has a
// zero pivot, and a Condition error after solving if the condition number
// estimate exceeds ConditionTolerance. It panics before Factorize or if b
// is too short.
func (lu *LU) Solve(b []float64, nrhs int) error {
	n := lu.n
	if n == 0 {
		panic("dense: Solve before Factorize")
	}
	if nrhs < 1 || len(b) < n*nrhs {
		panic(fmt.Sprintf("dense: Solve with %d right-hand sides in %d entries for order %d", nrhs, len(b), n))
	}
	if !lu.ok {
		return Condition(math.Inf(1))
	}
	lu.solve(b, nrhs)
	if lu.cond > ConditionTolerance {
		return Condition(lu.cond)
	}
	return nil
}

// solve overwrites the n×nrhs b with A⁻¹b, the factors free of zero pivots.
func (lu *LU) solve(b []float64, nrhs int) {
	n := lu.n
	b = b[:n*nrhs]
	if !lu.trans {
		lu.permute(b, nrhs, false)
	}
	switch nrhs {
	case 1, 2:
		lu.solveFactors(b, nrhs)
	default:
		x := make([]float64, n)
		for c := range nrhs {
			for i := range n {
				x[i] = b[i*nrhs+c]
			}
			lu.solveFactors(x, 1)
			for i := range n {
				b[i*nrhs+c] = x[i]
			}
		}
	}
	if lu.trans {
		lu.permute(b, nrhs, true)
	}
}

// permute applies the interchanges to the rows of the n×k x: in order
// (Pᵀx), or in reverse order (Px).
func (lu *LU) permute(x []float64, k int, reverse bool) {
	swap := func(i, p int) {
		xi, xp := x[i*k:(i+1)*k], x[p*k:(p+1)*k]
		for c := range xi {
			xi[c], xp[c] = xp[c], xi[c]
		}
	}
	if reverse {
		for i := len(lu.ipiv) - 1; i >= 0; i-- {
			if p := lu.ipiv[i]; p != i {
				swap(i, p)
			}
		}
		return
	}
	for i, p := range lu.ipiv {
		if p != i {
			swap(i, p)
		}
	}
}

// solveFactors overwrites the n×k x (k = 1 or 2) with (LU)⁻¹x, or with
// (UᵀLᵀ)⁻¹x if trans: the triangle below the diagonal of a, then the one
// above.
func (lu *LU) solveFactors(x []float64, k int) {
	lowerSolve(lu.a, lu.n, x, k, !lu.trans)
	upperSolve(lu.a, lu.n, x, k, lu.trans)
}

// solveFactorsT overwrites the n×k x with the transposed solve of
// solveFactors: (LU)⁻ᵀx, or (UᵀLᵀ)⁻ᵀx if trans.
func (lu *LU) solveFactorsT(x []float64, k int) {
	upperSolveT(lu.a, lu.n, x, k, lu.trans)
	lowerSolveT(lu.a, lu.n, x, k, !lu.trans)
}

// normInf returns the largest row sum of |a| of the n×n row-major a, or NaN
// if an entry is NaN.
func normInf(n int, a []float64) float64 {
	m := 0.0
	for i := range n {
		s := asum(a[i*n : (i+1)*n])
		if math.IsNaN(s) {
			return s
		}
		m = max(m, s)
	}
	return m
}
