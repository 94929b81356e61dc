// Package sourcepanel implements the source panel method of Hess and Smith
// for the non-lifting, inviscid, incompressible flow about a closed body.
//
// The surface is divided into flat panels between the nodes, each carrying a
// source of constant strength λ per unit length. The normal velocity is zero
// at the midpoint (control point) of every panel; a panel's own contribution
// there is λ/2 on the outer side. No vorticity is present, so the method
// produces no circulation and no lift: the lift it reports, from integrating
// the pressure, is a discretisation figure that vanishes as panels are added.
//
// References:
//
//	Hess, J. L. and Smith, A. M. O., Calculation of potential flow about
//	arbitrary bodies, Progress in Aerospace Sciences 8 (1967) 1–138.
//
// # Conventions
//
// Nodes follow the node order of package geometry (see geometry/doc.go),
// counter-clockwise, and must close: the first and last node coincide (to
// analyse a blunt trailing edge, append the first node to close the gap with
// a base panel). Any closed body works; force coefficients use a unit
// reference length and Cm is about (0.25, 0), positive nose-up, as for a
// section in the normalised frame. The free stream is (cos α, sin α), α in
// radians, V∞ = 1. Cp = 1 − (V/V∞)². Results are given at the control points.
//
// # Closure
//
// For a closed body the sources must add up to nothing, Σ λᵢ sᵢ = 0. Every
// case reports the closure Σ λᵢ sᵢ / Σ |λᵢ| sᵢ and warns when it exceeds
// ClosureTolerance.
package sourcepanel

import (
	"fmt"
	"math"
	"sync"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"gonum.org/v1/gonum/mat"
)

// ClosureTolerance is the closure |Σ λᵢ sᵢ| / Σ |λᵢ| sᵢ above which a case
// carries a warning. The closure falls like 1/N on smooth sections: a
// cosine-spaced NACA 0012 gives 8e-4 at 100 panels and 4e-4 at 200, a
// NACA 2412 4e-4 and 2e-4, a circle 1e-16 by symmetry. Values above 1e-2
// point to a coarse, badly panelled or nearly self-touching contour.
const ClosureTolerance = 1e-2

// MaxCondition is the largest condition number (mat.LU.Cond) of the
// influence matrix that New accepts.
const MaxCondition = 1e12

// Solver holds the panels of a closed body and its factored influence
// matrix. It is safe for concurrent use.
type Solver struct {
	nodes             []geometry.Point
	n                 int
	x0, y0, tx, ty, s []float64 // per panel: start, unit tangent, length
	cx, cy            []float64 // control points
	tan               []float64 // tangential influence, n×n, row-major
	lu                mat.LU
	cond              float64
	centroid          geometry.Point
	mu                sync.Mutex
	timings           Timings
}

// New checks the nodes, builds the influence matrix and factors it. The
// nodes are copied. It returns an error wrapping ErrTooFewNodes,
// ErrNonFinite, ErrRepeatedNode, ErrCrossing, ErrClockwise or ErrOpenContour
// for bad nodes, and a *ConditionError for an ill-conditioned matrix.
func New(nodes []geometry.Point) (*Solver, error) {
	closed, err := checkNodes(nodes)
	if err != nil {
		return nil, err
	}
	if !closed {
		return nil, fmt.Errorf("sourcepanel: %w: first and last node are %g apart", ErrOpenContour, nodes[0].Dist(nodes[len(nodes)-1]))
	}
	t0 := time.Now()
	n := len(nodes) - 1
	sv := &Solver{nodes: append([]geometry.Point(nil), nodes...), n: n}
	sv.x0, sv.y0, sv.tx, sv.ty, sv.s = make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	sv.cx, sv.cy = make([]float64, n), make([]float64, n)
	for j := range n {
		a, b := nodes[j], nodes[j+1]
		d := b.Sub(a)
		l := d.Norm()
		sv.x0[j], sv.y0[j], sv.tx[j], sv.ty[j], sv.s[j] = a.X, a.Y, d.X/l, d.Y/l, l
		sv.cx[j], sv.cy[j] = a.X+0.5*d.X, a.Y+0.5*d.Y
	}
	sv.centroid = spCentroid(nodes[:n])
	a := sv.build()
	t1 := time.Now()
	sv.lu.Factorize(a)
	sv.cond = sv.lu.Cond()
	t2 := time.Now()
	sv.timings = Timings{Build: t1.Sub(t0), Factor: t2.Sub(t1)}
	if !(sv.cond <= MaxCondition) {
		return nil, &ConditionError{Solver: pkgName, Cond: sv.cond, Max: MaxCondition}
	}
	return sv, nil
}

// build returns the normal-velocity influence matrix and fills the
// tangential one: entry (i, j) is the velocity at control point i, along the
// outward normal (or the tangent) of panel i, due to unit λ on panel j.
func (sv *Solver) build() *mat.Dense {
	const inv2pi = 1 / (2 * math.Pi)
	n := sv.n
	norm := make([]float64, n*n)
	sv.tan = make([]float64, n*n)
	for i := range n {
		nx, ny := sv.ty[i], -sv.tx[i]
		for j := range n {
			if i == j {
				norm[i*n+j] = 0.5 // the panel's own contribution, outer side
				continue          // and no tangential velocity at its midpoint
			}
			_, _, beta, lnr := sv.local(j, sv.cx[i], sv.cy[i])
			u, v := lnr*inv2pi, beta*inv2pi
			// Global velocity u·t_j + v·nL_j, nL_j = (−ty, tx).
			vx := u*sv.tx[j] - v*sv.ty[j]
			vy := u*sv.ty[j] + v*sv.tx[j]
			norm[i*n+j] = vx*nx + vy*ny
			sv.tan[i*n+j] = vx*sv.tx[i] + vy*sv.ty[i]
		}
	}
	return mat.NewDense(n, n, norm)
}

// local returns the coordinates of (px, py) in the frame of panel j (x along
// the panel, y along its left-hand normal, into the body), the angle β the
// panel subtends at the point and ln(r₁/r₂).
func (sv *Solver) local(j int, px, py float64) (x, y, beta, lnr float64) {
	s := sv.s[j]
	dx, dy := px-sv.x0[j], py-sv.y0[j]
	x = dx*sv.tx[j] + dy*sv.ty[j]
	y = -dx*sv.ty[j] + dy*sv.tx[j]
	xs := x - s
	beta = math.Atan2(y*s, x*xs+y*y)
	lnr = 0.5 * math.Log((x*x+y*y)/(xs*xs+y*y))
	return x, y, beta, lnr
}

// ControlPoints returns the panel midpoints, where the results are given.
func (sv *Solver) ControlPoints() []geometry.Point {
	pts := make([]geometry.Point, sv.n)
	for i := range pts {
		pts[i] = geometry.Point{X: sv.cx[i], Y: sv.cy[i]}
	}
	return pts
}

// Cond returns the condition number estimate of the influence matrix.
func (sv *Solver) Cond() float64 { return sv.cond }

// Timings returns the build and factor times and the time of the last Solve.
func (sv *Solver) Timings() Timings {
	sv.mu.Lock()
	defer sv.mu.Unlock()
	return sv.timings
}

// Case is the solution at one angle of attack; per-panel slices follow the
// panels (panel k joins nodes k and k+1; its control point is its midpoint).
type Case struct {
	Alpha     float64   // radians
	Vt        []float64 // tangential velocity Vt/V∞ along the node direction
	Cp        []float64 // 1 − Vt²
	Strengths []float64 // source strength λ per unit length, per panel
	// Closure is Σ λᵢ sᵢ / Σ |λᵢ| sᵢ, zero for an exactly closed source sum.
	Closure    float64
	Cl         float64 // from integrating the pressure; zero in the limit
	CdPressure float64 // pressure drag; zero in exact potential flow
	Cm         float64 // about (0.25, 0), positive nose-up
	Warnings   []string

	sv *Solver
}

// Solve returns the solution at each angle (radians), from the α = 0 and
// α = 90° solutions of the factored system. It returns an error wrapping
// ErrNonFinite or ErrAlphaRange for a bad angle.
func (sv *Solver) Solve(alphas []float64) ([]Case, error) {
	if err := checkAlphas(alphas); err != nil {
		return nil, err
	}
	t0 := time.Now()
	n := sv.n
	b := mat.NewDense(n, 2, nil)
	for i := range n {
		b.Set(i, 0, -sv.ty[i])
		b.Set(i, 1, sv.tx[i])
	}
	var x mat.Dense
	if err := sv.lu.SolveTo(&x, false, b); err != nil {
		return nil, &ConditionError{Solver: pkgName, Cond: sv.cond, Max: MaxCondition}
	}
	cases := make([]Case, len(alphas))
	for k, alpha := range alphas {
		sa, ca := math.Sincos(alpha)
		c := Case{Alpha: alpha, Vt: make([]float64, n), Cp: make([]float64, n), Strengths: make([]float64, n), sv: sv}
		var sum, abs float64
		for j := range n {
			c.Strengths[j] = ca*x.At(j, 0) + sa*x.At(j, 1)
			sum += c.Strengths[j] * sv.s[j]
			abs += math.Abs(c.Strengths[j]) * sv.s[j]
		}
		if abs > 0 {
			c.Closure = sum / abs
		}
		if math.Abs(c.Closure) > ClosureTolerance {
			c.Warnings = append(c.Warnings, fmt.Sprintf("source sum does not close: Σλs/Σ|λ|s = %.3g exceeds %.3g", c.Closure, ClosureTolerance))
		}
		var fx, fy, cm float64
		for i := range n {
			vt := ca*sv.tx[i] + sa*sv.ty[i]
			row := sv.tan[i*n : (i+1)*n]
			for j, l := range c.Strengths {
				vt += row[j] * l
			}
			c.Vt[i], c.Cp[i] = vt, 1-vt*vt
			s, nx, ny := sv.s[i], sv.ty[i], -sv.tx[i]
			fx -= c.Cp[i] * s * nx
			fy -= c.Cp[i] * s * ny
			rx, ry := sv.x0[i]-0.25, sv.y0[i]
			cm += c.Cp[i] * ((rx*ny-ry*nx)*s - s*s/2)
		}
		c.Cl = fy*ca - fx*sa
		c.CdPressure = fx*ca + fy*sa
		c.Cm = cm
		cases[k] = c
	}
	sv.mu.Lock()
	sv.timings.Solve = time.Since(t0)
	sv.mu.Unlock()
	return cases, nil
}

// FieldPoint is the flow at one point off the body.
type FieldPoint struct {
	Velocity geometry.Point // V/V∞
	Cp       float64        // 1 − (V/V∞)²
	// StreamFunction is ψ/(V∞ L); only differences carry meaning, and the
	// body surface is a streamline. Each source's angle is measured relative
	// to the direction from the body's area centroid, so ψ is single-valued
	// outside any body that is star-shaped about its centroid.
	StreamFunction float64
}

// Field returns the velocity, pressure coefficient and stream function of
// case c at each point. It returns an error wrapping ErrInside for a point
// inside the body and ErrNonFinite for a point that is not finite. Points on
// the surface are singular; keep them a fraction of a panel length away.
func (c *Case) Field(pts []geometry.Point) ([]FieldPoint, error) {
	const inv2pi = 1 / (2 * math.Pi)
	sv := c.sv
	loop := sv.nodes[:sv.n]
	out := make([]FieldPoint, len(pts))
	sa, ca := math.Sincos(c.Alpha)
	var total float64
	for j, l := range c.Strengths {
		total += l * sv.s[j]
	}
	for k, p := range pts {
		if !p.IsFinite() {
			return nil, fmt.Errorf("sourcepanel: %w: field point %d is (%g, %g)", ErrNonFinite, k, p.X, p.Y)
		}
		if geometry.InsideLoop(loop, p) {
			return nil, fmt.Errorf("sourcepanel: %w: field point %d (%g, %g)", ErrInside, k, p.X, p.Y)
		}
		u, v := ca, sa
		psi := p.Y*ca - p.X*sa
		ref := math.Atan2(p.Y-sv.centroid.Y, p.X-sv.centroid.X)
		for j, l := range c.Strengths {
			x, y, beta, lnr := sv.local(j, p.X, p.Y)
			s := sv.s[j]
			lu, lv := l*lnr*inv2pi, l*beta*inv2pi
			u += lu*sv.tx[j] - lv*sv.ty[j]
			v += lu*sv.ty[j] + lv*sv.tx[j]
			// ∫ θ dξ with θ the local angle atan2(y, x − ξ), continuous
			// along the panel; then shifted to the angle of (p − ξ)
			// relative to (p − centroid), in (−π, π].
			th1, th2 := math.Atan2(y, x), math.Atan2(y, x-s)
			kl := x*th1 - (x-s)*th2 + y*lnr
			thp := math.Atan2(sv.ty[j], sv.tx[j])
			mid := math.Atan2(y, x-s/2) + thp - ref
			shift := thp - ref - 2*math.Pi*math.Round(mid/(2*math.Pi))
			psi += l * (kl + s*shift) * inv2pi
		}
		psi += total * ref * inv2pi
		out[k] = FieldPoint{Velocity: geometry.Point{X: u, Y: v}, Cp: 1 - u*u - v*v, StreamFunction: psi}
	}
	return out, nil
}

// spCentroid returns the area centroid of the closed polygon pts.
func spCentroid(pts []geometry.Point) geometry.Point {
	var a, cx, cy float64
	m := len(pts)
	for k := range m {
		p, q := pts[k], pts[(k+1)%m]
		w := p.X*q.Y - q.X*p.Y
		a += w
		cx += (p.X + q.X) * w
		cy += (p.Y + q.Y) * w
	}
	return geometry.Point{X: cx / (3 * a), Y: cy / (3 * a)}
}
