package vortexpanel

import (
	"math"
	"runtime"
	"sync"
	"time"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/dense"
	"github.com/foilwright/foilwright/internal/par"
)

// MaxCondition is the largest condition number (∞-norm estimate of the LU
// factorisation, dense.LU.Cond) of the influence matrix that New accepts. Well
// panelled sections give 1e2–1e5; near 1e12 only about four significant
// digits of the solution survive rounding.
const MaxCondition = 1e12

// CuspAngle is the angle (radians) between the two trailing-edge panels of
// a sharp trailing edge below which the edge is treated as a cusp: see the
// package documentation. It is 2°.
const CuspAngle = 2 * math.Pi / 180

// Solver holds a section's panels and the solutions for α = 0 and α = 90°,
// of which every angle's is a combination. It is safe for concurrent use.
type Solver struct {
	nodes []geometry.Point
	n     int  // panels along the surface
	blunt bool // base panel with a source at index n
	cusp  bool
	// Per panel (and the base panel at index n if blunt): start point, unit
	// tangent, length and its reciprocal.
	x0, y0, tx, ty, s, inv []float64
	arc                    []float64 // arc length from node 0 to each node
	arr                    panelArrays
	gap                    float64   // base panel length (0 for a sharp TE)
	base                   []float64 // solutions for α = 0 and 90°, row-major m×2
	forms                  sweepForms
	cond                   float64

	mu      sync.Mutex
	timings Timings
}

// New checks the nodes, builds the influence matrix and factors it. The nodes
// are copied. New returns an error wrapping ErrTooFewNodes, ErrNonFinite,
// ErrRepeatedNode, ErrCrossing or ErrClockwise for bad nodes, and a
// *ConditionError if the matrix is ill-conditioned.
func New(nodes []geometry.Point) (*Solver, error) {
	sharp, err := checkNodes(nodes)
	if err != nil {
		return nil, err
	}
	t0 := time.Now()
	sv := &Solver{nodes: append([]geometry.Point(nil), nodes...), n: len(nodes) - 1, blunt: !sharp}
	sv.panels()
	if !sv.blunt {
		cosTE := -(sv.tx[0]*sv.tx[sv.n-1] + sv.ty[0]*sv.ty[sv.n-1])
		sv.cusp = cosTE > math.Cos(CuspAngle)
	}
	a := sv.build(buildWorkers(sv.n))
	t1 := time.Now()
	// The factors serve only the two right-hand sides (solved while the
	// condition number is estimated): the matrix goes back to the pool at
	// once.
	var lu dense.LU
	sv.base = sv.rhs()
	err2 := lu.FactorizeSolve(sv.size(), a, sv.base, 2)
	sv.cond = lu.Cond()
	if sv.cond <= MaxCondition && err2 == nil {
		sv.forms = sv.sweepForms()
	}
	putMatrix(&a)
	t2 := time.Now()
	sv.timings = Timings{Build: t1.Sub(t0), Factor: t2.Sub(t1)}
	if !(sv.cond <= MaxCondition) || err2 != nil {
		return nil, &ConditionError{Solver: pkgName, Cond: sv.cond, Max: MaxCondition}
	}
	return sv, nil
}

// Nodes returns a copy of the section's nodes.
func (sv *Solver) Nodes() []geometry.Point { return append([]geometry.Point(nil), sv.nodes...) }

// Blunt reports whether the trailing edge is blunt (first and last node differ).
func (sv *Solver) Blunt() bool { return sv.blunt }

// Cond returns the condition number estimate of the influence matrix.
func (sv *Solver) Cond() float64 { return sv.cond }

// Timings returns the build and factor times and the time of the last Solve.
func (sv *Solver) Timings() Timings {
	sv.mu.Lock()
	defer sv.mu.Unlock()
	return sv.timings
}

// panels fills the per-panel geometry.
func (sv *Solver) panels() {
	m := sv.n
	if sv.blunt {
		m++
	}
	sv.x0, sv.y0 = make([]float64, m), make([]float64, m)
	sv.tx, sv.ty, sv.s, sv.inv = make([]float64, m), make([]float64, m), make([]float64, m), make([]float64, m)
	sv.arc = make([]float64, sv.n+1)
	for j := range m {
		a, b := sv.nodes[j], sv.nodes[(j+1)%(sv.n+1)]
		if j == sv.n { // base panel: last node to first
			a, b = sv.nodes[sv.n], sv.nodes[0]
		}
		d := b.Sub(a)
		l := d.Norm()
		sv.x0[j], sv.y0[j], sv.tx[j], sv.ty[j], sv.s[j], sv.inv[j] = a.X, a.Y, d.X/l, d.Y/l, l, 1/l
		if j < sv.n {
			sv.arc[j+1] = sv.arc[j] + l
		} else {
			sv.gap = l
		}
	}
	sv.arr = panelArrays{x0: sv.x0, y0: sv.y0, tx: sv.tx, ty: sv.ty, s: sv.s, inv: sv.inv}
}

// size returns the order of the linear system.
func (sv *Solver) size() int {
	if sv.blunt {
		return sv.n + 2
	}
	return sv.n + 1
}

// mid returns the midpoint of panel j.
func (sv *Solver) mid(j int) (x, y float64) {
	return sv.x0[j] + 0.5*sv.s[j]*sv.tx[j], sv.y0[j] + 0.5*sv.s[j]*sv.ty[j]
}

// parallelMinResults is the number of angles times unknowns from which
// Solve shares the per-angle results out between goroutines.
const parallelMinResults = 2000

// parallelMinPanels is the panel count from which the matrix build is split
// across goroutines. Measured with the assembly rows on the two cores of the
// development machine, shared with other jobs: at 64 panels splitting broke
// even (50 µs), at 100 it gave 77 µs against 104–115 µs on one goroutine,
// at 200 310–350 µs against 450 µs.
const parallelMinPanels = 100

// buildWorkers returns the number of goroutines for the build of a
// section of n panels.
func buildWorkers(n int) int {
	if n < parallelMinPanels {
		return 1
	}
	return runtime.GOMAXPROCS(0)
}

// build returns the influence matrix. Row i < n is the normal velocity at
// the midpoint of panel i, row n the Kutta condition and, for a blunt
// trailing edge, row n+1 the normal velocity at the base panel's midpoint.
// Columns 0…n are the node strengths γ, column n+1 the base source σ. The
// matrix is returned row-major, every entry written (it may be recycled).
func (sv *Solver) build(workers int) []float64 {
	m := sv.size()
	data := getMatrix(m * m)
	rows := sv.n
	if sv.blunt {
		rows++
	}
	// Rows in batches that the goroutines take in turn.
	const batch = 8
	scratch := make([]rowScratch, max(workers, 1))
	par.For((rows+batch-1)/batch, workers, func(w, b int) {
		for i := b * batch; i < min((b+1)*batch, rows); i++ {
			r := i
			if i == sv.n { // the base row comes after the Kutta row
				r = sv.n + 1
			}
			sv.fillRow(data[r*m:(r+1)*m], i, &scratch[w])
		}
	})
	kutta := data[sv.n*m : (sv.n+1)*m]
	clear(kutta)
	kutta[0], kutta[sv.n] = 1, 1
	if sv.cusp { // replace the two trailing-edge collocation rows by extrapolation
		n := sv.n
		r0 := data[0:m]
		clear(r0)
		q := sv.s[0] / sv.s[1]
		r0[0], r0[1], r0[2] = 1, -(1 + q), q
		r1 := data[(n-1)*m : n*m]
		clear(r1)
		q = sv.s[n-1] / sv.s[n-2]
		r1[n], r1[n-1], r1[n-2] = 1, -(1 + q), q
	}
	return data
}

// panelArrays are the per-panel arrays the assembly row reads, in this
// order (influence_amd64.s relies on it): start point, unit tangent,
// length, reciprocal of the length.
type panelArrays struct {
	x0, y0, tx, ty, s, inv []float64
}

// useAsm selects the assembly build where the CPU has AVX2 and FMA, and
// use512 its eight-lane row where the CPU has AVX-512; tests turn them off
// to compare with the Go formulas and the four-lane row.
var useAsm, use512 = haveAVX2, haveAVX512

// rowScratch holds fillRow's arrays for one goroutine: the coefficients
// and the assembly's scratch.
type rowScratch struct {
	ca, cb, w []float64
}

// fillRow writes the normal-velocity influence of every panel at the
// midpoint of panel i (the base panel when i == n) into row, every entry.
func (sv *Solver) fillRow(row []float64, i int, w *rowScratch) {
	const inv2pi = 1 / (2 * math.Pi)
	px, py := sv.mid(i)
	// Outward normal of panel i: the right-hand normal of its direction.
	nx, ny := sv.ty[i], -sv.tx[i]
	n := sv.n
	done := 0
	if useAsm && n >= 4 {
		// Four panels at a time: row[j] gets ca[j] + cb[j−1]; the
		// panel's own midpoint and the last n%4 panels follow below.
		done = n &^ 3
		if cap(w.ca) < done {
			w.ca, w.cb, w.w = make([]float64, done), make([]float64, done), make([]float64, 5*done)
		}
		ca, cb := w.ca[:done], w.cb[:done]
		p := [4]float64{px, py, nx, ny}
		if d8 := n &^ 7; use512 && d8 > 0 {
			// Eight panels at a time, and four more if n%8 ≥ 4.
			vortexRow512(ca[:d8], cb[:d8], &sv.arr, &p, w.w[:5*d8])
			if d8 < done {
				a := &sv.arr
				tail := panelArrays{a.x0[d8:], a.y0[d8:], a.tx[d8:], a.ty[d8:], a.s[d8:], a.inv[d8:]}
				vortexRowAsm(ca[d8:], cb[d8:], &tail, &p, w.w[:5*(done-d8)])
			}
		} else {
			vortexRowAsm(ca, cb, &sv.arr, &p, w.w[:5*done])
		}
		if i < done {
			ca[i], cb[i] = sv.coeffs(i, px, py, nx, ny, true)
		}
		// Entries 0…done are written here, the rest cleared for the
		// panels below to add to (and the base column written last).
		out := row[:done+1]
		out[0] = ca[0]
		for j := 1; j < done; j++ {
			out[j] = ca[j] + cb[j-1]
		}
		out[done] = cb[done-1]
		clear(row[done+1:])
	} else {
		clear(row)
	}
	for j := done; j < n; j++ {
		a, b := sv.coeffs(j, px, py, nx, ny, i == j)
		row[j] += a
		row[j+1] += b
	}
	if sv.blunt {
		j := sv.n
		if i == j {
			row[sv.n+1] = 0.5 // own contribution σ/2 on the outer side
			return
		}
		_, _, beta, lnr := sv.local(j, px, py, false)
		u, v := lnr*inv2pi, beta*inv2pi
		tn := sv.tx[j]*nx + sv.ty[j]*ny
		ln := -sv.ty[j]*nx + sv.tx[j]*ny
		row[sv.n+1] = u*tn + v*ln
	}
}

// coeffs returns the coefficients of the node strengths γ_j and γ_j+1 of
// panel j in the velocity at (px, py) normal to (nx, ny); self marks panel
// j's own midpoint.
func (sv *Solver) coeffs(j int, px, py, nx, ny float64, self bool) (a, b float64) {
	const inv2pi = 1 / (2 * math.Pi)
	x, y, beta, lnr := sv.local(j, px, py, self)
	s := sv.s[j]
	i1u := x*beta - y*lnr
	i1v := x*lnr - s + y*beta
	// Multiplied by 1/s rather than divided by s: two divisions fewer
	// per entry, the build's dearest operation after the angle and the
	// logarithm.
	u1, v1 := i1u*sv.inv[j], i1v*sv.inv[j]
	ua, ub := -(beta-u1)*inv2pi, -u1*inv2pi
	va, vb := (lnr-v1)*inv2pi, v1*inv2pi
	// Global velocity u·t + v·nL projected on n: t·n and nL·n = −t·n_perp.
	tn := sv.tx[j]*nx + sv.ty[j]*ny
	ln := -sv.ty[j]*nx + sv.tx[j]*ny
	return ua*tn + va*ln, ub*tn + vb*ln
}

// local returns the coordinates of (px, py) in the frame of panel j (x along
// the panel from its start, y along its left-hand normal, into the body),
// the angle β the panel subtends at the point and ln(r₁/r₂), the log of the
// ratio of the distances to the panel's ends. self marks the panel's own
// midpoint, where y = 0 and β is taken as π.
func (sv *Solver) local(j int, px, py float64, self bool) (x, y, beta, lnr float64) {
	s := sv.s[j]
	if self {
		return s / 2, 0, math.Pi, 0
	}
	dx, dy := px-sv.x0[j], py-sv.y0[j]
	x = dx*sv.tx[j] + dy*sv.ty[j]
	y = -dx*sv.ty[j] + dy*sv.tx[j]
	xs := x - s
	r1, r2 := x*x+y*y, xs*xs+y*y
	beta = angle(y*s, x*xs+y*y)
	lnr = 0.5 * math.Log(r1/r2)
	return x, y, beta, lnr
}

// Stagnation is the front stagnation point: where γ changes sign from
// negative (upper surface flow) to positive between two nodes, found by
// linear interpolation. When several sign changes exist, the one with the
// steepest change is taken.
type Stagnation struct {
	X, Y  float64 // position
	S     float64 // arc length from node 0 along the nodes
	Panel int     // panel k joins nodes k and k+1; −1 if none was found
}

// Case is the solution at one angle of attack. Per-node slices have one
// entry per node, in node order.
type Case struct {
	Alpha float64 // angle of attack, radians

	// Gamma is the vortex strength at each node, which is the surface
	// velocity along the contour (node direction), Vt/V∞.
	Gamma []float64
	// Cp = 1 − γ² at each node.
	Cp []float64

	Cl         float64 // from the circulation, Kutta–Joukowski: Cl = 2Γ/(V∞ c)
	ClPressure float64 // from integrating the surface pressure
	ClDiff     float64 // Cl − ClPressure, a self-check
	CdPressure float64 // pressure drag; zero in exact potential flow
	Cm         float64 // about the quarter chord from the surface pressure, positive nose-up

	Stagnation Stagnation

	// BaseSource is the source strength σ on the base panel of a blunt
	// trailing edge (0 for a sharp one); σ·gap is the body's net outflow.
	BaseSource float64

	sv *Solver
	x0 []float64 // full solution vector
}

// Solve returns the solution at each angle of attack (radians) by
// superposition of the α = 0 and α = 90° solutions New computed.
// It returns an error wrapping ErrNonFinite or ErrAlphaRange for a bad angle.
func (sv *Solver) Solve(alphas []float64) ([]Case, error) {
	if err := checkAlphas(alphas); err != nil {
		return nil, err
	}
	t0 := time.Now()
	m := sv.size()
	b := sv.base
	cases := make([]Case, len(alphas))
	// One allocation each for the solutions and the pressures of all angles.
	vs := make([]float64, m*len(alphas))
	cps := make([]float64, (sv.n+1)*len(alphas))
	work := func(lo, hi int) {
		for k := lo; k < hi; k++ {
			alpha := alphas[k]
			sa, ca := math.Sincos(alpha)
			v := vs[k*m : (k+1)*m : (k+1)*m]
			for i := range v {
				v[i] = ca*b[2*i] + sa*b[2*i+1]
			}
			cases[k] = sv.result(alpha, v, cps[k*(sv.n+1):(k+1)*(sv.n+1):(k+1)*(sv.n+1)])
		}
	}
	workers := 1
	if len(alphas)*m >= parallelMinResults {
		workers = runtime.GOMAXPROCS(0)
	}
	// Angles in batches of four that the goroutines take in turn.
	par.For((len(alphas)+3)/4, workers, func(_, b int) {
		work(4*b, min(4*b+4, len(alphas)))
	})
	sv.mu.Lock()
	sv.timings.Solve = time.Since(t0)
	sv.mu.Unlock()
	return cases, nil
}

// rhs returns the right-hand sides for α = 0 and α = 90°, row-major m×2.
func (sv *Solver) rhs() []float64 {
	b := make([]float64, 2*sv.size())
	for i := range sv.n {
		b[2*i] = -sv.ty[i]  // −V∞·n with n = (ty, −tx), V∞ = (1, 0)
		b[2*i+1] = sv.tx[i] // V∞ = (0, 1)
	}
	if sv.cusp {
		b[0], b[1] = 0, 0
		b[2*(sv.n-1)], b[2*(sv.n-1)+1] = 0, 0
	}
	if sv.blunt {
		b[2*(sv.n+1)] = -sv.ty[sv.n]
		b[2*(sv.n+1)+1] = sv.tx[sv.n]
	}
	return b
}

// result computes the coefficients of one case from its solution vector,
// with cp (n+1 entries) to hold the pressure coefficients.
func (sv *Solver) result(alpha float64, v, cp []float64) Case {
	n := sv.n
	c := Case{Alpha: alpha, Gamma: v[: n+1 : n+1], Cp: cp, sv: sv, x0: v}
	for k, g := range c.Gamma {
		c.Cp[k] = 1 - g*g
	}
	if sv.blunt {
		c.BaseSource = v[n+1]
	}
	sa, ca := math.Sincos(alpha)
	f := &sv.forms
	circ := f.circ[0]*ca + f.circ[1]*sa
	fx, fy, cm := f.fx.at(ca, sa), f.fy.at(ca, sa), f.cm.at(ca, sa)
	c.Cl = -2 * circ
	c.ClPressure = fy*ca - fx*sa
	c.CdPressure = fx*ca + fy*sa
	c.ClDiff = c.Cl - c.ClPressure
	c.Cm = cm
	c.Stagnation = sv.stagnation(c.Gamma)
	return c
}

// sweepForms holds the circulation and the pressure integrals of every
// angle as functions of the angle. γ(α) = cos α·γ₀ + sin α·γ₉₀ is linear
// in (cos α, sin α), so the circulation is too, and the integrals of
// Cp = 1 − γ², quadratic in γ, are quadratic forms in (cos α, sin α): their
// coefficients, summed once over the panels, give each angle's force and
// moment without a pass over the panels per angle.
type sweepForms struct {
	circ       [2]float64 // Γ = circ[0]·cos α + circ[1]·sin α
	fx, fy, cm quadForm   // pressure force components and moment about c/4
}

// quadForm is k[0] + k[1]·cos²α + k[2]·cos α·sin α + k[3]·sin²α.
type quadForm [4]float64

func (q *quadForm) at(ca, sa float64) float64 {
	return q[0] + q[1]*ca*ca + q[2]*ca*sa + q[3]*sa*sa
}

// sweepForms sums the coefficients of the forms from the solutions for
// α = 0 and 90° (sv.base). On each panel γ is linear between its nodes,
// γ = a at the start and b at the end, and the integrals are exact:
// ∫Cp ds = s(1 − (a² + ab + b²)/3) and ∫Cp·ξ ds = s²(1/2 − (a²/12 + ab/6 +
// b²/4)), ξ the distance from the panel's start. With a = cos α·p₀ +
// sin α·q₀ and b = cos α·p₁ + sin α·q₁, each square or product splits into
// its cos²α, cos α·sin α and sin²α parts.
func (sv *Solver) sweepForms() sweepForms {
	const third, sixth, twelfth = 1.0 / 3, 1.0 / 6, 1.0 / 12
	var f sweepForms
	b := sv.base
	n := sv.n
	tx, ty, x0, y0 := sv.tx[:n], sv.ty[:n], sv.x0[:n], sv.y0[:n]
	for j, s := range sv.s[:n] {
		p0, q0, p1, q1 := b[2*j], b[2*j+1], b[2*j+2], b[2*j+3]
		f.circ[0] += 0.5 * s * (p0 + p1)
		f.circ[1] += 0.5 * s * (q0 + q1)
		// a² + ab + b² and a²/12 + ab/6 + b²/4, by parts.
		sq := [3]float64{p0*p0 + p0*p1 + p1*p1, 2*p0*q0 + p0*q1 + q0*p1 + 2*p1*q1, q0*q0 + q0*q1 + q1*q1}
		wt := [3]float64{
			p0*p0*twelfth + p0*p1*sixth + p1*p1*0.25,
			2*p0*q0*twelfth + (p0*q1+q0*p1)*sixth + 2*p1*q1*0.25,
			q0*q0*twelfth + q0*q1*sixth + q1*q1*0.25,
		}
		nx, ny := ty[j], -tx[j]
		// Nose-up moment about c/4: Σ ∫ Cp (r − r_c/4) × n ds, and t × n = −1.
		rx, ry := x0[j]-0.25, y0[j]
		mom := rx*ny - ry*nx
		// icp = s − (s/3)·sq, ixcp = s²/2 − s²·wt; fx −= icp·nx, fy −= icp·ny,
		// cm += mom·icp − ixcp.
		f.fx[0] -= s * nx
		f.fy[0] -= s * ny
		f.cm[0] += mom*s - 0.5*s*s
		for k := range 3 {
			icp := s * third * sq[k]
			f.fx[k+1] += icp * nx
			f.fy[k+1] += icp * ny
			f.cm[k+1] += s*s*wt[k] - mom*icp
		}
	}
	return f
}

func (sv *Solver) stagnation(g []float64) Stagnation {
	st := Stagnation{Panel: -1}
	best := 0.0
	for k := range sv.n {
		if g[k] < 0 && g[k+1] >= 0 {
			if d := (g[k+1] - g[k]) / sv.s[k]; d > best {
				best = d
				f := -g[k] / (g[k+1] - g[k])
				p := sv.nodes[k].Add(sv.nodes[k+1].Sub(sv.nodes[k]).Scale(f))
				st = Stagnation{X: p.X, Y: p.Y, S: sv.arc[k] + f*sv.s[k], Panel: k}
			}
		}
	}
	return st
}
