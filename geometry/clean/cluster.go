package clean

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
)

// The cluster test. A run of neighbouring points that lie off the surface
// together (a probe that slipped on a burr, dust or a fixture edge in a
// scanner's cut, a reflection streak) defeats the point-by-point test of
// residuals: each point's local fit takes in its companions and follows
// them. The cluster test judges a point by a fit that leaves out a whole
// window of positions about it (the point and up to w neighbours on each
// side) and is made on the points beyond the window on either side, the
// supports. When the window covers a run, the supports lie on the surface
// on both sides of it and the fit through them says where the surface
// runs under the run.
//
// A verdict needs supports that themselves lie on one smooth curve: every
// support point within the outlier threshold of the fit through them. A
// window next to a run has run points in a support and gives no verdict,
// so a good point beside a run is never judged by a fit the run pulled; a
// window whose supports span more of the outline than one parabola follows
// (round a nose far smaller than the window, across a corner) gives none
// either, so the nose and the corners stay the generic test's. The windows
// grow from one neighbour a side in steps of about a half, their supports
// as long as the window; they stop at clusterSpan of the loop's length:
// a departure wider than that is a stretch of the outline, not a cluster.
// A point is a cluster point when some window with clean supports
// predicts it farther off than the outlier threshold and than
// clusterMargin times the supports' largest residual (what the fit itself
// may be off by between its supports). Rounds peel a run from its middle
// outwards: the middle points are judged first (their window covers the
// run soonest), and once they are out the rest is a shorter run.

// clusterSpan is the largest share of the loop's length a window of the
// cluster test (the left-out positions and their supports) may span.
const clusterSpan = 0.05

// clusterTurn is the largest turn, in radians, of the curve fitted through
// a window's supports between their centroids (30°): over that a parabola
// no longer stands for an outline of any shape (at the nose, a circle's
// arc departs from it by about 0.1 % of the window's length at 30°, fast
// growing beyond).
const clusterTurn = math.Pi / 6

// minSupport is the fewest points a support of the cluster test holds.
const minSupport = 4

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
// robust scales and sc(i) the scale at point i (input units); points marked in exempt (by point index; nil for
// none) are never cluster points, though they may support a fit.
func clusterOutliers(pts []geometry.Point, seq []int32, sigma, scale float64, keep bool, exempt []bool) ([]int32, []hit) {
	var hits []hit
	work := seq
	for range clusterRounds {
		n := len(work)
		if n < 4*minSupport+3 {
			break
		}
		// The loop's length, to bound the windows.
		var length float64
		for k := range n {
			length += fastDist(pts[work[k]], pts[work[(k+1)%n]])
		}
		maxW := (n - 2*minSupport - 1) / 4
		out := make([]bool, n)
		dist := make([]float64, n)
		parallel(n, func(a, b int) {
			for i := a; i < b; i++ {
				p := work[i]
				if exempt != nil && exempt[p] {
					continue
				}
				if d, ok := clusterResidual(pts, work, i, maxW, clusterSpan*length, sigma, scale); ok {
					out[i], dist[i] = true, d
				}
			}
		})
		next := make([]int32, 0, n)
		found := false
		for i, p := range work {
			if !out[i] {
				next = append(next, p)
				continue
			}
			found = true
			sg := 0.0
			if scale > 0 {
				sg = dist[i] / scale
			}
			hits = append(hits, hit{idx: p, reason: "outlier", dist: dist[i], sigmas: sg, kept: keep})
			if edgeTrace != nil {
				edgeTrace("CLUSTER pos %d/%d pt %v d %.4g thr %.4g", i, n, pts[p], dist[i], sigma*scale)
			}
		}
		if !found || len(next) < minPoints {
			break
		}
		work = next
	}
	return work, hits
}

// clusterResidual tries the left-out windows about position i of seq,
// half-widths up to maxW, spanning at most span of arc length with their
// supports, and returns the distance of the point from the first fit with
// clean supports (every support point within thr of it) that predicts it
// off by more than sigma times the larger of the local scale sc and the
// supports' own scatter, both widened by the fit's uncertainty where the
// point is (its leverage); ok is false when none does.
func clusterResidual(pts []geometry.Point, seq []int32, i, maxW int, span, sigma, sc float64) (float64, bool) {
	n := len(seq)
	at := func(j int) geometry.Point { return pts[seq[((i+j)%n+n)%n]] }
	p0 := at(0)
	thr := sigma * sc
	var sup []geometry.Point
	for _, w := range clusterWindows(maxW) {
		k := max(minSupport, w)
		if 2*(w+k)+1 > n {
			break
		}
		// The window and its supports must stay within span, measured
		// straight across (a section order of a band, or one that puts a
		// run among the points it stands off from, zigzags along the
		// loop).
		if fastDist(at(-w-k), at(w+k)) > span {
			break
		}
		sup = sup[:0]
		for j := w + k; j > w; j-- {
			sup = append(sup, at(-j))
		}
		for j := w + 1; j <= w+k; j++ {
			sup = append(sup, at(j))
		}
		g, ok := gapFit(sup, k, p0)
		if edgeTrace != nil && ProbeR > 0 && p0.Dist(Probe) < ProbeR {
			edgeTrace("CLUSTER probe pos %d p %v w %d k %d ok %v worst %.3g thr %.3g d %.3g lev %.3g scat %.3g", i, p0, w, k, ok, g.worst, thr, g.d, g.leverage, g.scatter)
		}
		if !ok || g.worst > thr {
			continue // the supports do not lie on one smooth curve
		}
		if wide := math.Sqrt(1 + g.leverage); g.d > thr*wide && g.d > sigma*g.scatter*wide {
			return g.d, true
		}
	}
	return 0, false
}

// gap is a fit of gapFit: the distance of the point judged from it, the
// largest distance of a support point, the supports' scatter about it
// (root mean square, over the degrees of freedom left) and the leverage of
// the point (the variance of the fit where it projects, in units of the
// supports' variance).
type gap struct {
	d, worst, scatter, leverage float64
}

// gapFit fits a parabola y(x) by least squares to the supports sup (the
// first k before the window, the rest after it), in the frame whose x axis
// runs from the centroid of the first support to that of the second, and
// returns the fit's figures for p (distances across the frame over the
// slope's secant). ok is false when a support lies on the wrong side of
// the frame's middle (the outline turns too much over the window for a
// graph over it), when p does not project between the supports' centroids,
// or when the fit is singular.
func gapFit(sup []geometry.Point, k int, p geometry.Point) (gap, bool) {
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
	// In the frame: x along u scaled by half, y across.
	frame := func(q geometry.Point) (float64, float64) {
		v := q.Sub(c)
		return v.Dot(u) / half, u.Cross(v)
	}
	x0, _ := frame(p)
	if x0 < -1 || x0 > 1 {
		return g, false
	}
	var a [3][3]float64
	var by [3]float64
	for j, q := range sup {
		x, y := frame(q)
		// Each support may scatter (a band), but the first must lie
		// behind the window's middle and the second ahead of it.
		if j < k && x > 0 || j >= k && x < 0 {
			return g, false
		}
		b := [3]float64{1, x, x * x}
		for r := range 3 {
			for s := range 3 {
				a[r][s] += b[r] * b[s]
			}
			by[r] += b[r] * y
		}
	}
	cf, ok := numeric.Cramer3(a, by, 1e-12)
	if !ok {
		return g, false
	}
	// The fitted outline may turn by at most clusterTurn between the
	// supports: a window long beside the local radius of curvature (round
	// a nose, over a trailing edge) is not one a parabola spans.
	if turn := math.Abs(math.Atan((cf[1]+2*cf[2])/half) - math.Atan((cf[1]-2*cf[2])/half)); turn > clusterTurn {
		return g, false
	}
	b0 := [3]float64{1, x0, x0 * x0}
	z, ok := numeric.Cramer3(a, b0, 1e-12)
	if !ok {
		return g, false
	}
	g.leverage = b0[0]*z[0] + b0[1]*z[1] + b0[2]*z[2]
	dist := func(q geometry.Point) float64 {
		x, y := frame(q)
		slope := (cf[1] + 2*cf[2]*x) / half
		return math.Abs(y-(cf[0]+cf[1]*x+cf[2]*x*x)) / math.Sqrt(1+slope*slope)
	}
	var ss float64
	for _, q := range sup {
		e := dist(q)
		g.worst = max(g.worst, e)
		ss += e * e
	}
	g.scatter = math.Sqrt(ss / float64(len(sup)-3))
	g.d = dist(p)
	return g, true
}

var Probe geometry.Point
var ProbeR float64
