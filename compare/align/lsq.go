package align

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// LeastSquares moves the points onto the outline o so that the sum of
// their squared signed distances is least, starting from the motion start
// (which must be near enough for each point to find its own part of the
// outline: a datum alignment, say). With opts.Scale the uniform scale
// floats too; otherwise it stays that of start, and so does Mirror.
//
// Each step linearises the distances in a small rotation, shift and
// scaling about the centroid of the moved points and takes the
// Gauss–Newton step, damped (Levenberg–Marquardt) when the sum would not
// fall; the feet are found anew after every step, so the fit is the
// point-to-curve one, not point-to-point. It stops when a step moves no
// point by more than 1e-13 of the points' spread. For points that lie on a
// moved copy of the outline the motion is recovered to rounding.
//
// It returns ErrTooFewPoints for fewer points than the motion has degrees
// of freedom plus one, and ErrNonFinite for non-finite input.
func LeastSquares(o Outline, pts []geometry.Point, start Motion, opts Options) (Result, error) {
	if err := checkStart(pts, start, opts); err != nil {
		return Result{}, err
	}
	k := opts.freedoms()
	m := start
	feet := startFeet(o, m, pts, opts)
	cost, err := sumSquares(feet)
	if err != nil {
		return Result{}, err
	}
	trial := make([]Foot, len(pts))
	var lin linearisation
	jtj := make([]float64, k*k)
	jtd := make([]float64, k)
	sys := make([]float64, k*k)
	u := make([]float64, k)
	mu := 0.0
	res := Result{}
	for res.Iterations < opts.maxIterations() {
		res.Iterations++
		linearise(m, pts, feet, k, &lin)
		clear(jtj)
		clear(jtd)
		for i, f := range feet {
			row := lin.rows[i*k : (i+1)*k]
			for a := range k {
				jtd[a] += row[a] * f.Distance
				for b := range k {
					jtj[a*k+b] += row[a] * row[b]
				}
			}
		}
		accepted := false
		for !accepted {
			copy(sys, jtj)
			for a := range k {
				sys[a*k+a] += mu * (jtj[a*k+a] + 1e-30)
				u[a] = -jtd[a]
			}
			if !solveSmall(sys, u, k) {
				if mu == 0 {
					mu = 1e-9
				} else {
					mu *= 10
				}
				if mu > 1e9 {
					return Result{}, fmt.Errorf("align: least squares: the motion is not determined by the points")
				}
				continue
			}
			step := norm(u)
			next := lin.apply(m, u)
			var near []Foot
			if step <= trackReach*lin.length {
				near = feet
			}
			feetNear(o, next, pts, near, trial)
			c2, err := sumSquares(trial)
			if err != nil {
				return Result{}, err
			}
			small := step <= 1e-13*lin.length
			if c2 <= cost {
				m, cost = next, c2
				feet, trial = trial, feet
				accepted = true
				mu /= 10
				if mu < 1e-12 {
					mu = 0
				}
				if small {
					res.Converged = true
				}
			} else {
				if small {
					// No smaller step lowers the sum: rounding decides.
					res.Converged = true
					break
				}
				if mu == 0 {
					mu = 1e-6
				} else {
					mu *= 10
				}
			}
		}
		if res.Converged {
			break
		}
	}
	// The result's feet are found afresh, not tracked.
	feet = Feet(o, m, pts)
	if cost, err = sumSquares(feet); err != nil {
		return Result{}, err
	}
	res.Motion, res.Feet = m, feet
	res.Objective = math.Sqrt(cost / float64(len(pts)))
	return res, nil
}

// sumSquares returns the sum of the squared distances of feet.
func sumSquares(feet []Foot) (float64, error) {
	var s float64
	for _, f := range feet {
		s += f.Distance * f.Distance
	}
	if math.IsNaN(s) || math.IsInf(s, 0) {
		return 0, ErrNonFinite
	}
	return s, nil
}
