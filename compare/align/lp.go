package align

import (
	"errors"
	"fmt"
	"math"
)

// linProg is a linear program in inequality form with few variables and
// many constraints:
//
//	minimise cᵀx  subject to  aᵢ·x ≤ bᵢ, i = 0 … m−1, x ∈ ℝⁿ.
//
// Rows are stored flat, row i at a[i·n : (i+1)·n], and are scaled to unit
// length when added, so that the solver's tolerances are absolute.
type linProg struct {
	n    int
	a, b []float64
	c    []float64
}

// Errors of the simplex walk. Neither happens for the programs of this
// package (every one is bounded by its trust region); they guard against
// misuse and rounding gone wrong.
var (
	errUnbounded = errors.New("align: linear program is unbounded")
	errNoVertex  = errors.New("align: linear program: the working set is singular")
	errTooLong   = errors.New("align: linear program: too many simplex steps")
)

// Tolerances of the walk, for rows of unit length.
const (
	lpDualTol  = 1e-11 // a multiplier above −lpDualTol counts as non-negative
	lpPivotTol = 1e-11 // a row must turn into the direction by more than this to block it
)

func newLinProg(n int, c []float64) *linProg {
	return &linProg{n: n, c: c}
}

// reset empties the constraints, keeping the storage.
func (p *linProg) reset() { p.a, p.b = p.a[:0], p.b[:0] }

// add appends the constraint row·x ≤ rhs, scaled to a unit row. A zero row
// is dropped (it constrains nothing, or makes the program infeasible, which
// the callers never build). It returns the index of the row, or −1.
func (p *linProg) add(row []float64, rhs float64) int {
	var s float64
	for _, v := range row {
		s += v * v
	}
	if s == 0 {
		return -1
	}
	f := 1 / math.Sqrt(s)
	for _, v := range row {
		p.a = append(p.a, v*f)
	}
	p.b = append(p.b, rhs*f)
	return len(p.b) - 1
}

func (p *linProg) rows() int { return len(p.b) }

func (p *linProg) row(i int) []float64 { return p.a[i*p.n : (i+1)*p.n] }

// solve walks from the feasible vertex x, at which the n rows listed in
// work are active and linearly independent, along edges of the feasible
// set that lower cᵀx, to an optimal vertex (Dantzig's simplex method on the
// inequality form). At a vertex it solves B̃ᵀλ = −c for the multipliers of
// the active rows B̃; if none is negative the vertex is optimal, else the
// row with the most negative multiplier is released and the walk follows
// the edge on which the other active rows stay active, up to the first
// row it meets (the ratio test). After a run of steps of zero length
// (degenerate vertices, common in Chebyshev fits) it switches to Bland's
// rule, which cannot cycle. x and work are updated in place; it returns
// the number of steps.
func (p *linProg) solve(x []float64, work []int) (int, error) {
	n, m := p.n, p.rows()
	if len(x) != n || len(work) != n {
		panic("align: linear program: vertex of the wrong size")
	}
	slack := make([]float64, m)
	active := make([]bool, m)
	for i := range m {
		slack[i] = max(p.b[i]-dot(p.row(i), x), 0)
	}
	for _, w := range work {
		active[w], slack[w] = true, 0
	}
	bmat := make([]float64, n*n)
	lambda := make([]float64, n)
	dir := make([]float64, n)
	ap := make([]float64, m)
	bland := false
	degenerate := 0
	maxSteps := 50*m + 1000
	for steps := 0; steps < maxSteps; steps++ {
		// Multipliers: B̃ᵀλ = −c.
		for j, w := range work {
			for k, v := range p.row(w) {
				bmat[k*n+j] = v // transposed
			}
		}
		for k := range lambda {
			lambda[k] = -p.c[k]
		}
		if !solveSmall(bmat, lambda, n) {
			return steps, errNoVertex
		}
		q := -1
		for j, l := range lambda {
			if l >= -lpDualTol {
				continue
			}
			switch {
			case q < 0:
				q = j
			case bland && work[j] < work[q]:
				q = j
			case !bland && l < lambda[q]:
				q = j
			}
		}
		if q < 0 {
			return steps, nil
		}
		// Edge: B̃·d = −e_q.
		for j, w := range work {
			copy(bmat[j*n:(j+1)*n], p.row(w))
		}
		for k := range dir {
			dir[k] = 0
		}
		dir[q] = -1
		if !solveSmall(bmat, dir, n) {
			return steps, errNoVertex
		}
		dn := math.Sqrt(dot(dir, dir))
		enter, tmin := -1, math.Inf(1)
		for i := range m {
			v := dot(p.row(i), dir)
			ap[i] = v
			if active[i] || v <= lpPivotTol*dn {
				continue
			}
			t := slack[i] / v
			switch {
			case enter < 0 || t < tmin-1e-15*(1+tmin):
				enter, tmin = i, t
			case t <= tmin+1e-15*(1+tmin):
				// A tie: Bland takes the first row, Dantzig the row that
				// turns into the edge most steeply (the better conditioned
				// vertex).
				if (bland && i < enter) || (!bland && v > ap[enter]) {
					enter, tmin = i, min(t, tmin)
				}
			}
		}
		if enter < 0 {
			return steps, errUnbounded
		}
		for k := range x {
			x[k] += tmin * dir[k]
		}
		for i := range m {
			slack[i] = max(slack[i]-tmin*ap[i], 0)
		}
		leave := work[q]
		active[leave] = false
		slack[leave] = tmin * -ap[leave]
		active[enter], slack[enter] = true, 0
		work[q] = enter
		if tmin <= 1e-14 {
			degenerate++
			if degenerate > 2*n {
				bland = true
			}
		} else {
			degenerate = 0
		}
	}
	return maxSteps, fmt.Errorf("%w (%d)", errTooLong, maxSteps)
}

// solveSmall solves the n×n system a·x = rhs (a row-major, overwritten) by
// Gaussian elimination with partial pivoting, leaving x in rhs. It reports
// false for a matrix singular to working precision.
func solveSmall(a, rhs []float64, n int) bool {
	var scale float64
	for _, v := range a[:n*n] {
		scale = max(scale, math.Abs(v))
	}
	if scale == 0 {
		return false
	}
	for col := range n {
		piv, best := col, math.Abs(a[col*n+col])
		for r := col + 1; r < n; r++ {
			if v := math.Abs(a[r*n+col]); v > best {
				piv, best = r, v
			}
		}
		if best <= 1e-13*scale {
			return false
		}
		if piv != col {
			for k := range n {
				a[col*n+k], a[piv*n+k] = a[piv*n+k], a[col*n+k]
			}
			rhs[col], rhs[piv] = rhs[piv], rhs[col]
		}
		for r := col + 1; r < n; r++ {
			f := a[r*n+col] / a[col*n+col]
			if f == 0 {
				continue
			}
			for k := col; k < n; k++ {
				a[r*n+k] -= f * a[col*n+k]
			}
			rhs[r] -= f * rhs[col]
		}
	}
	for r := n - 1; r >= 0; r-- {
		s := rhs[r]
		for k := r + 1; k < n; k++ {
			s -= a[r*n+k] * rhs[k]
		}
		rhs[r] = s / a[r*n+r]
	}
	return true
}

func dot(a, b []float64) float64 {
	var s float64
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}
