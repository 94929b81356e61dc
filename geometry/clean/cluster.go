package clean

import (
	"math"
	"sync"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
)

// The cluster test. A run of neighbouring points that lie off the surface
// together (a probe that slipped on a burr, dust or a fixture edge in a
// scanner's cut, a reflection streak) defeats the point-by-point test of
// residuals: each point's local fit takes in its companions and follows
// them. The cluster test judges a point by a fit that leaves out a whole
// window of positions about it (the point and w neighbours on each side)
// and is made on the points beyond the window on either side, the
// supports. When the window covers a run, the supports lie on the surface
// on both sides of it, and the parabola through them says where the
// surface runs under the run. Nothing in it counts the run's points: the
// windows grow until the supports are clean, however long the run.
//
// The windows grow from one neighbour a side in steps of about a half,
// each support as long as the window's half, until one has clean
// supports: every support point within the outlier threshold (sigma
// robust scales of the loop's noise) of the fit. That smallest clean
// window judges the point, and no wider one: away from any run it is the
// narrowest (a point's own neighbours), beside a run it is the one that
// just spans the run. A support point beyond clusterGross thresholds marks
// a run reaching into the support, and the next window is tried; a support
// whose points all lie near the fit but some beyond the threshold shows an
// outline one parabola does not follow there (sparse points, curvature
// that changes fast), and the test gives no verdict. So does a window
// whose fit turns by more than clusterTurn (the nose, a trailing edge, a
// corner: those stay the generic test's and the edge models'), or that
// wraps round a thin edge, or that spans more than clusterSpan of the
// loop: a departure that wide is a stretch of the outline, not a cluster.
//
// The point is a cluster point when it lies off the fit by more than the
// threshold and than sigma times the supports' own scatter, both widened
// by the fit's uncertainty where the point projects (its leverage), by
// more than sigma spreads of the loop's own left-out residuals at that
// window (clusterScale) over indepRatio, and by more than the curve could bulge between
// the supports (a sagitta, as for the point-by-point test); and when it
// does not lie on the outline
// elsewhere (a point of the other surface that the ordering put among the
// wrong neighbours near a thin trailing edge). Rounds peel a run: once
// some of its points are out, the rest is a shorter run, judged again.
//
// The spread of the left-out residuals is what lets the test see noise
// that neighbouring points share. A slice of a scanned mesh carries the
// noise of the vertices it is cut between, a hand-held scanner drifts as
// it sweeps: the points wander off the surface together, by the whole of
// the noise, over a few to tens of points, while each differs little from
// its neighbours, so the point-to-point scale misses the wander and a
// window's parabola, bridging it, finds good points many of those scales
// off. Taken over the loop, the median left-out residual of each window
// stays with the good points as long as runs off the surface are the
// fewer. For independent noise it is the scatter widened by the fits'
// uncertainty: 1 to 2 times the point-to-point scale (measured on NACA
// 2412 contours of 80 to 1500 points), which runs low, being the least
// of three fits' residuals; over indepRatio it then adds nothing to the
// threshold, which only noise that neighbours share raises.

// clusterSpan is the largest share of the loop's length a window of the
// cluster test (the left-out positions and their supports) may span.
const clusterSpan = 0.2

// clusterTurn is the largest turn, in radians, of the curve fitted through
// a window's supports between their centroids (30°): over that a parabola
// no longer stands for an outline of any shape (at the nose, a circle's
// arc departs from it by about 0.1 % of the window's length at 30°, fast
// growing beyond).
const clusterTurn = math.Pi / 6

// clusterGross is how many outlier thresholds a support point must lie
// off the fit through the supports for the window to count as holding
// points off the surface, so that a wider one is tried; a support whose
// points all lie within that, some beyond the threshold, shows an outline
// the parabola does not follow, and the test gives no verdict there.
const clusterGross = 2

// minSupport is the fewest points a support of the cluster test holds.
const minSupport = 4

// supportPoints is the most points of a support the fit takes in.
const supportPoints = 8

// clusterRounds bounds the rounds of clusterOutliers.
const clusterRounds = 12

// clusterWindows returns the half-widths of the left-out windows tried,
// from 1 up to at most max: 1, 2, 3, then growing by about a half.
func clusterWindows(max int) []int {
	var ws []int
	for w := 1; w <= max; {
		ws = append(ws, w)
		w = w + (w+1)/2
	}
	return ws
}

// clusterOutliers takes the cluster points out of the loop seq (see the
// file's comment), round by round until none is left, and returns the
// loop without them and their hits (kept, as reported, if keep; they are
// out of the returned loop either way). sigma is the outlier threshold in
// robust scales and scale the loop's robust scale (input units); points
// marked in exempt (by point index; nil for none) are never cluster
// points, though they may support a fit. ws are the half-widths of the
// windows tried (clusterWindows) and wsc the spread of the loop's
// left-out residuals at each (clusterScale), found on the loop before
// the point-by-point test took its outliers out.
func clusterOutliers(pts []geometry.Point, seq []int32, sigma, scale float64, keep bool, exempt []bool, ws []int, wsc *windowScales) ([]int32, []hit) {
	n := len(seq)
	if n < 4*minSupport+3 {
		return seq, nil
	}
	// The loop's length, to bound the windows.
	var length float64
	for k := range n {
		length += fastDist(pts[seq[k]], pts[seq[(k+1)%n]])
	}
	var hits []hit
	work := seq
	// reach, by point index, is how far each way the last look at a point
	// reached: after a round only the points with a removed point within
	// that reach are looked at again (the others' windows are unchanged).
	reach := make([]int32, len(pts))
	todo := make([]bool, n)
	for i := range todo {
		todo[i] = true
	}
	for range clusterRounds {
		n := len(work)
		if n < 4*minSupport+3 {
			break
		}
		out := make([]bool, n)
		dist := make([]float64, n)
		parallel(n, func(a, b int) {
			for i := a; i < b; i++ {
				p := work[i]
				if !todo[i] || exempt != nil && exempt[p] {
					continue
				}
				d, r, ok := clusterResidual(pts, work, i, ws, clusterSpan*length, sigma, scale, wsc)
				reach[p] = int32(r)
				if ok && !nearOutline(pts, work, i, r, sigma*scale) {
					out[i], dist[i] = true, d
				}
			}
		})
		next := make([]int32, 0, n)
		var cuts []int // positions of the removed points, in work
		for i, p := range work {
			if !out[i] {
				next = append(next, p)
				continue
			}
			cuts = append(cuts, i)
			sg := 0.0
			if scale > 0 {
				sg = dist[i] / scale
			}
			hits = append(hits, hit{idx: p, reason: "outlier", dist: dist[i], sigmas: sg, kept: keep})
		}
		if len(cuts) == 0 || len(next) < minPoints {
			break
		}
		// The points to look at again: a removed point within their reach
		// (positions counted in work, round the loop).
		todo = make([]bool, len(next))
		j, c := 0, 0
		for i, p := range work {
			if out[i] {
				continue
			}
			for c < len(cuts) && cuts[c] < i {
				c++
			}
			near := n
			if c < len(cuts) {
				near = cuts[c] - i
			} else {
				near = cuts[0] + n - i
			}
			if c > 0 {
				near = min(near, i-cuts[c-1])
			} else {
				near = min(near, i+n-cuts[len(cuts)-1])
			}
			todo[j] = near <= int(reach[p])+1
			j++
		}
		work = next
	}
	return work, hits
}

// clusterResidual tries the left-out windows about position i of seq,
// half-widths ws, spanning at most span (input units, straight across)
// with their supports, and returns the distance of the point from the fit
// of the smallest window with clean supports (see the file's comment; sc
// is the loop's robust scale and wsc, by window, the spread of the
// loop's own residuals at that window, clusterScale), how many positions
// each way the last window looked at and its supports took in, and
// whether that fit makes the point a cluster point.
func clusterResidual(pts []geometry.Point, seq []int32, i int, ws []int, span, sigma, sc float64, wsc *windowScales) (d float64, reach int, ok bool) {
	thr := sigma * sc
	var buf [2 * supportPoints]geometry.Point
	for wi, w := range ws {
		g, r, fit, more := windowFit(pts, seq, i, w, span, thr, buf[:0])
		if r > 0 {
			reach = r
		}
		if !more {
			break
		}
		if !fit {
			continue
		}
		if g.worst > clusterGross*thr {
			continue // points off the surface among the supports
		}
		if g.worst > thr {
			// Every support point near the fit, some beyond the
			// threshold: the outline is not a parabola over this window
			// (sparse points, curvature that changes fast), and wider
			// windows bridge still more of it.
			return 0, reach, false
		}
		// The smallest window with clean supports judges: a wider one
		// would only bridge more of the outline with one parabola.
		if g.d <= thr {
			return g.d, reach, false
		}
		if !g.finish() {
			continue
		}
		// Beyond the threshold widened by the fit's uncertainty where the
		// point projects, and beyond sigma spreads of the loop's own
		// residuals at this window over indepRatio, what independent noise
		// gives at most beside the point-to-point scale: noise that
		// neighbours share (a mesh's vertices, a scanner's drift) moves a
		// run of good points together by far more than the point-to-point
		// scale, and these residuals see it as they see a run.
		wide := math.Sqrt(1 + g.leverage)
		lim := max(thr*wide, sigma*wsc.at(wi)/indepRatio)
		return g.d, reach, g.d > lim && g.d > sigma*g.scatter*wide && g.d > g.sag
	}
	return 0, reach, false
}

// windowFit fits the parabola of the left-out window of half-width w about
// position i of seq (gapFit; tol its tolerance), its supports gathered in
// buf. It returns the fit, how many positions each way the window and its
// supports take in (0 when none fits the loop), whether the fit is usable,
// and whether wider windows may still be tried (false when this one does
// not fit the loop or spans more than span).
func windowFit(pts []geometry.Point, seq []int32, i, w int, span, tol float64, buf []geometry.Point) (g gap, reach int, fit, more bool) {
	n := len(seq)
	k := max(minSupport, w)
	if 2*(w+k)+1 > n {
		return g, 0, false, false
	}
	// |j| ≤ w+k < n: one wrap round the loop at most.
	at := func(j int) geometry.Point {
		j += i
		if j < 0 {
			j += n
		} else if j >= n {
			j -= n
		}
		return pts[seq[j]]
	}
	reach = w + k
	// The window and its supports must stay within span, measured
	// straight across (a section order of a band, or one that puts a
	// run among the points it stands off from, zigzags along the
	// loop).
	if fastDist(at(-w-k), at(w+k)) > span {
		return g, reach, false, false
	}
	// Up to supportPoints of each support, evenly spread over it from
	// its nearest point to its farthest: a fit costs the same however
	// wide the window.
	m := min(k, supportPoints)
	sup := buf
	if m == k {
		// Every point of the supports (j(k−1)/(m−1) = j), without the
		// divisions.
		for j := m - 1; j >= 0; j-- {
			sup = append(sup, at(-w-1-j))
		}
		for j := range m {
			sup = append(sup, at(w+1+j))
		}
	} else {
		for j := m - 1; j >= 0; j-- {
			sup = append(sup, at(-w-1-j*(k-1)/(m-1)))
		}
		for j := range m {
			sup = append(sup, at(w+1+j*(k-1)/(m-1)))
		}
	}
	g, fit = gapFit(sup, m, at(0), tol)
	return g, reach, fit, true
}

// clusterCalibration returns the half-widths of the windows of the
// cluster test on the loop seq (clusterWindows) and the spread of the
// loop's left-out residuals at each (clusterScale; tol the outlier
// threshold, input units; exempt as there), found when first asked for.
func clusterCalibration(pts []geometry.Point, seq []int32, tol float64, exempt []bool) ([]int, *windowScales) {
	n := len(seq)
	var length float64
	for k := range n {
		length += fastDist(pts[seq[k]], pts[seq[(k+1)%n]])
	}
	ws := clusterWindows((n - 2*minSupport - 1) / 4)
	return ws, newWindowScales(pts, seq, ws, clusterSpan*length, tol, exempt)
}

// windowScales is the spread of a loop's left-out residuals at each
// window of the cluster test (clusterScale), each found the first time
// it is asked for: the test needs a window's spread only for a point that
// lies beyond the threshold at its smallest clean window, and most
// windows of most loops never judge one. Safe for concurrent use; the
// loop and exempt must not change while it is in use.
type windowScales struct {
	pts       []geometry.Point
	seq       []int32
	ws        []int
	span, tol float64
	exempt    []bool
	once      []sync.Once
	v         []float64
}

func newWindowScales(pts []geometry.Point, seq []int32, ws []int, span, tol float64, exempt []bool) *windowScales {
	return &windowScales{pts: pts, seq: seq, ws: ws, span: span, tol: tol, exempt: exempt,
		once: make([]sync.Once, len(ws)), v: make([]float64, len(ws))}
}

// at returns the spread at window wi (clusterScale).
func (s *windowScales) at(wi int) float64 {
	s.once[wi].Do(func() { s.v[wi] = clusterScale(s.pts, s.seq, s.ws[wi], s.span, s.tol, s.exempt) })
	return s.v[wi]
}

// scaleSample is the most positions of a loop whose left-out residuals
// make the spread of each window (clusterScale).
const scaleSample = 1000

// clusterScale returns the robust spread of the left-out residuals of the
// loop seq at the window of half-width w: 1.4826 × the median distance of
// a point from the fit of its window's supports, over up to scaleSample
// positions evenly spread round the loop (the points of exempt left out),
// whatever the supports hold. For independent noise it is the scatter, a
// little widened by the fits' uncertainty; for noise that neighbours share
// it grows with the window as the supports stop sharing the noise of the
// point they judge, and the median stays with the good points as long as
// runs off the surface are fewer. 0 for a window fitted at fewer than
// 2·minSupport positions. tol is the outlier threshold (input units).
func clusterScale(pts []geometry.Point, seq []int32, w int, span, tol float64, exempt []bool) float64 {
	n := len(seq)
	if 2*(w+max(minSupport, w))+1 > n {
		return 0 // the window does not fit the loop anywhere (windowFit)
	}
	m := min(n, scaleSample)
	var buf [2 * supportPoints]geometry.Point
	ds := make([]float64, 0, m)
	for j := range m {
		i := j * n / m
		if exempt != nil && exempt[seq[i]] {
			continue
		}
		if g, _, fit, _ := windowFit(pts, seq, i, w, span, tol, buf[:0]); fit {
			ds = append(ds, g.d)
		}
	}
	if len(ds) < 2*minSupport {
		return 0
	}
	return 1.4826 * median(ds)
}

// gap is a fit of gapFit: the distance of the point judged from it, the
// largest distance of a support point, the supports' scatter about it
// (root mean square, over the degrees of freedom left) and the leverage of
// the point (the variance of the fit where it projects, in units of the
// supports' variance).
//
// sag bounds how far the outline may stand off the parabola within the
// gap (between the innermost support points), as sagitta does for the
// point-by-point test: a circular arc over the gap's chord g that turns as
// the fit turns there, τ, bulges g/2 · tan(τ/4) from that chord. Where
// the points are sparse for the curvature (a coarsely probed nose, exact
// stations), a parabola through the supports can miss a good point in the
// gap by that much; a run off a gently curved surface stands off by far
// more.
type gap struct {
	d, worst, scatter, leverage, sag float64

	// The fit: the supports (the first k before the window), the frame's
	// origin c, unit axis u and half-length half, the normal equations a,
	// the coefficients cf and the point's x0 in the frame.
	sup  []geometry.Point
	k    int
	c, u geometry.Point
	half float64
	a    [3][3]float64
	cf   [3]float64
	x0   float64
}

// gapFit fits a parabola y(x) by least squares to the supports sup (the
// first k before the window, the rest after it), in the frame whose x axis
// runs from the centroid of the first support to that of the second, and
// returns the distances of p and the supports from it (across the frame,
// over the slope's secant) and their scatter; finish adds the rest. ok is
// false when a support lies on the wrong side of the frame's middle or
// runs back along it by more than tol (input units) or mostly back, or
// the fit turns by
// more than clusterTurn (the outline turns too much over the window for a
// graph over it, or the window wraps round a thin edge), when p does not
// project between the supports' centroids, or when the fit is singular.
func gapFit(sup []geometry.Point, k int, p geometry.Point, tol float64) (gap, bool) {
	var g gap
	var cl, cr geometry.Point
	for _, q := range sup[:k] {
		cl = cl.Add(q)
	}
	for _, q := range sup[k:] {
		cr = cr.Add(q)
	}
	cl, cr = cl.Scale(1/float64(k)), cr.Scale(1/float64(len(sup)-k))
	ax := cr.Sub(cl)
	half := ax.Norm() / 2
	if half == 0 || len(sup) <= 3 {
		return g, false
	}
	u := ax.Scale(1 / (2 * half))
	c := cl.Add(cr).Scale(0.5)
	g.sup, g.k, g.c, g.u, g.half = sup, k, c, u, half
	x0, _ := g.frame(p)
	if x0 < -1 || x0 > 1 {
		return g, false
	}
	// Both supports must run forward along the axis, as the loop runs: a
	// window that wraps round a thin trailing edge has one support on
	// each surface, running opposite ways. Within a band the order across
	// the scatter is arbitrary: a support may run back by up to tol, as
	// long as it runs across more than back.
	for _, run := range [2]geometry.Point{sup[k-1].Sub(sup[0]), sup[len(sup)-1].Sub(sup[k])} {
		if along := run.Dot(u); along < -tol || along < 0 && -along > 0.5*run.Norm() {
			return g, false
		}
	}
	// The normal equations of y = c₀ + c₁x + c₂x², written out: the
	// sums of 1, x, x², x³, x⁴ and of y, xy, x²y.
	var s0, s1, s2, s3, s4, t0, t1, t2 float64
	for j, q := range sup {
		x, y := g.frame(q)
		// Each support may scatter (a band), but the first must lie
		// behind the window's middle and the second ahead of it.
		if j < k && x > 0 || j >= k && x < 0 {
			return g, false
		}
		xx := x * x
		s0++
		s1 += x
		s2 += xx
		s3 += x * xx
		s4 += xx * xx
		t0 += y
		t1 += x * y
		t2 += xx * y
	}
	a := [3][3]float64{{s0, s1, s2}, {s1, s2, s3}, {s2, s3, s4}}
	cf, ok := numeric.Cramer3(a, [3]float64{t0, t1, t2}, 1e-12)
	if !ok {
		return g, false
	}
	// The fitted outline may turn by at most clusterTurn between the
	// supports' centroids: a window long beside the local radius of
	// curvature (round a nose, over a trailing edge, a step a run makes
	// with the surface) is not one a parabola spans.
	if tooTurned((cf[1]+2*cf[2])/half, (cf[1]-2*cf[2])/half) {
		return g, false
	}
	g.a, g.cf, g.x0 = a, cf, x0
	var ss float64
	for _, q := range sup {
		e := g.dist(q)
		g.worst = max(g.worst, e)
		ss += e * e
	}
	g.scatter = math.Sqrt(ss / float64(len(sup)-3))
	g.d = g.dist(p)
	return g, true
}

// tooTurned reports whether the directions of slopes p and m differ by
// more than clusterTurn, |atan p − atan m| > clusterTurn. The tangent of
// the difference, (p − m)/(1 + pm), settles it without the arc tangents
// unless it lies within 1e-9 (relative) of tan clusterTurn, where the arc
// tangents decide as they always did; the rounding of either form is
// some 1e-16.
func tooTurned(p, m float64) bool {
	const tanTurn = 0.57735026918962576 // tan 30° = 1/√3
	den := 1 + p*m
	if den > 0 {
		switch t := math.Abs(p-m) / den; {
		case t < tanTurn*(1-1e-9):
			return false
		case t > tanTurn*(1+1e-9) && !math.IsInf(t, 1):
			return true
		}
	}
	return math.Abs(math.Atan(p)-math.Atan(m)) > clusterTurn
}

// frame returns q in the fit's frame: x along the axis scaled by half, y
// across.
func (g *gap) frame(q geometry.Point) (float64, float64) {
	v := q.Sub(g.c)
	return v.Dot(g.u) / g.half, g.u.Cross(v)
}

// dist returns the distance of q from the fitted parabola, across the
// frame over the slope's secant.
func (g *gap) dist(q geometry.Point) float64 {
	x, y := g.frame(q)
	cf := g.cf
	slope := (cf[1] + 2*cf[2]*x) / g.half
	return math.Abs(y-(cf[0]+cf[1]*x+cf[2]*x*x)) / math.Sqrt(1+slope*slope)
}

// finish sets the leverage and the sagitta of the fit, which only a point
// beyond the threshold needs; it returns false when the leverage cannot be
// found.
func (g *gap) finish() bool {
	cf, half := g.cf, g.half
	b0 := [3]float64{1, g.x0, g.x0 * g.x0}
	z, ok := numeric.Cramer3(g.a, b0, 1e-12)
	if !ok {
		return false
	}
	g.leverage = b0[0]*z[0] + b0[1]*z[1] + b0[2]*z[2]
	xa, _ := g.frame(g.sup[g.k-1])
	xb, _ := g.frame(g.sup[g.k])
	tau := math.Abs(math.Atan((cf[1]+2*cf[2]*xb)/half) - math.Atan((cf[1]+2*cf[2]*xa)/half))
	g.sag = fastDist(g.sup[g.k-1], g.sup[g.k]) / 2 * math.Tan(tau/4)
	return true
}

// nearOutline reports whether the point at position i of the loop seq lies
// within tol of a step of the loop more than reach positions away from it:
// a point of the outline that the ordering put among the wrong neighbours
// (a point of the other surface near a thin trailing edge), not a point
// off it. A cluster of points off the surface lies away from the outline.
func nearOutline(pts []geometry.Point, seq []int32, i, reach int, tol float64) bool {
	n := len(seq)
	p := pts[seq[i]]
	for d := reach + 1; d < n-reach-1; d++ {
		a, b := pts[seq[(i+d)%n]], pts[seq[(i+d+1)%n]]
		ab := b.Sub(a)
		t := 0.0
		if l2 := ab.Dot(ab); l2 > 0 {
			t = min(1, max(0, p.Sub(a).Dot(ab)/l2))
		}
		if fastDist(p, a.Add(ab.Scale(t))) <= tol {
			return true
		}
	}
	return false
}
