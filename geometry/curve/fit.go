package curve

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
)

// Fit methods, as reported in FitReport.Method and the section document.
const (
	FitInterpolate = "interpolate" // exact interpolation (noise 0)
	FitNoise       = "noise"       // smoothing set from the expected noise
	FitGCV         = "gcv"         // smoothing set by generalised cross-validation
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
	// NoiseEstimate is the noise the residuals imply, RMS·√(n/(n − tr H)):
	// smaller residuals than the noise are expected, since the curve takes
	// up tr H of the n degrees of freedom. 0 for interpolation, and when
	// the curve takes up more than 90 % of the freedom.
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
	// their neighbours (a noise estimate made before fitting, 0 with
	// Exact); ScatterSmoothing reports that it replaced cross-validation
	// as the noise because cross-validation nearly interpolated.
	Scatter          float64
	ScatterSmoothing bool
	Warnings         []string
}

// trailingEnds is the result of looking for corners at the trailing edge.
type trailingEnds struct {
	open  bool
	order []int // contour indices in fit order; for a sharp edge the first is repeated at the end
	base  []int // contour indices on a blunt base
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
			var o geometry.Point
			for j := a + 1; j < b; j++ {
				o = o.Add(at(j - w))
			}
			o = o.Scale(1 / float64(b-a-1))
			var sxx, sxy, syy float64
			for j := a + 1; j < b; j++ {
				d := at(j - w).Sub(o)
				sxx, sxy, syy = sxx+d.X*d.X, sxy+d.X*d.Y, syy+d.Y*d.Y
			}
			th := 0.5 * math.Atan2(2*sxy, sxx-syy)
			dir := geometry.Point{X: math.Cos(th), Y: math.Sin(th)}
			straight = true
			for j := a + 1; j < b; j++ {
				if math.Abs(dir.Cross(at(j-w).Sub(o))) > baseSigmas*sigma {
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

// Limits of the cross-validation check (chooseLambda).
const (
	gcvScatter   = 0.05 // residual RMS, as a fraction of the scatter, that counts as interpolating
	gcvMinPoints = 100  // fewer points are too few to judge the scatter
	// gcvMinScatter is the least scatter, as a fraction of the median
	// point spacing, that counts as noise.
	gcvMinScatter = 0.01
)

// endWeight is the weight of the two end points of an open fit (all
// other points weigh 1): it pins the curve ends to the trailing-edge points.
const endWeight = 1e4

// Fit fits a cubic smoothing spline (Reinsch 1967, see spline.go) in a
// chord-length parameter to the contour c, coordinates x(t) and y(t)
// separately with one smoothing parameter: periodic over the loop when the
// trailing edge is smooth, open with both ends at the trailing edge when it
// has a corner (sharp) or two (blunt, whose base points are left out). c must
// run counter-clockwise with index 0 at or near the trailing edge.
//
// The smoothing strength λ follows opts: exact interpolation, the RMS normal
// residual equal to opts.Noise (bisection on log λ), or the minimum of the
// generalised cross-validation score (Craven and Wahba, Numer. Math. 31
// (1979), 377–403) over log λ. After a first fit the parameter of every
// point is replaced by the arc length of its foot on the curve and the fit
// is repeated, which keeps dense, noisy scans from wrinkling the parameter.
// Each fit costs O(n).
//
// Noisy scans. The local scatter of the points (FitReport.Scatter, the
// spread about parabolas through 10 neighbours) sets the scale at which
// trailing-edge corners are sought. Cross-validation assumes independent
// errors; points cut from a noisy mesh share their noise with their
// neighbours, and it then nearly interpolates them. When its curve leaves
// residuals below gcvScatter of the scatter on dense points, the scatter
// is used as the noise instead (FitReport.ScatterSmoothing, with a warning).
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
	var scatter float64
	if !opts.Exact {
		scatter = localScatter(c.Points)
	}
	ends := detectEnds(c.Points, opts.Ends, scatter)
	rep0Scatter := scatter

	pts, knot, err := fitOrder(c, ends, perim)
	if err != nil {
		return nil, nil, err
	}
	m := len(pts)
	ws := make([]float64, m)
	for i := range ws {
		ws[i] = 1
	}
	if ends.open {
		ws[0], ws[m-1] = endWeight, endWeight
	}
	xs, ys := make([]float64, m), make([]float64, m)
	for i, p := range pts {
		xs[i], ys[i] = p.X, p.Y
	}
	ts := make([]float64, m)
	for i := 1; i < m; i++ {
		ts[i] = ts[i-1] + pts[i].Dist(pts[i-1])
	}
	period := 0.0
	if !ends.open {
		period = ts[m-1] + pts[m-1].Dist(pts[0])
	}

	rep := &FitReport{Ends: FitEndsClosed, Scatter: rep0Scatter}
	if ends.open {
		rep.Ends = FitEndsOpen
	}
	switch {
	case opts.Exact:
		rep.Method = FitInterpolate
	case opts.Noise > 0:
		rep.Method = FitNoise
	default:
		rep.Method = FitGCV
	}
	baseSet := make(map[int]bool, len(ends.base))
	for _, i := range ends.base {
		baseSet[i] = true
		rep.Base = append(rep.Base, originOf(c, i))
	}
	var cv *Curve
	for round := 0; ; round++ {
		var err error
		cv, err = passes(pts, ts, ws, xs, ys, ends.open, period, opts, scatter, rep)
		if err != nil {
			return nil, nil, err
		}
		residuals(c, cv, knot, baseSet, rep)
		rep.Tolerance = opts.Tolerance
		if rep.Tolerance == 0 && !opts.Exact {
			noise := opts.Noise
			if rep.ScatterSmoothing {
				// The scatter stands for the noise the user did not give.
				noise = rep.Scatter
			}
			rep.Tolerance = math.Max(4*math.Max(noise, rep.RMS), ToleranceFloor*perim)
		}
		if opts.Exact || rep.Tolerance == 0 || round == robustRounds {
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
	return cv, rep, nil
}

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
// coincident neighbours, and knot[i], the index among them of contour
// point i (−1 for points on a blunt base).
func fitOrder(c *geometry.Contour, ends trailingEnds, perim float64) ([]geometry.Point, []int, error) {
	n := c.Len()
	knot := make([]int, n)
	for i := range knot {
		knot[i] = -1
	}
	var pts []geometry.Point
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
	}
	if !ends.open && len(pts) > 1 && pts[len(pts)-1].Dist(pts[0]) <= 1e-12*perim {
		pts = pts[:len(pts)-1]
	}
	if len(pts) < splineMinKnots {
		return nil, nil, fmt.Errorf("geometry: fit: %w: %d distinct point(s), need at least %d", geometry.ErrTooFewPoints, len(pts), splineMinKnots)
	}
	return pts, knot, nil
}

// finishReport completes rep once the fit is done: the noise estimate,
// the points beyond the tolerance and the warnings, each once. n is the
// number of points fitted.
func finishReport(c *geometry.Contour, opts FitOptions, n int, rep *FitReport) {
	// The estimate means little when the curve takes up nearly all the
	// freedom of the points (nearly interpolating): then it is left at 0.
	if dof := 1 - rep.EffectiveParams/float64(n); !opts.Exact && dof >= 0.1 {
		rep.NoiseEstimate = rep.RMS / math.Sqrt(dof)
	}
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

// chooseLambda returns λ for the options: 0 for exact interpolation, the
// λ whose RMS normal residual equals opts.Noise, or the GCV minimiser.
//
// A positive hint (a λ from an earlier fit of nearly the same data) narrows
// the search to a factor of e³ either side of it when that brackets the
// answer.
//
// scatter is the local scatter of the points (localScatter); when
// cross-validation leaves residuals below gcvScatter of it on at least
// gcvMinPoints points, the scatter is used as the noise.
func chooseLambda(p *splineProblem, xs, ys []float64, opts FitOptions, hint, scatter float64, rep *FitReport) (float64, error) {
	if opts.Exact {
		return 0, nil
	}
	n := p.n()
	var span float64
	for _, h := range p.hs {
		span += h
	}
	hbar := span / float64(len(p.hs))
	// λ ≈ ℓ⁴/h̄ for a smoothing length ℓ; search ℓ from 10⁻² h̄ to span/2.
	lo := math.Log(1e-8 * hbar * hbar * hbar)
	hi := math.Log(math.Pow(span/2, 4) / hbar)
	cols := [][]float64{xs, ys}
	const hintSpan = 3
	if opts.Noise > 0 {
		// With the noise known, λ minimises the unbiased risk estimate
		//
		//	U(λ) = RSS(λ)/n + 2·(2σ²)·tr H(λ)/n
		//
		// (Craven and Wahba, Numer. Math. 31 (1979) 377–403; Wahba, Spline
		// Models for Observational Data, SIAM 1990, §4.7), the expected
		// squared error of the curve at the points, both coordinates
		// counted. Matching the raw residual RMS to σ instead (the
		// discrepancy principle) over-smooths, and the nose, where the
		// curvature is largest, flattens first. Residuals are capped at
		// outlierSigmas·σ, so a few gross outliers are not taken for
		// noise. The residual RMS then comes out near σ·√(1 − tr H/n).
		sigma := opts.Noise
		clip := outlierSigmas * sigma
		ubre := func(ll float64) float64 {
			f, err := p.fit(math.Exp(ll), cols, true)
			if err != nil {
				return math.Inf(1)
			}
			var ss float64
			for i := 0; i < n; i++ {
				dx, dy := xs[i]-f.gs[0][i], ys[i]-f.gs[1][i]
				r2 := dx*dx + dy*dy
				ss += math.Min(p.ws[i], 1) * math.Min(r2, clip*clip)
			}
			return ss/float64(n) + 4*sigma*sigma*f.trace/float64(n)
		}
		return minimise(ubre, lo, hi, hint, hintSpan), nil
	}
	gcv := func(ll float64) float64 {
		f, err := p.fit(math.Exp(ll), cols, true)
		if err != nil {
			return math.Inf(1)
		}
		var ss float64
		for i := 0; i < n; i++ {
			dx, dy := xs[i]-f.gs[0][i], ys[i]-f.gs[1][i]
			ss += p.ws[i] * (dx*dx + dy*dy)
		}
		den := 1 - f.trace/float64(n)
		if !(den > 0) {
			return math.Inf(1)
		}
		return ss / float64(n) / (den * den)
	}
	ll, atEdge := minimiseLog(gcv, lo, hi, hint, hintSpan)
	if math.IsInf(gcv(ll), 1) {
		return 0, fmt.Errorf("geometry: fit: cross-validation failed for every smoothing strength")
	}
	// Cross-validation assumes independent errors. Points cut from a noisy
	// mesh lie on straight edges between noisy vertices, so neighbours
	// share their noise, a curve through every point looks predictable,
	// and the score prefers (nearly) interpolating the noise, which ruins
	// curvature. When the chosen curve leaves residuals far below the local
	// scatter of the points (localScatter, measured over windows wider
	// than the correlation), the scatter is taken as the noise instead and
	// λ minimises the unbiased risk estimate as for a given noise. White
	// noise gives residuals of about σ·√(1 − tr H/n), above 0.2σ even when
	// a sharply curved part of the outline makes the score keep 95 % of
	// the freedom, so only a curve that keeps more than 99.75 % (residuals
	// below gcvScatter = 0.05 of the scatter) is overruled; exact data
	// have (nearly) no scatter.
	// The check is made once, on the first full search (no hint); the
	// verdict holds for the later passes and rounds (passes).
	//
	// A scatter below gcvMinScatter of the median point spacing h is
	// left alone: it bends the curve by about σ/h², under 1 % of the
	// curvature of a nose resolved by a few points, and on clean data it
	// is the sag of straight facets (a cut of an exact mesh, a polyline),
	// which interpolation follows correctly.
	if scatter > gcvMinScatter*medianStep(p) && n >= gcvMinPoints && hint == 0 {
		f, err := p.fit(math.Exp(ll), cols, true)
		if err == nil && normalRMS(p, f, xs, ys) < gcvScatter*scatter {
			o := opts
			o.Noise = scatter
			lam, err := chooseLambda(p, xs, ys, o, hint, 0, rep)
			if err == nil {
				rep.Warnings = append(rep.Warnings, fmt.Sprintf("cross-validation nearly interpolated points whose local scatter is %.3g (noise correlated along the outline, as in a cut mesh): smoothing set from that scatter; give the noise to override", scatter))
				rep.ScatterSmoothing = true
			}
			return lam, err
		}
	}
	if atEdge && hint == 0 {
		rep.Warnings = append(rep.Warnings, "cross-validation chose the weakest smoothing tried: the points look noise-free; consider noise 0")
	}
	return math.Exp(ll), nil
}

// medianStep returns the median parameter step of p (the point spacing).
func medianStep(p *splineProblem) float64 {
	hs := append([]float64(nil), p.hs...)
	slices.Sort(hs)
	return hs[len(hs)/2]
}

// minimise returns the λ that minimises crit(log λ) over [lo, hi] (or
// within hintSpan of log hint when hint > 0).
func minimise(crit func(float64) float64, lo, hi, hint, hintSpan float64) float64 {
	ll, _ := minimiseLog(crit, lo, hi, hint, hintSpan)
	return math.Exp(ll)
}

// minimiseLog scans crit on a grid over [lo, hi] and refines the best
// sample by golden-section search. atEdge reports that the weakest
// smoothing tried was best.
func minimiseLog(crit func(float64) float64, lo, hi, hint, hintSpan float64) (ll float64, atEdge bool) {
	grid := 20
	if hint > 0 {
		lo, hi, grid = math.Log(hint)-hintSpan, math.Log(hint)+hintSpan, 6
	}
	best, bestV := 0, math.Inf(1)
	for k := 0; k <= grid; k++ {
		if v := crit(lo + (hi-lo)*float64(k)/float64(grid)); v < bestV {
			best, bestV = k, v
		}
	}
	a := lo + (hi-lo)*float64(max(best-1, 0))/float64(grid)
	b := lo + (hi-lo)*float64(min(best+1, grid))/float64(grid)
	return numeric.Golden(crit, a, b, 14), best == 0
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
	px := p.pieces(f.gs[0], f.gams[0])
	py := p.pieces(f.gs[1], f.gams[1])
	out := make([]float64, n)
	for i := 0; i < n; i++ {
		var dx, dy float64
		if i < len(px) {
			dx, dy = px[i][1], py[i][1]
		} else {
			j := len(px) - 1
			h := p.hs[j]
			_, dx, _ = poly(px[j], h)
			_, dy, _ = poly(py[j], h)
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
	slices.Sort(a)
	return 1.4826 * a[len(a)/2]
}

// passes fits twice: in the chord-length parameter ts, then in the arc
// length of each point's foot on the first curve (unless that would not
// increase strictly). It records λ and tr H in rep.
func passes(pts []geometry.Point, ts, ws, xs, ys []float64, open bool, period float64, opts FitOptions, scatter float64, rep *FitReport) (*Curve, error) {
	m := len(pts)
	var cv *Curve
	hint := rep.Lambda
	for pass := 0; pass < 2; pass++ {
		prob := splineNewProblem(ts, ws, !open, period)
		o := opts
		if rep.ScatterSmoothing && !o.Exact && o.Noise == 0 {
			// Cross-validation was overruled once: later passes and rounds
			// of the same data keep the scatter as the noise.
			o.Noise = rep.Scatter
		}
		lambda, err := chooseLambda(prob, xs, ys, o, hint, scatter, rep)
		if err != nil {
			return nil, err
		}
		f, err := prob.fit(lambda, [][]float64{xs, ys}, true)
		if err != nil {
			return nil, fmt.Errorf("geometry: fit: %w", err)
		}
		rep.Lambda, rep.EffectiveParams = lambda, f.trace
		hint = lambda
		cv = fromFit(prob, f, !open)
		if pass == 1 || lambda == 0 {
			break
		}
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
				return cv, nil
			}
			period = L
		}
		ts = nts
	}
	return cv, nil
}

// residuals fills S, Residual, RMS, Max and MaxAt of rep for every
// contour point.
func residuals(c *geometry.Contour, cv *Curve, knot []int, base map[int]bool, rep *FitReport) {
	n := c.Len()
	rep.S = make([]float64, n)
	rep.Residual = make([]float64, n)
	rep.Max, rep.MaxAt = 0, geometry.Origin{}
	var sum2 float64
	for i, p := range c.Points {
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
		r := rep.Residual[i]
		sum2 += r * r
		if math.Abs(r) > rep.Max {
			rep.Max = math.Abs(r)
			rep.MaxAt = originOf(c, i)
		}
	}
	rep.RMS = math.Sqrt(sum2 / float64(n))
}
