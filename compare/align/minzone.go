package align

import (
	"fmt"
	"math"
	"sort"

	"github.com/foilwright/foilwright/geometry"
)

// A Band is the tolerance zone of one point: its signed distance may lie
// in [Centre − Half, Centre + Half]. Half must be positive.
type Band struct {
	Centre, Half float64
}

// Use returns how much of the band the signed distance d takes: |d −
// Centre| / Half; 1 is the edge of the zone.
func (b Band) Use(d float64) float64 { return math.Abs(d-b.Centre) / b.Half }

// MinimumZone moves the points so that the largest band use,
//
//	F = maxᵢ |dᵢ − cᵢ| / hᵢ,
//
// is least (bands[i] = (cᵢ, hᵢ) belongs to pts[i]; nil bands means cᵢ = 0
// and hᵢ = 1, the plain Chebyshev fit, whose F is then the half-width of
// the thinnest zone about the outline that holds every point). F ≤ 1 means
// some placement puts every point inside its zone.
//
// The fit is a sequence of linear programs. At the motion m, the
// distances are linearised in the scaled small motion u (rotation, shift
// and, with opts.Scale, scaling about the centroid of the moved points),
// dᵢ + gᵢ·u, and the program
//
//	minimise z  subject to  |dᵢ − cᵢ + gᵢ·u| ≤ hᵢ z,  |uⱼ| ≤ Δ,
//
// is solved exactly by the simplex walk of lp.go, over the points that can
// bind at all within the box (those whose linearised use can reach the
// largest lower bound of any other), on a growing working set of them
// (see chebyshev.solve). The step is taken when the true F
// falls, and the trust region Δ grows or shrinks with the agreement
// between predicted and true decrease; the feet are found anew after every
// step. It stops when the program predicts no decrease beyond rounding or
// the region has shrunk below 1e-14 of the points' spread. Start from the
// least-squares fit: the program is local.
//
// It returns ErrTooFewPoints, ErrNonFinite for non-finite input, and an
// error for a band whose half-width is not positive.
func MinimumZone(o Outline, pts []geometry.Point, bands []Band, start Motion, opts Options) (Result, error) {
	if err := checkStart(pts, start, opts); err != nil {
		return Result{}, err
	}
	if bands != nil && len(bands) != len(pts) {
		panic("align: MinimumZone needs one band per point")
	}
	band := func(i int) Band {
		if bands == nil {
			return Band{Half: 1}
		}
		return bands[i]
	}
	for i := range pts {
		if b := band(i); !(b.Half > 0) || math.IsInf(b.Half, 0) || math.IsNaN(b.Centre) || math.IsInf(b.Centre, 0) {
			return Result{}, fmt.Errorf("align: band %d is (%g ± %g): want a finite centre and a positive half-width", i, b.Centre, b.Half)
		}
	}
	usage := func(feet []Foot) (float64, error) {
		var f float64
		for i, ft := range feet {
			f = max(f, band(i).Use(ft.Distance))
		}
		if math.IsNaN(f) || math.IsInf(f, 0) {
			return 0, ErrNonFinite
		}
		return f, nil
	}
	k := opts.freedoms()
	m := start
	feet := startFeet(o, m, pts, opts)
	F, err := usage(feet)
	if err != nil {
		return Result{}, err
	}
	trial := make([]Foot, len(pts))
	var lin linearisation
	linearise(m, pts, feet, k, &lin)
	L := lin.length
	// Start with a region about as large as the largest distance: the
	// start is meant to be the least-squares fit, which the zone fit moves
	// by about that much.
	var dmax float64
	for _, f := range feet {
		dmax = max(dmax, math.Abs(f.Distance))
	}
	delta := min(max(2*dmax, 1e-9*L), 0.05*L)
	res := Result{}
	var prog chebyshev
	for res.Iterations < opts.maxIterations() {
		if F == 0 {
			res.Converged = true
			break
		}
		res.Iterations++
		linearise(m, pts, feet, k, &lin)
		u, z, err := prog.solve(&lin, feet, band, delta)
		if err != nil {
			return Result{}, err
		}
		pred := F - z
		if !(pred > 1e-13*F) {
			res.Converged = true
			break
		}
		next := lin.apply(m, u)
		var near []Foot
		if normInf(u) <= trackReach*L {
			near = feet
		}
		feetNear(o, next, pts, near, trial)
		F2, err := usage(trial)
		if err != nil {
			return Result{}, err
		}
		rho := (F - F2) / pred
		step := normInf(u)
		if F2 < F {
			m, F = next, F2
			feet, trial = trial, feet
		}
		switch {
		case rho < 0.25:
			delta = 0.25 * step
		case rho > 0.75 && step >= 0.99*delta:
			delta = min(2*delta, 0.05*L)
		}
		if delta < 1e-14*L {
			res.Converged = true
			break
		}
	}
	// The result's feet are found afresh, not tracked.
	feet = Feet(o, m, pts)
	if F, err = usage(feet); err != nil {
		return Result{}, err
	}
	res.Motion, res.Feet, res.Objective = m, feet, F
	return res, nil
}

// chebyshev builds and solves the linear program of one step of
// MinimumZone, keeping its storage between steps.
type chebyshev struct {
	prog *linProg
	row  []float64
	keep []int
	hi   []float64 // the largest use each point of keep can reach in the box
}

// solve returns the step u (scaled) and the linearised largest use z of
// the program of MinimumZone in the box |uⱼ| ≤ delta.
//
// Only the points that can bind within the box take part (see below),
// and of those the program is solved on a working set that grows: first
// the points with the largest possible use, then, after each solve, the
// points whose use at the step exceeds the set's optimum, until none
// does. The optimum of the set is a lower bound of the whole program's
// and its step is feasible for all of it, so the last step is the
// program's optimum.
func (c *chebyshev) solve(lin *linearisation, feet []Foot, band func(int) Band, delta float64) ([]float64, float64, error) {
	k := lin.k
	n := k + 1 // u and z
	if c.prog == nil || c.prog.n != n {
		cost := make([]float64, n)
		cost[k] = 1
		c.prog = newLinProg(n, cost)
		c.row = make([]float64, n)
	}
	// Within the box a point's linearised use lies in [lo, hi]; the
	// optimum is at least the largest lo, so a point whose hi falls short
	// of it can never bind.
	var lb float64
	for i, f := range feet {
		b := band(i)
		rho := delta * sumAbs(lin.rows[i*k:(i+1)*k])
		lb = max(lb, max(math.Abs(f.Distance-b.Centre)-rho, 0)/b.Half)
	}
	c.keep = c.keep[:0]
	c.hi = c.hi[:0]
	for i, f := range feet {
		b := band(i)
		rho := delta * sumAbs(lin.rows[i*k:(i+1)*k])
		if hi := (math.Abs(f.Distance-b.Centre) + rho) / b.Half; hi >= lb*(1-1e-12) {
			c.keep = append(c.keep, i)
			c.hi = append(c.hi, hi)
		}
	}
	use := func(i int, u []float64) float64 {
		b := band(i)
		return math.Abs(feet[i].Distance-b.Centre+dot(lin.rows[i*k:(i+1)*k], u)) / b.Half
	}
	// The first working set: the points of largest possible use.
	set := make([]int, 0, min(len(c.keep), 2*workingSet))
	for _, j := range largest(c.hi, workingSet) {
		set = append(set, c.keep[j])
	}
	in := make(map[int]bool, len(set))
	for _, i := range set {
		in[i] = true
	}
	for {
		u, z, err := c.solveSet(lin, feet, band, delta, set)
		if err != nil {
			return nil, 0, err
		}
		var over []int
		var overUse []float64
		for _, i := range c.keep {
			if in[i] {
				continue
			}
			if v := use(i, u); v > z*(1+1e-12)+1e-300 {
				over, overUse = append(over, i), append(overUse, v)
			}
		}
		if len(over) == 0 {
			return u, z, nil
		}
		for _, j := range largest(overUse, workingSet) {
			set = append(set, over[j])
			in[over[j]] = true
		}
	}
}

// workingSet is the number of points the working set of the zone fit's
// program starts with, and the most it grows by in one round.
const workingSet = 256

// solveSet solves the program of one step over the points in set.
func (c *chebyshev) solveSet(lin *linearisation, feet []Foot, band func(int) Band, delta float64, set []int) ([]float64, float64, error) {
	k := lin.k
	n := k + 1
	p := c.prog
	p.reset()
	// Box rows first: the start vertex has every uⱼ at −delta.
	for j := range k {
		clear(c.row)
		c.row[j] = -1
		p.add(c.row, delta)
	}
	for j := range k {
		clear(c.row)
		c.row[j] = 1
		p.add(c.row, delta)
	}
	u := make([]float64, n)
	for j := range k {
		u[j] = -delta
	}
	enter, zmax := -1, math.Inf(-1)
	for _, i := range set {
		b := band(i)
		g := lin.rows[i*k : (i+1)*k]
		r := feet[i].Distance - b.Centre
		for _, sgn := range [2]float64{1, -1} {
			// sgn·(r + g·u) − h·z ≤ 0
			for j := range k {
				c.row[j] = sgn * g[j]
			}
			c.row[k] = -b.Half
			idx := p.add(c.row, -sgn*r)
			if z := sgn * (r + dot(g, u[:k])) / b.Half; z > zmax {
				enter, zmax = idx, z
			}
		}
	}
	u[k] = zmax
	work := make([]int, n)
	for j := range k {
		work[j] = j
	}
	work[k] = enter
	if _, err := p.solve(u, work); err != nil {
		return nil, 0, err
	}
	return u[:k], u[k], nil
}

// largest returns the indices of the k largest of vs (all of them when
// there are no more than k), largest first, ties by index: a bounded
// min-heap, O(n log k).
func largest(vs []float64, k int) []int {
	if len(vs) <= k {
		idx := make([]int, len(vs))
		for i := range idx {
			idx[i] = i
		}
		sort.SliceStable(idx, func(a, b int) bool { return vs[idx[a]] > vs[idx[b]] })
		return idx
	}
	// below reports whether entry a ranks below entry b.
	below := func(a, b int) bool { return vs[a] < vs[b] || vs[a] == vs[b] && a > b }
	h := make([]int, 0, k)
	down := func(i int) {
		for {
			l, m := 2*i+1, i
			if l < len(h) && below(h[l], h[m]) {
				m = l
			}
			if r := l + 1; r < len(h) && below(h[r], h[m]) {
				m = r
			}
			if m == i {
				return
			}
			h[i], h[m] = h[m], h[i]
			i = m
		}
	}
	for i := range vs {
		switch {
		case len(h) < k:
			h = append(h, i)
			for j := len(h) - 1; j > 0; {
				p := (j - 1) / 2
				if !below(h[j], h[p]) {
					break
				}
				h[j], h[p] = h[p], h[j]
				j = p
			}
		case below(h[0], i):
			h[0] = i
			down(0)
		}
	}
	sort.Slice(h, func(a, b int) bool { return below(h[b], h[a]) })
	return h
}

func sumAbs(v []float64) float64 {
	var s float64
	for _, x := range v {
		s += math.Abs(x)
	}
	return s
}
