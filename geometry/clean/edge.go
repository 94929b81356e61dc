package clean

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/mathext"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/par"
)

// Trailing-edge kinds (Edge.Kind).
const (
	EdgeSharp   = "sharp"   // the surfaces meet in a corner
	EdgeBlunt   = "blunt"   // a base joins the ends of the surfaces
	EdgeRounded = "rounded" // a small-radius end turns from one surface to the other
)

// Edge is the trailing edge found on the contour's points (Report.Edge).
// The contour starts at the end of the upper surface: the corner of a
// sharp edge when a point lies there, else the first point past it; the
// upper corner of a blunt edge; the tip of a rounded one. The last Base
// points of the contour lie on a blunt edge's base.
type Edge struct {
	Kind string
	// Base is the number of points at the end of the contour on a blunt
	// base, from the lower to the upper corner.
	Base int
	// Upper and Lower are the ends of the upper and the lower surface
	// (input coordinates) for a sharp or blunt edge: where the surfaces,
	// each fitted near the edge, meet each other (sharp: Upper = Lower) or
	// the base (blunt). They need not be points of the contour: a corner
	// that no point sampled is reconstructed.
	Upper, Lower geometry.Point
	// Reconstructed reports that Upper or Lower is not a contour point.
	Reconstructed bool
	// Thickness is the distance between the ends (blunt), or the width
	// where a rounded end gives way to the surfaces, input units.
	Thickness float64
	// Chord is the length of the coarse chord line the analysis used
	// (input units), for scaling its figures.
	Chord float64
	// Why says what decided the kind, in words a user can check.
	Why string
	// Spread is how far along the chord (input units) the trailing edge
	// of another model of the end lies from this one's, among the models
	// the points cannot tell from it (edgePlausible): an unsampled sharp
	// corner beyond a base through the last points, say. 0 when the
	// points decide.
	Spread float64
	// SpreadAcross is how far across the chord (input units) the trailing
	// edge of another model the points cannot tell from this one lies:
	// the chord line, and with it the twist, turns by that much over the
	// chord. 0 when the points decide.
	SpreadAcross float64
	// SpreadSurface is how far (chord units) the outline of the end stated
	// may lie from that of another model the points cannot tell from it
	// (a base's corners from an arc they square off, a base from the
	// surfaces run on to a corner beyond it, with the stretch of the
	// chord between them): a bound on the surface's error there that the
	// replicas of the fit, which keep the end stated, do not see. 0 when
	// the points decide.
	SpreadSurface float64
	// Rivals are the other kinds of end (sharp, blunt, rounded, in the
	// order tried) that the points cannot tell from Kind: a model of that
	// kind scores within edgePlausible of the winner (a rounded end only
	// with a point on its arc). The spreads above take them in. Empty
	// when the points decide the kind.
	Rivals []string
}

// edgePlausible is the score difference (−2 ln of a likelihood ratio of
// 20, common practice for a 95 % statement) within which another model of
// the end counts as plausible for Edge.Spread.
const edgePlausible = 6

// Lengths of the trailing-edge analysis, in chord units.
const (
	edgeFit     = 0.03 // each surface is fitted over this much of the chord ...
	edgeFitMax  = 0.4  // ... or more, up to this, to hold edgeCoreFit points ...
	edgeZone    = 0.02 // ... short of this end zone, where the end models compete
	edgeCoreFit = 8    // points a surface fit takes when it has to reach farther
	edgeMinFit  = 4    // least points of a surface fit
	edgeCross   = 0.15 // the fits' crossing is sought this far beyond the aftmost point
)

// Limits of the trailing-edge analysis.
const (
	edgeCap   = 4   // a point's misfit counts at most this many scatters (outliers of the end models)
	edgeOn    = 2   // a zone point within this many scatters of a surface's first fit joins its second ...
	edgeShare = 0.1 // ... or within this share of the surfaces' separation
	edgeReach = 2.5 // a corner no point sampled lies within this many local steps of the last points
	edgeBases = 24  // positions of a blunt end's base, or a rounded end's tip, tried
)

// endModel is one model of the end of a section: the two surfaces up to
// where they end, and what joins them.
type endModel struct {
	kind  string
	score float64
	// extra is what the model pays besides its points' misfits: for the
	// numbers it fits and the stretches it leaves unsampled.
	extra float64
	// xu, xl: the surfaces count up to these x (beyond them, the distance
	// to their last point).
	xu, xl float64
	// Sharp: the corner. Blunt: the base from lo to hi. Rounded: the
	// circle (centre, r), from the tangent point tl to tu.
	corner, lo, hi geometry.Point
	// beyond (sharp): how far aft of corner, along the chord, the corner
	// is expected to lie when it was put at the aftmost point of a thin
	// edge (chord units; see endCarry); 0 otherwise.
	beyond float64
	centre geometry.Point
	r      float64
	tl, tu geometry.Point
	// spread, spreadY: see Edge.Spread and Edge.SpreadAcross (chord
	// units), set on the winner.
	spread, spreadY float64
	// spreadS: see Edge.SpreadSurface (chord units), set on the winner.
	spreadS float64
	// rivals: see Edge.Rivals, set on the winner.
	rivals []string
	// tipLo, tipHi: the range of the trailing edge's station over the
	// positions of this kind of end (the bases or arcs tried) that score
	// within edgePlausible of this one, when tips says they were measured.
	tipLo, tipHi float64
	tips         bool
}

// plausibleTips returns the range of tipX over best and the candidates
// that score within edgePlausible of it.
func plausibleTips(cands []endModel, best *endModel) (lo, hi float64) {
	lo, hi = best.tipX(), best.tipX()
	for i := range cands {
		if cands[i].score <= best.score+edgePlausible {
			x := cands[i].tipX()
			lo, hi = min(lo, x), max(hi, x)
		}
	}
	return lo, hi
}

// tipsBeyond returns best.tipHi raised to the trailing edges of the ends
// at (bases or arcs at a station) tried on past the grid of candidates
// cands, whose last station is xLast, for as long as they score within
// edgePlausible of best, when the grid's last candidate still does: a
// grid that stops while its ends are as likely as the best says nothing
// of how far on they stay so, and the plausible range (and the spread it
// gives) would end where the grid does. The ends are tried a twelfth of
// the step between points apart, up to tipsMore of them and no farther
// than edgeCross beyond the aftmost point xmax (as far as the fits'
// crossing is sought).
func tipsBeyond(at func(x float64) (endModel, bool), best *endModel, cands []endModel, xLast, step, xmax float64) float64 {
	hi := best.tipHi
	if len(cands) == 0 || !(step > 0) {
		return hi
	}
	if last := cands[len(cands)-1]; last.score > best.score+edgePlausible {
		return hi
	}
	dx := step / 12
	for j := 1; j <= tipsMore; j++ {
		x := xLast + float64(j)*dx
		if x > xmax+edgeCross {
			break
		}
		m, ok := at(x)
		if !ok || m.score > best.score+edgePlausible {
			break
		}
		hi = max(hi, m.tipX())
	}
	return hi
}

// tipsMore is the most ends tipsBeyond tries: eight steps between points
// past the grid, a bound on its cost (an end that far on leaves eight
// steps more unsampled either side, far beyond what the gaps' law allows
// at the 95 % level, plausibleEnd).
const tipsMore = 96

// tipX returns the chord station of the model's trailing edge: the
// corner, the base, the tip of the arc.
func (m *endModel) tipX() float64 {
	switch m.kind {
	case EdgeSharp:
		return m.corner.X
	case EdgeBlunt:
		return (m.lo.X + m.hi.X) / 2
	}
	return m.centre.X + m.r
}

// tipY returns the height of the model's trailing-edge point across the
// coarse chord line: the corner, the base's midpoint, the arc's tip.
func (m *endModel) tipY() float64 {
	switch m.kind {
	case EdgeSharp:
		return m.corner.Y
	case EdgeBlunt:
		return (m.lo.Y + m.hi.Y) / 2
	}
	return m.centre.Y
}

// surfaceMiss returns the distance of p from the surface q up to xEnd:
// the offset in y where p lies before xEnd (the surfaces run nearly along
// the chord near the edge), else the distance to the surface's last point.
func surfaceMiss(q quadFit, xEnd float64, p geometry.Point) float64 {
	if p.X <= xEnd {
		return math.Abs(p.Y - q.at(p.X))
	}
	return p.Dist(geometry.Point{X: xEnd, Y: q.at(xEnd)})
}

// miss returns the distance of p from the model: from the nearer surface
// and from the piece that joins them, and which it is nearest to: −1 the
// lower surface, 0 the joining piece, +1 the upper surface.
func (m *endModel) miss(u, l quadFit, p geometry.Point) (float64, int) {
	du, dl := surfaceMiss(u, m.xu, p), surfaceMiss(l, m.xl, p)
	best, which := du, 1
	if dl < best {
		best, which = dl, -1
	}
	var de float64
	switch m.kind {
	case EdgeSharp:
		de = p.Dist(m.corner)
	case EdgeBlunt:
		de = geometry.SegmentDist(p, m.lo, m.hi)
	default:
		v := p.Sub(m.centre)
		a, al, au := math.Atan2(v.Y, v.X), math.Atan2(m.tl.Y-m.centre.Y, m.tl.X-m.centre.X), math.Atan2(m.tu.Y-m.centre.Y, m.tu.X-m.centre.X)
		if a >= al && a <= au {
			de = math.Abs(v.Norm() - m.r)
		} else {
			de = math.Min(p.Dist(m.tl), p.Dist(m.tu))
		}
	}
	if de < best {
		best, which = de, 0
	}
	return best, which
}

// side returns which part of the model p belongs to, as miss does, but
// with the surfaces keeping a point that is within the scatter of both
// a surface and the joining piece (a corner point is a surface's end).
func (m *endModel) side(u, l quadFit, p geometry.Point, scat float64) int {
	d, w := m.miss(u, l, p)
	if w != 0 {
		return w
	}
	du, dl := surfaceMiss(u, m.xu, p), surfaceMiss(l, m.xl, p)
	switch {
	case du <= d+scat && du <= dl:
		return 1
	case dl <= d+scat:
		return -1
	}
	return 0
}

// scoreOf sets m.score: the misfits of the zone points in scatters (zs,
// see misfit), squared and capped at edgeCap (common practice for a
// robust loss).
func (m *endModel) scoreOf(u, l quadFit, z []geometry.Point, scat float64, zs []float64) {
	m.score = m.misfit(u, l, z, scat, edgeCap, nil, zs) + m.extra
}

// misfit returns the sum of the squared misfits of the points z in
// scatters, each capped at limit scatters, leaving out the points marked
// in skip (nil: none). The scatter of point j is zs[j] (nil: scat for
// all).
func (m *endModel) misfit(u, l quadFit, z []geometry.Point, scat, limit float64, skip []bool, zs []float64) float64 {
	var s float64
	for j, p := range z {
		if skip != nil && skip[j] {
			continue
		}
		sc := scat
		if zs != nil {
			sc = zs[j]
		}
		d, _ := m.miss(u, l, p)
		r := min(d/sc, limit)
		s += r * r
	}
	return s
}

// zoneScatter returns the scatter of each zone point about a model of the
// end: the points' own and the error of the surfaces' fits carried to
// its station (a new point misses a least-squares fit by both, common
// practice), so that fits carried far beyond their points do not turn
// the surfaces' own uncertainty into misfits that decide the end.
func (f endFits) zoneScatter(z []geometry.Point, scat float64) []float64 {
	zs := make([]float64, len(z))
	for j, p := range z {
		e := max(f.eu.se(p.X), f.el.se(p.X))
		zs[j] = math.Sqrt(scat*scat + e*e)
	}
	return zs
}

// roundEnd returns the rounded end of radius r tangent to the surfaces u
// and l near their end at xmax: the circle tangent to their tangent lines,
// taken where the circle touches them (three rounds, starting at xmax), or
// false when no such circle lies between them.
func roundEnd(u, l quadFit, xmax, r float64) (endModel, bool) {
	x0 := xmax
	var m endModel
	for range 3 {
		var ok bool
		if m, ok = roundEndAt(u, l, x0, r); !ok {
			return m, false
		}
		x0 = (m.tu.X + m.tl.X) / 2
	}
	return m, true
}

// roundTip returns the rounded end tangent to the surfaces (roundEnd)
// whose aftmost point lies at xtip, its radius found by bisection (the tip
// of a circle between converging surfaces moves forward as it grows), or
// false when none does.
func roundTip(u, l quadFit, xtip, rmax float64) (endModel, bool) {
	tipOf := func(r float64) (float64, bool) {
		m, ok := roundEnd(u, l, xtip, r)
		return m.centre.X + r, ok
	}
	// A bracket on a log scale from the largest radius down: the tip lies
	// beyond xtip for the smaller radius and short of it for the larger.
	hi := rmax
	th, okh := tipOf(hi)
	lo := hi
	found := false
	for range 40 {
		lo = hi / 1.5
		tl, okl := tipOf(lo)
		if okl && okh && th <= xtip && tl >= xtip {
			found = true
			break
		}
		hi, th, okh = lo, tl, okl
	}
	if !found {
		return endModel{}, false
	}
	for range 50 {
		mid := math.Sqrt(lo * hi)
		t, ok := tipOf(mid)
		if !ok {
			return endModel{}, false
		}
		if t > xtip {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo <= 1e-9*hi {
			break
		}
	}
	return roundEnd(u, l, xtip, math.Sqrt(lo*hi))
}

// roundEndAt returns the rounded end of radius r tangent to the lines that
// continue u and l from x0 (their tangents there), or false when no such
// circle lies between them.
func roundEndAt(u, l quadFit, x0, r float64) (endModel, bool) {
	su, sl := u.c[1]+2*u.c[2]*x0, l.c[1]+2*l.c[2]*x0
	yu, yl := u.at(x0), l.at(x0)
	if yu <= yl {
		return endModel{}, false
	}
	// The centre is r below the upper line and r above the lower one:
	//   yc − yu − su (xc − x0) = −r √(1 + su²)
	//   yc − yl − sl (xc − x0) = +r √(1 + sl²)
	nu, nl := math.Sqrt(1+su*su), math.Sqrt(1+sl*sl)
	var xc float64
	if math.Abs(su-sl) < 1e-9 {
		// Parallel: the radius is fixed by their distance; put the circle
		// at the end.
		xc = x0 - r
	} else {
		// Subtract: (yl − yu) + (sl − su)(xc − x0) ... solve for xc.
		xc = x0 + ((yu-yl)-r*(nu+nl))/(sl-su)
	}
	yc := yu + su*(xc-x0) - r*nu
	c := geometry.Point{X: xc, Y: yc}
	tu := c.Add(geometry.Point{X: -su, Y: 1}.Scale(r / nu))
	tl := c.Add(geometry.Point{X: sl, Y: -1}.Scale(r / nl))
	if !(tu.Y > tl.Y) || !(r > 0) {
		return endModel{}, false
	}
	return endModel{kind: EdgeRounded, xu: tu.X, xl: tl.X, centre: c, r: r, tu: tu, tl: tl}, true
}

// edgeFound is what findEdge found: the loop re-ordered to start at the
// end of the upper surface, the edge, the points of the end zone, and
// those of them that miss the winning end model by more than edgeOutlier
// scatters (and a tenth of the local step): gross outliers, which the
// generic test leaves to the edge's model there.
type edgeFound struct {
	seq      []int32
	edge     Edge
	zone     []int32
	outliers []hit
	frame    chordFrame // the chord frame of the analysis
	// misfit is the mean squared misfit of the zone points to the model,
	// in scatters (capped as in its score, outliers left out).
	misfit float64
	// scat is the scatter the models were scored in (chord units).
	scat float64
	// gapRatio is the longest gap round the end over the spacing either
	// side (endGap).
	gapRatio float64
}

// edgeOutlier is the misfit, in scatters, beyond which a point of the end
// zone is an outlier of the end model.
const edgeOutlier = 6

// findEdge analyses the trailing edge of the loop seq (counter-clockwise,
// outliers removed) whose points scatter by sigma about local fits. It
// returns the loop rotated to start at the end of the upper surface, with
// the base points of a blunt edge last, and the edge; ok is false when the
// loop does not show a thin end it can analyse (the caller keeps its own
// start).
//
// The method. In the chord frame of the loop (farthest pair, the thin end
// aft, see sectionFrame) each surface is fitted by a parabola y(x) over
// edgeFit of the chord (farther, up to edgeFitMax, until it holds
// edgeCoreFit points) short of the end zone (edgeZone): short, so that the
// parabola's own error where it is carried into the zone stays below the
// scatter of good data. The scatter is the larger of sigma and
// those fits' own. Three models of the end then compete for the points of
// the zone, each scored by the sum of their squared misfits in scatters,
// capped at edgeCap (so that no single point decides); a point's scatter
// takes in the error of the fits carried to its station (zoneScatter):
//
//   - sharp: the surfaces run on to where their fits cross. A corner that
//     no point sampled is stated only within reach of the last points
//     (edgeReach local steps), or where the surfaces end within the
//     scatter of each other; otherwise the surfaces must have ended apart
//     (a corner beyond reach still counts among the plausible ends for
//     the spreads).
//   - blunt: the surfaces run to a base across the chord at some x (the
//     best of edgeBases positions about the aftmost point), which joins
//     them; a lone point on it is a base point.
//   - rounded: a circular arc tangent to the surfaces joins them, its tip
//     at the best of edgeBases positions about the aftmost point.
//
// The blunt and rounded models each fit one number more than the sharp
// one and pay for it (twice the log of the zone's point count, a Bayesian
// information criterion, common practice); on a tie the simpler model
// wins, sharp before blunt before rounded. A joining piece that few or no
// points show must win by edgeEvidence besides: a base no point lies on
// over a corner, an arc with fewer than edgeArcMin points over a base
// (see chooseEnd). The points of the zone are
// then split into the lower surface, the joining piece and the upper
// surface in loop order, as the winning model assigns them.
func findEdge(pts []geometry.Point, seq []int32, sigma float64) (edgeFound, bool) {
	n := len(seq)
	if n < 2*edgeMinFit+2 {
		return edgeFound{seq: seq}, false
	}
	// The ends' widths weigh each point by the length of the loop it
	// stands for: counted alike, the points of a surface probed 5–20
	// times more coarsely than the other are trimmed off both ends as
	// extremes, and the widths compared are the dense surface's scatter.
	f, ok := sectionFrameWeighted(pts, seq, loopWeights(pts, seq), 0.3)
	if !ok {
		return edgeFound{seq: seq}, false
	}
	r, ok := findEdgeIn(pts, seq, sigma, f)
	// A wide flat base (a flatback or a cut thick section) tilts in the
	// frame of the farthest pair, which ends at one of its corners: the
	// blunt model, whose base runs square across the chord, then misses
	// the base's far end by the tilt and the refits take its points as
	// the surface's. The analysis is run again in the frame square to the
	// base the points show, and wins when it leaves at most half as many
	// points out and explains the rest (or explains them no worse): when
	// the lean was the trouble, the base's points fit once square to it;
	// when many still do not, the trouble is elsewhere (a base a grazing
	// probe saw in part) and the first verdict stands.
	if bf, wide := baseFrame(pts, seq, f); wide {
		if rb, okb := findEdgeIn(pts, seq, sigma, bf); okb && rb.edge.Kind == EdgeBlunt && rb.misfit <= edgePoor &&
			(!ok || 2*len(rb.outliers) <= len(r.outliers) && (len(rb.outliers) < len(r.outliers) || rb.misfit < r.misfit) &&
				(rb.misfit <= baseExplains || rb.misfit <= r.misfit)) {
			r, ok = rb, true
		}
	}
	if ok && r.misfit <= edgePoor {
		// A rounded end may be a nose (a thin section whose rounded
		// trailing edge is blunter than its nose is as wide near its nose
		// as near its tail): the other end is analysed too, and when a
		// model explains its points better, with surfaces that parabolas
		// fit more closely (a nose's do not), it is the trailing edge.
		if r.edge.Kind == EdgeRounded {
			if r2, ok2 := findEdgeIn(pts, seq, sigma, newChordFrame(f.te, f.le)); ok2 && r2.misfit < r.misfit && r2.scat < r.scat {
				return r2, true
			}
		}
		return r, true
	}
	// No model of the end explains the points of the end the widths
	// called thin (the nose of a thin, strongly cambered section with a
	// wide trailing-edge angle is no wider there): the other end is
	// analysed too, and when a model explains that one, with surfaces
	// that parabolas fit at least as closely (a nose's do not), it is the
	// trailing edge.
	if r2, ok2 := findEdgeIn(pts, seq, sigma, newChordFrame(f.te, f.le)); ok2 && r2.misfit <= edgePoor && (!ok || r2.misfit < r.misfit && r2.scat <= r.scat) {
		return r2, true
	}
	return r, ok
}

// Limits of a wide flat base (baseFrame).
const (
	baseWide   = 0.01 // a base spans at least this much of the chord across it ...
	baseMinPts = 6    // ... on at least this many points
	// A verdict in the base's frame that leaves fewer points out wins
	// when the mean squared misfit of the rest, in scatters, is within
	// this (a model that explains the points gives about 1, see
	// edgePoor), or no worse than the first verdict's.
	baseExplains = 2
)

// baseFrame returns the chord frame of the loop seq turned square to a
// wide flat base at the aft end of f, and whether the points show one.
// The base is the run of points about the aftmost one whose every step
// runs more across the chord than along it (a surface near its end runs
// along it: even a 40 % thick section's surfaces leave the base at well
// under 45°); it must span baseWide of the chord on baseMinPts points.
// Its direction is the principal axis of its points (a total least
// squares line, common practice); the frame keeps f's nose and puts the
// tail square to the base through the base's centroid.
func baseFrame(pts []geometry.Point, seq []int32, f chordFrame) (chordFrame, bool) {
	n := len(seq)
	if n < 2*baseMinPts {
		return f, false
	}
	k0, x0 := 0, math.Inf(-1)
	for k, i := range seq {
		if x, _ := f.at(pts[i]); x > x0 {
			k0, x0 = k, x
		}
	}
	at := func(k int) geometry.Point { return pts[seq[((k%n)+n)%n]] }
	across := func(a, b geometry.Point) bool {
		d := b.Sub(a)
		along := d.Dot(f.d)
		return math.Abs(f.d.Cross(d)) > math.Abs(along)
	}
	base := []geometry.Point{at(k0)}
	for _, dir := range []int{1, -1} {
		for s := 1; s < n/2; s++ {
			if !across(at(k0+dir*(s-1)), at(k0+dir*s)) {
				break
			}
			base = append(base, at(k0+dir*s))
		}
	}
	if len(base) < baseMinPts {
		return f, false
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range base {
		_, y := f.at(p)
		lo, hi = min(lo, y), max(hi, y)
	}
	if hi-lo < baseWide {
		return f, false
	}
	// The normal of the base is the minor axis of its points.
	c, ax := geometry.MajorAxis(base)
	nrm := geometry.Point{X: -ax.Y, Y: ax.X}
	if nrm.Dot(f.d) < 0 {
		nrm = nrm.Scale(-1)
	}
	l := c.Sub(f.le).Dot(nrm)
	if !(l > 0) {
		return f, false
	}
	return newChordFrame(f.le, f.le.Add(nrm.Scale(l))), true
}

// edgeEvidence is the least difference of scores by which a rounded end
// wins over a blunt one (a likelihood ratio of e, positive evidence on
// the usual scale of Bayes factors, common practice).
const edgeEvidence = 2

// edgeArcMin is the least number of points on its arc for which a
// rounded end is stated: fewer fit a base or a corner alike.
const edgeArcMin = 3

// onEnd returns the number of the zone points z, outliers (out) left out,
// that the model places on the piece joining the surfaces, a point within
// tol of a surface counting as the surface's (as apply places them).
func (m *endModel) onEnd(u, l quadFit, z []geometry.Point, out []bool, tol float64) int {
	k := 0
	for j, p := range z {
		if !out[j] && m.side(u, l, p, tol) == 0 {
			k++
		}
	}
	return k
}

// edgeGapK is how many times the mean spacing of the points either side
// the gap round the end must exceed before the end counts as unsampled:
// the gap that holds a given spot is longer than five mean steps in about
// 4 % of cases for points at random (Poisson: (1 + 5) e^−5), about 5 %
// for log-normal steps of σ 0.8 (our choice: a gap this long is more
// likely a stretch the measurement missed).
const edgeGapK = 5

// endGap returns the gap of the loop (as apply leaves it: the nu zone
// points of the upper surface first, the nl of the lower surface and the
// end last) that holds the trailing-edge point tip, the distance between
// the neighbouring points whose segment passes nearest to it, over the
// mean distance between neighbours round the end: those of the zone and
// gapSteps beyond it either side, the longest of them left out (a
// stretch missed there too). 0 when it cannot tell.
func endGap(pts []geometry.Point, loop []int32, nu, nl int, tip geometry.Point) float64 {
	n := len(loop)
	at := func(k int) geometry.Point { return pts[loop[((k%n)+n)%n]] }
	if nu+nl+2*gapSteps+2 >= n {
		return 0
	}
	g, gd := 0.0, math.Inf(1)
	var sum, top float64
	k0, k1 := -nl-1-gapSteps, nu+gapSteps
	for k := k0; k < k1; k++ {
		a, b := at(k), at(k+1)
		d := a.Dist(b)
		sum += d
		top = max(top, d)
		if k >= -nl-1 && k < nu {
			// A tip beyond a point (a corner put at the aftmost point,
			// or carried past it) is nearest to that point on both
			// segments that meet there: the two tie, and the tip lies
			// in neither. The longer of them is the stretch the points
			// leave open round the end, the shorter a step along a
			// surface; the longer is taken, whichever comes first.
			e := geometry.SegmentDist(tip, a, b)
			if tie := math.Abs(e-gd) <= gapTie*(e+d+g); (tie && d > g) || (!tie && e < gd) {
				g, gd = d, e
			}
		}
	}
	h := (sum - top) / float64(k1-k0-1)
	if !(h > 0) {
		return 0
	}
	return g / h
}

// gapTie is the relative difference below which endGap takes two
// segments' distances to the tip for the same: that of their common point
// (rounding of the feet found on each).
const gapTie = 1e-9

// gapSteps is the number of gaps either side whose mean endGap takes.
const gapSteps = 4

// openEnd widens the spread of the winning model when the points leave
// the end unsampled (ratio, see endGap, beyond edgeGapK): the section may
// end anywhere from a base through the aftmost point (xmax) to the corner
// where the surfaces, carried on, meet, whatever the scores say (a missed
// stretch of the outline is no sample of the end).
func (m *endModel) openEnd(fits endFits, xa, xmax, ratio float64) bool {
	if !(ratio > edgeGapK) {
		return false
	}
	u, l := fits.u, fits.l
	bx, by := m.tipX(), m.tipY()
	widen := func(x, y float64) {
		m.spread = max(m.spread, math.Abs(x-bx))
		m.spreadY = max(m.spreadY, math.Abs(y-by))
		o := endModel{kind: EdgeSharp, xu: x, xl: x, corner: geometry.Point{X: x, Y: y}}
		if x <= xmax {
			o = endModel{kind: EdgeBlunt, xu: x, xl: x, lo: geometry.Point{X: x, Y: l.at(x)}, hi: geometry.Point{X: x, Y: u.at(x)}}
		}
		m.spreadS = max(m.spreadS, m.apart(o, u, l, xa))
	}
	widen(xmax, (u.at(xmax)+l.at(xmax))/2)
	if xc, ok := crossing(u, l, xmax, xmax, xmax+edgeCross); ok {
		widen(xc, u.at(xc))
	}
	// Surfaces that straighten towards the edge, as most do, meet no
	// nearer than the fits' curvature says and no farther than their
	// tangents at the last points do.
	sep, slope := u.at(xmax)-l.at(xmax), (u.c[1]-l.c[1])+2*(u.c[2]-l.c[2])*xmax
	if sep > 0 && slope < 0 {
		if xt := xmax + sep/-slope; xt <= xmax+edgeCross {
			widen(xt, u.at(xmax)+(u.c[1]+2*u.c[2]*xmax)*(xt-xmax))
		}
	}
	// The fits carried over the missed stretch are known only to their
	// standard errors there: the surfaces may close as far on as their
	// separation, within √edgePlausible of those errors, runs out along
	// its slope (cornerReach's statement, without its cap of a few
	// spacings: the gaps of the points say nothing of a missed stretch).
	if slope < 0 {
		sd := math.Hypot(fits.eu.se(xmax), fits.el.se(xmax))
		if d := (sep + math.Sqrt(edgePlausible)*sd) / -slope; d > 0 {
			xr := xmax + min(d, edgeCross)
			widen(xr, (u.at(xr)+l.at(xr))/2)
		}
	}
	return true
}

// edgePoor is the mean squared misfit of the zone points, in scatters, of
// the best end model beyond which findEdge looks at the other end too (a
// model that explains the points gives about 1).
const edgePoor = 4

// findEdgeIn is findEdge in the chord frame f.
func findEdgeIn(pts []geometry.Point, seq []int32, sigma float64, f chordFrame) (edgeFound, bool) {
	n := len(seq)
	xs, ys := make([]float64, n), make([]float64, n)
	for k, i := range seq {
		xs[k], ys[k] = f.at(pts[i])
	}
	at := func(k int) int { return ((k % n) + n) % n }
	k0 := 0
	for k := range n {
		if xs[k] > xs[k0] {
			k0 = k
		}
	}
	// The cores: from the edge each side runs on (the upper side forward,
	// the lower side backward); its core is the part of it beyond the end
	// zone, within edgeFit of the chord or, to hold edgeCoreFit points,
	// up to edgeFitMax.
	// A point within the end zone that the order put among a core's
	// points (a stray point beside the edge) is a zone point too (hole).
	var holes []int
	core := func(dir int) (first int, idx []int) {
		first = -1
		for s := 1; s < n/2; s++ {
			k := at(k0 + dir*s)
			x := xs[k]
			if x < 1-edgeFitMax || x < 1-edgeZone-edgeFit && len(idx) >= edgeCoreFit {
				break
			}
			if x <= 1-edgeZone {
				if first < 0 {
					first = s
				}
				idx = append(idx, k)
			} else if first >= 0 {
				holes = append(holes, k)
			}
		}
		return first, idx
	}
	uf, uidx := core(1)
	lf, lidx := core(-1)
	if len(uidx) < edgeMinFit || len(lidx) < edgeMinFit {
		return edgeFound{seq: seq}, false
	}
	// The zone: the positions between the cores, from the lower side
	// through the edge to the upper side, and the holes.
	var zpos []int
	for k := at(k0 - lf + 1); k != at(k0+uf); k = at(k + 1) {
		zpos = append(zpos, k)
	}
	zpos = append(zpos, holes...)
	z := make([]geometry.Point, len(zpos))
	xmax := xs[k0]
	for j, k := range zpos {
		z[j] = geometry.Point{X: xs[k], Y: ys[k]}
		xmax = max(xmax, xs[k])
	}
	// The step between points near the edge.
	step := max(localStep(pts, seq, at(k0+uf), 1, 5), localStep(pts, seq, at(k0-lf), -1, 5)) / f.chord
	// The spacing at the end itself, where the models' outlines differ,
	// sets the rate of the points along them (a drawing's cosine stations
	// crowd there); the snapping and reach tolerances keep the step of
	// the surfaces ahead.
	pstep := step
	if es, ok := endStep(z[:len(z)-len(holes)], lf-1); ok {
		pstep = es
	}
	// How regular the spacing is either side of the zone (gapModel).
	gm := newGapModel(pts, seq, at(k0+uf), at(k0-lf), f.chord)
	// Twice: the second time each surface is fitted again with the zone
	// points the first verdict gave it, which shortens the reach of the
	// fits into the zone to the last of them.
	var best endModel
	var out []bool
	var u, l quadFit
	var eu, el fitSpread // what the winning fits leave unknown
	var scat float64
	coreU, coreL := slices.Clone(uidx), slices.Clone(lidx)
	uCore, lCore := len(coreU), len(coreL)
	var cores endFits // the surfaces' fits on their cores alone
	for round := range 2 {
		var us, ls float64
		u, us = fitScatter(xs, ys, uidx)
		l, ls = fitScatter(xs, ys, lidx)
		if !u.ok || !l.ok {
			return edgeFound{seq: seq}, false
		}
		scat = max(sigma/f.chord, us, ls, 1e-9)
		eu, el = newFitSpread(xs, uidx, scat), newFitSpread(xs, lidx, scat)
		fits := endFits{u: u, l: l, eu: eu, el: el, gaps: gm}
		if round == 0 {
			cores = fits
		}
		m, o, ok := chooseEnd(fits, z, xmax, step, pstep, scat)
		if !ok {
			return edgeFound{seq: seq}, false
		}
		best, out = m, o
		if round == 1 {
			break
		}
		for j, p := range z {
			// Only points well on a surface (near a rounded end the
			// surfaces already bend): within edgeOn scatters of its fit,
			// or edgeShare of the surfaces' separation there (the first
			// fits carried into the zone miss exact data by more than
			// their scatter, and a base or an arc lies far off).
			on := max(edgeOn*scat, edgeShare*(u.at(p.X)-l.at(p.X)))
			switch m.side(u, l, p, scat) {
			case 1:
				if math.Abs(p.Y-u.at(p.X)) <= on {
					uidx = append(uidx, zpos[j])
				}
			case -1:
				if math.Abs(p.Y-l.at(p.X)) <= on {
					lidx = append(lidx, zpos[j])
				}
			}
		}
	}
	// The surfaces fitted once more over their whole side of the zone as
	// well, robustly: near a sharp corner or a small base on exact or
	// nearly exact data the fits carried into the zone from outside miss by
	// more than the scatter, while fits that take the zone in do not (and
	// near a large rounded end they bend and lose). The better scored
	// verdict of the two wins.
	for j, k := range zpos {
		switch {
		case k == k0:
		case j < slices.Index(zpos, k0):
			coreL = append(coreL, k)
		default:
			coreU = append(coreU, k)
		}
	}
	if u2, _ := fitScatter(xs, ys, coreU); u2.ok {
		if l2, _ := fitScatter(xs, ys, coreL); l2.ok {
			eu2, el2 := newFitSpread(xs, coreU, scat), newFitSpread(xs, coreL, scat)
			if m, o, ok := chooseEnd(endFits{u: u2, l: l2, eu: eu2, el: el2, gaps: gm}, z, xmax, step, pstep, scat); ok && m.score < best.score {
				best, out, u, l, eu, el = m, o, u2, l2, eu2, el2
			}
		}
	}
	xa := xmax
	for _, p := range z {
		xa = min(xa, p.X)
	}
	if best.kind == EdgeBlunt {
		lastU, lastL := math.Inf(-1), math.Inf(-1)
		for _, k := range coreU[:uCore] {
			lastU = max(lastU, xs[k])
		}
		for _, k := range coreL[:lCore] {
			lastL = max(lastL, xs[k])
		}
		best.acrossGap(cores, z, lastU, lastL, scat, max(step, pstep))
	}
	r, ok := best.apply(pts, seq, f, u, l, zpos, z, out, scat, step)
	if ok && best.openEnd(endFits{u: u, l: l, eu: eu, el: el}, xa, xmax, r.gapRatio) {
		r.edge.Spread, r.edge.SpreadAcross, r.edge.SpreadSurface = best.spread*f.chord, best.spreadY*f.chord, best.spreadS
		// A base through the last points or a corner beyond them.
		for _, k := range []string{EdgeSharp, EdgeBlunt} {
			if k != r.edge.Kind && !slices.Contains(r.edge.Rivals, k) {
				r.edge.Rivals = append(r.edge.Rivals, k)
			}
		}
	}
	return r, ok
}

// acrossGap widens the spreads of a blunt end m whose corner on a surface
// lies across a gap in that surface's points, more than edgeReach steps h
// past its last point (foreU, foreL: the last stations of the surfaces'
// cores; zone points on a core's fit count too): a surface shadowed short
// of the edge, or probed short of it. The corner there is where the
// surface's fit (which may have taken in the base's points) meets the base,
// a reconstruction the points do not check: the surface's fit on its own
// core carried on to the base (cores) may put it elsewhere, as far again
// as that fit's own error there. The trailing edge's point, the base's
// middle, moves by half as much across the chord (the twist's bound), and
// the outline by as much (the surface's).
func (m *endModel) acrossGap(cores endFits, z []geometry.Point, foreU, foreL, scat, h float64) {
	// A zone point on a surface lies on its core's fit (as in the second
	// round of findEdgeIn; the fits u and l may have bent through the
	// base); or, nearer it than the other's, within that fit's own error
	// carried out to the point: a core fitted short of the zone
	// misses a surface sampled right to its corner by more than the
	// scatter where the surface bends into its edge (campaign 1732: the
	// upper core 0.0014 c off at the corner, its points 0.0005–0.0015 c
	// off all the way there).
	band := func(sp fitSpread, x float64) float64 {
		if !sp.ok {
			return 0
		}
		return math.Sqrt(edgePlausible) * sp.se(x)
	}
	lastU, lastL := foreU, foreL
	for _, p := range z {
		on := max(edgeOn*scat, edgeShare*(cores.u.at(p.X)-cores.l.at(p.X)))
		du, dl := math.Abs(p.Y-cores.u.at(p.X)), math.Abs(p.Y-cores.l.at(p.X))
		if du <= on || du <= dl && du <= band(cores.eu, p.X) {
			lastU = max(lastU, p.X)
		}
		if dl <= on || dl < du && dl <= band(cores.el, p.X) {
			lastL = max(lastL, p.X)
		}
	}
	// A core whose own error carried out to the corner exceeds the base's
	// height (a few points far forward, their parabola carried across a
	// long gap) cannot tell where on the base the corner lies, nor check
	// it: it says nothing (campaign 15 and 584: the upper core's band
	// 1.9 c and 0.14 c at a base 0.011 c and 0.005 c high would have
	// stated the twist within 55 and 4.8 degrees).
	widen := func(corner geometry.Point, last float64, fit quadFit, sp fitSpread) {
		if !(corner.X-last > edgeReach*h) || !fit.ok || band(sp, corner.X) > m.hi.Y-m.lo.Y {
			return
		}
		d := math.Abs(fit.at(corner.X)-corner.Y) + band(sp, corner.X)
		m.spreadY = max(m.spreadY, d/2)
		m.spreadS = max(m.spreadS, d)
	}
	widen(m.hi, lastU, cores.u, cores.eu)
	widen(m.lo, lastL, cores.l, cores.el)
}

// chooseEnd fits the three end models to the zone points z and returns the
// winner (see findEdge).
func chooseEnd(fits endFits, z []geometry.Point, xmax, step, pstep, scat float64) (endModel, []bool, bool) {
	u, l := fits.u, fits.l
	zs := fits.zoneScatter(z, scat)
	pen := 2 * math.Log(float64(len(z))+2)
	// Every model's outline is measured from the foremost zone station on
	// (the part all share is the same length in each).
	xa := xmax
	for _, p := range z {
		xa = min(xa, p.X)
	}
	var models, alts []endModel
	// Sharp.
	sepEnd := u.at(xmax) - l.at(xmax)
	// The rounded end's grid of tips and its search read only what the
	// sharp and blunt models read: they run on a second core meanwhile.
	var bestR *endModel
	rounded := par.Start(func() { bestR = roundBest(u, l, z, zs, xmax, xa, step, pstep, scat, max(sepEnd, 0), pen) })
	// The end spacing that a corner put at the aftmost point is carried
	// on within (endCarry): the smallest of the steps and of the zone's own
	// (its points share its length between the two surfaces), so that a
	// step measured across an odd order (passes linked at the edge) does
	// not carry the corner far beyond the points.
	hEnd := min(step, pstep)
	if len(z) > 2 {
		hEnd = min(hEnd, 2*(xmax-xa)/float64(len(z)-1))
	}
	carried, evenCarried := endCarry(z, xmax, hEnd, fits.gaps.k, max(2*scat, snapTol(scat, step)))
	if xc, ok := crossing(u, l, xmax, xmax-edgeZone, xmax+edgeCross); ok {
		c := geometry.Point{X: xc, Y: u.at(xc)}
		carry := false // the corner put at the aftmost point, no point's
		var beyond float64
		if xc < xmax+step/20 {
			// The fits cross short of the points (a thin edge, noisy),
			// or just beyond the aftmost point: the surfaces run on to
			// it, where they are within the scatter of each other; that
			// point is the corner when it lies between them and, where
			// the fits crossed short of it and so say nothing of how far
			// on the surfaces meet, the gap round the end leaves no room
			// beyond it (endCarry); else the corner lies where the fits
			// cross, or that far on.
			short := xc < xmax
			beyond = max(0, xc-xmax)
			if short {
				beyond = carried
			}
			xc = xmax
			c = geometry.Point{X: xmax, Y: (u.at(xmax) + l.at(xmax)) / 2}
			carry = true
			for _, p := range z {
				if p.X == xmax && math.Abs(p.Y-c.Y) <= math.Abs(sepEnd)/2+edgeCap*scat && (!short || evenCarried <= snapTol(scat, step)) && snapTol(scat, step) > 0 {
					c, carry = p, false
				}
			}
		}
		lastU, lastL := lastOn(z, u, l, xc)
		m := endModel{kind: EdgeSharp, xu: xc, xl: xc, corner: c}
		if carry {
			m.beyond = beyond
		}
		if !sampled(z, c, 2*scat) {
			// A corner no point sampled: the surfaces' last points
			// end at the same chord station only by chance (as the
			// stations of a drawing end at a blunt base whose corners
			// they sample, never short of a corner).
			m.extra = coincidence(math.Abs(lastU.X-lastL.X)+scat, pstep)
		}
		m.extra += gapDeviance(m.path(u, l, xa), pstep)
		m.scoreOf(u, l, z, scat, zs)
		if c.Dist(lastU)+c.Dist(lastL) <= edgeReach*step+lastU.Dist(lastL)+2*scat || sepEnd <= 2*scat {
			models = append(models, m)
		} else {
			// Beyond reach of the last points the corner is not stated,
			// but where the points leave it as likely as the end stated
			// (a stretch at the end left unsampled), the bounds cover it.
			alts = append(alts, m)
		}
	}
	if sepEnd <= edgeCap*scat {
		// The surfaces end within a few scatters of each other at the
		// aftmost point: a thin sharp edge whose corner is that point (when
		// it lies between them) or the middle there, however far on the
		// fits would cross (near a thin edge the crossing is ill-posed).
		c := geometry.Point{X: xmax, Y: (u.at(xmax) + l.at(xmax)) / 2}
		beyond := carried
		for _, p := range z {
			if p.X == xmax && math.Abs(p.Y-c.Y) <= math.Abs(sepEnd)/2+2*scat && evenCarried <= snapTol(scat, step) && snapTol(scat, step) > 0 {
				c, beyond = p, 0 // a point sampled the corner
			}
		}
		m := endModel{kind: EdgeSharp, xu: xmax, xl: xmax, corner: c, beyond: beyond}
		// The surfaces' fits end sepEnd apart, each half of it off the
		// corner they share: a misfit of the fits' ends, in scatters.
		m.extra = gapDeviance(m.path(u, l, xa), pstep) + 2*sq(sepEnd/2/scat)
		m.scoreOf(u, l, z, scat, zs)
		models = append(models, m)
	}
	// Blunt: bases about the aftmost point, and beyond it by up to two
	// steps (a base no point sampled, its position left open).
	var bestB *endModel
	var cands []endModel
	baseAt := func(xb float64) (endModel, bool) {
		lo, hi := geometry.Point{X: xb, Y: l.at(xb)}, geometry.Point{X: xb, Y: u.at(xb)}
		if hi.Y <= lo.Y {
			return endModel{}, false
		}
		m := endModel{kind: EdgeBlunt, xu: xb, xl: xb, lo: lo, hi: hi, extra: pen}
		if cs := max(2*scat, snapTol(scat, step)); !sampled(z, hi, cs) || !sampled(z, lo, cs) {
			// A corner no point sampled: the surfaces' last points end
			// at the same station by chance, as short of a sharp corner.
			lastU, lastL := m.lastOnSurfaces(u, l, z, cs, xmax-edgeZone)
			m.extra += coincidence(math.Abs(lastU-lastL)+scat, pstep)
		}
		m.extra += gapDeviance(m.path(u, l, xa), pstep)
		m.scoreOf(u, l, z, scat, zs)
		return m, true
	}
	var xLast float64
	for j := range edgeBases + edgeBases/2 {
		xb := xmax + (float64(j)/float64(edgeBases-1)-0.75)*4*scat
		if j >= edgeBases {
			xb = xmax + 2*pstep*float64(j-edgeBases+1)/float64(edgeBases/2)
		}
		xLast = max(xLast, xb)
		m, ok := baseAt(xb)
		if !ok {
			continue
		}
		cands = append(cands, m)
		if bestB == nil || m.score < bestB.score {
			bestB = &m
		}
	}
	if bestB != nil {
		bestB.tipLo, bestB.tipHi = plausibleTips(cands, bestB)
		bestB.tipHi = tipsBeyond(baseAt, bestB, cands, xLast, step, xmax)
		bestB.tips = true
		models = append(models, *bestB)
	}
	// Rounded: arcs whose tips lie about the aftmost point, or beyond it
	// by up to a step: an end sampled by one or two points need not have
	// one at its tip (a point a angle θ round an arc of radius r lies
	// r(1 − cos θ) short of it). The best of a grid of tips is refined by
	// golden-section search between its neighbours (begun above).
	if rounded.Wait(); bestR != nil {
		models = append(models, *bestR)
	}
	if len(models) == 0 {
		return endModel{}, nil, false
	}
	// Points that every model misses by more than edgeOutlier scatters
	// (and a tenth of the step) are outliers; the models are scored again
	// without them, their misfits now capped only there, so that a model
	// that misses a good point by many scatters pays for it.
	out := make([]bool, len(z))
	for j, p := range z {
		out[j] = true
		for k := range models {
			if d, _ := models[k].miss(u, l, p); d <= edgeOutlier*scat || d <= 0.1*step {
				out[j] = false
				break
			}
		}
	}
	for k := range models {
		models[k].score = models[k].misfit(u, l, z, scat, edgeOutlier, out, zs) + models[k].extra + fits.gaps.deviance(&models[k], u, l, z, out, xa)
	}
	// A rounded end with fewer than edgeArcMin points on its arc must beat
	// a blunt one by edgeEvidence: an end sampled by a point or two fits a
	// base and an arc alike, and the base is the more common end of a
	// measured or drawn section (common practice). With more, the scores
	// decide.
	//
	// An arc with no point on it is not chosen at all, and one with fewer
	// than edgeArcMin never wins over a sharp corner: a circle tangent to
	// both surfaces through one or two points fits a corner as well, and
	// the points show no turning end (either still counts among the
	// plausible ends for the spread below).
	//
	// A base with no point on it must likewise beat a sharp corner by
	// edgeEvidence: such a base is seen only in where the surfaces' last
	// points stop, which a corner a little beyond them, unsampled in the
	// gap round the end, explains as well; the points show no base (of
	// sections whose base no point samples, one whose surfaces would meet
	// within the spacing of their last points cannot be told from a sharp
	// one at all). A base that points lie on is judged by the scores.
	endPts := make([]int, len(models))
	for k := range models {
		if models[k].kind != EdgeSharp {
			endPts[k] = models[k].onEnd(u, l, z, out, max(scat, snapTol(scat, step)))
		}
	}
	eligible := func(k int) bool { return models[k].kind != EdgeRounded || endPts[k] > 0 }
	bk := 0
	for k := range models {
		if eligible(k) {
			bk = k
			break
		}
	}
	for k, m := range models {
		if !eligible(k) || k == bk {
			continue
		}
		b := models[bk]
		if m.kind == EdgeRounded && endPts[k] < edgeArcMin && b.kind == EdgeSharp {
			continue
		}
		margin := 0.0
		switch {
		case m.kind == EdgeRounded && b.kind == EdgeBlunt && endPts[k] < edgeArcMin,
			m.kind == EdgeBlunt && b.kind == EdgeSharp && endPts[k] == 0:
			margin = edgeEvidence
		case b.kind == EdgeRounded && m.kind == EdgeBlunt && endPts[bk] < edgeArcMin,
			b.kind == EdgeBlunt && m.kind == EdgeSharp && endPts[bk] == 0:
			margin = -edgeEvidence
		}
		if m.score+margin < b.score {
			bk = k
		}
	}
	for k := range alts {
		alts[k].score = alts[k].misfit(u, l, z, scat, edgeOutlier, out, zs) + alts[k].extra + fits.gaps.deviance(&alts[k], u, l, z, out, xa)
	}
	if b := models[bk]; b.kind == EdgeBlunt && endPts[bk] == 0 && !b.cornersSampled(z, 2*scat) {
		// A base no point lies on, nor both of whose corners a point
		// sampled (a drawing's stations), is no sample of a base: it is
		// seen only in where the surfaces' last points stop. A corner is
		// sampled by a point within two scatters of it, not within
		// snapTol: the base's corners lie on the surfaces' fits where the
		// last points stop, so on a scan whose scatter is far below its
		// step the other surface's last point falls within a twentieth of
		// a step of a corner by chance, and a drawing whose one station
		// is the sharp corner has it within snapTol of both corners of a
		// base through it; neither is a sample of two corners. (On exact
		// data the scatter is the fits' own: their parabolas' miss of the
		// stations.) Where a
		// sharp corner within reach of them explains the points as well
		// (its misfits within edgePlausible of the base's) and leaves
		// unsampled stretches either side of the end that the spacing of
		// each surface allows (gapModel.plausibleEnd), the points show
		// nothing the corner does not, and the simpler end is stated; the
		// base stays among the rivals for the bounds. The corner must lie
		// within edgeReach end spacings of the base and within edgeGuess
		// of the chord: farther on, the corner stated is a guess the
		// points do not bound (pairs of points a hair apart at stations
		// 0.02-0.08 c apart left a 0.019 c stretch round a guessed corner
		// and the fit crossed its surfaces short of it, a chord bound of
		// 44 % of the chord), and the base through the points is the
		// statement that invents the less.
		mb := b.misfit(u, l, z, scat, edgeOutlier, out, zs)
		for _, m := range models {
			if m.kind != EdgeSharp {
				continue
			}
			if d := m.corner.X + m.beyond - b.tipX(); d <= edgeReach*min(step, pstep) && d <= edgeGuess &&
				m.misfit(u, l, z, scat, edgeOutlier, out, zs) <= mb+edgePlausible && fits.gaps.plausibleEnd(&m, u, l, z, out, xa, pstep) {
				return chooseSpread(fits, models, alts, eligible, m, z, out, xa, step, pstep, scat)
			}
		}
	}
	return chooseSpread(fits, models, alts, eligible, models[bk], z, out, xa, step, pstep, scat)
}

// chooseSpread completes chooseEnd for the winner best: the rivals among
// models and alts that score within edgePlausible of it and the spreads
// of their ends.
func chooseSpread(fits endFits, models, alts []endModel, eligible func(int) bool, best endModel, z []geometry.Point, out []bool, xa, step, pstep, scat float64) (endModel, []bool, bool) {
	u, l := fits.u, fits.l
	for k, m := range append(models, alts...) {
		if m.score <= best.score+edgePlausible {
			if m.kind != best.kind && (k >= len(models) || eligible(k)) && !slices.Contains(best.rivals, m.kind) {
				best.rivals = append(best.rivals, m.kind)
			}
			bx, by := best.tipX(), best.tipY()
			best.spread = max(best.spread, math.Abs(m.tipX()-bx))
			best.spreadY = max(best.spreadY, math.Abs(m.tipY()-by))
			if m.tips {
				// The positions of its kind the points leave open.
				best.spread = max(best.spread, math.Abs(m.tipLo-bx), math.Abs(m.tipHi-bx))
			}
			best.spreadS = max(best.spreadS, best.apart(m, u, l, xa))
			if m.kind == EdgeSharp {
				// How far on the surfaces' fits, within their own
				// uncertainty, may meet.
				x, y := fits.cornerReach(m.corner.X, max(step, pstep))
				best.spread = max(best.spread, math.Abs(x-bx))
				best.spreadY = max(best.spreadY, math.Abs(y-by))
				far := endModel{kind: EdgeSharp, xu: x, xl: x, corner: geometry.Point{X: x, Y: y}}
				best.spreadS = max(best.spreadS, best.apart(far, u, l, xa))
			}
		}
	}
	return best, out, true
}

// apart returns how far the outline of the end m lies from that of the
// end o at most, once each is normalised by its own chord (scaled by
// 1/tip station: the leading edge stays at x = 0): the larger distance
// of a point of either from the other, both on the surfaces u and l from
// the station xa on (of the shorter; the same normalised station of the
// longer). The stretch of the chord between them moves the
// surfaces near the edge along themselves, across the other's by their
// slope.
func (m *endModel) apart(o endModel, u, l quadFit, xa float64) float64 {
	// Both from the same normalised station on.
	s0 := xa / min(m.tipX(), o.tipX())
	a, b := m.outline(u, l, s0*m.tipX()), o.outline(u, l, s0*o.tipX())
	return max(polyApart(a, b), polyApart(b, a))
}

// polyApart returns the largest distance of a point of the pieces a from
// the pieces b (each a polyline).
func polyApart(a, b [][]geometry.Point) float64 {
	var d float64
	for _, pa := range a {
		for _, p := range pa {
			e := math.Inf(1)
			for _, pb := range b {
				for k := 1; k < len(pb); k++ {
					e = min(e, geometry.SegmentDist(p, pb[k-1], pb[k]))
				}
			}
			d = max(d, e)
		}
	}
	return d
}

// outline returns the model's outline from the station xa on, as three
// polylines (the upper surface to its end, the piece that joins the
// surfaces, the lower surface to its end), normalised by the model's own
// chord: scaled by 1/tipX.
func (m *endModel) outline(u, l quadFit, xa float64) [][]geometry.Point {
	const k = 16
	g := 1 / m.tipX()
	var up, end, lo []geometry.Point
	for j := 0; j <= k; j++ {
		f := float64(j) / k
		xu, xl := xa+(m.xu-xa)*f, xa+(m.xl-xa)*f
		up = append(up, geometry.Point{X: xu, Y: u.at(xu)}.Scale(g))
		lo = append(lo, geometry.Point{X: xl, Y: l.at(xl)}.Scale(g))
		switch m.kind {
		case EdgeSharp:
			if j == 0 {
				end = append(end, m.corner.Scale(g))
			}
		case EdgeBlunt:
			end = append(end, m.lo.Add(m.hi.Sub(m.lo).Scale(f)).Scale(g))
		default:
			al := math.Atan2(m.tl.Y-m.centre.Y, m.tl.X-m.centre.X)
			au := math.Atan2(m.tu.Y-m.centre.Y, m.tu.X-m.centre.X)
			a := al + (au-al)*f
			end = append(end, m.centre.Add(geometry.Point{X: math.Cos(a), Y: math.Sin(a)}.Scale(m.r)).Scale(g))
		}
	}
	// The joining piece meets the surfaces' ends.
	end = append(append([]geometry.Point{lo[k]}, end...), up[k])
	return [][]geometry.Point{up, end, lo}
}

// endFits are the fits of the surfaces near the end and what they leave
// unknown.
type endFits struct {
	u, l   quadFit
	eu, el fitSpread
	gaps   gapModel
}

// fitSpread holds what a least-squares parabola leaves unknown where it
// is carried on: the normal matrix of its points' stations (about x = 1)
// and the scatter s about it. The standard error of its value at x is
// s·√(vᵀ A⁻¹ v), v = (1, x − 1, (x − 1)²) (the error of a least-squares
// prediction, common practice).
type fitSpread struct {
	a  [3][3]float64
	s  float64
	ok bool
}

// newFitSpread returns the fitSpread of a parabola fitted to the points
// idx (chord coordinates xs) that scatter by s.
func newFitSpread(xs []float64, idx []int, s float64) fitSpread {
	var f fitSpread
	for _, i := range idx {
		d := xs[i] - 1
		v := [3]float64{1, d, d * d}
		for r := range 3 {
			for c := range 3 {
				f.a[r][c] += v[r] * v[c]
			}
		}
	}
	f.s, f.ok = s, len(idx) >= 3
	return f
}

// se returns the standard error of the fit's value at x (0 when unknown).
func (f fitSpread) se(x float64) float64 {
	if !f.ok {
		return 0
	}
	d := x - 1
	v := [3]float64{1, d, d * d}
	z, ok := solve3(f.a, v)
	if !ok {
		return 0
	}
	q := v[0]*z[0] + v[1]*z[1] + v[2]*z[2]
	return f.s * math.Sqrt(max(q, 0))
}

// cornerReach returns the farthest station, and the height there midway
// between the fits, at which the surfaces may meet when their crossing
// (or the corner put at the aftmost point) is xc: where their separation,
// carried on along its slope there, closes to within √edgePlausible
// standard errors of the fits (a 95 % statement, as edgePlausible), and
// at most (or, where the fits have crossed already, so that they say
// nothing of it, just) edgeOpen steps h beyond xc (h the spacing along the surfaces
// there: across a thin edge the last points of the two surfaces lie
// closer than that).
func (f endFits) cornerReach(xc, h float64) (x, y float64) {
	sep := f.u.at(xc) - f.l.at(xc)
	slope := (f.u.c[1] - f.l.c[1]) + 2*(f.u.c[2]-f.l.c[2])*xc
	sd := math.Hypot(f.eu.se(xc), f.el.se(xc))
	d := edgeOpen * h
	// Fits already crossed at xc (the corner put at the aftmost point of a
	// thin edge) say nothing of how far on the surfaces meet.
	if slope < 0 && sep >= 0 {
		d = min(d, max(0, (sep+math.Sqrt(edgePlausible)*sd)/-slope))
	}
	x = xc + d
	return x, (f.u.at(x) + f.l.at(x)) / 2
}

// endCarry returns how far (chord units) beyond the aftmost zone point,
// at station xmax, the corner of a thin sharp edge lies that the fits
// cannot place (they cross short of the points, or run within the scatter
// of each other there), and how far it would lie were the points evenly
// spaced (the test of a sampled corner). The corner falls in the gap round
// the end, between the last point of each surface, a and b short of it
// along them, g = a + b that gap; with the corner anywhere in it
// (uniformly), the two aftmost points, δ = b − a apart (on a thin edge
// their distance; across a wider wedge their distance is more, and the
// corner is carried less), place it:
//
//	beyond = a = (g − δ) / 2.
//
// g is not seen, only that it is at least δ. The points' gaps follow the
// gamma law of mean h and shape k (gapModel), and the corner's place is
// uniform in its gap, so δ is uniform on [0, g] given g: the chance of
// the gap being g given δ is the law's own density for g ≥ δ (the length
// bias of the gap that holds a given spot cancels against the 1/g of δ's
// density), whose mean is
//
//	E[g | g ≥ δ] = h · Q(k+1, kδ/h) / Q(k, kδ/h)
//
// with Q the regularised upper incomplete gamma function: h for evenly
// spaced points (k → ∞, δ < h), so that the corner is placed there to
// within what the wedge's thickness adds to δ, and a point a whole
// spacing ahead of the next sampled the corner itself; δ +
// h for points at random (k = 1, the exponential's lack of memory). A
// fixed quarter of the spacing (the mean of (h − δ)/2 over even spacings)
// left edges whose aftmost point lay near the corner long and the others
// short, and a point that merely lay between the fits was taken for the
// corner however far short of it: the thin sharp edges of Kármán–Trefftz
// scans regenerated without noise came out 0.0003 chord short in the
// median, 0.0014 at worst. The second point is the aftmost one farther
// than near from the first: points within it are the same station (a
// point measured twice a hair apart, or the pile of probe-ball centres
// that a compensation moves onto a sharp corner the ball could not reach
// into). k ≤ 0 (no gap model) takes the even spacing's answer.
func endCarry(z []geometry.Point, xmax, h, k, near float64) (beyond, even float64) {
	a := -1
	for j, p := range z {
		if p.X == xmax && (a < 0 || p.Y > z[a].Y) {
			a = j
		}
	}
	if a < 0 || !(h > 0) {
		return 0, 0
	}
	b := -1
	for j, p := range z {
		if j != a && p.Dist(z[a]) > near && (b < 0 || p.X > z[b].X) {
			b = j
		}
	}
	if b < 0 {
		return 0, 0
	}
	return gapCarry(z[a].Dist(z[b]), h, k)
}

// gapCarry returns (E[g | g ≥ d] − d)/2 for the gap g round the end under
// the gamma law of mean h and shape k (see endCarry), and the same for
// evenly spaced points, (h − d)/2 or 0; k ≤ 0 takes the even answer for
// both.
func gapCarry(d, h, k float64) (beyond, even float64) {
	if !(h > 0) {
		return 0, 0
	}
	if d < h {
		even = (h - d) / 2
	}
	if !(k > 0) {
		return even, even
	}
	g := h
	if q := mathext.GammaIncRegComp(k, k*d/h); q > 1e-300 {
		g = h * mathext.GammaIncRegComp(k+1, k*d/h) / q
	} else {
		g = d + h/k // the tail of a gamma law far out: exponential of mean h/k
	}
	return max(0, (g-d)/2), even
}

// edgeOpen is how many end spacings beyond the stated end a corner the
// fits cannot place may lie: leaving twice that much more outline
// unsampled costs edgePlausible in gapDeviance (4·d/step), so a corner
// farther on is less likely than the plausible ends by more than that.
const edgeOpen = edgePlausible / 4.0

// roundBest returns the best scored rounded end whose tip lies between
// 3 scatters short of xmax and a step beyond it (at least a scatter), nil
// when no arc fits; rmax is the largest radius tried.
func roundBest(u, l quadFit, z []geometry.Point, zs []float64, xmax, xa, step, pstep, scat, rmax, pen float64) *endModel {
	if !(rmax > 0) {
		return nil
	}
	lo, hi := xmax-3*scat, xmax+max(scat, step)
	tipAt := func(xt float64) (endModel, bool) {
		m, ok := roundTip(u, l, xt, rmax)
		if !ok {
			return m, false
		}
		m.extra = pen + gapDeviance(m.path(u, l, xa), pstep)
		if cs := max(2*scat, snapTol(scat, step)); !sampled(z, m.tu, cs) || !sampled(z, m.tl, cs) {
			// Where the arc meets a surface no point sampled: the
			// surfaces' last points end at the same station by chance,
			// as short of a base's corners (chooseEnd).
			lastU, lastL := m.lastOnSurfaces(u, l, z, cs, xmax-edgeZone)
			m.extra += coincidence(math.Abs(lastU-lastL)+scat, pstep)
		}
		m.scoreOf(u, l, z, scat, zs)
		return m, true
	}
	var best *endModel
	var cands []endModel
	bj := -1
	xt := func(j int) float64 { return lo + (hi-lo)*float64(j)/float64(edgeBases-1) }
	for j := range edgeBases {
		m, ok := tipAt(xt(j))
		if !ok {
			continue
		}
		cands = append(cands, m)
		if best == nil || m.score < best.score {
			best, bj = &m, j
		}
	}
	if best == nil {
		return nil
	}
	defer func() {
		best.tipLo, best.tipHi = plausibleTips(cands, best)
		best.tipHi = tipsBeyond(tipAt, best, cands, hi, step, xmax)
		best.tips = true
	}()
	// Golden-section search over the grid cells either side of the best.
	a, b := xt(max(bj-1, 0)), xt(min(bj+1, edgeBases-1))
	score := func(x float64) float64 {
		m, ok := tipAt(x)
		if !ok {
			return math.Inf(1)
		}
		if m.score < best.score {
			best = &m
		}
		return m.score
	}
	const g = 0.6180339887498949
	c, d := b-g*(b-a), a+g*(b-a)
	fc, fd := score(c), score(d)
	// Until the bracket is a tenth of the scatter: finer tips change no
	// score that matters.
	for k := 0; k < 20 && b-a > scat/10; k++ {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - g*(b-a)
			fc = score(c)
		} else {
			a, c, fc = c, d, fd
			d = a + g*(b-a)
			fd = score(d)
		}
	}
	return best
}

func sq(x float64) float64 { return x * x }

// snapTol is how near (chord units) a point must lie to a corner the end
// model places for the corner to be that point: within a twentieth of the
// local step, on data whose scatter is well below that (exact data, whose
// fits carried to the corner miss it by their own small error). A noisy
// point is never the corner: pinned there, the curve would kink by the
// noise.
func snapTol(scat, step float64) float64 {
	if 2*scat > step/20 {
		return 0
	}
	return step / 20
}

// sampled reports whether a point of z lies within d of c.
func sampled(z []geometry.Point, c geometry.Point, d float64) bool {
	for _, p := range z {
		if p.Dist(c) <= d {
			return true
		}
	}
	return false
}

// path returns the length of the model's outline from the station xa on
// the lower surface round the end to xa on the upper one.
func (m *endModel) path(u, l quadFit, xa float64) float64 {
	arc := func(q quadFit, a, b float64) float64 {
		if b <= a {
			return 0
		}
		const k = 8
		var s float64
		prev := geometry.Point{X: a, Y: q.at(a)}
		for j := 1; j <= k; j++ {
			x := a + (b-a)*float64(j)/k
			p := geometry.Point{X: x, Y: q.at(x)}
			s += p.Dist(prev)
			prev = p
		}
		return s
	}
	s := arc(u, xa, m.xu) + arc(l, xa, m.xl)
	switch m.kind {
	case EdgeBlunt:
		s += m.hi.Dist(m.lo)
	case EdgeRounded:
		a := math.Atan2(m.tu.Y-m.centre.Y, m.tu.X-m.centre.X) - math.Atan2(m.tl.Y-m.centre.Y, m.tl.X-m.centre.X)
		if a < 0 {
			a += 2 * math.Pi
		}
		s += a * m.r
	}
	return s
}

// gapDeviance is −2 ln of the chance, up to a constant, of the points of
// a stretch of the outline of length gap when they fall along it at
// random with a mean step (a Poisson process, common practice): 2·gap/step.
// Models of the same points that trace outlines of different lengths
// differ by it: a longer outline leaves more of itself unsampled.
func gapDeviance(gap, step float64) float64 {
	if !(step > 0) {
		return 0
	}
	return 2 * gap / step
}

// gapModel is the spacing of the points either side of the end zone:
// their mean gap h (chord units) and the shape k of a gamma law of the
// gaps with that mean whose spread is theirs (k = 1/CV², the coefficient
// of variation from the interquartile range of the gaps' logs, a robust
// estimate). gapDeviance scores the outlines of the end models as if the
// points fell along them at random (a Poisson process, k = 1), under
// which the stretch from the end to the next point either side is
// exponential: a corner a few steps beyond the last points costs little.
// Points stepped along the outline at a steadier pace (a probe program,
// a scanner's even sweep) leave such a stretch longer than a step far
// less often: from a given spot (the end), the distance to the next point
// of a renewal process of gaps with law F and mean h has the density
// (1 − F(d))/h (the forward recurrence time, common practice), which
// deviance weighs in place of the exponential's. k is held within
// [1, gapShapeMax]: never more lenient than the Poisson process, nor so
// strict that a spacing made uneven by noise or curvature near the end
// decides it.
type gapModel struct {
	h [2]float64 // the upper surface's, the lower's
	k float64
	// sigma is the σ of the gaps' logs k was made from (at least
	// gapSigmaMin).
	sigma float64
}

// gapSpan is the number of gaps either side of the zone that give the
// spacing's mean and regularity (fewer make a poor estimate of it: for
// log-normal gaps of σ 0.8, eight a side put σ below 0.5 in 16 % of
// draws, twenty-four in 1.3 %, measured on 20000 draws).
const gapSpan = 24

// gapSigmaMin is the least σ of the gaps' logs a gapModel takes (a
// spread of some 25 % even in a drawing's steps, our choice: noise and
// the outline's curvature move the points along it too): gapShapeMax =
// 1/(e^{σ²} − 1) with that σ.
const gapSigmaMin = 0.25

var gapShapeMax = 1 / (math.Exp(gapSigmaMin*gapSigmaMin) - 1)

// newGapModel returns the gapModel of up to gapSpan gaps of seq (a
// quarter of its points at most) from position ku on (up the upper
// surface, away from the end) and from kl back (down the lower one), in
// chord units (chord: the frame's).
func newGapModel(pts []geometry.Point, seq []int32, ku, kl int, chord float64) gapModel {
	n := len(seq)
	span := min(gapSpan, n/4)
	if span < gapMin || !(chord > 0) {
		return gapModel{}
	}
	var gm gapModel
	var logs []float64
	for side, sd := range [2]struct{ k, dir int }{{ku, 1}, {kl, -1}} {
		ls := make([]float64, 0, span)
		var sum float64
		for s := range span {
			a := seq[((sd.k+sd.dir*s)%n+n)%n]
			b := seq[((sd.k+sd.dir*(s+1))%n+n)%n]
			d := pts[a].Dist(pts[b]) / chord
			if !(d > 0) {
				continue
			}
			sum += d
			ls = append(ls, math.Log(d))
		}
		if len(ls) < gapMin {
			return gapModel{}
		}
		gm.h[side] = sum / float64(len(ls))
		// Each side about its own median: one surface may be probed
		// more coarsely than the other.
		slices.Sort(ls)
		med := ls[len(ls)/2]
		for _, l := range ls {
			logs = append(logs, l-med)
		}
	}
	slices.Sort(logs)
	iqr := logs[3*len(logs)/4] - logs[len(logs)/4]
	sigma := max(gapSigmaMin, iqr/1.349)
	gm.k = min(gapShapeMax, max(1, 1/(math.Exp(sigma*sigma)-1)))
	gm.sigma = sigma
	return gm
}

// gapMin is the least number of gaps either side a gapModel is made of.
const gapMin = 6

// deviance returns what the model's outline adds to gapDeviance under
// the gamma law of the gaps: the zone points (outliers out left out),
// placed along the outline from the station xa on the lower surface round
// the end to xa on the upper one, stop short of the model's end (the
// corner, the middle of the base, the tip of the arc) by d either side,
// and each adds −2 ln Q(k, k·d/h) − 2d/h (Q the regularised upper
// incomplete gamma function: −2 ln of the forward recurrence density over
// the exponential's that gapDeviance counts, at most gapDevMax); 0 when
// the law is Poisson's.
func (gm gapModel) deviance(m *endModel, u, l quadFit, z []geometry.Point, out []bool, xa float64) float64 {
	if !(gm.k > 1) || !(gm.h[0] > 0) || !(gm.h[1] > 0) {
		return 0
	}
	var dev float64
	for side, d := range endStretches(m, u, l, z, out, xa) {
		r := d / gm.h[side]
		q := mathext.GammaIncRegComp(gm.k, gm.k*r)
		e := float64(gapDevMax)
		if q > 0 {
			e = min(gapDevMax, -2*math.Log(q))
		}
		if e >= gapDevMax {
			// Capped, the gamma law's cost may not fall below the
			// exponential law's 2r it replaces: a model leaving a
			// stretch of many mean gaps unsampled (a degenerate fit
			// whose end lies far off) would otherwise win by the
			// difference, without bound.
			e = max(e, 2*r)
		}
		dev += e - 2*r
	}
	return dev
}

// cornersSampled reports whether points of z lie within d of both
// corners of the blunt end m.
func (m *endModel) cornersSampled(z []geometry.Point, d float64) bool {
	return sampled(z, m.hi, d) && sampled(z, m.lo, d)
}

// edgeGuess is the farthest (chord units) beyond a base through the
// last points that a corner no point shows is stated over that base: the
// share of the chord beyond which prep warns that the chord's bound is
// wide (prep's wideChord), so that stating such a corner never by itself
// makes the chord a wide guess.
const edgeGuess = 0.005

// endGapLevel is the chance below which a gap round the end is too long
// to hold it (a one-sided 95 % test, common practice).
const endGapLevel = 0.05

// plausibleEnd reports whether the stretches the zone points z
// (outliers out left out) leave unsampled either side of the end of the
// model m, from the end along the outline to the last point of each
// surface, are ones the spacing allows. The gaps of each surface are
// taken log-normal with the σ of their logs (the irregular spacing of
// hand-probed and scanned points: fast over flat parts, slow at the
// nose, gaps where a beam grazed) and that surface's own mean h (a
// surface probed more finely than the other, as a second pass may,
// leaves a shorter stretch). From a given spot (the end), the distance d
// to the next point of such gaps exceeds d with the chance
//
//	(1/h) ∫_d^∞ P(G > x) dx = Φ(d₁) − (d/h) Φ(d₁ − σ),  d₁ = (ln(h/d) + σ²/2)/σ
//
// (the forward recurrence of a renewal process, common practice, with
// the partial mean of the log-normal law). The end is plausible when
// that chance is at least endGapLevel on each surface. Without a model of the spacing (too few gaps), the mean
// step and the least σ the model takes stand in.
func (gm gapModel) plausibleEnd(m *endModel, u, l quadFit, z []geometry.Point, out []bool, xa, step float64) bool {
	// σ at most that of gaps as irregular as a Poisson process's (a
	// coefficient of variation of 1: e^{σ²} − 1 = 1), as gapModel's k is
	// held to at least 1: points measured twice or two passes interleaved
	// leave gaps near zero whose logs would call any gap plausible.
	sigma, hs := min(gm.sigma, math.Sqrt(math.Ln2)), gm.h
	if !(sigma > 0) || !(hs[0] > 0) || !(hs[1] > 0) {
		sigma, hs = gapSigmaMin, [2]float64{step, step}
	}
	if !(hs[0] > 0) || !(hs[1] > 0) {
		return false
	}
	phi := func(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }
	p := 1.0
	for side, d := range endStretches(m, u, l, z, out, xa) {
		if !(d > 0) {
			continue
		}
		h := hs[side]
		d1 := (math.Log(h/d) + sigma*sigma/2) / sigma
		p = min(p, max(0, phi(d1)-d/h*phi(d1-sigma)))
	}
	return p >= endGapLevel
}

// endStretches returns the stretches of the model's outline from its end
// (the corner, the middle of the base, the tip of the arc) to the
// nearest of the zone points z (outliers out left out) either side, the
// points placed along the outline from the station xa on the lower
// surface round the end to xa on the upper one: [0] towards the upper
// surface, [1] towards the lower.
func endStretches(m *endModel, u, l quadFit, z []geometry.Point, out []bool, xa float64) [2]float64 {
	pcs := m.outline(u, l, xa)
	sc := m.tipX() // outline normalises by the model's own chord
	// One polyline: the lower surface out to its end, the joining piece,
	// the upper surface back; the end is the joining piece's middle.
	var line []geometry.Point
	for _, p := range pcs[2] {
		line = append(line, p.Scale(sc))
	}
	startEnd := len(line) - 1
	for _, p := range pcs[1][1 : len(pcs[1])-1] {
		line = append(line, p.Scale(sc))
	}
	for j := len(pcs[0]) - 1; j >= 0; j-- {
		line = append(line, pcs[0][j].Scale(sc))
	}
	stopEnd := len(line) - len(pcs[0])
	arc := make([]float64, len(line))
	for j := 1; j < len(line); j++ {
		arc[j] = arc[j-1] + line[j].Dist(line[j-1])
	}
	tip := (arc[startEnd] + arc[stopEnd]) / 2
	below, above := 0.0, arc[len(arc)-1]
	for j, p := range z {
		if out != nil && out[j] {
			continue
		}
		best, at := math.Inf(1), 0.0
		for i := 1; i < len(line); i++ {
			a, b := line[i-1], line[i]
			d := b.Sub(a)
			l2 := d.Dot(d)
			t := 0.0
			if l2 > 0 {
				t = min(1, max(0, p.Sub(a).Dot(d)/l2))
			}
			if e := p.Dist(a.Add(d.Scale(t))); e < best {
				best, at = e, arc[i-1]+t*math.Sqrt(l2)
			}
		}
		if at <= tip {
			below = max(below, at)
		} else {
			above = min(above, at)
		}
	}
	return [2]float64{above - tip, tip - below}
}

// gapDevMax caps what one stretch may cost under the gamma law (a
// likelihood ratio of e^−25 against a stretch of no length): beyond it
// the end is settled either way.
const gapDevMax = 50.0

// coincidence is −2 ln of the chance that the last points of two surfaces
// sampled independently with a mean step lie within dx of each other
// along the chord: 2·dx/step, at most 1 (dx includes the scatter). Every
// model whose ends the last points do not sample pays it (a sharp corner
// beyond them, a base one of whose corners no point lies on), so it
// weighs only for a base whose corners both are sampled (the stations of
// a drawing, a probe's hits at both corners).
func coincidence(dx, step float64) float64 {
	if !(step > 0) {
		return 0
	}
	return -2 * math.Log(min(1, 2*dx/step))
}

// fitScatter fits a parabola y(x) robustly to the points idx and returns
// it with the robust scale of its residuals.
func fitScatter(xs, ys []float64, idx []int) (quadFit, float64) {
	q := robustQuad(xs, ys, idx, 1)
	res := make([]float64, 0, len(idx))
	for _, k := range idx {
		res = append(res, math.Abs(ys[k]-q.at(xs[k])))
	}
	return q, 1.4826 * median(res)
}

// lastOnSurfaces returns the stations of the last points of the upper
// and the lower surface, as the model m places the zone points z (a point
// within tol of a surface counting as the surface's, see side): a point
// on the piece that joins the surfaces (a base point) is no surface's
// last point, and a surface that no zone point lies on ends short of the
// zone, at fore at most (the end zone's foremost station), not at the
// end the model puts it at.
func (m *endModel) lastOnSurfaces(u, l quadFit, z []geometry.Point, tol, fore float64) (xu, xl float64) {
	xu, xl = fore, fore
	for _, p := range z {
		switch m.side(u, l, p, tol) {
		case 1:
			xu = max(xu, p.X)
		case -1:
			xl = max(xl, p.X)
		}
	}
	return xu, xl
}

// lastOn returns the zone points nearest the edge (before x) that lie
// nearer the upper and the lower fit.
func lastOn(z []geometry.Point, u, l quadFit, x float64) (lu, ll geometry.Point) {
	lu, ll = geometry.Point{X: math.Inf(-1)}, geometry.Point{X: math.Inf(-1)}
	for _, p := range z {
		if p.X > x {
			continue
		}
		if math.Abs(p.Y-u.at(p.X)) < math.Abs(p.Y-l.at(p.X)) {
			if p.X > lu.X {
				lu = p
			}
		} else if p.X > ll.X {
			ll = p
		}
	}
	if math.IsInf(lu.X, -1) {
		lu = geometry.Point{X: x, Y: u.at(x)}
	}
	if math.IsInf(ll.X, -1) {
		ll = geometry.Point{X: x, Y: l.at(x)}
	}
	return lu, ll
}

// apply turns the winning model into the edge and the loop that starts
// at the end of the upper surface. The zone points are re-ordered as the
// model places them: those of the lower surface by chordwise position
// towards the edge, those of the joining piece across the end (a base
// from its lower to its upper corner, an arc by angle about its centre),
// those of the upper surface away from the edge; near a thin, noisy edge
// the points of the two surfaces mingle in any order made without the
// model, and the loop would zigzag between them.
func (m endModel) apply(pts []geometry.Point, seq []int32, f chordFrame, u, l quadFit, zpos []int, z []geometry.Point, outl []bool, scat, step float64) (edgeFound, bool) {
	n, nz := len(seq), len(z)
	type placed struct {
		key float64
		k   int // zone index
	}
	var lower, end, upper []placed
	for j, p := range z {
		// A point within the snapping distance of a surface's end is
		// that surface's (a drawing's station at a corner), however
		// close the base.
		w := m.side(u, l, p, max(scat, snapTol(scat, step)))
		if m.kind == EdgeSharp && w == 0 {
			// Beyond the corner: the side it is nearer to.
			w = -1
			if math.Abs(p.Y-u.at(m.corner.X)) < math.Abs(p.Y-l.at(m.corner.X)) {
				w = 1
			}
		}
		// Along a surface, by the point's foot on the surface's fit (in a
		// noisy band x alone would zigzag the feet).
		foot := func(q quadFit) float64 {
			sl := q.c[1] + 2*q.c[2]*p.X
			return p.X + sl*(p.Y-q.at(p.X))/(1+sl*sl)
		}
		switch w {
		case -1:
			lower = append(lower, placed{foot(l), j})
		case 1:
			upper = append(upper, placed{-foot(u), j})
		default:
			key := p.Y // across a base, from the lower corner up
			if m.kind == EdgeRounded {
				key = math.Atan2(p.Y-m.centre.Y, p.X-m.centre.X)
			}
			end = append(end, placed{key, j})
		}
	}
	for _, ps := range [][]placed{lower, end, upper} {
		slices.SortStableFunc(ps, func(a, b placed) int {
			switch {
			case a.key < b.key:
				return -1
			case a.key > b.key:
				return 1
			}
			return a.k - b.k
		})
	}
	// The loop: the upper zone points, the rest of the loop from the upper
	// core round to the lower core, the lower zone points, the joining
	// piece.
	out := make([]int32, 0, n)
	for _, p := range upper {
		out = append(out, seq[zpos[p.k]])
	}
	inZone := make(map[int]bool, nz)
	for _, k := range zpos {
		inZone[k] = true
	}
	for s := 1; s < n; s++ {
		// From the first position after the zone's contiguous part on.
		k := (zpos[0] + s) % n
		if !inZone[k] {
			out = append(out, seq[k])
		}
	}
	for _, p := range lower {
		out = append(out, seq[zpos[p.k]])
	}
	for _, p := range end {
		out = append(out, seq[zpos[p.k]])
	}
	gr := endGap(pts, out, len(upper), len(lower)+len(end), f.point(m.tipX(), m.tipY()))
	e := Edge{Kind: m.kind, Chord: f.chord, Spread: m.spread * f.chord, SpreadAcross: m.spreadY * f.chord, SpreadSurface: m.spreadS, Rivals: slices.Clone(m.rivals)}
	switch m.kind {
	case EdgeSharp:
		e.Why = "the surfaces, fitted near the edge, meet in a corner"
		if m.beyond > 0 {
			// A corner put at the aftmost point of a thin edge lies, in
			// expectation, beyond it (endCarry): carried there
			// along the coarse chord line (the fits, crossed or within
			// the scatter of each other, say too little of where their
			// mean line heads), it is no longer a point's.
			m.corner.X += m.beyond
		}
		// A zone point within the scatter of the corner is the corner:
		// the loop starts there.
		near, nd := -1, math.Inf(1)
		for j, p := range z {
			if d := p.Dist(m.corner); d < nd {
				near, nd = j, d
			}
		}
		if near >= 0 && nd <= snapTol(scat, step) {
			at := slices.Index(out, seq[zpos[near]])
			e.Upper = pts[out[at]]
			e.Lower = e.Upper
			return m.found(rotateTo(out, at), e, pts, seq, u, l, zpos, z, outl, scat, f).withGap(gr), true
		}
		p := f.point(m.corner.X, m.corner.Y)
		e.Upper, e.Lower, e.Reconstructed = p, p, true
		// The loop starts at whichever of the surfaces' last points lies
		// nearer the corner (a point at a thin edge may fall to either).
		if last := out[len(out)-1]; pts[last].Dist(p) < pts[out[0]].Dist(p) {
			out = rotateTo(out, len(out)-1)
		}
		return m.found(out, e, pts, seq, u, l, zpos, z, outl, scat, f).withGap(gr), true
	case EdgeBlunt:
		e.Upper, e.Lower, e.Reconstructed = f.point(m.hi.X, m.hi.Y), f.point(m.lo.X, m.lo.Y), true
		e.Thickness = m.hi.Dist(m.lo) * f.chord
		e.Base = len(end)
		// A corner that a point sampled is that point.
		tol := snapTol(scat, step) * f.chord
		first, last := out[0], out[len(out)-1-e.Base]
		snapU, snapL := pts[first].Dist(e.Upper) <= tol, pts[last].Dist(e.Lower) <= tol
		if snapU {
			e.Upper = pts[first]
		}
		if snapL {
			e.Lower = pts[last]
		}
		e.Reconstructed = !snapU || !snapL
		if e.Base == 0 {
			e.Why = fmt.Sprintf("the surfaces end %.3g chord apart, with no point between them", m.hi.Dist(m.lo))
		} else {
			e.Why = fmt.Sprintf("%d point(s) lie on a straight base %.3g chord across the end", e.Base, m.hi.Dist(m.lo))
		}
		return m.found(out, e, pts, seq, u, l, zpos, z, outl, scat, f).withGap(gr), true
	default:
		e.Thickness = m.tu.Dist(m.tl) * f.chord
		e.Why = fmt.Sprintf("%d point(s) lie on an arc of radius %.3g chord round the end", len(end), m.r)
		// Start at the tip: the point of the arc nearest its aftmost
		// point (any zone point when none is on the arc).
		tip := geometry.Point{X: m.centre.X + m.r, Y: m.centre.Y}
		k, kd := -1, math.Inf(1)
		for _, p := range end {
			if d := z[p.k].Dist(tip); d < kd {
				k, kd = p.k, d
			}
		}
		if k < 0 {
			for j := range z {
				if d := z[j].Dist(tip); d < kd {
					k, kd = j, d
				}
			}
		}
		return m.found(rotateTo(out, slices.Index(out, seq[zpos[k]])), e, pts, seq, u, l, zpos, z, outl, scat, f).withGap(gr), true
	}
}

// found completes the result of apply: the zone's points and its
// outliers (out, see chooseEnd).
func (m endModel) found(loop []int32, e Edge, pts []geometry.Point, seq []int32, u, l quadFit, zpos []int, z []geometry.Point, out []bool, scat float64, f chordFrame) edgeFound {
	r := edgeFound{seq: loop, edge: e, frame: f}
	kept := 0
	for j := range z {
		if !out[j] {
			kept++
		}
	}
	r.misfit = m.misfit(u, l, z, scat, edgeOutlier, out, nil) / float64(max(kept, 1))
	r.scat = scat
	for j, k := range zpos {
		r.zone = append(r.zone, seq[k])
		if out[j] {
			d, _ := m.miss(u, l, z[j])
			r.outliers = append(r.outliers, hit{idx: seq[k], reason: "outlier", dist: d * f.chord, sigmas: d / scat})
		}
	}
	return r
}

// withGap returns r with its gapRatio set to g.
func (r edgeFound) withGap(g float64) edgeFound {
	r.gapRatio = g
	return r
}

// rotateTo returns seq rotated to start at position k.
func rotateTo(seq []int32, k int) []int32 {
	out := make([]int32, 0, len(seq))
	out = append(out, seq[k:]...)
	return append(out, seq[:k]...)
}

// crossing returns where the parabolas u and l cross nearest to x0 within
// [lo, hi], or false.
func crossing(u, l quadFit, x0, lo, hi float64) (float64, bool) {
	a, b, c := u.c[2]-l.c[2], u.c[1]-l.c[1], u.c[0]-l.c[0]
	var roots []float64
	if math.Abs(a) < 1e-12*(math.Abs(b)+math.Abs(c)) {
		if b != 0 {
			roots = append(roots, -c/b)
		}
	} else if disc := b*b - 4*a*c; disc >= 0 {
		q := -0.5 * (b + math.Copysign(math.Sqrt(disc), b))
		if q != 0 {
			roots = append(roots, q/a, c/q)
		} else {
			roots = append(roots, 0)
		}
	}
	best, ok := 0.0, false
	for _, r := range roots {
		if r >= lo && r <= hi && (!ok || math.Abs(r-x0) < math.Abs(best-x0)) {
			best, ok = r, true
		}
	}
	return best, ok
}

// endStep returns the median of the four distances between consecutive
// zone points nearest the aftmost one (at position i0 of the zone, which
// runs from the lower surface round the end to the upper one): two each
// side, one of which may cross a base. ok is false when fewer than three
// are there.
func endStep(z []geometry.Point, i0 int) (float64, bool) {
	var ds []float64
	for j := i0 - 2; j <= i0+1; j++ {
		if j >= 0 && j+1 < len(z) {
			ds = append(ds, z[j].Dist(z[j+1]))
		}
	}
	if len(ds) < 3 {
		return 0, false
	}
	return median(ds), true
}

// localStep returns the median distance between consecutive points of
// seq over the w positions before position k (dir −1) or after it (+1).
func localStep(pts []geometry.Point, seq []int32, k, dir, w int) float64 {
	n := len(seq)
	var ds []float64
	for s := range w {
		a := seq[((k+dir*s)%n+n)%n]
		b := seq[((k+dir*(s+1))%n+n)%n]
		ds = append(ds, fastDist(pts[a], pts[b]))
	}
	return median(ds)
}
