package curve

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
	"github.com/foilwright/foilwright/internal/par"
)

// Fit methods, as reported in FitReport.Method and the section document.
const (
	FitInterpolate = "interpolate" // exact interpolation: noise 0 given, or the points are exact samples
	FitNoise       = "noise"       // smoothing set from the noise the user gave
	FitAuto        = "auto"        // smoothing set from the noise the points show
)

// Curve ends chosen by Fit, FitOptions.Ends and FitReport.Ends.
const (
	FitEndsAuto   = ""       // decide from the contour (corners at the trailing edge)
	FitEndsClosed = "closed" // periodic spline, smooth all round (rounded trailing edge)
	FitEndsOpen   = "open"   // open spline with both ends at the trailing edge
)

// FitOptions controls Fit. The zero value chooses the smoothing strength
// automatically (generalised cross-validation) and the curve ends from the
// contour.
type FitOptions struct {
	// Noise is the expected measurement noise in input units (a standard
	// deviation, normal to the surface). When positive, the smoothing strength
	// is chosen so that the RMS residual equals Noise. Zero means automatic
	// unless Exact is set.
	Noise float64
	// Exact interpolates every point (no smoothing): what "noise 0" means.
	Exact bool
	// Tolerance lists the points farther than this from the curve, in input
	// units, in FitReport.Beyond; they are not moved. Zero means 4 times the
	// larger of Noise (or the scatter, when it replaced cross-validation)
	// and the RMS residual, but at least ToleranceFloor of the contour's
	// perimeter; with Exact and Tolerance 0 nothing is listed.
	Tolerance float64
	// Ends is FitEndsAuto (default), FitEndsClosed or FitEndsOpen.
	Ends string
	// Edge, when set, is the trailing edge as the caller found it on the
	// points (the cleaning step does): Fit takes the curve's ends from it
	// and does not look for corners itself; Ends is then ignored.
	Edge *Edge
}

// Edge is the trailing edge of a contour as the caller found it
// (FitOptions.Edge). The contour starts at the end of the upper surface.
type Edge struct {
	// Closed asks for a periodic fit (a rounded edge, its tip at contour
	// point 0).
	Closed bool
	// Base is the number of points at the end of the contour that lie on
	// a blunt base: the fit leaves them out and measures them from the
	// straight base between the curve's ends (FitReport.Base).
	Base int
	// Upper and Lower are where an open curve starts and ends: the ends of
	// the upper and the lower surface, equal for a sharp edge. They are
	// added to the fit as end points (pinned by endWeight) unless they
	// coincide with contour point 0 and the last point before the base, so
	// a corner no point sampled is part of the curve.
	Upper, Lower geometry.Point
}

// endsOf returns the fit order of a contour of n points with the edge e.
func endsOf(e *Edge, n int) trailingEnds {
	if e.Closed || e.Base < 0 || e.Base > n-splineMinKnots {
		o := make([]int, n)
		for i := range o {
			o[i] = i
		}
		return trailingEnds{order: o}
	}
	m := n - e.Base
	o := make([]int, m)
	for i := range o {
		o[i] = i
	}
	var base []int
	for i := m; i < n; i++ {
		base = append(base, i)
	}
	up, lo := e.Upper, e.Lower
	return trailingEnds{open: true, order: o, base: base, upper: &up, lower: &lo}
}

// ToleranceFloor is the smallest automatic FitOptions.Tolerance, as a
// fraction of the contour's perimeter: on noise-free data (a CAD export)
// the residuals are round-off, and a tolerance of four times their RMS
// would list points a fraction of a nanometre off the curve.
const ToleranceFloor = 1e-6

// SetNoise sets the smoothing from a user value: "auto" (or "") for
// generalised cross-validation, "0" for exact interpolation, or a positive
// number (input units). It returns an error for anything else.
func (o *FitOptions) SetNoise(s string) error {
	s = strings.TrimSpace(s)
	if s == "" || strings.EqualFold(s, "auto") {
		o.Noise, o.Exact = 0, false
		return nil
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || v < 0 || math.IsInf(v, 0) || math.IsNaN(v) {
		return fmt.Errorf("geometry: noise %q: want auto, 0 or a positive length", s)
	}
	o.Noise, o.Exact = v, v == 0
	return nil
}

// FitReport says how the curve was fitted and how far it departs from every
// kept input point. Lengths are in input units.
type FitReport struct {
	Method string  // FitInterpolate, FitNoise or FitGCV
	Lambda float64 // smoothing parameter λ of the penalty λ∫|C''|² (0 for interpolation)
	Ends   string  // FitEndsClosed or FitEndsOpen
	// EffectiveParams is tr H(λ), the equivalent number of parameters per
	// coordinate (n for interpolation).
	EffectiveParams float64
	RMS, Max        float64 // RMS and largest |Residual|
	// NoiseEstimate is the noise (a standard deviation normal to the
	// outline) the points show: their scatter about a pilot curve that
	// smooths over a tenth of the feature scale, corrected for the freedom
	// the pilot takes up, or, where the points are too sparse for that,
	// the scatter the sampling test implies. 0 for interpolation.
	NoiseEstimate float64
	MaxAt         geometry.Origin // where the largest residual is
	// S[i] and Residual[i] belong to point i of the contour: the arc length
	// of its foot on the curve and its signed normal distance (positive
	// outside the loop). Points on the base of a blunt trailing edge (listed
	// in Base) are measured from the straight base between the curve ends,
	// with S at the nearer end.
	S, Residual []float64
	Beyond      []geometry.Origin // points farther than the tolerance, in contour order
	Tolerance   float64           // the tolerance used for Beyond
	Base        []geometry.Origin // points on a blunt trailing-edge base, left out of the fit
	// Scatter is the local scatter of the points about parabolas through
	// their neighbours (made before fitting, 0 with Exact): the scale at
	// which trailing-edge corners are sought.
	Scatter float64
	// Interpolates says why the curve passes through every point, when it
	// does: noise 0 was given, or the points are exact samples (the
	// sampling test, SampleRatio), or too few to tell noise from shape.
	Interpolates string
	// SampleRatio is the ratio of the errors with which interpolating
	// splines through every fourth and every second point predict the
	// points between their knots (the sampling test, sampling.go): near 1
	// for noisy points, 3 and more for exact samples of a smooth outline;
	// 0 when not measured.
	SampleRatio float64
	// Parameter names the parameter an interpolating fit runs in
	// (bins.go, chooseParameter): "chord length", "centripetal" or
	// "uniform"; empty for a smoothing fit (arc length of the feet).
	Parameter string
	// Smoothing is the smoothing length in units of the local feature
	// scale (the arc over which the outline turns by half a radian; see
	// smoothing.go); 0 when interpolating.
	Smoothing float64
	// Fairness measures the fitted curve (fairness.go); FairSteps counts
	// the doublings of λ the fairness guard made to take noise-made
	// wiggles out of the curvature.
	Fairness  Fairness
	FairSteps int
	// BinNoise is the noise of the bins of a dense fit when it replaced
	// the noise given (FitOptions.Noise over the square root of the points
	// a bin holds), because the bins scatter by more than binNoisier times
	// that (see passes); 0 otherwise. It is per bin, input units.
	BinNoise float64
	Warnings []string

	resampler *resampler // the final fit, for Replica and Half
}

// trailingEnds is the result of looking for corners at the trailing edge.
type trailingEnds struct {
	open  bool
	order []int // contour indices in fit order; for a sharp edge the first is repeated at the end
	base  []int // contour indices on a blunt base
	// upper and lower, when set, are end points added before and after
	// the order (FitOptions.Edge).
	upper, lower *geometry.Point
}

// sharpDeg are the turning angles (degrees) that make a corner: one
// vertex turning at least sharpDeg is a sharp edge; two vertices turning
// at least bluntDeg each, with a nearly straight base between them and at
// least bluntSumDeg together, are the corners of a blunt edge.
const (
	sharpDeg    = 110
	bluntDeg    = 40
	bluntSumDeg = 130
	baseDeg     = 20
	gapRatio    = 4 // a segment this many times the median spacing is a base
	baseSigmas  = 4 // largest distance of noisy base points from the line between the corners, in scatters
)

// detectEnds looks for a sharp corner or the two corners of a blunt base
// near index 0 of the counter-clockwise loop pts. It uses the turning angle
// between the chords to the k-th neighbours, k growing with the point count
// so that dense scans are not read point by point, and the chords reaching
// at least cornerScatter scatters along the outline so that noise is not
// read as corners. A strong turn spread over a run of points on a circle is
// a rounded end (roundedEnd) and gives a periodic fit.
//
// sigma is the scatter of the points (localScatter), 0 for clean data.
func detectEnds(pts []geometry.Point, mode string, sigma float64) trailingEnds {
	n := len(pts)
	at := func(i int) geometry.Point { return pts[((i%n)+n)%n] }
	idx := func(i int) int { return ((i % n) + n) % n }
	periodic := func() trailingEnds {
		o := make([]int, n)
		for i := range o {
			o[i] = i
		}
		return trailingEnds{order: o}
	}
	openAt := func(start int) trailingEnds { // ends at start−1 and start: blunt without base
		o := make([]int, n)
		for i := range o {
			o[i] = idx(start + i)
		}
		return trailingEnds{open: true, order: o}
	}
	if mode == FitEndsClosed {
		return periodic()
	}
	k := max(1, n/1000)
	w := max(4*k, n/16)
	// The chords reach at least k points and at least cornerScatter
	// times the scatter σ along the outline each way: on a noisy scan whose
	// spacing is comparable to the noise, the turning between neighbours is
	// mostly noise, and a wiggle of a few σ over a few points must not pass
	// for a corner. Over a chord of ℓ ≥ 10σ the noise tilts each chord by
	// about √2σ/ℓ ≤ 8°, well below the corner thresholds, while a rounded
	// end of radius r > ℓ still turns gradually, point by point.
	reach := cornerScatter * sigma
	kb := make([]int, 2*w+1) // points reached behind and ahead of each vertex
	kf := make([]int, 2*w+1)
	turn := make([]float64, 2*w+1) // turn[j] at vertex j−w
	for j := range turn {
		i := j - w
		kb[j], kf[j] = stencilReach(pts, i, -1, k, reach), stencilReach(pts, i, 1, k, reach)
		a, b := at(i).Sub(at(i-kb[j])), at(i+kf[j]).Sub(at(i))
		turn[j] = math.Atan2(a.Cross(b), a.Dot(b)) * 180 / math.Pi
	}
	top := 0
	for j := range turn {
		if turn[j] > turn[top] {
			top = j
		}
	}
	// A rounded end: the turning is spread over a run of points that lie
	// on a circle, within the scatter, whose radius the stencil resolves.
	if turn[top] >= bluntDeg && roundedEnd(pts, turn, kb, kf, top, w, k, sigma, reach) {
		return periodic()
	}
	// A blunt edge without base points (or a gap in the outline): a segment
	// in the corner region much longer than the spacing around it joins
	// the two ends.
	if turn[top] >= sharpDeg {
		var lens []float64
		for i := top - w - 4*k; i < top-w+4*k; i++ {
			lens = append(lens, at(i+1).Dist(at(i)))
		}
		med := append([]float64(nil), lens...)
		slices.Sort(med)
		long, li := 0.0, 0
		for j, l := range lens {
			if l > long {
				long, li = l, j
			}
		}
		if long > gapRatio*med[len(med)/2] {
			lower := idx(top - w - 4*k + li)
			return openAt(idx(lower + 1))
		}
	}
	if turn[top] >= sharpDeg {
		start := idx(top - w)
		o := make([]int, n+1)
		for i := 0; i < n; i++ {
			o[i] = idx(start + i)
		}
		o[n] = start
		return trailingEnds{open: true, order: o}
	}
	// Second corner: the largest turning beyond the first one's stencil.
	sec := -1
	for j := range turn {
		if j > top-max(k, kb[top]) && j < top+max(k, kf[top]) {
			continue
		}
		if sec < 0 || turn[j] > turn[sec] {
			sec = j
		}
	}
	if sec >= 0 && turn[top] >= bluntDeg && turn[sec] >= bluntDeg && turn[top]+turn[sec] >= bluntSumDeg {
		a, b := min(top, sec), max(top, sec) // a lower corner, b upper corner
		straight := true
		for j := a + k + 1; j < b-k; j++ {
			if j-kb[j] < a || j+kf[j] > b {
				continue // the chords reach past the corners
			}
			if math.Abs(turn[j]) >= baseDeg {
				straight = false
			}
		}
		if !straight && sigma > 0 && b-a >= 4 {
			// On noisy points the turning of a short base is mostly
			// noise: take it as straight when every point between the
			// corners lies within baseSigmas scatters of the line
			// fitted to them (principal axis).
			between := make([]geometry.Point, 0, b-a-1)
			for j := a + 1; j < b; j++ {
				between = append(between, at(j-w))
			}
			o, dir := geometry.MajorAxis(between)
			straight = true
			for _, p := range between {
				if math.Abs(dir.Cross(p.Sub(o))) > baseSigmas*sigma {
					straight = false
				}
			}
		}
		if straight {
			ia, ib := idx(a-w), idx(b-w)
			var base []int
			for i := idx(ia + 1); i != ib; i = idx(i + 1) {
				base = append(base, i)
			}
			var o []int
			for i := ib; ; i = idx(i + 1) {
				o = append(o, i)
				if i == ia {
					break
				}
			}
			return trailingEnds{open: true, order: o, base: base}
		}
	}
	if mode == FitEndsOpen {
		return openAt(0)
	}
	return periodic()
}

// cornerScatter is the least reach, in units of the scatter of the
// points, of the chords whose turning finds a corner.
const cornerScatter = 10

// stencilReach returns how many points from i (going the way of dir, ±1) the
// chord of the turning stencil reaches: at least k, and on until the arc
// along the polyline is at least reach, but at most an eighth of the loop.
func stencilReach(pts []geometry.Point, i, dir, k int, reach float64) int {
	n := len(pts)
	at := func(i int) geometry.Point { return pts[((i%n)+n)%n] }
	var arc float64
	for j := 1; j <= max(k, n/8); j++ {
		arc += at(i + dir*j).Dist(at(i + dir*(j-1)))
		if j >= k && arc >= reach {
			return j
		}
	}
	return max(k, n/8)
}

// Limits of a rounded end (roundedEnd).
const (
	roundRunDeg  = 15  // least turning of the points on the rounded end
	roundSpanDeg = 120 // least angle the end spans about its centre
	roundFit     = 2.5 // largest RMS residual of the circle, in scatters
	roundRel     = 0.02
	roundPoints  = 5 // least number of points on the end
)

// roundedEnd reports whether the turning around vertex top−w (turn,
// stencils kb, kf as in detectEnds) is a rounded end rather than a
// corner or the two corners of a blunt base: the run of vertices around it
// that turn at least roundRunDeg each must hold at least roundPoints
// points lying on a circle (RMS residual at most roundFit scatters, or
// roundRel of the radius on clean data) that span at least
// roundSpanDeg about its centre, with a radius no smaller than the
// stencil reach. A sharp corner fails the last test (its run is the width
// of the stencil, the fitted circle smaller than the reach), a blunt base
// fails the residual (its two corners and straight base are no circle).
func roundedEnd(pts []geometry.Point, turn []float64, kb, kf []int, top, w, k int, sigma, reach float64) bool {
	n := len(pts)
	at := func(i int) geometry.Point { return pts[((i%n)+n)%n] }
	lo, hi := top, top
	for lo > 0 && turn[lo-1] >= roundRunDeg {
		lo--
	}
	for hi < len(turn)-1 && turn[hi+1] >= roundRunDeg {
		hi++
	}
	if hi-lo+1 < roundPoints {
		return false
	}
	var run []geometry.Point
	for j := lo; j <= hi; j++ {
		run = append(run, at(j-w))
	}
	c, r, rms, ok := numeric.FitCircle(run)
	if !ok || rms > math.Max(roundFit*sigma, roundRel*r) {
		return false
	}
	// The stencil's own reach: the larger of the scatter reach and the
	// chord to the k-th neighbour.
	stencil := math.Max(reach, at(top-w).Dist(at(top-w+k)))
	if r < stencil {
		return false
	}
	// The outline must turn through roundSpanDeg across the run, from
	// the chord that arrives at its first point to the one that leaves its
	// last (a single corner of a blunt base turns about 90°) ...
	in := at(lo - w).Sub(at(lo - w - kb[lo]))
	out := at(hi - w + kf[hi]).Sub(at(hi - w))
	if math.Atan2(in.Cross(out), in.Dot(out))*180/math.Pi < roundSpanDeg {
		return false
	}
	// ... and the run must span as much about the centre (the run is in
	// order, so sum the signed steps).
	var span float64
	for j := 1; j < len(run); j++ {
		a, b := run[j-1].Sub(c), run[j].Sub(c)
		span += math.Atan2(a.Cross(b), a.Dot(b))
	}
	return math.Abs(span)*180/math.Pi >= roundSpanDeg
}

// endWeight is the weight of the two end points of an open fit (all
// other points weigh 1): it pins the curve ends to the trailing-edge points.
const endWeight = 1e4

// sampleRawMax is the most points whose sampling test reads the points
// themselves rather than their bins (see Fit).
const sampleRawMax = 100000

// Fit fits a cubic smoothing spline (Reinsch 1967, see spline.go) to the
// contour c, coordinates x(t) and y(t) separately with one smoothing
// parameter: periodic over the loop when the trailing edge is smooth, open
// with both ends at the trailing edge when it has a corner (sharp) or two
// (blunt, whose base points are left out). c must run counter-clockwise
// with index 0 at or near the trailing edge.
//
// How much it smooths, and where (smoothing.go):
//
//   - opts.Exact interpolates every point;
//   - otherwise the sampling test (sampling.go) first asks whether the
//     points are exact samples of a smooth outline (a CAD polyline): then
//     they are interpolated too, and FitReport.Interpolates says why;
//   - otherwise a pilot fit in the chord-length parameter gives each
//     point's foot (its arc length, the parameter of the final fit) and
//     the feature scale of the outline about it; the final fit smooths
//     each part over a length that grows with its feature scale, short at
//     the nose and at a rounded end, long along the surfaces, with one
//     factor chosen by the unbiased risk estimate for the noise (opts.Noise,
//     or the noise the points show by local regression), corrected for
//     noise that neighbouring points share (a cut mesh); a fairness guard
//     then smooths more wherever wiggles of the curvature remain along the
//     surfaces (fairness.go).
//
// Points farther than the tolerance are listed; gross outliers among them
// are down-weighted and the fit repeated (robustRounds). More than binFrom
// points are fitted through bins of neighbours (bins.go) and every point's
// residual is measured against the curve. Each fit costs O(n).
//
// The local scatter of the points (FitReport.Scatter, the spread about
// parabolas through 10 neighbours) sets the scale at which trailing-edge
// corners are sought.
//
// Fit returns an error wrapping ErrTooFewPoints for fewer than 8 distinct
// points, ErrNonFinite for NaN or infinite coordinates and ErrCollinear for
// points on a line.
func Fit(c *geometry.Contour, opts FitOptions) (*Curve, *FitReport, error) {
	perim, err := checkContour(c, opts)
	if err != nil {
		return nil, nil, err
	}
	// The scatter sets the scale at which corners are sought; it is not
	// needed when interpolating exactly.
	// With the trailing edge given it is only reported, and is measured on
	// a second core while the fit goes on.
	var scatter float64
	var scatterTask *par.Task
	if !opts.Exact {
		if opts.Edge != nil {
			scatterTask = par.Start(func() { scatter = localScatter(c.Points) })
			defer scatterTask.Wait()
		} else {
			scatter = localScatter(c.Points)
		}
	}
	var ends trailingEnds
	if opts.Edge != nil {
		ends = endsOf(opts.Edge, c.Len())
	} else {
		ends = detectEnds(c.Points, opts.Ends, scatter)
	}

	pts, knot, along, err := fitOrder(c, ends, perim)
	if err != nil {
		return nil, nil, err
	}
	// The sampling test, when it has been run on the order taken already.
	var sampled *sampling
	if opts.Edge == nil && !opts.Exact && opts.Noise == 0 && scatter > 0 {
		if f, ok := fineEnds(c, opts.Ends, ends, perim); ok {
			ends, pts, knot, along, sampled = f.ends, f.pts, f.knot, f.along, &f.sample
		}
	}
	m := len(pts)
	ws := make([]float64, m)
	for i := range ws {
		ws[i] = 1
	}
	// The ends of an open fit are pinned to the trailing-edge points when
	// interpolating; a smoothing fit leaves them free (the corner point of
	// a sharp edge, at both ends, counts half at each) and rebuilds the
	// corner afterwards (corner.go).
	sharp := ends.open && len(ends.base) == 0 && ends.order[0] == ends.order[len(ends.order)-1]
	if ends.open {
		switch {
		case opts.Exact || (!sharp && len(ends.base) < 2):
			// Interpolation, or the two sides of a gap, which end where
			// the points do.
			ws[0], ws[m-1] = endWeight, endWeight
		case sharp:
			ws[0], ws[m-1] = 0.5, 0.5
		}
	}
	rep := &FitReport{Ends: FitEndsClosed} // Scatter is set at the end
	if ends.open {
		rep.Ends = FitEndsOpen
	}
	st := &smoothState{}
	if e := opts.Edge; e != nil && ends.open && len(ends.base) == 0 && ends.upper != nil && ends.lower != nil && *ends.upper == *ends.lower {
		st.corner = true
		st.cornerData = c.Points[ends.order[0]].Dist(*ends.upper) <= 1e-12*perim
	}
	switch {
	case opts.Exact:
		rep.Method = FitInterpolate
		rep.Interpolates = "noise 0 was given"
		st.exact = true
	case opts.Noise > 0:
		rep.Method = FitNoise
	default:
		rep.Method = FitAuto
	}
	baseSet := make(map[int]bool, len(ends.base))
	for _, i := range ends.base {
		baseSet[i] = true
		rep.Base = append(rep.Base, originOf(c, i))
	}
	var cv *Curve
	for round := 0; ; round++ {
		fp := newFitPoints(pts, ws, along, ends.open, !st.exact)
		if round == 0 && !opts.Exact {
			// The sampling test reads the points themselves, not their
			// bins: a bin's centroid sits off a curved outline by the
			// sagitta of its points, which would pass for noise.
			// Above sampleRawMax points the bins' sagitta (κh²/8 for
			// points h apart) is far below any noise a scan leaves, and a
			// test on every point would double the fit's memory (a
			// million-point scan: 330 → 700 MiB).
			tp := fp
			if fp.of != nil && m <= sampleRawMax {
				tp = newFitPoints(pts, ws, along, ends.open, false)
			}
			if sampled != nil {
				st.sample = *sampled
			} else {
				st.sample = sampleTest(tp.ts, tp.xs, tp.ys, !ends.open, tp.period, perim)
			}
			rep.SampleRatio = st.sample.Ratio
			if opts.Noise == 0 {
				switch {
				case st.sample.Ratio == 0:
					st.exact = true
					rep.Method = FitInterpolate
					rep.Interpolates = fmt.Sprintf("too few points (%d) to tell noise from shape", m)
				case st.sample.Exact:
					st.exact = true
					rep.Method = FitInterpolate
					rep.Interpolates = exactReason(st.sample)
				}
				if st.exact && ends.open && ws[0] < endWeight {
					// Exact points are interpolated, ends and all.
					ws[0], ws[m-1] = endWeight, endWeight
					tp = newFitPoints(pts, ws, along, ends.open, false)
				}
				if st.exact {
					fp = tp // exact samples are interpolated, every one
				}
			}
		}
		if st.exact {
			rep.Parameter = fp.chooseParameter(!ends.open)
		}
		var err error
		cv, err = passes(fp, ends.open, ends.open && ws[0] < endWeight, opts, st, rep)
		if err != nil {
			return nil, nil, err
		}
		if ends.open {
			eb := newEndRebuild(c, ends, sharp, pts)
			if !st.exact {
				cv = rebuildEnds(cv, eb)
			}
			st.final.ends = eb
		}
		fk := make([]int, len(knot))
		for i, j := range knot {
			fk[i] = fp.index(j)
		}
		residuals(c, cv, fk, baseSet, rep)
		if fp.of != nil && !st.exact {
			// The noise of single points, from their residuals: the
			// curve takes up a negligible share of their freedom.
			rep.NoiseEstimate = robustSigma(rep.Residual)
		}
		rep.Tolerance = opts.Tolerance
		if rep.Tolerance == 0 && st.exact && !opts.Exact {
			// Exact samples, found so: a floor, as for any automatic
			// tolerance.
			rep.Tolerance = ToleranceFloor * perim
		}
		if rep.Tolerance == 0 && !st.exact {
			noise := opts.Noise
			if noise == 0 {
				noise = rep.NoiseEstimate
			}
			rep.Tolerance = math.Max(4*math.Max(noise, rep.RMS), ToleranceFloor*perim)
		}
		if st.exact || rep.Tolerance == 0 || round == robustRounds {
			break
		}
		// Points beyond the tolerance are listed, not moved. Those that are
		// also gross outliers (beyond outlierSigmas robust standard
		// deviations) get a tiny weight so that they do not drag the curve
		// towards them.
		cut := math.Max(rep.Tolerance, outlierSigmas*robustSigma(rep.Residual))
		changed := false
		for i, r := range rep.Residual {
			if j := knot[i]; j >= 0 && math.Abs(r) > cut && ws[j] > outlierWeight && j > 0 && j < m-1 {
				ws[j] = outlierWeight
				changed = true
			}
		}
		if !changed {
			break
		}
	}
	finishReport(c, opts, len(pts), rep)
	rep.resampler = st.final
	if scatterTask != nil {
		scatterTask.Wait()
	}
	rep.Scatter = scatter
	return cv, rep, nil
}

// rebuildEnds rebuilds the trailing-edge corners of a smoothed open fit
// (corner.go): the sharp corner where the branches meet, or each corner of
// a blunt edge where its branch meets the line through the base points.
// An open end without base points (a gap) is left where the fit put it.
func rebuildEnds(cv *Curve, e endRebuild) *Curve {
	switch {
	case e.sharp:
		return joinCorner(cv, e.h)
	case e.base:
		return toBase(cv, e.o, e.dir)
	}
	return cv
}

// endRebuild says how rebuildEnds rebuilds the ends of a smoothed open fit:
// a sharp corner (with h the spacing of the points at the ends), or the
// corners on the base line through o in direction dir.
type endRebuild struct {
	sharp, base bool
	h           float64
	// reach is the spacing that may hide the part's end beyond the last
	// points, for the accuracy estimate (endStretch, FitReport.EndGap).
	reach  float64
	o, dir geometry.Point
	// nBase is the number of base points, spread their RMS distance along
	// the base from o: how well they fix the line (Replica).
	nBase  int
	spread float64
}

// newEndRebuild returns how the ends of the open fit of c with ends are
// rebuilt; pts are the points in fit order.
func newEndRebuild(c *geometry.Contour, ends trailingEnds, sharp bool, pts []geometry.Point) endRebuild {
	e := endRebuild{sharp: sharp, h: endSpacing(pts), reach: endStretch(pts)}
	if sharp || len(ends.base) < 2 {
		return e
	}
	base := make([]geometry.Point, len(ends.base))
	for k, i := range ends.base {
		base[k] = c.Points[i]
	}
	o, dir := geometry.MajorAxis(base)
	e.base, e.o, e.dir = true, o, dir
	e.nBase = len(ends.base)
	for _, i := range ends.base {
		u := c.Points[i].Sub(o).Dot(e.dir)
		e.spread += u * u
	}
	e.spread = math.Sqrt(e.spread / float64(e.nBase))
	return e
}

// endSpacing returns the median spacing of the endSpan points at either
// end of pts (fit order).
func endSpacing(pts []geometry.Point) float64 {
	m := len(pts)
	var gaps []float64
	for i := 1; i <= min(endSpan, m-1); i++ {
		gaps = append(gaps, pts[i].Dist(pts[i-1]), pts[m-i].Dist(pts[m-i-1]))
	}
	return median(gaps)
}

// endStretch returns the length-biased mean of the endSpan spacings at
// either end of pts (fit order),
//
//	Σ g² / Σ g,
//
// the expected length of the spacing a point of the outline, the part's
// unseen end, falls into when the spacings come in random order (the
// inspection paradox of renewal theory; see W. Feller, An Introduction to
// Probability Theory and Its Applications, vol. 2, 2nd ed., Wiley, 1971,
// section XI.4): the stretch the surfaces may run on beyond the last
// points. Unlike the median (endSpacing) it is not set by points
// measured twice a hair apart, which halve the spacings between the
// stations that were measured but leave the distance to the next one
// unchanged. It equals the spacing of evenly spaced points.
func endStretch(pts []geometry.Point) float64 {
	m := len(pts)
	var s1, s2 float64
	for i := 1; i <= min(endSpan, m-1); i++ {
		for _, g := range []float64{pts[i].Dist(pts[i-1]), pts[m-i].Dist(pts[m-i-1])} {
			s1 += g
			s2 += g * g
		}
	}
	if !(s1 > 0) {
		return 0
	}
	return s2 / s1
}

// binNoisier is how many times the noise a bin should carry (the noise
// given over √count) its measured scatter must exceed before it is taken
// for the bins' noise (passes): well beyond the estimate's own spread
// over a thousand bins, a few per cent.
const binNoisier = 1.5

// endSpan is the number of gaps at each end over which endSpacing takes
// the median.
const endSpan = 10

// checkContour checks the contour and options Fit is given and returns
// the perimeter of the contour.
func checkContour(c *geometry.Contour, opts FitOptions) (float64, error) {
	n := c.Len()
	if n < splineMinKnots {
		return 0, fmt.Errorf("geometry: fit: %w: %d point(s), need at least %d", geometry.ErrTooFewPoints, n, splineMinKnots)
	}
	for i, p := range c.Points {
		if !p.IsFinite() {
			return 0, fmt.Errorf("geometry: fit: point %d (%s): %w", i, originOf(c, i), geometry.ErrNonFinite)
		}
	}
	if opts.Noise < 0 || math.IsNaN(opts.Noise) || math.IsInf(opts.Noise, 0) {
		return 0, fmt.Errorf("geometry: fit: noise %g: want 0 or a positive length", opts.Noise)
	}
	switch opts.Ends {
	case FitEndsAuto, FitEndsClosed, FitEndsOpen:
	default:
		return 0, fmt.Errorf("geometry: fit: ends %q: want closed or open", opts.Ends)
	}
	var perim float64
	for i := range c.Points {
		perim += c.Points[i].Dist(c.Points[(i+1)%n])
	}
	if a := geometry.SignedArea(c.Points); math.Abs(a) <= 1e-9*perim*perim {
		return 0, fmt.Errorf("geometry: fit: %w", geometry.ErrCollinear)
	}
	return perim, nil
}

// fitOrder returns the contour points in fit order (ends.order) without
// coincident neighbours, knot[i], the index among them of contour point i
// (−1 for points on a blunt base), and, when the contour carries its
// positions along the loop (Contour.Along), those of the fit points (nil
// otherwise; an added end point lies its distance beyond its neighbour).
func fitOrder(c *geometry.Contour, ends trailingEnds, perim float64) ([]geometry.Point, []int, []float64, error) {
	n := c.Len()
	knot := make([]int, n)
	for i := range knot {
		knot[i] = -1
	}
	useAlong := len(c.Along) == n
	// Room for every point and both added ends: grown by appends, the
	// slices copied each point about twice more.
	pts := make([]geometry.Point, 0, len(ends.order)+2)
	var along []float64
	if useAlong {
		along = make([]float64, 0, len(ends.order)+2)
	}
	upperAdded := false
	if ends.upper != nil {
		pts = append(pts, *ends.upper)
		along = append(along, 0)
		upperAdded = true
	}
	for _, ci := range ends.order {
		p := c.Points[ci]
		if len(pts) > 0 && p.Dist(pts[len(pts)-1]) <= 1e-12*perim {
			if knot[ci] < 0 {
				knot[ci] = len(pts) - 1
			}
			continue
		}
		if knot[ci] < 0 {
			knot[ci] = len(pts)
		}
		pts = append(pts, p)
		if useAlong {
			a := c.Along[ci]
			if len(along) > 0 && a < along[len(along)-1] {
				a += c.Along[n-1] + c.Points[n-1].Dist(c.Points[0]) // a closed fit's wrap
			}
			along = append(along, a)
		}
	}
	if useAlong && upperAdded && len(along) > 1 {
		along[0] = along[1] - pts[0].Dist(pts[1])
	}
	if ends.lower != nil && (len(pts) == 0 || ends.lower.Dist(pts[len(pts)-1]) > 1e-12*perim) {
		if useAlong && len(pts) > 0 {
			along = append(along, along[len(along)-1]+ends.lower.Dist(pts[len(pts)-1]))
		}
		pts = append(pts, *ends.lower)
	}
	if !ends.open && len(pts) > 1 && pts[len(pts)-1].Dist(pts[0]) <= 1e-12*perim {
		pts = pts[:len(pts)-1]
		if useAlong {
			along = along[:len(along)-1]
		}
	}
	if len(pts) < splineMinKnots {
		return nil, nil, nil, fmt.Errorf("geometry: fit: %w: %d distinct point(s), need at least %d", geometry.ErrTooFewPoints, len(pts), splineMinKnots)
	}
	if !useAlong {
		along = nil
	}
	return pts, knot, along, nil
}

// finishReport completes rep once the fit is done: the noise estimate,
// the points beyond the tolerance and the warnings, each once. n is the
// number of points fitted.
func finishReport(c *geometry.Contour, opts FitOptions, n int, rep *FitReport) {
	rep.Beyond = nil
	if rep.Tolerance > 0 {
		for i, r := range rep.Residual {
			if math.Abs(r) > rep.Tolerance {
				rep.Beyond = append(rep.Beyond, originOf(c, i))
			}
		}
	}
	seen := map[string]bool{}
	var ws2 []string
	for _, w := range rep.Warnings {
		if !seen[w] {
			seen[w] = true
			ws2 = append(ws2, w)
		}
	}
	rep.Warnings = ws2
	if len(rep.Beyond) > 0 {
		unit := string(c.Units)
		if c.Units == geometry.ChordUnit {
			unit = "c"
		}
		rep.Warnings = append(rep.Warnings, strings.TrimSpace(fmt.Sprintf("%d point(s) farther than %.3g %s from the curve (worst %.3g %s at %s)", len(rep.Beyond), rep.Tolerance, unit, rep.Max, unit, rep.MaxAt)))
	}
}

// knotU returns the local parameter of knot j on its piece (0, or the end
// of the last piece for the last knot of an open curve).
func knotU(cv *Curve, j int) float64 {
	if j >= cv.Pieces() {
		return cv.Span(cv.Pieces() - 1)
	}
	return 0
}

// segmentSide returns the signed distance of p from segment a→b,
// positive to the right of the direction of travel (outside a
// counter-clockwise loop).
func segmentSide(p, a, b geometry.Point) float64 {
	d := b.Sub(a)
	l := d.Norm()
	if l == 0 {
		return p.Dist(a)
	}
	tt := math.Max(0, math.Min(1, p.Sub(a).Dot(d)/(l*l)))
	q := a.Add(d.Scale(tt))
	dist := p.Dist(q)
	if d.Cross(p.Sub(a)) > 0 {
		return -dist
	}
	return dist
}

func originOf(c *geometry.Contour, i int) geometry.Origin {
	if i < len(c.Origins) {
		return c.Origins[i]
	}
	return geometry.Origin{File: fmt.Sprintf("point %d", i+1)}
}

// medianStep returns the median parameter step of p (the point spacing).
func medianStep(p *splineProblem) float64 {
	hs := append([]float64(nil), p.hs...)
	return numeric.Nth(hs, len(hs)/2)
}

// minimise returns the λ that minimises crit(log λ) over [lo, hi] (or
// within hintSpan of log hint when hint > 0).
func minimise(crit func(float64) float64, lo, hi, hint, hintSpan float64) float64 {
	ll, _ := minimiseLog(crit, lo, hi, hint, hintSpan)
	return math.Exp(ll)
}

// minimiseLog scans crit on a grid over [lo, hi] and refines the best
// sample by golden-section search. atEdge reports that the weakest
// smoothing tried was best. The grid's samples are independent and are
// taken on two cores, and the search looks a step ahead on the second
// (goldenAhead): crit must be safe to call from two goroutines at once (a
// spline problem's fits are).
func minimiseLog(crit func(float64) float64, lo, hi, hint, hintSpan float64) (ll float64, atEdge bool) {
	grid := 20
	if hint > 0 {
		lo, hi, grid = math.Log(hint)-hintSpan, math.Log(hint)+hintSpan, 6
	}
	vals := make([]float64, grid+1)
	par.For(grid+1, 2, func(_, k int) {
		vals[k] = crit(lo + (hi-lo)*float64(k)/float64(grid))
	})
	best, bestV := 0, math.Inf(1)
	for k, v := range vals {
		if v < bestV {
			best, bestV = k, v
		}
	}
	a := lo + (hi-lo)*float64(max(best-1, 0))/float64(grid)
	b := lo + (hi-lo)*float64(min(best+1, grid))/float64(grid)
	return goldenAhead(crit, a, b, 14), best == 0
}

// normalRMS returns the RMS of the residuals projected on the curve
// normal at each knot, a cheap stand-in for the distance to the curve; each
// point counts with its weight capped at 1, so down-weighted outliers drop
// out.
func normalRMS(p *splineProblem, f *splineFit, xs, ys []float64) float64 {
	rs := normalResiduals(p, f, xs, ys)
	var ss, sw float64
	for i, r := range rs {
		if math.IsNaN(r) {
			continue
		}
		w := math.Min(p.ws[i], 1)
		ss += w * r * r
		sw += w
	}
	return math.Sqrt(ss / sw)
}

// normalResiduals returns the residual of every point normal to the fit
// at its knot (NaN where the tangent vanishes; weights are not applied).
func normalResiduals(p *splineProblem, f *splineFit, xs, ys []float64) []float64 {
	n := p.n()
	out := make([]float64, n)
	for i := 0; i < n; i++ {
		var dx, dy float64
		if i < len(p.hs) {
			dx, dy = p.piece(f.gs[0], f.gams[0], i)[1], p.piece(f.gs[1], f.gams[1], i)[1]
		} else {
			j := len(p.hs) - 1
			h := p.hs[j]
			_, dx, _ = poly(p.piece(f.gs[0], f.gams[0], j), h)
			_, dy, _ = poly(p.piece(f.gs[1], f.gams[1], j), h)
		}
		l := math.Hypot(dx, dy)
		if l == 0 {
			out[i] = math.NaN()
			continue
		}
		out[i] = ((xs[i]-f.gs[0][i])*dy - (ys[i]-f.gs[1][i])*dx) / l
	}
	return out
}

// robustRounds is how many times the fit is repeated with the points
// beyond the tolerance down-weighted to outlierWeight.
const (
	minStep       = 0.05 // least ratio of a reparametrised step to its chord-length step
	robustRounds  = 2
	outlierWeight = 1e-4
	outlierSigmas = 6
)

// robustSigma returns 1.4826 times the median absolute residual, a
// standard deviation that outliers do not inflate.
func robustSigma(rs []float64) float64 {
	a := make([]float64, len(rs))
	for i, r := range rs {
		a[i] = math.Abs(r)
	}
	return 1.4826 * numeric.Nth(a, len(a)/2)
}

// smoothState is what the rounds of Fit share: the verdict of the
// sampling test, the feature scales and the smoothing chosen so far.
type smoothState struct {
	final  *resampler // the last fit, for replicas
	sample sampling
	exact  bool      // interpolate
	T      []float64 // feature scale at each fit point, from the first round
	lambda float64   // λ of the last round (a hint for the next)
	pilot  float64   // λ of the last pilot pass
	// corner says that both ends of an open fit are pinned to one sharp
	// corner the caller found, whose place a smoothing fit takes as an
	// unknown (freecorner.go); cornerData that a point sampled it (the
	// first fit point, then also a data point).
	corner, cornerData bool
}

// exactReason says why points the sampling test found exact are
// interpolated.
func exactReason(s sampling) string {
	if math.IsInf(s.Ratio, 1) {
		return "the points lie on a smooth curve to the last digits (exact data)"
	}
	return fmt.Sprintf("the points are exact samples: the spline through every fourth point misses the others %.3g times as far as the spline through every second point (noise would give about 1)", s.Ratio)
}

// passes fits the curve in two passes. An exact fit interpolates the
// points in the chord-length parameter ts. Otherwise the first pass
// smooths in ts with one λ for every point, for the noise given or the
// noise of the sampling test, as a pilot of the shape; the second pass
// takes as parameters the arc lengths of the points' feet on the pilot,
// the feature scales along it, and smooths each part over a length in
// proportion to its feature scale with the factor the risk estimate
// chooses (smoothing.go). It records λ, tr H, the smoothing factor and
// the noise estimate in rep.
func passes(fp fitPoints, open, freeEnds bool, opts FitOptions, st *smoothState, rep *FitReport) (*Curve, error) {
	pts, ts, ws, xs, ys, period := fp.pts, fp.ts, fp.ws, fp.xs, fp.ys, fp.period
	m := len(pts)
	cols := [][]float64{xs, ys}
	// The noise the user gave, per fit point: a bin averages its points.
	userNoise := opts.Noise / math.Sqrt(fp.count)
	if st.exact {
		prob := splineNewProblem(ts, ws, !open, period)
		f, err := prob.fit(0, cols, false)
		if err != nil {
			return nil, fmt.Errorf("geometry: fit: %w", err)
		}
		rep.Lambda, rep.EffectiveParams, rep.Smoothing, rep.NoiseEstimate = 0, float64(m), 0, 0
		st.final = newResampler(prob, f, xs, ys, 0, 0, open, false)
		return fromFit(prob, f, !open), nil
	}
	c := critWeights(ws)

	// Pass 1: the pilot of the shape.
	sigma0 := userNoise
	if sigma0 == 0 {
		sigma0 = st.sample.Noise
	}
	prob0 := splineNewProblem(ts, ws, !open, period)
	span := ts[m-1] - ts[0]
	if !open {
		span = period
	}
	hbar := span / float64(len(prob0.hs))
	// λ ≈ ℓ⁴/h̄ for a smoothing length ℓ; search ℓ from 10⁻² h̄ to span/2.
	lo, hi := math.Log(1e-8*hbar*hbar*hbar), math.Log(math.Pow(span/2, 4)/hbar)
	lp := 0.0
	hint := st.pilot
	var (
		nts, s, w     []float64
		nperiod, mean float64
		prob          *splineProblem
		noise, tau    float64
		tauLong       float64
		profile       []float64
		binsNoisier   bool
	)
	for try := 0; ; try++ {
		lambda0 := riskLambda(prob0, xs, ys, c, sigma0, 1, lo, hi, hint)
		st.pilot = lambda0
		f0, err := prob0.fit(lambda0, cols, false)
		if err != nil {
			return nil, fmt.Errorf("geometry: fit: %w", err)
		}
		cv0 := fromFit(prob0, f0, !open)

		// Pass 2: arc-length parameter, feature scales, adaptive smoothing.
		nts, nperiod = reparametrise(cv0, pts, ts, open, period)
		s = make([]float64, m)
		for i := range s {
			s[i] = nts[i] - nts[0]
		}
		st.T = featureScales(cv0, s, open)
		// The weights and the problem they make, and the local noise,
		// read the same positions and feature scales and nothing of each
		// other: the weights are made on a second core while the noise is
		// measured (a panic there is raised again here).
		var failed any
		weigh := par.Start(func() {
			defer func() { failed = recover() }()
			a, mn := arcWeights(nts, st.T, !open, nperiod, featurePower, spacingPower)
			wt := make([]float64, m)
			for i := range wt {
				wt[i] = ws[i] * a[i]
			}
			w, mean, prob = wt, mn, splineNewProblem(nts, wt, !open, nperiod)
		})
		if !open {
			lp = nperiod
		}
		noise, tau, tauLong, _, profile = localNoise(xs, ys, s, st.T, c, lp)
		weigh.Wait()
		if failed != nil {
			panic(failed)
		}
		// The noise given is per point, and a bin of count points is
		// taken to average it down by √count. The bins of a band are
		// runs of points in the order of their feet on a curve drawn
		// through the band, an order the noise itself sets, so their
		// centroids need not average it out: when the bins scatter
		// about the pilot by more than binNoisier times the noise they
		// should carry, that scatter is their noise (a dense scan,
		// campaign seed 558: bins scatter 0.0086 mm where 0.0296 mm over
		// √51 points gives 0.0041 mm). The pilot is then made again at
		// that noise: one that follows the bins' noise turns sharply
		// at an open end, and the feature scales it gives shrink the
		// smoothing along the whole of the trailing edge's stretch.
		if try > 0 || fp.of == nil || userNoise == 0 || !(noise > binNoisier*userNoise) {
			break
		}
		binsNoisier = true
		sigma0, hint = noise, 0
	}
	rep.NoiseEstimate = noise
	sigma := userNoise
	if sigma == 0 || binsNoisier {
		sigma = noise
	}
	rep.BinNoise = 0
	if binsNoisier {
		rep.BinNoise = noise
	}
	var lambda float64
	llo, lhi := math.Log(lambdaOfBeta(betaMin, mean)), math.Log(lambdaOfBeta(betaMax, mean))
	switch {
	case userNoise > 0:
		lambda = riskLambda(prob, xs, ys, c, sigma, tau, llo, lhi, st.lambda)
	case sigma > 0:
		lambda = riskLambda(prob, xs, ys, c, sigma, tau, llo, lhi, st.lambda)
	}
	st.lambda = lambda
	// The fairness guard: noise the risk estimate left in the curve
	// (noise shared by neighbours that it could not tell from shape)
	// shows as wiggles; smooth more until there are none.
	Tat := func(sv float64) float64 {
		j := searchSorted(s, sv)
		return st.T[max(0, min(j, m-1))]
	}
	if lambda > 0 {
		period := nperiod
		prevProb := prob
		w0 := w
		for step := 0; step < fairSteps; step++ {
			f, err := prob.fit(lambda, cols, false)
			if err != nil {
				// Smoothed past what the system can carry: the step
				// before stands.
				prob = prevProb
				rep.FairSteps--
				break
			}
			fr := MeasureFairness(fromFit(prob, f, !open), Tat, sigma)
			lobes := fr.lobes
			if step < dipSteps {
				// Dips of the curvature round the nose get a few
				// steps only: where the points cannot tell a dip from
				// the shape (a sparse, rounded end), smoothing on would
				// take the curve off them.
				lobes = append(lobes[:len(lobes):len(lobes)], fr.dips...)
			}
			if len(lobes) == 0 {
				break
			}
			// Smooth more about each wiggle: the weights of the points
			// within a lobe's length of it drop by fairGrow for each lobe,
			// but to no less than fairFloor of what the risk estimate gave
			// them: on dense noisy scans many lobes overlap, and weights
			// without a floor fell to 1e-24 of their start, where the
			// spline system is no longer positive definite in floating
			// point.
			w = append([]float64(nil), w...)
			for _, lb := range lobes {
				pad := lb[1] - lb[0]
				for i, si := range s {
					d := si
					if !open && d > lb[1]+pad {
						d -= period
					}
					if d >= lb[0]-pad && d <= lb[1]+pad {
						w[i] = math.Max(w[i]/fairGrow, fairFloor*w0[i])
					}
				}
			}
			prevProb = prob
			prob = splineNewProblem(nts, w, !open, nperiod)
			rep.FairSteps++
		}
	}
	var f *splineFit
	var err error
	var cornerRatio float64
	if st.corner && open && !freeEnds && lambda > 0 {
		// A sharp corner the caller found: its place is fitted too
		// (freecorner.go).
		if st.cornerData {
			cornerRatio = 1 / fp.ws[0] // knot 0's weight as a data point, per unit of its pinned weight
		}
		f, err = cornerFit(prob, lambda, xs, ys, cornerRatio*prob.ws[0], true)
	} else {
		f, err = prob.fit(lambda, cols, true)
	}
	if err != nil {
		return nil, fmt.Errorf("geometry: fit: %w", err)
	}
	if open && freeEnds && lambda > 0 {
		if fc, ok := endCorrected(prob, xs, ys, lambda, f); ok {
			fc.trace = f.trace
			f = fc
		}
	}
	rep.Lambda, rep.EffectiveParams, rep.Smoothing = lambda, f.trace, betaOfLambda(lambda, mean)
	st.final = newResampler(prob, f, xs, ys, lambda, sigma, open, freeEnds)
	st.final.setGrowth(profile, noise)
	st.final.setCorrelation(c, tau, tauLong, f.trace, outlierSigmas*noise)
	st.final.corner = st.corner && open && !freeEnds
	st.final.cornerRatio = cornerRatio
	cv := fromFit(prob, f, !open)
	rep.Fairness = MeasureFairness(cv, Tat, sigma)
	return cv, nil
}

// The fairness guard divides the weights about a wiggle by fairGrow at
// most fairSteps times.
const (
	fairGrow  = 2
	fairSteps = 16
	// fairFloor is the least share of its weight a point keeps.
	fairFloor = 1e-8
	// dipSteps is the most steps the guard takes for dips of the
	// curvature (Fairness.Ripples): their weights fall to no less than an
	// eighth.
	dipSteps = 3
)

// reparametrise returns the arc lengths of the feet of the points on cv
// (from the foot of the first point on a closed curve), kept increasing by
// at least minStep of each chord-length step, and the period of a closed
// curve (its length). When the feet leave too short a closing step, the
// chord-length parameter stands.
func reparametrise(cv *Curve, pts []geometry.Point, ts []float64, open bool, period float64) ([]float64, float64) {
	m := len(pts)
	L := cv.Length()
	nts := make([]float64, m)
	var s0 float64
	for i, p := range pts {
		s, _ := cv.residual(p, min(i, cv.Pieces()-1), knotU(cv, i))
		if !open {
			if i == 0 {
				s0 = s
			}
			s -= s0
			if s < 0 {
				s += L
			}
			if i == 0 {
				s = 0
			}
		}
		if i > 0 {
			// Feet of dense, noisy points can crowd or swap; keep every
			// step at least a twentieth of its chord-length step so the
			// system stays well conditioned.
			s = math.Max(s, nts[i-1]+minStep*(ts[i]-ts[i-1]))
		}
		nts[i] = s
	}
	if !open {
		closing := period - (ts[m-1] - ts[0])
		if L-nts[m-1] < minStep*closing {
			return ts, period
		}
		return nts, L
	}
	return nts, period
}

// residuals fills S, Residual, RMS, Max and MaxAt of rep for every
// contour point.
func residuals(c *geometry.Contour, cv *Curve, knot []int, base map[int]bool, rep *FitReport) {
	n := c.Len()
	rep.S = make([]float64, n)
	rep.Residual = make([]float64, n)
	rep.Max, rep.MaxAt = 0, geometry.Origin{}
	// Each point's foot on its own, on two cores in chunks; the sums in
	// order after.
	chunks(n, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			p := c.Points[i]
			if base[i] {
				a, b := cv.End(), cv.Start()
				rep.Residual[i] = segmentSide(p, a, b)
				if p.Dist(a) <= p.Dist(b) {
					rep.S[i] = cv.Length()
				}
			} else {
				j := knot[i]
				rep.S[i], rep.Residual[i] = cv.residual(p, min(j, cv.Pieces()-1), knotU(cv, j))
			}
		}
	})
	var sum2 float64
	for i := range c.Points {
		r := rep.Residual[i]
		sum2 += r * r
		if math.Abs(r) > rep.Max {
			rep.Max = math.Abs(r)
			rep.MaxAt = originOf(c, i)
		}
	}
	rep.RMS = math.Sqrt(sum2 / float64(n))
}
