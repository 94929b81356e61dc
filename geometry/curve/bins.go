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
		onCurve(&fp, pts, ws, open)
	}
	mf := len(fp.pts)
	fp.xs, fp.ys, fp.ts = make([]float64, mf), make([]float64, mf), make([]float64, mf)
	for i, p := range fp.pts {
		fp.xs[i], fp.ys[i] = p.X, p.Y
		if i > 0 {
			d := p.Dist(fp.pts[i-1])
			if fAlong != nil && fp.of == nil {
				d = fAlong[i] - fAlong[i-1]
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

// onCurve moves the centroid of each bin onto the outline: the centroid
// of points spread along a curved outline lies inside the bend by κ·⟨u²⟩/2
// (u the points' offsets along the outline from it, κ the curvature), the
// sagitta a fit of the bins would otherwise read as shape, and the noise
// estimate as noise shared by neighbours (on a 3100-point scan of a 152 mm
// NACA 0012 with 1e-4 mm rounding, the bins' residuals correlated over
// twelve neighbours and the nose was cut by 0.036 mm). κ is that of the
// circle through the centroids of the bin and its neighbours, the
// direction along the outline that from one neighbour to the other; noise
// in them moves a bin by about a sixth of its own noise. Pinned ends and
// bins without a neighbour either side stay where they are.
func onCurve(fp *fitPoints, pts []geometry.Point, ws []float64, open bool) {
	const (
		onCurveTurn  = 0.5 // largest κ times the span of the neighbours
		onCurveMove  = 0.1 // largest move, in distances to the nearer neighbour
		onCurveSteps = 3   // the neighbours' own moves change κ: repeat
	)
	nb := len(fp.pts)
	if nb < 3 {
		return
	}
	c := append([]geometry.Point(nil), fp.pts...) // the centroids
	spread := make([]float64, nb)                 // Σ u² of each bin's points
	dir := make([]geometry.Point, nb)
	kappa := make([]float64, nb)
	ok := make([]bool, nb)
	short := make([]float64, nb)
	for range onCurveSteps {
		q := append([]geometry.Point(nil), fp.pts...)
		for j := range nb {
			ok[j] = false
			pj, nj := j-1, j+1
			if !open {
				pj, nj = (j+nb-1)%nb, (j+1)%nb
			}
			if pj < 0 || nj >= nb || fp.ws[j] < 2 {
				continue // an end, or a bin of one point (no spread)
			}
			a, b := q[j].Sub(q[pj]), q[nj].Sub(q[j])
			ab := q[nj].Sub(q[pj])
			la, lb, lab := a.Norm(), b.Norm(), ab.Norm()
			if la == 0 || lb == 0 || lab == 0 {
				continue
			}
			dir[j] = ab.Scale(1 / lab)
			kappa[j] = 2 * a.Cross(b) / (la * lb * lab)
			// Neighbours that turn by more than about 30° do not
			// resolve the bend (noisy bins close together, a corner):
			// left alone.
			ok[j] = math.Abs(kappa[j])*lab <= onCurveTurn
			short[j] = math.Min(la, lb)
			spread[j] = 0
		}
		for i, p := range pts {
			j := fp.of[i]
			if !ok[j] || ws[i] < 1 {
				continue
			}
			u := p.Sub(c[j]).Dot(dir[j])
			spread[j] += u * u
		}
		for j := range nb {
			if !ok[j] {
				fp.pts[j] = c[j]
				continue
			}
			sag := kappa[j] * spread[j] / fp.ws[j] / 2
			// At most a tenth of the distance to the nearer neighbour:
			// a bin's own spread is far below it where this holds.
			sag = math.Max(-onCurveMove*short[j], math.Min(onCurveMove*short[j], sag))
			left := geometry.Point{X: -dir[j].Y, Y: dir[j].X}
			fp.pts[j] = c[j].Sub(left.Scale(sag))
		}
	}
}
