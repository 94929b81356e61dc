package align

import (
	"fmt"
	"math"

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
// largest lower bound of any other). The step is taken when the true F
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
	feet := Feet(o, m, pts)
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
		feetInto(o, next, pts, trial)
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
	res.Motion, res.Feet, res.Objective = m, feet, F
	return res, nil
}

// chebyshev builds and solves the linear program of one step of
// MinimumZone, keeping its storage between steps.
type chebyshev struct {
	prog *linProg
	row  []float64
	keep []int
}

// solve returns the step u (scaled) and the linearised largest use z of
// the program of MinimumZone in the box |uⱼ| ≤ delta.
func (c *chebyshev) solve(lin *linearisation, feet []Foot, band func(int) Band, delta float64) ([]float64, float64, error) {
	k := lin.k
	n := k + 1 // u and z
	if c.prog == nil || c.prog.n != n {
		cost := make([]float64, n)
		cost[k] = 1
		c.prog = newLinProg(n, cost)
		c.row = make([]float64, n)
	}
	p := c.prog
	p.reset()
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
	for i, f := range feet {
		b := band(i)
		rho := delta * sumAbs(lin.rows[i*k:(i+1)*k])
		if (math.Abs(f.Distance-b.Centre)+rho)/b.Half >= lb*(1-1e-12) {
			c.keep = append(c.keep, i)
		}
	}
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
	for _, i := range c.keep {
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

func sumAbs(v []float64) float64 {
	var s float64
	for _, x := range v {
		s += math.Abs(x)
	}
	return s
}
