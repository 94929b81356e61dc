package campaign

import (
	"cmp"
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/scangen"
)

// teIndistinct reports whether the good points of a case, at their noise,
// cannot tell a blunt base from a rounded end (either way round) or a
// rounded end from a sharp corner, and the separation λ of the nearest
// rival kind (+Inf when there is none to weigh: a sharp edge, which is
// teUndecidable's, and noise-free points).
//
// The test is the one an ideal judge of the points could make. Each good
// point is put where the generator drew it, on the true outline, without
// its noise; the rival kind's outline that fits those points best is
// found (for a base, a rounded end tangent to the true surfaces, its
// radius free; for a rounded end, a base square to the chord across the
// true surfaces carried on along their end tangents, its station free,
// and the sharp corner where those tangents meet); λ is the sum of the
// squared distances of the points from it, in scatters (the noise and
// the rounding of the written numbers, as teRight takes them). With
// normal scatter, λ is the expected difference of −2 ln likelihood
// between the true and the rival outline, and the likelihood-ratio test
// between them picks the truth with probability Φ(√λ / 2) (the
// Neyman–Pearson lemma for two outlines a known scatter blurs; any
// textbook of statistical decision theory). The kind is indistinct when
// that is below 95 %: λ < (2·1.645)² (teSeparation).
//
// The rival is held to the true surfaces, so a method that fits the
// surfaces too, as any must, has less to tell them apart by: λ is an
// upper bound, and the cases called indistinct here are indistinct for
// every method.
//
// Why it is needed: a base 0.002–0.004 c thick under noise of a tenth of
// that differs from the rounded end that fits it best only at its two
// corners, by some 0.2 of its half-thickness (a semicircle cuts a square
// corner by (√2 − 1) r), that is by a scatter or two at the one or two
// points that sample each corner; rounded ends under a scanner's noise
// are no better. teRight's "smaller than four scatters" catches only the
// thinnest of these.
func teIndistinct(tr *scangen.Truth) (bool, float64) {
	sec := tr.Section
	if sec == nil || sec.Shape == nil || sec.TEKind == scangen.TESharp || sec.Shape.Pieces() < 3 {
		return false, math.Inf(1)
	}
	s := math.Sqrt(tr.Noise*tr.Noise + tr.Resolution*tr.Resolution/12)
	if !(s > 0) {
		return false, math.Inf(1)
	}
	e, ok := newTEEnds(sec.Shape)
	if !ok {
		return false, math.Inf(1)
	}
	var pts []geometry.Point
	for _, l := range tr.Lines {
		if l.Kind != scangen.LineGood {
			continue
		}
		if p := sec.Shape.At(l.T); p.X >= 1-teRivalSpan {
			pts = append(pts, p)
		}
	}
	if len(pts) == 0 {
		return false, math.Inf(1)
	}
	// lambda returns λ for the rival outline out, +Inf when fewer than
	// least points lie nearest its piece join (out[2]): a rival end the
	// points do not sample is no reading of them (a rounded end with
	// fewer than three points on its arc is teUndecidable's, and a base
	// no point lies on is weighed there against the gaps).
	lambda := func(out [][]geometry.Point, least int) float64 {
		var sum float64
		on := 0
		for _, p := range pts {
			d, k := polyDist(p, out)
			if k == 2 {
				on++
			}
			sum += sq(d / s)
		}
		if on < least {
			return math.Inf(1)
		}
		return sum
	}
	var best float64
	if sec.TEKind == scangen.TEBlunt {
		best = minimise(e.rTiny, e.rMax, true, func(r float64) float64 {
			out, ok := e.rounded(r)
			if !ok {
				return math.Inf(1)
			}
			return lambda(out, teArcMin)
		})
	} else {
		best = lambda(e.sharp(), 0)
		best = min(best, minimise(e.xLo, e.xHi, false, func(xb float64) float64 { return lambda(e.blunt(xb), 1) }))
	}
	return best < teSeparation, best
}

// teSeparation is the least λ (see teIndistinct) at which the points tell
// two kinds of end apart: the ideal test then errs in at most 5 % of
// draws, Φ(−√λ/2) ≤ 0.05 (common practice for a 95 % statement).
const teSeparation = 4 * 1.6448536269514722 * 1.6448536269514722

// teArcMin is the least number of points on its arc for which a rounded
// rival counts: fewer fit a corner or a base alike (teUndecidable).
const teArcMin = 3

// teRivalSpan is how far forward of the trailing edge (chord units) the
// points and the outlines are compared: the rival outlines differ from
// the true one only within a few end thicknesses of the end.
const teRivalSpan = 0.08

// teEnds holds the true surfaces near the end, carried on along their end
// tangents to where they meet: each a polyline from teRivalSpan forward
// of the end to the meeting point, in the normalised frame.
type teEnds struct {
	up, lo         []geometry.Point // forward to aft
	nu, nl         int              // points of up and lo on the true surfaces; the rest is the carried-on tangent
	xLo, xHi       float64          // range of base stations tried
	rTiny, rMax    float64          // range of radii tried
	sharpU, sharpL []geometry.Point
}

// newTEEnds samples the surfaces of sh near its end; ok is false when
// their end tangents do not meet aft of the end corners.
func newTEEnds(sh *scangen.Shape) (teEnds, bool) {
	var e teEnds
	a, b, ok := sharpRival(sh)
	if !ok {
		return e, false
	}
	sLo := sh.ArcAt(2)
	cu, cl := sh.At(0), sh.At(2)
	const k = 400
	for j := k; j >= 0; j-- {
		e.up = append(e.up, sh.At(sh.ParamAt(teRivalSpan*1.5*float64(j)/k)))
	}
	for j := k; j >= 0; j-- {
		e.lo = append(e.lo, sh.At(sh.ParamAt(sLo-teRivalSpan*1.5*float64(j)/k)))
	}
	e.nu, e.nl = len(e.up), len(e.lo)
	const step = 1e-3
	tu := unit(cu.Sub(sh.At(sh.ParamAt(step))))
	tl := unit(cl.Sub(sh.At(sh.ParamAt(sLo - step))))
	const m = 100
	for j := 1; j <= m; j++ {
		f := float64(j) / m
		if a > 0 { // 0 for a sharp edge (teJudge): nothing to carry on
			e.up = append(e.up, cu.Add(tu.Scale(a*f)))
		}
		if b > 0 {
			e.lo = append(e.lo, cl.Add(tl.Scale(b*f)))
		}
	}
	tip := e.up[len(e.up)-1]
	e.xLo, e.xHi = min(cu.X, cl.X)-teRivalSpan/4, tip.X
	e.rTiny = 1e-6
	e.rMax = cu.Dist(cl) * 4
	return e, true
}

// sharp returns the outline of the sharp rival: the surfaces carried on
// to their meeting point.
func (e teEnds) sharp() [][]geometry.Point { return [][]geometry.Point{e.up, e.lo} }

// blunt returns the outline of a base square to the chord at station xb
// across the carried-on surfaces.
func (e teEnds) blunt(xb float64) [][]geometry.Point {
	u, pu := cutAtX(e.up, xb)
	l, pl := cutAtX(e.lo, xb)
	return [][]geometry.Point{u, l, {pu, pl}}
}

// cutAtX returns the polyline p (forward to aft) up to where it first
// reaches station x, and that point (its last point when it never does).
func cutAtX(p []geometry.Point, x float64) ([]geometry.Point, geometry.Point) {
	for k := 1; k < len(p); k++ {
		if p[k].X >= x && p[k-1].X < x {
			f := (x - p[k-1].X) / (p[k].X - p[k-1].X)
			c := p[k-1].Add(p[k].Sub(p[k-1]).Scale(f))
			return append(append([]geometry.Point(nil), p[:k]...), c), c
		}
	}
	return p, p[len(p)-1]
}

// rounded returns the outline of the end of radius r tangent to both
// carried-on surfaces: the upper surface to the tangent point, the arc
// round the aft end, the lower surface from its tangent point; ok is
// false when no such circle lies between them.
func (e teEnds) rounded(r float64) ([][]geometry.Point, bool) {
	// The centre lies r inward (below) of the upper polyline at vertex k;
	// g(k) is its distance from the lower polyline less r, positive
	// forward (the surfaces apart) and negative near where they meet.
	centre := func(k int) geometry.Point {
		a, b := e.up[max(k-1, 0)], e.up[min(k+1, len(e.up)-1)]
		d := unit(b.Sub(a))
		return e.up[k].Add(geometry.Point{X: d.Y, Y: -d.X}.Scale(r)) // right of aft travel: inward
	}
	g := func(k int) float64 { d, _ := polyDist(centre(k), [][]geometry.Point{e.lo}); return d - r }
	k0 := -1
	for k := len(e.up) - 2; k >= 0; k-- {
		if g(k) >= 0 && g(k+1) < 0 {
			k0 = k
			break
		}
	}
	if k0 < 0 {
		return nil, false
	}
	// Between vertices k0 and k0+1, interpolated.
	g0, g1 := g(k0), g(k0+1)
	f := g0 / (g0 - g1)
	c := centre(k0).Add(centre(k0 + 1).Sub(centre(k0)).Scale(f))
	pu := e.up[k0].Add(e.up[k0+1].Sub(e.up[k0]).Scale(f))
	kl, pl := nearestOn(e.lo, c)
	au := math.Atan2(pu.Y-c.Y, pu.X-c.X)
	al := math.Atan2(pl.Y-c.Y, pl.X-c.X)
	if al > au {
		al -= 2 * math.Pi
	}
	var arc []geometry.Point
	const m = 64
	for j := 0; j <= m; j++ {
		t := au + (al-au)*float64(j)/m
		arc = append(arc, c.Add(geometry.Point{X: math.Cos(t), Y: math.Sin(t)}.Scale(r)))
	}
	up := append(append([]geometry.Point(nil), e.up[:k0+1]...), pu)
	lo := append(append([]geometry.Point(nil), e.lo[:kl+1]...), pl)
	return [][]geometry.Point{up, lo, arc}, true
}

// nearestOn returns the segment k (p[k]–p[k+1]) of the polyline p nearest
// to q and the foot of q on it.
func nearestOn(p []geometry.Point, q geometry.Point) (int, geometry.Point) {
	bk, bd, bf := 0, math.Inf(1), p[0]
	for k := 0; k+1 < len(p); k++ {
		f := geometry.SegmentFoot(q, p[k], p[k+1])
		if d := q.Dist(f); d < bd {
			bk, bd, bf = k, d, f
		}
	}
	return bk, bf
}

// polyDist returns the distance of p from the nearest of the polylines,
// and which that is.
// On a polyline longer than 2·polyWindow points whose stations increase
// along it (a surface's do near the end) only the segments about p's
// station are searched; any other (a rounded end's arc turns back) is
// searched whole.
func polyDist(p geometry.Point, polys [][]geometry.Point) (float64, int) {
	d, which := math.Inf(1), -1
	byX := func(a, b geometry.Point) int { return cmp.Compare(a.X, b.X) }
	for j, q := range polys {
		if len(q) == 1 && p.Dist(q[0]) < d {
			d, which = p.Dist(q[0]), j
		}
		k0, k1 := 0, len(q)-1
		if len(q) > 2*polyWindow && slices.IsSortedFunc(q, byX) {
			i, _ := slices.BinarySearchFunc(q, p.X, func(a geometry.Point, x float64) int { return cmp.Compare(a.X, x) })
			k0, k1 = max(i-polyWindow, 0), min(i+polyWindow, len(q)-1)
		}
		for k := k0; k < k1; k++ {
			if e := p.Dist(geometry.SegmentFoot(p, q[k], q[k+1])); e < d {
				d, which = e, j
			}
		}
	}
	return d, which
}

// polyWindow is how many segments either side of a point's station
// polyDist searches on a long polyline: 0.009 c of the surfaces as
// newTEEnds samples them, beyond the thickness of any end it weighs.
const polyWindow = 30

// minimise returns the least value of f over [a, b] (on a log scale when
// logScale): the best of a grid, refined by golden-section search between
// its neighbours.
func minimise(a, b float64, logScale bool, f func(float64) float64) float64 {
	to, from := func(x float64) float64 { return x }, func(x float64) float64 { return x }
	if logScale {
		to, from = math.Log, math.Exp
	}
	lo, hi := to(a), to(b)
	const n = 48
	at := func(j int) float64 { return lo + (hi-lo)*float64(j)/n }
	best, bj := math.Inf(1), 0
	for j := 0; j <= n; j++ {
		if v := f(from(at(j))); v < best {
			best, bj = v, j
		}
	}
	x0, x1 := at(max(bj-1, 0)), at(min(bj+1, n))
	const g = 0.6180339887498949
	c, d := x1-g*(x1-x0), x0+g*(x1-x0)
	fc, fd := f(from(c)), f(from(d))
	for range 40 {
		if fc < fd {
			x1, d, fd = d, c, fc
			c = x1 - g*(x1-x0)
			fc = f(from(c))
		} else {
			x0, c, fc = c, d, fd
			d = x0 + g*(x1-x0)
			fd = f(from(d))
		}
	}
	return min(best, fc, fd)
}
