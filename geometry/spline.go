package geometry

import (
	"fmt"
	"math"
)

// This file holds the cubic smoothing spline of
//
//	Reinsch, C. H., Smoothing by spline functions, Numerische Mathematik 10
//	(1967), 177–183,
//
// in the matrix form of
//
//	Green, P. J. and Silverman, B. W., Nonparametric Regression and
//	Generalized Linear Models, Chapman & Hall (1994), ch. 2,
//
// and the band of the inverse needed for generalised cross-validation from
//
//	Hutchinson, M. F. and de Hoog, F. R., Smoothing noisy data with spline
//	functions, Numerische Mathematik 47 (1985), 99–106.
//
// For knots t₀ < … < tₙ₋₁ with data yᵢ and weights wᵢ the smoothing spline g
// minimises
//
//	Σ wᵢ (yᵢ − g(tᵢ))² + λ ∫ g''(t)² dt.
//
// Its second derivatives γ at the knots solve (R + λ QᵀW⁻¹Q) γ = Qᵀy and its
// values are g = y − λ W⁻¹Q γ, where Q (n × m) and R (m × m) are the banded
// matrices of the cubic spline continuity conditions. The system matrix is
// pentadiagonal (cyclic for a periodic spline), so a fit costs O(n). λ = 0
// gives the interpolating spline; a natural spline (γ = 0 at both ends) for an
// open fit.

// splineMinKnots is the least number of data points a spline problem takes.
const splineMinKnots = 8

// splineProblem is the fixed part of a smoothing problem: knots and weights.
type splineProblem struct {
	ts       []float64 // knots t₀ … tₙ₋₁
	hs       []float64 // hs[i] = t[i+1] − t[i]; periodic: hs[n−1] closes the period
	ws       []float64 // weights, > 0
	periodic bool
	m        int // number of unknown second derivatives: n−2 open, n periodic
	// open is the open problem on the same knots, made once for the trace
	// of a periodic problem (the weights must not change meanwhile).
	open *splineProblem
}

// splineNewProblem returns the problem for knots ts (strictly increasing)
// and weights ws (nil for all 1). For a periodic problem period is the
// parameter length of the loop (period > ts[n−1] − ts[0]); it is ignored
// otherwise. It panics if fewer than splineMinKnots knots are given or the
// knots do not increase.
func splineNewProblem(ts, ws []float64, periodic bool, period float64) *splineProblem {
	n := len(ts)
	if n < splineMinKnots {
		panic("geometry: spline needs at least 8 knots")
	}
	p := &splineProblem{ts: ts, periodic: periodic}
	nh := n - 1
	if periodic {
		nh = n
	}
	p.hs = make([]float64, nh)
	for i := 0; i < n-1; i++ {
		p.hs[i] = ts[i+1] - ts[i]
		if !(p.hs[i] > 0) {
			panic("geometry: spline knots must increase strictly")
		}
	}
	if periodic {
		p.hs[n-1] = period - (ts[n-1] - ts[0])
		if !(p.hs[n-1] > 0) {
			panic("geometry: spline period shorter than its knots")
		}
		p.m = n
	} else {
		p.m = n - 2
	}
	if ws == nil {
		ws = make([]float64, n)
		for i := range ws {
			ws[i] = 1
		}
	}
	p.ws = ws
	return p
}

// n returns the number of data points.
func (p *splineProblem) n() int { return len(p.ts) }

// unknown returns the index of the unknown second derivative at knot c, or
// −1 when γ is fixed at zero there (the ends of an open spline).
func (p *splineProblem) unknown(c int) int {
	n := p.n()
	if p.periodic {
		return ((c % n) + n) % n
	}
	if c < 1 || c > n-2 {
		return -1
	}
	return c - 1
}

// qRow returns, for data row i, the knots c of the three possibly non-zero
// entries of Q in that row and their values.
func (p *splineProblem) qRow(i int) (cs [3]int, qs [3]float64) {
	n := p.n()
	var hPrev, hNext float64
	if i > 0 {
		hPrev = p.hs[i-1]
	} else if p.periodic {
		hPrev = p.hs[n-1]
	}
	if i < len(p.hs) {
		hNext = p.hs[i]
	}
	cs = [3]int{i - 1, i, i + 1}
	if hPrev > 0 {
		qs[0] = 1 / hPrev
		qs[1] -= 1 / hPrev
	}
	if hNext > 0 {
		qs[1] -= 1 / hNext
		qs[2] = 1 / hNext
	}
	return cs, qs
}

// splineBand is a symmetric pentadiagonal matrix of order m stored by
// diagonals: d0[j] = A[j][j], d1[j] = A[j][j+1], d2[j] = A[j][j+2]. When
// cyclic the indices wrap modulo m.
type splineBand struct {
	d0, d1, d2 []float64
	cyclic     bool
}

func splineNewBand(m int, cyclic bool) *splineBand {
	return &splineBand{d0: make([]float64, m), d1: make([]float64, m), d2: make([]float64, m), cyclic: cyclic}
}

// add adds v to A[j][k] (and, by symmetry, A[k][j]); callers pass each
// unordered pair once, or each ordered pair and accept the diagonal twice.
func (b *splineBand) add(j, k int, v float64) {
	m := len(b.d0)
	off := k - j
	if b.cyclic {
		off = ((off % m) + m) % m
	}
	switch {
	case off == 0:
		b.d0[j] += v
	case off == 1:
		b.d1[j] += v
	case off == 2:
		b.d2[j] += v
	case b.cyclic && off == m-1:
		b.d1[k] += v
	case b.cyclic && off == m-2:
		b.d2[k] += v
	case !b.cyclic && off == -1:
		b.d1[k] += v
	case !b.cyclic && off == -2:
		b.d2[k] += v
	default:
		panic("geometry: spline band entry outside the band")
	}
}

// assemble returns the band of R and of λ QᵀW⁻¹Q.
func (p *splineProblem) assemble(lambda float64) (r, a *splineBand) {
	m := p.m
	r = splineNewBand(m, p.periodic)
	a = splineNewBand(m, p.periodic)
	for i, h := range p.hs {
		u0, u1 := p.unknown(i), p.unknown(i+1)
		if u0 >= 0 {
			r.add(u0, u0, h/3)
		}
		if u1 >= 0 {
			r.add(u1, u1, h/3)
		}
		if u0 >= 0 && u1 >= 0 {
			r.add(u0, u1, h/6)
		}
	}
	for i := 0; i < p.n(); i++ {
		cs, qs := p.qRow(i)
		f := lambda / p.ws[i]
		for x := 0; x < 3; x++ {
			ux := p.unknown(cs[x])
			if ux < 0 || qs[x] == 0 {
				continue
			}
			a.add(ux, ux, f*qs[x]*qs[x])
			for y := x + 1; y < 3; y++ {
				uy := p.unknown(cs[y])
				if uy < 0 || qs[y] == 0 {
					continue
				}
				a.add(ux, uy, f*qs[x]*qs[y])
			}
		}
	}
	for j := range a.d0 {
		a.d0[j] += r.d0[j]
		a.d1[j] += r.d1[j]
		a.d2[j] += r.d2[j]
	}
	return r, a
}

// splineLDL is the LDLᵀ factorisation of a (non-cyclic) pentadiagonal band:
// L has unit diagonal and sub-diagonals l1 (L[j][j−1]) and l2 (L[j][j−2]).
type splineLDL struct {
	d, l1, l2 []float64
}

// splineFactor factors the leading m×m block of b, ignoring wrap-around
// entries. It returns an error if the block is not positive definite.
func splineFactor(b *splineBand, m int) (*splineLDL, error) {
	f := &splineLDL{d: make([]float64, m), l1: make([]float64, m), l2: make([]float64, m)}
	for j := 0; j < m; j++ {
		dj := b.d0[j]
		if j >= 2 {
			f.l2[j] = b.d2[j-2] / f.d[j-2]
			dj -= f.l2[j] * f.l2[j] * f.d[j-2]
		}
		if j >= 1 {
			v := b.d1[j-1]
			if j >= 2 {
				v -= f.l2[j] * f.d[j-2] * f.l1[j-1]
			}
			f.l1[j] = v / f.d[j-1]
			dj -= f.l1[j] * f.l1[j] * f.d[j-1]
		}
		if !(dj > 0) || math.IsInf(dj, 0) {
			return nil, fmt.Errorf("geometry: spline system not positive definite at row %d", j)
		}
		f.d[j] = dj
	}
	return f, nil
}

// solve overwrites x with the solution of L D Lᵀ x = x.
func (f *splineLDL) solve(x []float64) {
	m := len(f.d)
	for j := 1; j < m; j++ {
		x[j] -= f.l1[j] * x[j-1]
		if j >= 2 {
			x[j] -= f.l2[j] * x[j-2]
		}
	}
	for j := 0; j < m; j++ {
		x[j] /= f.d[j]
	}
	for j := m - 2; j >= 0; j-- {
		x[j] -= f.l1[j+1] * x[j+1]
		if j+2 < m {
			x[j] -= f.l2[j+2] * x[j+2]
		}
	}
}

// inverseBand returns the entries of A⁻¹ inside the band (diagonals 0, 1, 2)
// by the backward recursion of Hutchinson and de Hoog (1985).
func (f *splineLDL) inverseBand() (s0, s1, s2 []float64) {
	m := len(f.d)
	s0, s1, s2 = make([]float64, m), make([]float64, m), make([]float64, m)
	at := func(s []float64, j int) float64 {
		if j < m {
			return s[j]
		}
		return 0
	}
	l1 := func(j int) float64 {
		if j < m {
			return f.l1[j]
		}
		return 0
	}
	l2 := func(j int) float64 {
		if j < m {
			return f.l2[j]
		}
		return 0
	}
	for j := m - 1; j >= 0; j-- {
		// Σ[j][j+2], Σ[j][j+1], Σ[j][j] from rows below.
		s2[j] = -l1(j+1)*at(s1, j+1) - l2(j+2)*at(s0, j+2)
		s1[j] = -l1(j+1)*at(s0, j+1) - l2(j+2)*at(s1, j+1)
		s0[j] = 1/f.d[j] - l1(j+1)*s1[j] - l2(j+2)*s2[j]
	}
	return s0, s1, s2
}

// splineSolver solves A x = b for a pentadiagonal band A, cyclic or not. The
// cyclic case splits off the last two unknowns and solves the banded block
// with a 2×2 Schur complement, still in O(m).
type splineSolver struct {
	band   *splineBand
	ldl    *splineLDL
	cyclic bool
	y1, y2 []float64     // B⁻¹ c₁, B⁻¹ c₂ (cyclic)
	sInv   [2][2]float64 // inverse Schur complement (cyclic)
}

func splineNewSolver(b *splineBand) (*splineSolver, error) {
	m := len(b.d0)
	s := &splineSolver{band: b, cyclic: b.cyclic}
	if !b.cyclic {
		f, err := splineFactor(b, m)
		if err != nil {
			return nil, err
		}
		s.ldl = f
		return s, nil
	}
	if m < 6 {
		panic("geometry: cyclic spline system needs at least 6 unknowns")
	}
	f, err := splineFactor(b, m-2)
	if err != nil {
		return nil, err
	}
	s.ldl = f
	s.y1 = make([]float64, m-2)
	s.y2 = make([]float64, m-2)
	s.couplingTo(s.y1, s.y2)
	f.solve(s.y1)
	f.solve(s.y2)
	// S = D − Cᵀ B⁻¹ C.
	c1, c2 := make([]float64, m-2), make([]float64, m-2)
	s.couplingTo(c1, c2)
	var d [2][2]float64
	d[0][0] = b.d0[m-2] - splineDot(c1, s.y1)
	d[0][1] = b.d1[m-2] - splineDot(c1, s.y2)
	d[1][0] = b.d1[m-2] - splineDot(c2, s.y1)
	d[1][1] = b.d0[m-1] - splineDot(c2, s.y2)
	det := d[0][0]*d[1][1] - d[0][1]*d[1][0]
	if !(det > 0) {
		return nil, fmt.Errorf("geometry: cyclic spline system not positive definite")
	}
	s.sInv = [2][2]float64{{d[1][1] / det, -d[0][1] / det}, {-d[1][0] / det, d[0][0] / det}}
	return s, nil
}

// couplingTo writes the columns of C (coupling of the first m−2 unknowns to
// unknowns m−2 and m−1) into c1 and c2.
func (s *splineSolver) couplingTo(c1, c2 []float64) {
	b := s.band
	m := len(b.d0)
	clear(c1)
	clear(c2)
	c1[m-4] += b.d2[m-4]
	c1[m-3] += b.d1[m-3]
	c1[0] += b.d2[m-2]
	c2[m-3] += b.d2[m-3]
	c2[0] += b.d1[m-1]
	c2[1] += b.d2[m-1]
}

func splineDot(a, b []float64) float64 {
	var s float64
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

// solve overwrites x with A⁻¹ x.
func (s *splineSolver) solve(x []float64) {
	if !s.cyclic {
		s.ldl.solve(x)
		return
	}
	m := len(x)
	z := x[:m-2]
	b1, b2 := x[m-2], x[m-1]
	s.ldl.solve(z)
	// r = b₂ − Cᵀ z.
	var r1, r2 float64
	b := s.band
	r1 = b1 - (b.d2[m-4]*z[m-4] + b.d1[m-3]*z[m-3] + b.d2[m-2]*z[0])
	r2 = b2 - (b.d2[m-3]*z[m-3] + b.d1[m-1]*z[0] + b.d2[m-1]*z[1])
	x1 := s.sInv[0][0]*r1 + s.sInv[0][1]*r2
	x2 := s.sInv[1][0]*r1 + s.sInv[1][1]*r2
	for j := range z {
		z[j] -= s.y1[j]*x1 + s.y2[j]*x2
	}
	x[m-2], x[m-1] = x1, x2
}

// splineFit is one smoothing fit of several data columns on one problem.
type splineFit struct {
	gs, gams [][]float64 // values and second derivatives at every knot, per column
	trace    float64     // tr H(λ), the effective number of parameters; NaN if not computed
}

// fit returns the smoothing spline of every column of ys for λ ≥ 0. With
// wantTrace it also computes tr H(λ) (of the open problem on the same knots
// when the problem is periodic; the two differ by O(1)).
func (p *splineProblem) fit(lambda float64, ys [][]float64, wantTrace bool) (*splineFit, error) {
	r, a := p.assemble(lambda)
	sol, err := splineNewSolver(a)
	if err != nil {
		return nil, err
	}
	n := p.n()
	out := &splineFit{trace: math.NaN()}
	for _, y := range ys {
		rhs := make([]float64, p.m)
		for i := 0; i < n; i++ {
			cs, qs := p.qRow(i)
			for x := 0; x < 3; x++ {
				if u := p.unknown(cs[x]); u >= 0 {
					rhs[u] += qs[x] * y[i]
				}
			}
		}
		sol.solve(rhs)
		g := make([]float64, n)
		gam := make([]float64, n)
		for i := 0; i < n; i++ {
			if u := p.unknown(i); u >= 0 {
				gam[i] = rhs[u]
			}
		}
		for i := 0; i < n; i++ {
			cs, qs := p.qRow(i)
			var qg float64
			for x := 0; x < 3; x++ {
				if u := p.unknown(cs[x]); u >= 0 {
					qg += qs[x] * rhs[u]
				}
			}
			g[i] = y[i] - lambda/p.ws[i]*qg
		}
		out.gs = append(out.gs, g)
		out.gams = append(out.gams, gam)
	}
	if wantTrace {
		q := p
		if p.periodic {
			if p.open == nil {
				p.open = splineNewProblem(p.ts, p.ws, false, 0)
			}
			q = p.open
			r, a = q.assemble(lambda)
		}
		f, err := splineFactor(a, q.m)
		if err != nil {
			return nil, err
		}
		s0, s1, s2 := f.inverseBand()
		// tr H = n − tr(A⁻¹ (A − R)), both symmetric pentadiagonal.
		var t float64
		for j := 0; j < q.m; j++ {
			t += s0[j] * (a.d0[j] - r.d0[j])
			if j+1 < q.m {
				t += 2 * s1[j] * (a.d1[j] - r.d1[j])
			}
			if j+2 < q.m {
				t += 2 * s2[j] * (a.d2[j] - r.d2[j])
			}
		}
		out.trace = float64(n) - t
	}
	return out, nil
}

// splinePieces converts knot values g and second derivatives γ into cubic
// coefficients per piece in u = t − tᵢ:
//
//	g(u) = a + b u + c u² + d u³
//	a = gᵢ, b = (gᵢ₊₁ − gᵢ)/h − h(2γᵢ + γᵢ₊₁)/6, c = γᵢ/2, d = (γᵢ₊₁ − γᵢ)/(6h)
func (p *splineProblem) pieces(g, gam []float64) [][4]float64 {
	n := p.n()
	out := make([][4]float64, len(p.hs))
	for i, h := range p.hs {
		j := (i + 1) % n
		out[i] = [4]float64{
			g[i],
			(g[j]-g[i])/h - h*(2*gam[i]+gam[j])/6,
			gam[i] / 2,
			(gam[j] - gam[i]) / (6 * h),
		}
	}
	return out
}
