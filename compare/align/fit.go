package align

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"

	"github.com/foilwright/foilwright/geometry"
)

// Options control a fit.
type Options struct {
	// Scale lets the uniform scale float; otherwise the fit keeps the
	// start motion's scale.
	Scale bool
	// MaxIterations bounds the steps of the fit; 0 means 100.
	MaxIterations int
	// Feet, when not nil, are the feet of the points at the start motion
	// (found afresh, as a Result's are), which the fit then need not find
	// again.
	Feet []Foot
}

// Result is the outcome of a fit.
type Result struct {
	Motion Motion
	// Feet holds, for every point, the foot of its image under Motion.
	Feet []Foot
	// Iterations is the number of linearisations the fit took.
	Iterations int
	// Converged reports that the last step no longer changed the motion
	// beyond rounding; false means MaxIterations ran out first.
	Converged bool
	// Objective is the value the fit minimised at Motion: the RMS
	// distance (LeastSquares) or the largest band use (MinimumZone).
	Objective float64
}

// ErrTooFewPoints means there are fewer points than the motion has
// degrees of freedom.
var ErrTooFewPoints = errors.New("align: too few points for the motion")

// ErrNonFinite means a point, band or start motion is not finite, or a
// distance became so.
var ErrNonFinite = errors.New("align: non-finite value")

// freedoms returns the number of motion parameters a fit adjusts.
func (o Options) freedoms() int {
	if o.Scale {
		return 4
	}
	return 3
}

func (o Options) maxIterations() int {
	if o.MaxIterations > 0 {
		return o.MaxIterations
	}
	return 100
}

// checkStart checks the points and the start motion of a fit.
func checkStart(pts []geometry.Point, start Motion, opts Options) error {
	if opts.Feet != nil && len(opts.Feet) != len(pts) {
		panic("align: start feet of the wrong length")
	}
	if len(pts) < opts.freedoms()+1 {
		return fmt.Errorf("%w: %d point(s), need at least %d", ErrTooFewPoints, len(pts), opts.freedoms()+1)
	}
	for i, p := range pts {
		if !p.IsFinite() {
			return fmt.Errorf("%w: point %d", ErrNonFinite, i)
		}
	}
	if !(start.Scale > 0) || math.IsInf(start.Scale, 0) || math.IsNaN(start.Angle) || math.IsInf(start.Angle, 0) || !start.Shift.IsFinite() {
		return fmt.Errorf("%w: start motion %+v", ErrNonFinite, start)
	}
	return nil
}

// startFeet returns opts.Feet, or the feet at m found afresh.
func startFeet(o Outline, m Motion, pts []geometry.Point, opts Options) []Foot {
	if opts.Feet != nil {
		return append([]Foot(nil), opts.Feet...)
	}
	return Feet(o, m, pts)
}

// parallelFeet is the least number of points whose feet are found on
// several goroutines.
const parallelFeet = 2048

// Feet returns the foot of the image under m of every point, found on up
// to GOMAXPROCS goroutines. The result does not depend on their number.
func Feet(o Outline, m Motion, pts []geometry.Point) []Foot {
	out := make([]Foot, len(pts))
	feetInto(o, m, pts, out)
	return out
}

func feetInto(o Outline, m Motion, pts []geometry.Point, out []Foot) {
	feetNear(o, m, pts, nil, out)
}

// trackReach is the largest step, as a fraction of the points' spread,
// after which feet are tracked from the step's start rather than found
// afresh.
const trackReach = 0.01

// feetNear is feetInto, tracking each foot from near[i] when near is not
// nil and o is a Tracker. near and out may not be the same slice.
func feetNear(o Outline, m Motion, pts []geometry.Point, near, out []Foot) {
	tr, ok := o.(Tracker)
	work := func(lo, hi int) {
		if ok && near != nil {
			for i := lo; i < hi; i++ {
				out[i] = tr.NearestFrom(m.Apply(pts[i]), near[i])
			}
			return
		}
		for i := lo; i < hi; i++ {
			out[i] = o.Nearest(m.Apply(pts[i]))
		}
	}
	g := runtime.GOMAXPROCS(0)
	if len(pts) < parallelFeet || g < 2 {
		work(0, len(pts))
		return
	}
	var wg sync.WaitGroup
	chunk := (len(pts) + g - 1) / g
	for lo := 0; lo < len(pts); lo += chunk {
		hi := min(lo+chunk, len(pts))
		wg.Go(func() { work(lo, hi) })
	}
	wg.Wait()
}

// linearisation holds what a step needs of the moved points: the centre
// the small motion turns about, the length that scales its angle and
// scale, and per point the row of the Jacobian of the signed distance with
// respect to the scaled motion u = (L·φ, tx, ty[, L·σ]).
type linearisation struct {
	centre geometry.Point
	length float64
	k      int
	rows   []float64 // k per point
}

// linearise builds the Jacobian of the distances at the motion m.
func linearise(m Motion, pts []geometry.Point, feet []Foot, k int, lin *linearisation) {
	n := len(pts)
	moved := make([]geometry.Point, n)
	var c geometry.Point
	for i, q := range pts {
		moved[i] = m.Apply(q)
		c = c.Add(moved[i])
	}
	c = c.Scale(1 / float64(n))
	var r2 float64
	for _, p := range moved {
		d := p.Sub(c)
		r2 += d.Dot(d)
	}
	L := math.Sqrt(r2 / float64(n))
	if !(L > 0) {
		L = 1
	}
	lin.centre, lin.length, lin.k = c, L, k
	if cap(lin.rows) < n*k {
		lin.rows = make([]float64, n*k)
	}
	lin.rows = lin.rows[:n*k]
	for i, p := range moved {
		r := p.Sub(c)
		nv := feet[i].Normal
		row := lin.rows[i*k : (i+1)*k]
		row[0] = nv.Dot(geometry.Point{X: -r.Y, Y: r.X}) / L
		row[1], row[2] = nv.X, nv.Y
		if k == 4 {
			row[3] = nv.Dot(r) / L
		}
	}
}

// apply returns m followed by the small motion u (scaled, see
// linearisation).
func (lin *linearisation) apply(m Motion, u []float64) Motion {
	var sigma float64
	if lin.k == 4 {
		sigma = u[3] / lin.length
	}
	return m.step(u[0]/lin.length, sigma, geometry.Point{X: u[1], Y: u[2]}, lin.centre)
}

func norm(u []float64) float64 { return math.Sqrt(dot(u, u)) }

func normInf(u []float64) float64 {
	var s float64
	for _, v := range u {
		s = max(s, math.Abs(v))
	}
	return s
}
