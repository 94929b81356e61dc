package curve

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// Dense scans are fitted through bins: runs of neighbouring points
// replaced by their centroid, weighted by their count. A bin spans a
// small fraction of the shortest smoothing length the fit can choose, so
// the curve is the one the points would give, while the spline has a few
// thousand knots instead of a million: the fit is fast, and its system
// stays well conditioned (with tens of thousands of knots inside one
// smoothing length it would not). Residuals are measured for every point
// against the curve.

// Limits of binning.
const (
	// binFrom is the least number of points that are binned.
	binFrom = 3000
	// binTarget is about how many bins a scan is reduced to.
	binTarget = 1500
	// binMaxArc is the longest arc of a bin, as a fraction of the
	// length of the outline (a few thousandths of the chord).
	binMaxArc = 1.0 / 2000
)

// fitPoints are the points a fit works on: the contour points in fit
// order, or their bins.
type fitPoints struct {
	pts    []geometry.Point
	xs, ys []float64
	ts     []float64 // chord-length parameter
	ws     []float64 // weights: end pins, outliers, counts of bins
	period float64   // parameter length of a closed loop
	// of maps each point in fit order to its fit point (bin); nil when
	// the points are not binned.
	of []int
	// count is the mean number of points in a bin (1 when not binned).
	count float64
}

// newFitPoints returns the fit points of pts (fit order) with weights ws:
// the points themselves, or, when bin is set, for more than binFrom points
// their bins. A point whose weight is below 1 (an outlier) is left out of
// the bins; the ends of an open fit, which are pinned, stay alone.
//
// Exact samples are not binned (Fit): the centroid of two neighbours lies
// inside a curved outline by the sagitta of their chord, which the
// sampling test reads as noise, and an interpolating spline, which has no
// smoothing length to keep its system conditioned, does not need bins.
func newFitPoints(pts []geometry.Point, ws []float64, along []float64, open, bin bool) fitPoints {
	m := len(pts)
	// step is the distance along the curve from point i-1 to point i: the
	// contour's own positions along the loop when it carries them (a band,
	// whose neighbours zigzag across it), else the chord between them.
	step := func(i int) float64 {
		if along != nil {
			return along[i] - along[i-1]
		}
		return pts[i].Dist(pts[i-1])
	}
	var fAlong []float64 // positions of the fit points along the loop
	fp := fitPoints{count: 1}
	if m < binFrom || !bin {
		fp.pts, fp.ws = pts, append([]float64(nil), ws...)
		fAlong = along
	} else {
		fp.of = make([]int, m)
		var perim float64
		for i := 1; i < m; i++ {
			perim += step(i)
		}
		k := max(2, m/binTarget)
		maxArc := binMaxArc * perim
		var sum geometry.Point
		var n int
		var arc, sumAlong float64
		flush := func() {
			if n == 0 {
				return
			}
			fp.pts = append(fp.pts, sum.Scale(1/float64(n)))
			fp.ws = append(fp.ws, float64(n))
			if along != nil {
				fAlong = append(fAlong, sumAlong/float64(n))
			}
			sum, n, arc, sumAlong = geometry.Point{}, 0, 0, 0
		}
		for i, p := range pts {
			pinned := open && (i == 0 || i == m-1)
			if pinned {
				flush()
				fp.of[i] = len(fp.pts)
				fp.pts = append(fp.pts, p)
				fp.ws = append(fp.ws, ws[i]*float64(k))
				if along != nil {
					fAlong = append(fAlong, along[i])
				}
				continue
			}
			if n > 0 {
				arc += step(i)
			}
			if n >= k || arc > maxArc {
				flush()
			}
			fp.of[i] = len(fp.pts) // the bin being filled
			if ws[i] < 1 {
				continue // an outlier: measured, not fitted
			}
			sum = sum.Add(p)
			if along != nil {
				sumAlong += along[i]
			}
			n++
		}
		flush()
		// A bin left empty (only outliers) maps to the bin before it.
		for i := range fp.of {
			fp.of[i] = min(fp.of[i], len(fp.pts)-1)
		}
		fp.count = float64(m) / float64(len(fp.pts))
	}
	mf := len(fp.pts)
	fp.xs, fp.ys, fp.ts = make([]float64, mf), make([]float64, mf), make([]float64, mf)
	for i, p := range fp.pts {
		fp.xs[i], fp.ys[i] = p.X, p.Y
		if i > 0 {
			d := p.Dist(fp.pts[i-1])
			if fAlong != nil && fp.of == nil {
				// Positions along the loop measured at the points'
				// feet on a curve: points whose feet coincide (two
				// points on one normal of it, as a stair-stepped
				// scan's are) tie, and a knot step of nothing leaves
				// the spline system singular in floating point. Keep
				// the step at least the share of the chord between
				// them that reparametrise keeps of a chord-length step.
				d = math.Max(fAlong[i]-fAlong[i-1], minStep*d)
			}
			fp.ts[i] = fp.ts[i-1] + math.Max(d, 1e-12)
		}
	}
	if !open {
		fp.period = fp.ts[mf-1] + math.Max(fp.pts[mf-1].Dist(fp.pts[0]), 1e-12)
	}
	return fp
}

// index returns the fit point of the point j (fit order).
func (fp fitPoints) index(j int) int {
	if fp.of == nil || j < 0 {
		return j
	}
	return fp.of[j]
}

// Parameters an interpolating fit may run in: the spacing of the parameter
// between neighbouring points is their distance to the power alpha.
var parameters = []struct {
	name  string
	alpha float64
}{
	{"chord length", 1},
	{"centripetal", 0.5},
	{"uniform", 0},
}

// chooseParameter sets the parameter of fp for interpolation to the one,
// of chord length, centripetal and uniform, under which the spline
// through every second point predicts the others best (the root mean
// square of the normal errors), and returns its name. Exact samples are
// seldom spaced evenly along the arc: a CAD export puts its stations by a
// law in x (the cosine law, dense at both edges), and its outline is
// smooth in the parameter of that law, which the uniform parameter
// follows and chord length does not; measured on NACA Report 824 polylines
// of 41 to 81 cosine stations, the uniform parameter leaves a tenth of the
// error of chord length at the nose. Points spaced by arc length favour
// chord length; the test decides. With too few points it keeps chord
// length.
func (fp *fitPoints) chooseParameter(periodic bool) string {
	m := len(fp.pts)
	if m < 2*splineMinKnots {
		return parameters[0].name
	}
	best, bestErr := 0, math.Inf(1)
	var bestTs []float64
	var bestPeriod float64
	for k, pm := range parameters {
		ts := make([]float64, m)
		for i := 1; i < m; i++ {
			ts[i] = ts[i-1] + parameterStep(fp.pts[i].Dist(fp.pts[i-1]), pm.alpha)
		}
		period := 0.0
		if periodic {
			period = ts[m-1] + parameterStep(fp.pts[m-1].Dist(fp.pts[0]), pm.alpha)
		}
		e := nanSlice(m)
		predictInto(e, ts, fp.xs, fp.ys, periodic, period, 2)
		var ss float64
		var n int
		for _, v := range e {
			if !math.IsNaN(v) {
				ss += v * v
				n++
			}
		}
		if n == 0 {
			continue
		}
		if rms := math.Sqrt(ss / float64(n)); rms < bestErr {
			best, bestErr, bestTs, bestPeriod = k, rms, ts, period
		}
	}
	if bestTs != nil {
		fp.ts, fp.period = bestTs, bestPeriod
	}
	return parameters[best].name
}

// parameterStep returns the parameter step for points d apart: d^alpha,
// kept positive.
func parameterStep(d, alpha float64) float64 {
	if alpha == 1 {
		return math.Max(d, 1e-12)
	}
	return math.Max(math.Pow(d, alpha), 1e-12)
}
