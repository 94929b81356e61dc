package curve

import (
	"fmt"
	"math"
	"sync"
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

	// The λ-independent parts of the system, made on the first fit, and
	// work space reused by later fits (the smoothing-parameter search fits
	// one problem many times). Weights must not change after the first fit.
	fixedOnce sync.Once
	fixed     *splineFixed
	scratchMu sync.Mutex
	scratch   []*splineScratch
	// spare holds columns of n values that fits handed back (release),
	// for the values and second derivatives of later fits.
	spare [][]float64
	// ownWs is ws when the problem made it (weights all 1), for a renewed
	// problem to reuse; reused and reusedOpen are storage taken from a
	// problem renewed into this one, for the fixed part and the open
	// problem when they are made.
	ownWs      []float64
	reused     *splineFixed
	reusedOpen *splineProblem
}

// splineFixed holds what every fit of a problem shares: the band of R and,
// for each data row, the entries of Q and where the products of its entries
// land in the band of QᵀW⁻¹Q.
type splineFixed struct {
	r *splineBand
	// qu[i][x] is the unknown of entry x of row i of Q (−1 where γ is fixed
	// at zero) and qv[i][x] its value.
	qu [][3]int32
	qv [][3]float64
}

// splineScratch is the work space of one fit.
type splineScratch struct {
	a          *splineBand
	ldl        splineLDL
	sol        splineSolver
	c1, c2     []float64
	rhs        [][]float64
	s0, s1, s2 []float64 // the band of the inverse, for the trace (made on first use)
	fs         []float64 // λ/wᵢ
}

// splineNewProblem returns the problem for knots ts (strictly increasing)
// and weights ws (nil for all 1). For a periodic problem period is the
// parameter length of the loop (period > ts[n−1] − ts[0]); it is ignored
// otherwise. It panics if fewer than splineMinKnots knots are given or the
// knots do not increase.
func splineNewProblem(ts, ws []float64, periodic bool, period float64) *splineProblem {
	return splineRenewProblem(nil, ts, ws, periodic, period)
}

// splineRenewProblem is splineNewProblem built in the storage of old (nil
// for none), a problem that nobody uses any more: its fits, columns and
// knots are not read again. Every buffer taken from old is cleared or
// overwritten before use, so the new problem's fits are those of a new
// one, bit for bit; only the allocations (and the fresh pages the heap
// grows by for them) are saved. The knots ts may be old's knots' storage,
// written anew.
func splineRenewProblem(old *splineProblem, ts, ws []float64, periodic bool, period float64) *splineProblem {
	n := len(ts)
	if n < splineMinKnots {
		panic("geometry: spline needs at least 8 knots")
	}
	p := &splineProblem{ts: ts, periodic: periodic}
	nh := n - 1
	if periodic {
		nh = n
	}
	var oldHs, oldWs []float64
	if old != nil {
		oldHs, oldWs = old.hs, old.ownWs
	}
	p.hs = reuseFloats(oldHs, nh)
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
		ws = reuseFloats(oldWs, n)
		for i := range ws {
			ws[i] = 1
		}
		p.ownWs = ws
	}
	p.ws = ws
	if old != nil {
		p.reuse(old)
	}
	return p
}

// reuse hands the storage of old's fixed part, scratch, spare columns and
// open problem to p, which has its knots, weights and m set and has not
// been fitted, resized to p's size.
func (p *splineProblem) reuse(old *splineProblem) {
	n, m := p.n(), p.m
	if fx := old.fixed; fx != nil {
		p.reused = &splineFixed{
			r:  reuseBand(fx.r, m, p.periodic),
			qu: reuseSlice(fx.qu, n),
			qv: reuseSlice(fx.qv, n),
		}
	}
	if old.open != nil {
		p.reusedOpen = old.open
	} else {
		p.reusedOpen = old.reusedOpen
	}
	for _, sc := range old.scratch {
		sc.a = reuseBand(sc.a, m, p.periodic)
		sc.ldl = splineLDL{d: reuseFloats(sc.ldl.d, m), l1: reuseFloats(sc.ldl.l1, m), l2: reuseFloats(sc.ldl.l2, m)}
		sc.fs = reuseFloats(sc.fs, n)
		c1, c2, y1, y2 := sc.c1, sc.c2, sc.sol.y1, sc.sol.y2
		sc.c1, sc.c2, sc.sol = nil, nil, splineSolver{}
		if p.periodic {
			sc.c1, sc.c2 = reuseFloats(c1, m-2), reuseFloats(c2, m-2)
			sc.sol.y1, sc.sol.y2 = reuseFloats(y1, m-2), reuseFloats(y2, m-2)
		}
		for k := range sc.rhs {
			sc.rhs[k] = reuseFloats(sc.rhs[k], m)
		}
		if sc.s0 != nil {
			sc.s0, sc.s1, sc.s2 = reuseFloats(sc.s0, m), reuseFloats(sc.s1, m), reuseFloats(sc.s2, m)
		}
		p.scratch = append(p.scratch, sc)
	}
	for _, c := range old.spare {
		if cap(c) >= n {
			p.spare = append(p.spare, c[:n])
		}
	}
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
	all        []float64 // d0, d1 and d2 one after the other
	cyclic     bool
}

func splineNewBand(m int, cyclic bool) *splineBand {
	all := make([]float64, 3*m)
	return &splineBand{d0: all[:m:m], d1: all[m : 2*m : 2*m], d2: all[2*m:], all: all, cyclic: cyclic}
}

// reuseBand returns a zero band of order m, in b's storage when it holds
// enough (b may be nil).
func reuseBand(b *splineBand, m int, cyclic bool) *splineBand {
	var all []float64
	if b != nil {
		all = b.all
	}
	all = reuseFloats(all, 3*m)
	return &splineBand{d0: all[:m:m], d1: all[m : 2*m : 2*m], d2: all[2*m:], all: all, cyclic: cyclic}
}

// reuseFloats returns n zeros, in the storage of s when its capacity
// allows.
func reuseFloats(s []float64, n int) []float64 { return reuseSlice(s, n) }

// reuseSlice returns n zero values, in the storage of s when its capacity
// allows.
func reuseSlice[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n)
	}
	s = s[:n]
	clear(s)
	return s
}

// add adds v to A[j][k] (and, by symmetry, A[k][j]); callers pass each
// unordered pair once, or each ordered pair and accept the diagonal twice.
func (b *splineBand) add(j, k int, v float64) {
	b.all[b.slot(j, k)] += v
}

// slot returns the index in b.all of the stored entry A[j][k] (or A[k][j]).
func (b *splineBand) slot(j, k int) int {
	m := len(b.d0)
	off := k - j
	if b.cyclic {
		off = ((off % m) + m) % m
	}
	switch {
	case off == 0:
		return j
	case off == 1:
		return m + j
	case off == 2:
		return 2*m + j
	case b.cyclic && off == m-1:
		return m + k
	case b.cyclic && off == m-2:
		return 2*m + k
	case !b.cyclic && off == -1:
		return m + k
	case !b.cyclic && off == -2:
		return 2*m + k
	default:
		panic("geometry: spline band entry outside the band")
	}
}

// assemble returns the band of R and of R + λ QᵀW⁻¹Q, the reference
// assembleInto is tested against.
func (p *splineProblem) assemble(lambda float64) (r, a *splineBand) {
	r = p.assembleR()
	a = splineNewBand(p.m, p.periodic)
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

// assembleR returns the band of R, the λ-independent part of the system.
func (p *splineProblem) assembleR() *splineBand {
	r := splineNewBand(p.m, p.periodic)
	p.assembleRInto(r)
	return r
}

// assembleRInto adds the band of R into r, a zero band of p's order.
func (p *splineProblem) assembleRInto(r *splineBand) {
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
}

// fixedPart returns the λ-independent parts of p's system, made once.
func (p *splineProblem) fixedPart() *splineFixed {
	p.fixedOnce.Do(func() {
		if p.periodic {
			p.open = splineRenewProblem(p.reusedOpen, p.ts, p.ws, false, 0)
			p.reusedOpen = nil
		}
		n := p.n()
		fx := p.reused
		p.reused = nil
		if fx == nil {
			fx = &splineFixed{qu: make([][3]int32, n), qv: make([][3]float64, n), r: splineNewBand(p.m, p.periodic)}
		}
		p.assembleRInto(fx.r)
		for i := 0; i < n; i++ {
			cs, qs := p.qRow(i)
			for x := 0; x < 3; x++ {
				fx.qu[i][x] = int32(p.unknown(cs[x]))
				fx.qv[i][x] = qs[x]
			}
		}
		p.fixed = fx
	})
	return p.fixed
}

// getScratch returns work space for one fit of p; putScratch gives it back.
// Concurrent fits of one problem each get their own.
func (p *splineProblem) getScratch() *splineScratch {
	p.scratchMu.Lock()
	defer p.scratchMu.Unlock()
	if k := len(p.scratch); k > 0 {
		sc := p.scratch[k-1]
		p.scratch = p.scratch[:k-1]
		return sc
	}
	m := p.m
	sc := &splineScratch{
		a:   splineNewBand(m, p.periodic),
		ldl: splineLDL{d: make([]float64, m), l1: make([]float64, m), l2: make([]float64, m)},
		fs:  make([]float64, p.n()),
	}
	if p.periodic {
		sc.c1, sc.c2 = make([]float64, m-2), make([]float64, m-2)
		sc.sol.y1, sc.sol.y2 = make([]float64, m-2), make([]float64, m-2)
	}
	return sc
}

func (p *splineProblem) putScratch(sc *splineScratch) {
	p.scratchMu.Lock()
	p.scratch = append(p.scratch, sc)
	p.scratchMu.Unlock()
}

// column returns a column of n values for a fit's output: one a fit
// handed back, or a new one. Its contents are arbitrary.
func (p *splineProblem) column() []float64 {
	p.scratchMu.Lock()
	defer p.scratchMu.Unlock()
	if k := len(p.spare); k > 0 {
		c := p.spare[k-1]
		p.spare = p.spare[:k-1]
		return c
	}
	return make([]float64, p.n())
}

// release hands f's columns back to p for later fits of p: a caller that
// has taken what it needs from a fit of p (a risk, the pieces of a curve)
// and keeps no reference to f. Columns of another length are left to the
// collector.
func (p *splineProblem) release(f *splineFit) {
	p.scratchMu.Lock()
	defer p.scratchMu.Unlock()
	for _, cols := range [][][]float64{f.gs, f.gams} {
		for _, c := range cols {
			if len(c) == p.n() {
				p.spare = append(p.spare, c)
			}
		}
	}
	f.gs, f.gams = nil, nil
}

// assembleInto writes R + λ QᵀW⁻¹Q into a, adding the same terms in the
// same order as assemble, so the result is identical. fs is work space of
// length n.
//
// Entry (u, u+δ) of QᵀW⁻¹Q, u the unknown at knot c, sums over the rows
// i = c+1−x of Q (x = 2−δ, …, 0; modulo n when periodic) the products
// (λ/wᵢ)·Q[i][x]·Q[i][x+δ] of the entries x and x+δ of row i, in the order
// of i, as assemble adds them.
func (p *splineProblem) assembleInto(fx *splineFixed, lambda float64, a *splineBand, fs []float64) {
	n, m := p.n(), p.m
	for i, w := range p.ws {
		if w == 1 {
			fs[i] = lambda // λ/1, exactly, without the slow division
		} else {
			fs[i] = lambda / w
		}
	}
	qv := fx.qv
	shift := 1 // knot of unknown 0
	if p.periodic {
		shift = 0
	}
	for delta := 0; delta < 3; delta++ {
		d := a.all[delta*m : (delta+1)*m]
		r := fx.r.all[delta*m : (delta+1)*m]
		// Interior entries, whose rows do not wrap round.
		lo := max(1-delta-shift, 0)
		hi := min(n-2-shift, m-1-delta)
		switch delta {
		case 0:
			for u := lo; u <= hi; u++ {
				i := u + shift
				v := fs[i-1] * qv[i-1][2] * qv[i-1][2]
				v += fs[i] * qv[i][1] * qv[i][1]
				v += fs[i+1] * qv[i+1][0] * qv[i+1][0]
				d[u] = v + r[u]
			}
		case 1:
			for u := lo; u <= hi; u++ {
				i := u + shift
				v := fs[i] * qv[i][1] * qv[i][2]
				v += fs[i+1] * qv[i+1][0] * qv[i+1][1]
				d[u] = v + r[u]
			}
		case 2:
			for u := lo; u <= hi; u++ {
				i := u + shift + 1
				d[u] = fs[i]*qv[i][0]*qv[i][2] + r[u]
			}
		}
		for u := 0; u < m; u++ {
			if u == lo && lo <= hi {
				u = hi // skip the interior
				continue
			}
			if !p.periodic && u+delta > m-1 {
				d[u] = 0 + r[u]
				continue
			}
			c := u + shift
			var v float64
			if c-1+delta >= 0 && c+1 <= n-1 {
				for x := 2 - delta; x >= 0; x-- {
					i := c + 1 - x
					v += fs[i] * qv[i][x] * qv[i][x+delta]
				}
			} else {
				// The rows wrap round: take them in increasing order.
				var rows, xs [3]int
				k := 0
				for x := 2 - delta; x >= 0; x-- {
					i := ((c+1-x)%n + n) % n
					j := k
					for j > 0 && rows[j-1] > i {
						rows[j], xs[j] = rows[j-1], xs[j-1]
						j--
					}
					rows[j], xs[j] = i, x
					k++
				}
				for j := 0; j < k; j++ {
					i, x := rows[j], xs[j]
					v += fs[i] * qv[i][x] * qv[i][x+delta]
				}
			}
			d[u] = v + r[u]
		}
	}
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
	if err := splineFactorInto(b, m, f); err != nil {
		return nil, err
	}
	return f, nil
}

// splineFactorInto is splineFactor into the storage of f, which it
// reslices to length m (its capacity must be at least m).
func splineFactorInto(b *splineBand, m int, f *splineLDL) error {
	f.d, f.l1, f.l2 = f.d[:m], f.l1[:m], f.l2[:m]
	if m == 0 {
		return nil
	}
	d, l1, l2 := f.d, f.l1, f.l2
	b0, b1, b2 := b.d0[:m], b.d1[:m], b.d2[:m]
	l1[0], l2[0] = 0, 0
	bad := func(j int) error {
		return fmt.Errorf("geometry: spline system not positive definite at row %d", j)
	}
	dj := b0[0]
	if !(dj > 0 && dj <= math.MaxFloat64) {
		return bad(0)
	}
	d[0] = dj
	if m == 1 {
		return nil
	}
	l2[1] = 0
	l1j := b1[0] / d[0]
	dj = b0[1] - l1j*l1j*d[0]
	if !(dj > 0 && dj <= math.MaxFloat64) {
		return bad(1)
	}
	l1[1], d[1] = l1j, dj
	// The previous pivots and multiplier stay in registers: the loop is
	// one chain of dependent operations.
	dPrev2, dPrev1, l1Prev := d[0], d[1], l1j
	for j := 2; j < m; j++ {
		l2j := b2[j-2] / dPrev2
		dj := b0[j] - l2j*l2j*dPrev2
		v := b1[j-1] - l2j*dPrev2*l1Prev
		l1j := v / dPrev1
		dj -= l1j * l1j * dPrev1
		if !(dj > 0 && dj <= math.MaxFloat64) {
			return bad(j)
		}
		l2[j], l1[j], d[j] = l2j, l1j, dj
		dPrev2, dPrev1, l1Prev = dPrev1, dj, l1j
	}
	return nil
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

// solve2 is solve for x and y at once, with the same operations on each.
func (f *splineLDL) solve2(x, y []float64) {
	m := len(f.d)
	if m < 3 {
		f.solve(x)
		f.solve(y)
		return
	}
	d, l1, l2 := f.d[:m], f.l1[:m], f.l2[:m]
	x, y = x[:m], y[:m]
	// The last two values of each sweep stay in registers, and the
	// division by the pivots is done on the way back.
	x1, y1 := x[1]-l1[1]*x[0], y[1]-l1[1]*y[0]
	x[1], y[1] = x1, y1
	x2, y2 := x[0], y[0]
	for j := 2; j < m; j++ {
		a, b := l1[j], l2[j]
		vx := x[j] - a*x1 - b*x2
		vy := y[j] - a*y1 - b*y2
		x[j], y[j] = vx, vy
		x2, x1, y2, y1 = x1, vx, y1, vy
	}
	x1, y1 = x[m-1]/d[m-1], y[m-1]/d[m-1]
	x[m-1], y[m-1] = x1, y1
	a := l1[m-1]
	vx, vy := x[m-2]/d[m-2]-a*x1, y[m-2]/d[m-2]-a*y1
	x[m-2], y[m-2] = vx, vy
	x2, x1, y2, y1 = x1, vx, y1, vy
	for j := m - 3; j >= 0; j-- {
		a, b := l1[j+1], l2[j+2]
		vx := x[j]/d[j] - a*x1 - b*x2
		vy := y[j]/d[j] - a*y1 - b*y2
		x[j], y[j] = vx, vy
		x2, x1, y2, y1 = x1, vx, y1, vy
	}
}

// splineTiny is the magnitude below which solveSparse2 sets entries to zero.
const splineTiny = 1e-280

// solveSparse2 is solve2 for right-hand sides that are zero but for a few
// entries near the ends, as the coupling columns of a cyclic system are.
// The solutions decay geometrically away from them, through subnormal
// numbers, which are very slow to compute with; solveSparse2 sets entries
// below splineTiny in magnitude to zero instead, changing the solution by
// less than that. An entry whose two predecessors (successors, going back)
// are zero does not change, so the long run of zeros is passed over.
func (f *splineLDL) solveSparse2(x, y []float64) {
	m := len(f.d)
	d, l1, l2 := f.d, f.l1, f.l2
	x, y = x[:m], y[:m]
	for j := 1; j < m; j++ {
		if j >= 2 && x[j-1] == 0 && x[j-2] == 0 && y[j-1] == 0 && y[j-2] == 0 {
			continue
		}
		a := l1[j]
		x[j] -= a * x[j-1]
		y[j] -= a * y[j-1]
		if j >= 2 {
			b := l2[j]
			x[j] -= b * x[j-2]
			y[j] -= b * y[j-2]
		}
		if math.Abs(x[j]) < splineTiny {
			x[j] = 0
		}
		if math.Abs(y[j]) < splineTiny {
			y[j] = 0
		}
	}
	for j := 0; j < m; j++ {
		if x[j] != 0 {
			x[j] /= d[j]
		}
		if y[j] != 0 {
			y[j] /= d[j]
		}
	}
	for j := m - 2; j >= 0; j-- {
		if j+2 < m && x[j+1] == 0 && x[j+2] == 0 && y[j+1] == 0 && y[j+2] == 0 {
			continue
		}
		a := l1[j+1]
		x[j] -= a * x[j+1]
		y[j] -= a * y[j+1]
		if j+2 < m {
			b := l2[j+2]
			x[j] -= b * x[j+2]
			y[j] -= b * y[j+2]
		}
		if math.Abs(x[j]) < splineTiny {
			x[j] = 0
		}
		if math.Abs(y[j]) < splineTiny {
			y[j] = 0
		}
	}
}

// inverseBand returns the entries of A⁻¹ inside the band (diagonals 0, 1, 2)
// by the backward recursion of Hutchinson and de Hoog (1985).
func (f *splineLDL) inverseBand() (s0, s1, s2 []float64) {
	m := len(f.d)
	s0, s1, s2 = make([]float64, m), make([]float64, m), make([]float64, m)
	f.inverseBandInto(s0, s1, s2)
	return s0, s1, s2
}

// inverseBandInto is inverseBand into s0, s1 and s2 (each of length m).
func (f *splineLDL) inverseBandInto(s0, s1, s2 []float64) {
	m := len(f.d)
	s0, s1, s2 = s0[:m], s1[:m], s2[:m]
	d, l1, l2 := f.d, f.l1, f.l2
	for j := m - 1; j >= 0; j-- {
		// Σ[j][j+2], Σ[j][j+1], Σ[j][j] from rows below; entries past
		// the end count as zero.
		var a1, b1, b2, c0, c1 float64 // l1[j+1], s1[j+1], l2[j+2], s0[j+2], s0[j+1]
		if j+1 < m {
			a1, b1, c1 = l1[j+1], s1[j+1], s0[j+1]
		}
		if j+2 < m {
			b2, c0 = l2[j+2], s0[j+2]
		}
		s2[j] = -a1*b1 - b2*c0
		s1[j] = -a1*c1 - b2*b1
		s0[j] = 1/d[j] - a1*s1[j] - b2*s2[j]
	}
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
	s := &splineSolver{ldl: &splineLDL{d: make([]float64, m), l1: make([]float64, m), l2: make([]float64, m)}}
	if b.cyclic {
		if m < 6 {
			panic("geometry: cyclic spline system needs at least 6 unknowns")
		}
		s.y1, s.y2 = make([]float64, m-2), make([]float64, m-2)
	}
	if err := s.setup(b, nil, nil); err != nil {
		return nil, err
	}
	return s, nil
}

// setup factors b into the storage s already has (s.ldl, and s.y1, s.y2
// of length m−2 when b is cyclic). c1 and c2 are work space of length m−2
// for a cyclic b, or nil to allocate it.
func (s *splineSolver) setup(b *splineBand, c1, c2 []float64) error {
	m := len(b.d0)
	s.band, s.cyclic = b, b.cyclic
	if !b.cyclic {
		return splineFactorInto(b, m, s.ldl)
	}
	if m < 6 {
		panic("geometry: cyclic spline system needs at least 6 unknowns")
	}
	f := s.ldl
	if err := splineFactorInto(b, m-2, f); err != nil {
		return err
	}
	s.couplingTo(s.y1, s.y2)
	f.solveSparse2(s.y1, s.y2)
	// S = D − Cᵀ B⁻¹ C.
	if c1 == nil {
		c1, c2 = make([]float64, m-2), make([]float64, m-2)
	}
	s.couplingTo(c1, c2)
	var d [2][2]float64
	d[0][0] = b.d0[m-2] - splineDot(c1, s.y1)
	d[0][1] = b.d1[m-2] - splineDot(c1, s.y2)
	d[1][0] = b.d1[m-2] - splineDot(c2, s.y1)
	d[1][1] = b.d0[m-1] - splineDot(c2, s.y2)
	det := d[0][0]*d[1][1] - d[0][1]*d[1][0]
	if !(det > 0) {
		return fmt.Errorf("geometry: cyclic spline system not positive definite")
	}
	s.sInv = [2][2]float64{{d[1][1] / det, -d[0][1] / det}, {-d[1][0] / det, d[0][0] / det}}
	return nil
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
	s.ldl.solve(x[:len(x)-2])
	s.finish(x)
}

// solve2 is solve for two right-hand sides at once. The sweeps are
// sequential chains of operations; two independent chains in one loop run
// side by side in the processor, so this takes little longer than one.
func (s *splineSolver) solve2(x, y []float64) {
	if !s.cyclic {
		s.ldl.solve2(x, y)
		return
	}
	s.ldl.solve2(x[:len(x)-2], y[:len(y)-2])
	s.finish(x)
	s.finish(y)
}

// finish completes a cyclic solve once the leading block of x holds B⁻¹ b₁.
func (s *splineSolver) finish(x []float64) {
	m := len(x)
	z := x[:m-2]
	b1, b2 := x[m-2], x[m-1]
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
	fx := p.fixedPart()
	n := p.n()
	out := &splineFit{trace: math.NaN(), gs: make([][]float64, len(ys)), gams: make([][]float64, len(ys))}
	sc := p.getScratch()
	defer p.putScratch(sc)
	for len(sc.rhs) < len(ys) {
		sc.rhs = append(sc.rhs, make([]float64, p.m))
	}
	// values fills in column k once the solve is done.
	values := func(k int) {
		rhs := sc.rhs[k]
		g, gam := p.column(), p.column()
		if p.periodic {
			copy(gam, rhs)
		} else {
			gam[0], gam[n-1] = 0, 0 // natural ends
			copy(gam[1:n-1], rhs)
		}
		p.valuesInto(fx, ys[k], rhs, sc.fs, g)
		out.gs[k], out.gams[k] = g, gam
	}
	// For many knots a second goroutine computes the trace meanwhile (of
	// the open problem on the same knots from the start when p is
	// periodic, else once p's system is factored), then the values of the
	// second half of the columns once they are solved.
	var (
		tr       float64
		trErr    error
		wg       sync.WaitGroup
		parallel = wantTrace && n >= splineParallelKnots
		solved   = make(chan bool, 1) // true once solved, false on failure
		split    = len(ys)
	)
	if parallel {
		split = (len(ys) + 1) / 2
		defer wg.Wait()
	}
	second := func() {
		if p.periodic {
			tr, trErr = p.open.openTrace(lambda)
		} else {
			tr = p.traceTerm(fx, sc, &sc.ldl)
		}
		if <-solved {
			for k := split; k < len(ys); k++ {
				values(k)
			}
		}
	}
	if parallel && p.periodic {
		wg.Go(second)
	}
	a := sc.a
	p.assembleInto(fx, lambda, a, sc.fs)
	sol := &sc.sol
	sol.ldl = &sc.ldl
	if err := sol.setup(a, sc.c1, sc.c2); err != nil {
		solved <- false
		return nil, err
	}
	if parallel && !p.periodic {
		// The solves below only read the factor.
		wg.Go(second)
	}
	for k, y := range ys {
		p.rhsInto(fx, y, sc.rhs[k])
	}
	k := 0
	for ; k+1 < len(ys); k += 2 {
		sol.solve2(sc.rhs[k], sc.rhs[k+1])
	}
	if k < len(ys) {
		sol.solve(sc.rhs[k])
	}
	solved <- true
	for k := range split {
		values(k)
	}
	if wantTrace {
		switch {
		case parallel:
			wg.Wait()
		case p.periodic:
			tr, trErr = p.open.openTrace(lambda)
		default:
			// An open problem's solver factored the whole band already.
			tr = p.traceTerm(fx, sc, &sc.ldl)
		}
		if trErr != nil {
			return nil, trErr
		}
		out.trace = float64(n) - tr
	}
	return out, nil
}

// rhsInto writes Qᵀy into rhs, adding the same terms in the same order as
// the row-by-row sum: entry u, at knot c, takes rows c−1, c, c+1 of Q
// (entries 2, 1, 0), in increasing row order.
func (p *splineProblem) rhsInto(fx *splineFixed, y, rhs []float64) {
	n, m := p.n(), p.m
	qv := fx.qv
	shift := 1 // knot of unknown 0
	if p.periodic {
		shift = 0
	}
	lo, hi := max(1-shift, 0), min(n-2-shift, m-1)
	for u := lo; u <= hi; u++ {
		c := u + shift
		v := qv[c-1][2] * y[c-1]
		v += qv[c][1] * y[c]
		v += qv[c+1][0] * y[c+1]
		rhs[u] = v
	}
	for u := 0; u < m; u++ {
		if u == lo && lo <= hi {
			u = hi
			continue
		}
		// Rows wrapping round (periodic ends): in increasing order.
		c := u + shift
		var rows, xs [3]int
		k := 0
		for x := 2; x >= 0; x-- {
			i := ((c+1-x)%n + n) % n
			j := k
			for j > 0 && rows[j-1] > i {
				rows[j], xs[j] = rows[j-1], xs[j-1]
				j--
			}
			rows[j], xs[j] = i, x
			k++
		}
		var v float64
		for j := 0; j < k; j++ {
			v += qv[rows[j]][xs[j]] * y[rows[j]]
		}
		rhs[u] = v
	}
}

// valuesInto writes the fitted values g = y − λW⁻¹Qγ, γ the solution in
// gam (indexed by unknown) and fs[i] = λ/wᵢ, with the terms of each row in
// the order of its entries.
func (p *splineProblem) valuesInto(fx *splineFixed, y, gam, fs, g []float64) {
	n := p.n()
	qu, qv := fx.qu, fx.qv
	shift := 1
	if p.periodic {
		shift = 0
	}
	// Rows 2 … n−3 have three unknowns, knots i−1, i, i+1, without wrap.
	row := func(i int) {
		var qg float64
		for x := 0; x < 3; x++ {
			if u := qu[i][x]; u >= 0 {
				qg += qv[i][x] * gam[u]
			}
		}
		g[i] = y[i] - fs[i]*qg
	}
	row(0)
	row(1)
	for i := 2; i <= n-3; i++ {
		u := i - shift
		q := &qv[i]
		qg := q[0] * gam[u-1]
		qg += q[1] * gam[u]
		qg += q[2] * gam[u+1]
		g[i] = y[i] - fs[i]*qg
	}
	row(n - 2)
	row(n - 1)
}

// splineParallelKnots is the least number of knots for which fit computes
// the trace on a second goroutine (a variable so that tests can take either
// path).
var splineParallelKnots = 2000

// openTrace returns tr(A⁻¹ (A − R)) for the open problem p at λ.
func (p *splineProblem) openTrace(lambda float64) (float64, error) {
	fx := p.fixedPart()
	sc := p.getScratch()
	defer p.putScratch(sc)
	p.assembleInto(fx, lambda, sc.a, sc.fs)
	if err := splineFactorInto(sc.a, p.m, &sc.ldl); err != nil {
		return 0, err
	}
	return p.traceTerm(fx, sc, &sc.ldl), nil
}

// traceTerm returns tr(A⁻¹ (A − R)) for the open problem p, whose system is
// in sc.a and factored in f: tr H = n − tr(A⁻¹ (A − R)), both symmetric
// pentadiagonal.
func (p *splineProblem) traceTerm(fx *splineFixed, sc *splineScratch, f *splineLDL) float64 {
	a, r := sc.a, fx.r
	if sc.s0 == nil {
		// Made for the first trace only: most problems are fitted
		// without one (replicas, the sampling test's subsets).
		sc.s0, sc.s1, sc.s2 = make([]float64, p.m), make([]float64, p.m), make([]float64, p.m)
	}
	f.inverseBandInto(sc.s0, sc.s1, sc.s2)
	s0, s1, s2 := sc.s0, sc.s1, sc.s2
	var t float64
	for j := 0; j < p.m; j++ {
		t += s0[j] * (a.d0[j] - r.d0[j])
		if j+1 < p.m {
			t += 2 * s1[j] * (a.d1[j] - r.d1[j])
		}
		if j+2 < p.m {
			t += 2 * s2[j] * (a.d2[j] - r.d2[j])
		}
	}
	return t
}

// splinePieces converts knot values g and second derivatives γ into cubic
// coefficients per piece in u = t − tᵢ:
//
//	g(u) = a + b u + c u² + d u³
//	a = gᵢ, b = (gᵢ₊₁ − gᵢ)/h − h(2γᵢ + γᵢ₊₁)/6, c = γᵢ/2, d = (γᵢ₊₁ − γᵢ)/(6h)
func (p *splineProblem) pieces(g, gam []float64) [][4]float64 {
	out := make([][4]float64, len(p.hs))
	for i := range p.hs {
		out[i] = p.piece(g, gam, i)
	}
	return out
}

// piece returns the coefficients of piece i (see pieces), for a caller
// that needs a few pieces, or each once, and not the table.
func (p *splineProblem) piece(g, gam []float64, i int) [4]float64 {
	h := p.hs[i]
	j := (i + 1) % p.n()
	return [4]float64{
		g[i],
		(g[j]-g[i])/h - h*(2*gam[i]+gam[j])/6,
		gam[i] / 2,
		(gam[j] - gam[i]) / (6 * h),
	}
}
