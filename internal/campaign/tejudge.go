package campaign

import (
	"math"
	"sort"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/scangen"
)

// The stop 26 judgement of whether the good points of a case decide the
// kind of its trailing edge. The stop 23 judgement (teUndecidable and
// teIndistinct) made three different tests for three kind pairs: a count
// of points on a rounded end (three at least), a gap test for a blunt
// base no point lies on against a sharp corner, and a likelihood-ratio
// test for a base against a rounded end, that needed three points on the
// rival arc; a sharp edge was never undecidable. This one makes the same
// test for every pair, truth against the best rival of each other kind,
// both ways:
//
//	λ = λ_pos + λ_gap ≥ teSeparation (= (2·1.645)²)
//
// λ_pos is teIndistinct's: the sum of the squared distances, in
// scatters, of the noise-free good points from the rival outline (the
// expected difference of −2 ln likelihood between truth and rival under
// normal scatter; the likelihood-ratio test picks the truth with
// probability Φ(√λ/2), the Neyman–Pearson lemma).
//
// λ_gap is the difference of −2 ln likelihood of the gap round the end,
// where it is a real test: when no good point lies on the end piece of
// either outline (the end then lies inside one gap between the last
// points of the two surfaces, whose length is g_t round the true end and
// g_r round the rival's), and the measurement reached the end (each
// surface's last point lies within a plausible gap of its end corner,
// teGapPlausible; otherwise the end lies in a stretch the scan missed and
// the gap says nothing of its shape). The gaps are taken as a renewal
// sequence of log-normal gaps with the mean h and the σ of the surfaces'
// last gaps (gapStats): −2 ln f(g) = 2 ln g + (ln g − μ)²/σ² + const,
// μ = ln h − σ²/2, and λ_gap = D(g_r) − D(g_t). It may be negative: a
// rival whose end gap is likelier than the truth's is favoured by it.
//
// Rivals: sharp (the true surfaces carried on along their end tangents to
// where they meet); blunt (a base square to the chord across them, its
// station free); rounded (an arc tangent to both, its radius free). A
// rival counts as another kind only where teRight would not take it for
// the truth's: a base or an arc at least four scatters thick, and, for a
// truth thinner than that, not the kinds teRight accepts for it. No rival
// needs a least number of points on its end piece: one with none is
// weighed by the gap.
//
// Noise-free points (scatter 0) are left to the stop 23 judgement: their
// positions tell any two outlines apart.

// teRivalKinds are the kinds of end the judgement weighs, in the order of
// the λ it returns.
var teRivalKinds = [3]string{scangen.TESharp, scangen.TEBlunt, scangen.TERounded}

// teVerdict is the stop 26 judgement of one case.
type teVerdict struct {
	Decided bool
	Rival   string     // the best rival kind, "" when none is weighed
	Lambda  float64    // its λ, +Inf when none is weighed
	Each    [3]float64 // λ of each rival kind, teRivalKinds order; +Inf for the truth's own kind and rivals not weighed
	// OnEnd counts the good points on the true end piece (a base or a
	// rounded end); Gap says whether the gap round the end was weighed
	// (no point on the end and the scan reached it).
	OnEnd int
	Gap   bool
	// Miss is, for an end no good point lies on, the probability that an
	// end piece of its length at this spacing leaves no point
	// (teNoPointProb); −1 where there is none to weigh.
	Miss float64
	OK   bool // false when the judgement does not apply (no end pieces, noise-free points): the stop 23 one stands
}

// Why returns, for an undecided case, why the points do not decide it:
// its end holds points that the rival fits within their scatter, or no
// point lies on it and the gap round it fits the rival too, or no point
// lies on it and the scan stops short of it (the gap says nothing).
// It returns "" for a decided case.
func (v teVerdict) Why() string {
	switch {
	case v.Decided:
		return ""
	case v.OnEnd > 0:
		return "points on the end, within their scatter of the rival"
	case v.Gap:
		return "no point on the end, its gap fits the rival"
	}
	return "no point on the end, the scan stops short of it"
}

// teJudge returns the stop 26 judgement (above) of a case.
func teJudge(tr *scangen.Truth) teVerdict {
	v := teVerdict{Miss: -1}
	v.Decided, v.Rival, v.Lambda, v.Each, v.OK = teJudgeOf(tr, &v)
	return v
}

// teJudgeOf makes the judgement; it also sets v's OnEnd, Gap and Miss.
func teJudgeOf(tr *scangen.Truth, v *teVerdict) (decided bool, rival string, lambda float64, each [3]float64, ok bool) {
	each = [3]float64{math.Inf(1), math.Inf(1), math.Inf(1)}
	sec := tr.Section
	if sec == nil || sec.Shape == nil {
		return false, "", math.Inf(1), each, false
	}
	sh := sec.Shape
	s := math.Sqrt(tr.Noise*tr.Noise + tr.Resolution*tr.Resolution/12)
	if !(s > 0) {
		return false, "", math.Inf(1), each, false
	}
	e, okE := newTEEnds(sh)
	if !okE {
		return false, "", math.Inf(1), each, false
	}
	three := sh.Pieces() >= 3
	sLo := sh.ArcAt(2)
	endLen := 0.0
	if three {
		endLen = sh.Length() - sLo
	}
	upper, lower, onEnd := goodArcs(tr, sh)
	var pts []geometry.Point
	for _, l := range tr.Lines {
		if l.Kind != scangen.LineGood {
			continue
		}
		if p := sh.At(l.T); p.X >= 1-teRivalSpan {
			pts = append(pts, p)
		}
	}
	v.OnEnd = onEnd
	if len(pts) == 0 {
		return false, "", math.Inf(1), each, false
	}
	// The gap model, and the true end gap where the gap is a test.
	gapTest, gt, mu, sig := false, 0.0, 0.0, 0.0
	if onEnd == 0 && len(upper) >= 2 && len(lower) >= 2 {
		sort.Float64s(upper)
		sort.Float64s(lower)
		n := len(lower)
		du, dl := upper[0], sLo-lower[n-1]
		var gu, gl []float64
		for k := 1; k < len(upper) && k <= teGapSpan; k++ {
			gu = append(gu, upper[k]-upper[k-1])
		}
		for k := 1; k < n && k <= teGapSpan; k++ {
			gl = append(gl, lower[n-k]-lower[n-k-1])
		}
		h, sigma := gapStats(gu, gl)
		gapTest = h > 0 && teGapPlausible(max(du, dl), h, sigma)
		if h > 0 && endLen > 0 {
			v.Miss = teNoPointProb(endLen, h, sigma)
		}
		gt, mu, sig = du+endLen+dl, math.Log(h)-sigma*sigma/2, sigma
	}
	v.Gap = gapTest
	dev := func(g float64) float64 {
		lg := math.Log(max(g, 1e-12))
		return 2*lg + sq(lg-mu)/(sig*sig)
	}
	// eval returns λ for the rival outline out ({upper, lower[, end]},
	// each surface forward to aft).
	eval := func(out [][]geometry.Point) float64 {
		var sum float64
		on := 0
		// The last point of each surface: the aftmost of those nearest it
		// (the surfaces run aft near the end).
		last := [2]int{-1, -1}
		for j, p := range pts {
			d, k := polyDist(p, out)
			sum += sq(d / s)
			switch {
			case k == 0 || k == 1:
				if last[k] < 0 || p.X > pts[last[k]].X {
					last[k] = j
				}
			default:
				on++
			}
		}
		if gapTest && on == 0 && last[0] >= 0 && last[1] >= 0 {
			gr := aftArc(pts[last[0]], out[0]) + aftArc(pts[last[1]], out[1])
			if len(out) > 2 {
				gr += polyLen(out[2])
			}
			sum += dev(gr) - dev(gt)
		}
		return sum
	}
	if sec.TEKind == scangen.TESharp {
		// The nested null: see the comment at the top.
		return true, "", math.Inf(1), each, true
	}
	small := tr.TEThickness < 4*s
	least := 0.0
	if small {
		least = 4 * s
	}
	if !small {
		each[0] = eval(e.sharp())
	}
	if sec.TEKind != scangen.TEBlunt && !(sec.TEKind == scangen.TERounded && small) {
		each[1] = minimise(e.xLo, e.xHi, false, func(xb float64) float64 {
			out := e.blunt(xb)
			if out[2][0].Dist(out[2][1]) < least || out[2][0].Dist(out[2][1]) == 0 {
				return math.Inf(1)
			}
			return eval(out)
		})
	}
	if sec.TEKind != scangen.TERounded {
		rMax := e.rMax
		if rLo := max(least/2, e.rTiny); rLo < rMax {
			each[2] = minimiseArc(rLo, rMax, s, func(r float64) (float64, float64) {
				out, ok := e.rounded(r)
				if !ok {
					return math.Inf(1), math.NaN()
				}
				tip := math.Inf(-1)
				for _, p := range out[2] {
					tip = max(tip, p.X)
				}
				return eval(out), tip
			})
		}
	}
	lambda = math.Inf(1)
	for k, l := range each {
		if l < lambda {
			lambda, rival = l, teRivalKinds[k]
		}
	}
	return !(lambda < teSeparation), rival, lambda, each, true
}

// minimiseArc returns the least λ of the rounded rival over radii [a, b].
// λ turns on where the arc lies, and where the surfaces close at a small
// angle the arc's tip moves along them several times as fast as its
// radius grows: the basin where it passes through the points of a base
// may be a few per cent of the radius wide, narrower than a step of
// minimise's grid, which then settles on the plateau of the small radii
// (the sharp corner's λ). So the grid on ln r is refined until the tip
// moves at most step (the scatter) between neighbours, where f gives it
// (at most arcRefine points more, spread over the intervals as they
// need them), and the best of it by golden-section search between its
// neighbours. f returns λ and the station of the arc's tip (NaN when
// there is no arc of that radius).
func minimiseArc(a, b, step float64, f func(r float64) (lambda, tip float64)) float64 {
	const n = 48
	type at struct{ lr, v, tip float64 }
	lo, hi := math.Log(a), math.Log(b)
	grid := make([]at, n+1)
	for j := range grid {
		lr := lo + (hi-lo)*float64(j)/n
		v, tip := f(math.Exp(lr))
		grid[j] = at{lr, v, tip}
	}
	need := make([]int, n)
	total := 0
	for j := range need {
		if d := math.Abs(grid[j+1].tip - grid[j].tip); d > step { // false for NaN
			need[j] = int(math.Ceil(d/step)) - 1
			total += need[j]
		}
	}
	pts := grid[:1:1]
	for j := range need {
		m := need[j]
		if total > arcRefine {
			m = int(math.Ceil(float64(m) * arcRefine / float64(total)))
		}
		for k := 1; k <= m; k++ {
			lr := grid[j].lr + (grid[j+1].lr-grid[j].lr)*float64(k)/float64(m+1)
			v, tip := f(math.Exp(lr))
			pts = append(pts, at{lr, v, tip})
		}
		pts = append(pts, grid[j+1])
	}
	bj := 0
	for j, p := range pts {
		if p.v < pts[bj].v {
			bj = j
		}
	}
	x0, x1 := pts[max(bj-1, 0)].lr, pts[min(bj+1, len(pts)-1)].lr
	g := func(lr float64) float64 { v, _ := f(math.Exp(lr)); return v }
	const gr = 0.6180339887498949
	c, d := x1-gr*(x1-x0), x0+gr*(x1-x0)
	fc, fd := g(c), g(d)
	for range 40 {
		if fc < fd {
			x1, d, fd = d, c, fc
			c = x1 - gr*(x1-x0)
			fc = g(c)
		} else {
			x0, c, fc = c, d, fd
			d = x0 + gr*(x1-x0)
			fd = g(d)
		}
	}
	return min(pts[bj].v, fc, fd)
}

// arcRefine bounds the points minimiseArc adds to its grid.
const arcRefine = 400

// aftArc returns the arc length along the polyline q (forward to aft)
// from the foot of p on it to q's aft end.
func aftArc(p geometry.Point, q []geometry.Point) float64 {
	k, f := nearestOn(q, p)
	rest := f.Dist(q[k+1])
	for j := k + 1; j+1 < len(q); j++ {
		rest += q[j].Dist(q[j+1])
	}
	return rest
}

// polyLen returns the length of the polyline q.
func polyLen(q []geometry.Point) float64 {
	var l float64
	for j := 0; j+1 < len(q); j++ {
		l += q[j].Dist(q[j+1])
	}
	return l
}

// teNoPointProb returns the probability that a stretch of outline of
// length w, at a given spot, holds no point of a renewal sequence of
// log-normal gaps of mean h and σ sigma: the gap that holds the spot is
// drawn in proportion to its length, and the stretch, placed uniformly
// in it, is missed with probability (G − w)⁺/G, so the probability is
// E[(G − w)⁺]/h = Φ(d₁) − (w/h)·Φ(d₂), d₁ = (ln(h/w) + σ²/2)/σ,
// d₂ = d₁ − σ (the log-normal partial expectation, as in the
// Black–Scholes formula).
func teNoPointProb(w, h, sigma float64) float64 {
	if w <= 0 {
		return 1
	}
	d1 := (math.Log(h/w) + sigma*sigma/2) / sigma
	d2 := d1 - sigma
	phi := func(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }
	return phi(d1) - w/h*phi(d2)
}
