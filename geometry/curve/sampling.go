package curve

import (
	"math"
	"slices"
	"sort"
	"sync"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
	"github.com/foilwright/foilwright/internal/par"
)

// This file holds the two-scale sampling test: what the points themselves
// say about their noise, before any smoothing is chosen.
//
// The interpolating spline through every second point predicts the points
// left out, halfway between its knots (spacing 2h); the spline through
// every fourth point predicts the points halfway between its knots
// (spacing 4h). For exact samples of a smooth curve the prediction error
// is the spline's interpolation error, which grows as the fourth power of
// the spacing (de Boor, A Practical Guide to Splines, rev. ed., Springer
// 2001, ch. V): 16 times when the spacing doubles. Noise does not grow
// with the spacing. So the ratio of the two tells exact data (ratio near
// 16) from noisy data (ratio near 1); the test is repeated one scale up
// (4h against 8h) where the points allow, which noise shared between
// neighbours cannot pass. The smaller error gives the noise
// where noise dominates, and the interpolation error of the spline through
// all the points, the error between them, is the 2h error divided by 16.

// Limits of the sampling test.
const (
	// sampleExactRatio is the least ratio of the 4h to the 2h prediction
	// error (medians) for which points count as exact samples: their
	// noise is then below the interpolation error between them. Noisy
	// points give 1 to 2 (1.9 for 150 points of a 100 mm section with
	// 0.002 mm noise, the sparsest CMM case), exact ones 5 (a 41-point
	// cosine polyline, far from the asymptotic 16) to 60.
	sampleExactRatio = 3
	// sampleNoiseGain is the variance of a 2h prediction error in units
	// of the noise variance: the point's own noise plus that of the
	// spline's prediction (about 0.6σ² for a cubic spline halfway between
	// knots, from its cardinal functions; measured on white noise, 1.6 in
	// all).
	sampleNoiseGain = 1.6
	// sampleFloat is the scatter, relative to the size of the outline,
	// below which points count as exact whatever the ratio: rounding in
	// the last digits of a double.
	sampleFloat = 1e-9
	// sampleThin: points closer to the last one kept than this fraction of
	// the mean spacing of their neighbours (sampleWindow either side) are
	// left out of the test.
	sampleThin   = 0.3
	sampleWindow = 8
)

// sampling is the result of the sampling test on the points of a fit.
type sampling struct {
	// E2 and E4 are, per point, the signed normal prediction error (input
	// units) of the interpolating spline at spacing 2h and 4h; NaN where a
	// point was not predicted (the ends of an open fit, too few points).
	E2, E4 []float64
	// Ratio is median|E4| / median|E2|; Ratio8 the same one scale up
	// (spacing 8h against 4h), when there are enough points (0 if not).
	Ratio, Ratio8 float64
	// Noise is the noise (standard deviation normal to the outline) the 2h
	// errors imply, as if they were all noise: an upper bound when the
	// points are exact.
	Noise float64
	// Exact reports that the points are exact samples at their spacing:
	// their noise is below the interpolation error between them.
	Exact bool
}

// sampleTest runs the sampling test on the fit points (chord-length
// parameter ts, coordinates xs, ys). For a periodic fit period is the
// parameter length of the loop. It needs at least 4·splineMinKnots points;
// with fewer it returns Ratio 0 and Exact false.
func sampleTest(ts, xs, ys []float64, periodic bool, period, size float64) sampling {
	m := len(ts)
	out := sampling{E2: nanSlice(m), E4: nanSlice(m)}
	keep := thinned(ts, periodic)
	k := len(keep)
	if k < 4*splineMinKnots {
		return out
	}
	kt, kx, ky := make([]float64, k), make([]float64, k), make([]float64, k)
	for j, i := range keep {
		kt[j], kx[j], ky[j] = ts[i], xs[i], ys[i]
	}
	e2, e4, e8 := nanSlice(k), nanSlice(k), nanSlice(k)
	predictInto(e2, kt, kx, ky, periodic, period, 2)
	predictInto(e4, kt, kx, ky, periodic, period, 4)
	if k >= 8*splineMinKnots {
		predictInto(e8, kt, kx, ky, periodic, period, 8)
	}
	for j, i := range keep {
		out.E2[i], out.E4[i] = e2[j], e4[j]
	}
	a2, a4, a8 := absFinite(e2), absFinite(e4), absFinite(e8)
	if len(a2) == 0 || len(a4) == 0 {
		return out
	}
	m2, m4 := median(a2), median(a4)
	// The robust RMS of the 2h errors (1.4826 × median of |e|).
	out.Noise = 1.4826 * m2 / math.Sqrt(sampleNoiseGain)
	switch {
	case m2 <= sampleFloat*size:
		out.Ratio, out.Exact = math.Inf(1), true
	default:
		out.Ratio = m4 / m2
		out.Exact = out.Ratio >= sampleExactRatio
		if len(a8) > 0 {
			// Noise shared by neighbouring points (a cut mesh) makes
			// the 2h predictions look good, from neighbours carrying the
			// same error; one scale up the neighbours are independent
			// and the ratio falls to about 1.
			out.Ratio8 = median(a8) / m4
			out.Exact = out.Exact && out.Ratio8 >= sampleExactRatio
		}
	}
	return out
}

// thinned returns the indices of the points the sampling test uses:
// every point but those closer (in the parameter ts) to the last point
// kept than sampleThin of the mean spacing around them. Points in tight
// clusters, as a plane cuts them from a mesh near its vertices, share
// their noise; one of each cluster is kept, so that a point is never
// predicted from a near copy of itself. The ends of an open fit are kept.
func thinned(ts []float64, periodic bool) []int {
	m := len(ts)
	if m < 2 {
		return []int{0}
	}
	keep := []int{0}
	for i := 1; i < m; i++ {
		lo, hi := max(0, i-sampleWindow), min(m-1, i+sampleWindow)
		mean := (ts[hi] - ts[lo]) / float64(hi-lo)
		if ts[i]-ts[keep[len(keep)-1]] >= sampleThin*mean || (!periodic && i == m-1) {
			if !periodic && i == m-1 && ts[i]-ts[keep[len(keep)-1]] < sampleThin*mean && len(keep) > 1 {
				keep[len(keep)-1] = i // the end replaces its near neighbour
				continue
			}
			keep = append(keep, i)
		}
	}
	return keep
}

// predictInto writes into e[j] the signed normal error with which the
// interpolating spline through every step-th point predicts point j,
// halfway between two of its knots, for every phase of the subsets. The
// ends of an open fit are in every subset (they pin the curve), so they
// are not predicted.
func predictInto(e, ts, xs, ys []float64, periodic bool, period float64, step int) {
	m := len(ts)
	half := step / 2
	// Each phase writes its own points (i ≡ phase + half modulo step), so
	// the phases of many points run on two cores.
	workers := 1
	if m >= predictParallel {
		workers = 2
	}
	par.For(step, workers, func(_, phase int) {
		w, _ := predictScratch.Get().(*predictWork)
		if w == nil {
			w = new(predictWork)
		}
		defer predictScratch.Put(w)
		keep := w.keep[:0]
		for i := phase; i < m; i += step {
			keep = append(keep, i)
		}
		if !periodic {
			if keep[0] != 0 {
				keep = slices.Insert(keep, 0, 0)
			}
			if keep[len(keep)-1] != m-1 {
				keep = append(keep, m-1)
			}
		}
		w.keep = keep
		if len(keep) < splineMinKnots {
			return
		}
		st := reuseFloats(w.st, len(keep))
		sx := reuseFloats(w.sx, len(keep))
		sy := reuseFloats(w.sy, len(keep))
		w.st, w.sx, w.sy = st, sx, sy
		for k, i := range keep {
			st[k], sx[k], sy[k] = ts[i], xs[i], ys[i]
		}
		if periodic && period-(st[len(st)-1]-st[0]) <= 0 {
			return
		}
		// The phase's problem, its fit and its columns are not used once
		// its points are predicted: the next phase builds in their storage.
		prob := splineRenewProblem(w.prob, st, nil, periodic, period)
		w.prob = prob
		f, err := prob.fit(0, [][]float64{sx, sy}, false)
		if err != nil {
			return
		}
		for i := phase + half; i < m; i += step {
			if !periodic && (i == 0 || i == m-1) {
				continue
			}
			e[i] = normalError(prob, f, ts[i], xs[i], ys[i], period)
		}
		prob.release(f)
	})
}

// predictWork is the storage of one phase of predictInto, which the next
// phase (of this or a later call) builds in: the subset's indices, knots
// and coordinates, and its spline problem.
type predictWork struct {
	keep       []int
	st, sx, sy []float64
	prob       *splineProblem
}

// predictScratch holds predictWork that no phase is using.
var predictScratch sync.Pool

// predictParallel is the number of knots from which predictInto fits its
// phases on two cores.
const predictParallel = 1024

// normalError returns the signed distance, along the normal of the spline
// f (columns x and y, on prob's knots) at parameter t, of (x, y) from the
// spline point at t.
func normalError(prob *splineProblem, f *splineFit, t, x, y, period float64) float64 {
	st := prob.ts
	if prob.periodic && t < st[0] {
		t += period
	}
	j := sort.SearchFloat64s(st, t) - 1
	j = max(0, min(j, len(prob.hs)-1))
	u := t - st[j]
	gx, dx, _ := poly(prob.piece(f.gs[0], f.gams[0], j), u)
	gy, dy, _ := poly(prob.piece(f.gs[1], f.gams[1], j), u)
	l := math.Hypot(dx, dy)
	if l == 0 {
		return math.NaN()
	}
	return ((x-gx)*dy - (y-gy)*dx) / l
}

func nanSlice(n int) []float64 {
	s := make([]float64, n)
	for i := range s {
		s[i] = math.NaN()
	}
	return s
}

// absFinite returns |v| for the finite entries of vs.
func absFinite(vs []float64) []float64 {
	out := make([]float64, 0, len(vs))
	for _, v := range vs {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			out = append(out, math.Abs(v))
		}
	}
	return out
}

// median returns the median of vs (the upper middle of an even count;
// vs is reordered); 0 for none.
func median(vs []float64) float64 {
	if len(vs) == 0 {
		return 0
	}
	return numeric.Nth(vs, len(vs)/2)
}

// fineOrder is a fit order with the ends the points draw at their own
// spacing, and the sampling test run on it.
type fineOrder struct {
	ends   trailingEnds
	pts    []geometry.Point
	knot   []int
	along  []float64
	sample sampling
}

// fineEnds returns the trailing-edge ends of c sought at the points' own
// spacing (detectEnds with no scatter, as for exact points) with their fit
// order, and true, when they differ from ends, found at the reach of the
// points' scatter, and the sampling test on that order finds the points
// exact.
//
// The scatter about parabolas through ten neighbours (localScatter) is
// noise on a dense scan, but on sparse exact points (a CAD polyline or a
// table at cosine stations) it is the outline's own curvature between
// them: corners sought at ten times that reach take the two 90° turns of
// a short blunt base, with a point or two on it, for one corner, and the
// base's points for surface points, which the fit then bends the
// surfaces' ends into. The sampling test decides which it is, and it is
// run on the order of the finer ends, so that it never predicts a point
// across the corners of the base (both ends of an open fit are kept, not
// predicted): a turn the spline cannot follow would pass for noise there.
// Noisy points fail the test on either order, and keep the ends found at
// the reach of their scatter.
func fineEnds(c *geometry.Contour, mode string, ends trailingEnds, perim float64) (fineOrder, bool) {
	f := fineOrder{ends: detectEnds(c.Points, mode, 0)}
	if sameEnds(f.ends, ends) {
		return f, false
	}
	var err error
	if f.pts, f.knot, f.along, err = fitOrder(c, f.ends, perim); err != nil {
		return f, false
	}
	m := len(f.pts)
	ws := make([]float64, m)
	for i := range ws {
		ws[i] = 1
	}
	// The points the test reads, as Fit's first round reads them.
	tp := newFitPoints(f.pts, ws, f.along, f.ends.open, m > sampleRawMax)
	f.sample = sampleTest(tp.ts, tp.xs, tp.ys, !f.ends.open, tp.period, perim)
	return f, f.sample.Exact
}

// sameEnds reports whether a and b cut the loop and order it alike.
func sameEnds(a, b trailingEnds) bool {
	return a.open == b.open && slices.Equal(a.order, b.order) && slices.Equal(a.base, b.base) && a.upper == nil && b.upper == nil && a.lower == nil && b.lower == nil
}
