package curve

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
)

// The ends of a smoothed open fit are free: pinning them to the points at
// a trailing-edge corner would pin the curve to those points' noise, and
// the tangent there, which sets the Kutta condition of a panel method,
// would swing with it. The corner is then rebuilt from the curve: a sharp
// edge where its two branches cross (or, if they stop short, where their
// end tangents meet); the corners of a blunt edge where each branch meets
// the straight base through the base points.

// cornerReach is how far along each branch, as a fraction of the length of
// the curve, the corner is sought.
const cornerReach = 0.02

// cornerSkip is the part of each branch at a sharp corner, in point
// spacings, that is replaced by its tangent; cornerExtend is the longest
// extension of a branch beyond its end to the corner, in point spacings.
const (
	cornerSkip   = 2
	cornerExtend = 4
)

// cornerSamples is the number of samples of each branch searched for a
// crossing.
const cornerSamples = 400

// joinCorner returns the open curve cv with its ends brought together at
// the corner of a sharp trailing edge. The last cornerSkip point spacings
// of each branch (h, the spacing of the points at the ends) are where the
// branches feel each other's points and the corner point they share, and
// may cross or curl; each branch is cut there and continued straight
// along its tangent to the point X where the two tangents meet. X must
// lie within cornerExtend spacings of both cuts: tangents that meet
// farther out belong to a blunt edge without base points (or nearly
// parallel surfaces), whose ends, uncut, are then joined by straight
// segments to their midpoint.
func joinCorner(cv *Curve, h float64) *Curve {
	L := cv.Length()
	reach := cornerReach * L
	skip := math.Min(cornerSkip*h, reach/4)
	sa, sb := skip, L-skip
	p0, p1 := cv.At(sa), cv.At(sb)
	d0 := cv.Tangent(sa).Scale(-1) // towards the start
	d1 := cv.Tangent(sb)           // towards the end
	x, ta, tb, ok := lineMeet(p0, d0, p1, d1)
	if lim := math.Min(reach, cornerExtend*h+skip); !ok || ta < -skip || tb < -skip || ta > lim || tb > lim {
		// No corner within reach: join the ends themselves.
		sa, sb = 0, L
		x = cv.Start().Add(cv.End()).Scale(0.5)
		ta, tb = 0, 0
	}
	// Cut a branch back to the foot of x when x lies behind its cut.
	if ta < 0 {
		sa = footOn(cv, x, 0, sa)
	}
	if tb < 0 {
		sb = footOn(cv, x, sb, L)
	}
	var bl Builder
	bl.AddLine(x, cv.At(sa))
	bl.AddArc(cv, sa, sb)
	bl.AddLine(cv.At(sb), x)
	return bl.Curve(false)
}

// footOn returns the arc length in [s0, s1] of the point of cv nearest to
// p.
func footOn(cv *Curve, p geometry.Point, s0, s1 float64) float64 {
	br := branch(cv, s0, s1)
	best, bd := s0, math.Inf(1)
	for k, q := range br.p {
		if d := q.Dist(p); d < bd {
			best, bd = br.s[k], d
		}
	}
	step := (s1 - s0) / cornerSamples
	return numeric.Golden(func(s float64) float64 { return cv.At(s).Dist(p) }, math.Max(s0, best-step), math.Min(s1, best+step), 40)
}

// toBase returns the open curve cv with each end trimmed or extended to
// the straight base of a blunt trailing edge, the line through o in
// direction dir: each branch is cut where it crosses the line within
// reach, or extended along its end tangent to the line.
func toBase(cv *Curve, o, dir geometry.Point) *Curve {
	L := cv.Length()
	reach := cornerReach * L
	side := func(p geometry.Point) float64 { return dir.Cross(p.Sub(o)) }
	endAt := func(s0, s1 float64) (s float64, ext geometry.Point, extended bool) {
		br := branch(cv, s0, s1)
		for k := 1; k < len(br.s); k++ {
			f0, f1 := side(br.p[k-1]), side(br.p[k])
			if (f0 <= 0) != (f1 <= 0) {
				t := f0 / (f0 - f1)
				return br.s[k-1] + t*(br.s[k]-br.s[k-1]), geometry.Point{}, false
			}
		}
		// No crossing: extend along the tangent at the end.
		p := cv.At(s0)
		d := cv.Tangent(s0)
		if s0 == 0 {
			d = d.Scale(-1)
		}
		if x, tt, _, ok := lineMeet(p, d, o, dir); ok && tt >= 0 && tt <= reach {
			return s0, x, true
		}
		return s0, geometry.Point{}, false
	}
	sa, xa, exA := endAt(0, reach)
	sb, xb, exB := endAt(L, L-reach)
	if !(sa < sb) {
		return cv
	}
	var bl Builder
	if exA {
		bl.AddLine(xa, cv.Start())
	}
	bl.AddArc(cv, sa, sb)
	if exB {
		bl.AddLine(cv.End(), xb)
	}
	return bl.Curve(false)
}

// branchSamples are points of a curve with their arc lengths.
type branchSamples struct {
	s []float64
	p []geometry.Point
}

// branch samples cv from arc length s0 towards s1.
func branch(cv *Curve, s0, s1 float64) branchSamples {
	var b branchSamples
	for k := 0; k <= cornerSamples; k++ {
		s := s0 + (s1-s0)*float64(k)/cornerSamples
		b.s = append(b.s, s)
		b.p = append(b.p, cv.At(s))
	}
	return b
}

// crossing returns the arc lengths at which the polylines a and b (each
// starting at a curve end) first cross, nearest to their starts.
func crossing(a, b branchSamples) (float64, float64, bool) {
	best := -1
	var sa, sb float64
	for i := 1; i < len(a.p); i++ {
		for j := 1; j < len(b.p); j++ {
			if best >= 0 && i+j >= best {
				break
			}
			ta, tb, ok := segmentsCross(a.p[i-1], a.p[i], b.p[j-1], b.p[j])
			if !ok {
				continue
			}
			best = i + j
			sa = a.s[i-1] + ta*(a.s[i]-a.s[i-1])
			sb = b.s[j-1] + tb*(b.s[j]-b.s[j-1])
		}
	}
	return sa, sb, best >= 0
}

// segmentsCross reports whether segments p0p1 and q0q1 cross, and where,
// as fractions along each.
func segmentsCross(p0, p1, q0, q1 geometry.Point) (float64, float64, bool) {
	d, e := p1.Sub(p0), q1.Sub(q0)
	den := d.Cross(e)
	if den == 0 {
		return 0, 0, false
	}
	w := q0.Sub(p0)
	t := w.Cross(e) / den
	u := w.Cross(d) / den
	if t < 0 || t > 1 || u < 0 || u > 1 {
		return 0, 0, false
	}
	return t, u, true
}

// lineMeet returns where the lines p + t·d and q + u·e meet, with t and u
// in units of |d| and |e|; ok is false for (nearly) parallel lines.
func lineMeet(p, d, q, e geometry.Point) (geometry.Point, float64, float64, bool) {
	den := d.Cross(e)
	if math.Abs(den) <= 1e-9*d.Norm()*e.Norm() {
		return geometry.Point{}, 0, 0, false
	}
	w := q.Sub(p)
	t := w.Cross(e) / den
	u := w.Cross(d) / den
	return p.Add(d.Scale(t)), t, u, true
}

// snapped returns c with both ends moved exactly to their midpoint (they
// agree to rounding after a trim or a join).
func (c *Curve) snapped() *Curve {
	out, _ := c.SnapEnds()
	return out.WithClosed(false)
}

// endCorrected refits the open problem p at λ, whose fit f has free ends,
// without the bias of those ends. A smoothing spline's second derivative
// vanishes at a free end (the natural end condition), so over a smoothing
// length the fit straightens a surface that is curved up to its end, and
// tilts its end tangent. The fit's own second derivative endReach
// smoothing lengths in, beyond the reach of the end condition, stands for
// the end's; the fit is made to the data less a cubic c(t) that has that
// second derivative at the end and fades to zero (with its first two
// derivatives) at that knot, and c is added back: the penalty then draws
// the curve towards the curvature the surface has there instead of
// towards none. The estimate is renewed from the corrected fit once. It
// returns false when the ends have too few points.
func endCorrected(p *splineProblem, xs, ys []float64, lambda float64, f *splineFit) (*splineFit, bool) {
	n := p.n()
	ts := p.ts
	// The fade-out knot of each end: endReach smoothing lengths in.
	var kf [2]int
	for end := 0; end < 2; end++ {
		at := func(k int) int {
			if end == 0 {
				return k
			}
			return n - 1 - k
		}
		h := math.Abs(ts[at(1)] - ts[at(0)])
		ell := math.Pow(lambda*h/math.Max(p.ws[at(1)], 1e-300), 0.25)
		k := 1
		for k < n/4 && math.Abs(ts[at(k)]-ts[at(0)]) < endReach*ell {
			k++
		}
		if k < 2 || k >= n/4 {
			return nil, false
		}
		kf[end] = k
	}
	for range 2 {
		cx, cy := make([]float64, n), make([]float64, n) // c at the knots
		gx, gy := make([]float64, n), make([]float64, n) // c'' at the knots
		for end := 0; end < 2; end++ {
			at := func(k int) int {
				if end == 0 {
					return k
				}
				return n - 1 - k
			}
			j := at(kf[end])
			gamX, gamY := f.gams[0][j], f.gams[1][j]
			t0 := ts[at(0)]
			d := math.Abs(ts[j] - t0)
			for k := 0; k < kf[end]; k++ {
				i := at(k)
				r := d - math.Abs(ts[i]-t0) // distance to the fade-out knot
				cx[i] += gamX * r * r * r / (6 * d)
				cy[i] += gamY * r * r * r / (6 * d)
				gx[i] += gamX * r / d
				gy[i] += gamY * r / d
			}
		}
		rx, ry := make([]float64, n), make([]float64, n)
		for i := range rx {
			rx[i], ry[i] = xs[i]-cx[i], ys[i]-cy[i]
		}
		g, err := p.fit(lambda, [][]float64{rx, ry}, false)
		if err != nil {
			return nil, false
		}
		for i := 0; i < n; i++ {
			g.gs[0][i] += cx[i]
			g.gs[1][i] += cy[i]
			g.gams[0][i] += gx[i]
			g.gams[1][i] += gy[i]
		}
		f = g
	}
	return f, true
}

// endReach is how many smoothing lengths from the end endCorrected takes
// the curvature, and fades its correction out.
const endReach = 3
