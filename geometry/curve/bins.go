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
// the points themselves, or for more than binFrom points their bins. A
// point whose weight is below 1 (an outlier) is left out of the bins; the
// ends of an open fit, which are pinned, stay alone.
func newFitPoints(pts []geometry.Point, ws []float64, open bool) fitPoints {
	m := len(pts)
	fp := fitPoints{count: 1}
	if m < binFrom {
		fp.pts, fp.ws = pts, append([]float64(nil), ws...)
	} else {
		fp.of = make([]int, m)
		var perim float64
		for i := 1; i < m; i++ {
			perim += pts[i].Dist(pts[i-1])
		}
		k := max(2, m/binTarget)
		maxArc := binMaxArc * perim
		var sum geometry.Point
		var n int
		var arc float64
		flush := func() {
			if n == 0 {
				return
			}
			fp.pts = append(fp.pts, sum.Scale(1/float64(n)))
			fp.ws = append(fp.ws, float64(n))
			sum, n, arc = geometry.Point{}, 0, 0
		}
		for i, p := range pts {
			pinned := open && (i == 0 || i == m-1)
			if pinned {
				flush()
				fp.of[i] = len(fp.pts)
				fp.pts = append(fp.pts, p)
				fp.ws = append(fp.ws, ws[i]*float64(k))
				continue
			}
			if n > 0 {
				arc += p.Dist(pts[i-1])
			}
			if n >= k || arc > maxArc {
				flush()
			}
			fp.of[i] = len(fp.pts) // the bin being filled
			if ws[i] < 1 {
				continue // an outlier: measured, not fitted
			}
			sum = sum.Add(p)
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
			fp.ts[i] = fp.ts[i-1] + math.Max(p.Dist(fp.pts[i-1]), 1e-12)
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
