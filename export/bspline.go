package export

import (
	"errors"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// A bspline is a clamped cubic B-spline curve in 3D: control points and
// a knot vector of len(ctrl)+4 knots, the first four and the last four
// equal.
type bspline struct {
	knots []float64
	ctrl  []geometry.Vec3
}

// errSpline means nodes a spline cannot interpolate: fewer than four, or
// two consecutive nodes at the same place.
var errSpline = errors.New("export: nodes a spline cannot pass through (fewer than 4, or repeated)")

// interpolate returns the cubic B-spline through pts (at least 4, no two
// consecutive ones equal) and the parameters at which it passes through
// them: parameters by cumulative chord length, scaled to [0, 1], and the
// knots of the not-a-knot condition,
//
//	u₀ u₀ u₀ u₀  u₂ u₃ … u_{m−2}  u_m u_m u_m u_m
//
// so that each coordinate of the curve is the not-a-knot cubic spline
// interpolant of that coordinate against the parameter (de Boor, A
// Practical Guide to Splines, Springer 1978, ch. IV and IX, from memory;
// the tests compare it with gonum's interp.NotAKnotCubic). The collocation
// matrix is banded and totally positive, so it is solved by Gaussian
// elimination without pivoting (de Boor, 1978).
func interpolate(pts []geometry.Vec3) (*bspline, []float64, error) {
	m := len(pts) - 1
	if m < 3 {
		return nil, nil, errSpline
	}
	us := make([]float64, m+1)
	for i := 1; i <= m; i++ {
		d := pts[i].Sub(pts[i-1]).Norm()
		if !(d > 0) {
			return nil, nil, errSpline
		}
		us[i] = us[i-1] + d
	}
	for i := range us {
		us[i] /= us[m]
	}
	us[m] = 1
	knots := make([]float64, 0, m+5)
	knots = append(knots, 0, 0, 0, 0)
	knots = append(knots, us[2:m-1]...)
	knots = append(knots, 1, 1, 1, 1)
	b := &bspline{knots: knots}

	// Row k holds the four basis functions that do not vanish at u_k, in
	// columns span(u_k)−3 … span(u_k), which lie within k−3 … k+3: the
	// band is stored as a[k][c−k+w]. Eliminating row r < k+w by row k
	// touches columns k … k+w only, inside the band of row r.
	n := m + 1
	const w = 3
	a := make([][2*w + 1]float64, n)
	for k, u := range us {
		s := b.span(u)
		for j, v := range b.basis(s, u) {
			c := s - 3 + j
			if c-k < -w || c-k > w {
				return nil, nil, errSpline
			}
			a[k][c-k+w] = v
		}
	}
	rhs := make([]geometry.Vec3, n)
	copy(rhs, pts)
	for k := 0; k < n; k++ {
		piv := a[k][w]
		if piv == 0 || math.IsNaN(piv) {
			return nil, nil, errSpline
		}
		for r := k + 1; r < n && r <= k+w; r++ {
			f := a[r][k-r+w] / piv
			if f == 0 {
				continue
			}
			for c := k; c < n && c <= k+w; c++ {
				a[r][c-r+w] -= f * a[k][c-k+w]
			}
			rhs[r] = rhs[r].Sub(rhs[k].Scale(f))
		}
	}
	b.ctrl = make([]geometry.Vec3, n)
	for k := n - 1; k >= 0; k-- {
		v := rhs[k]
		for c := k + 1; c < n && c <= k+w; c++ {
			v = v.Sub(b.ctrl[c].Scale(a[k][c-k+w]))
		}
		b.ctrl[k] = v.Scale(1 / a[k][w])
	}
	return b, us, nil
}

// span returns the knot span index s with knots[s] ≤ u < knots[s+1]
// (the last non-empty span for u = 1).
func (b *bspline) span(u float64) int {
	n := len(b.knots) - 5 // the last control point
	if u >= b.knots[n+1] {
		return n
	}
	lo, hi := 3, n+1
	for hi-lo > 1 {
		mid := (lo + hi) / 2
		if u < b.knots[mid] {
			hi = mid
		} else {
			lo = mid
		}
	}
	return lo
}

// basis returns the four cubic basis functions N_{s−3..s,3}(u) of span s
// (the Cox–de Boor recurrence; The NURBS Book, Piegl and Tiller, 2nd ed.,
// Springer 1997, algorithm A2.2, from memory).
func (b *bspline) basis(s int, u float64) [4]float64 {
	var nv [4]float64
	var left, right [4]float64
	nv[0] = 1
	for j := 1; j <= 3; j++ {
		left[j] = u - b.knots[s+1-j]
		right[j] = b.knots[s+j] - u
		saved := 0.0
		for r := 0; r < j; r++ {
			tmp := nv[r] / (right[r+1] + left[j-r])
			nv[r] = saved + right[r+1]*tmp
			saved = left[j-r] * tmp
		}
		nv[j] = saved
	}
	return nv
}

// at returns the point of the curve at parameter u in [0, 1].
func (b *bspline) at(u float64) geometry.Vec3 {
	s := b.span(u)
	var p geometry.Vec3
	for j, v := range b.basis(s, u) {
		p = p.Add(b.ctrl[s-3+j].Scale(v))
	}
	return p
}
