package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// chordFrame is the coarse frame of a section-like set of points: the
// chord line from the nose end to the tail end of the points' extent, in
// which x runs from 0 at the nose end to 1 at the tail end and y is the
// offset to the left of the chord line, both in units of the chord. It is
// a rotation (never a mirror) of the input frame, so a loop that runs
// counter-clockwise in one runs counter-clockwise in the other.
type chordFrame struct {
	le, te geometry.Point // the nose end and the tail end
	d      geometry.Point // unit vector le → te
	chord  float64
}

// newChordFrame returns the frame with its nose at le and tail at te.
func newChordFrame(le, te geometry.Point) chordFrame {
	d := te.Sub(le)
	c := d.Norm()
	return chordFrame{le: le, te: te, d: d.Scale(1 / c), chord: c}
}

// at returns the chord coordinates of p.
func (f chordFrame) at(p geometry.Point) (x, y float64) {
	q := p.Sub(f.le)
	return q.Dot(f.d) / f.chord, f.d.Cross(q) / f.chord
}

// point returns the input coordinates of the chord coordinates (x, y).
func (f chordFrame) point(x, y float64) geometry.Point {
	n := geometry.Point{X: -f.d.Y, Y: f.d.X}
	return f.le.Add(f.d.Scale(x * f.chord)).Add(n.Scale(y * f.chord))
}

// farthestPair returns the two points of sel (indices into pts) farthest
// apart, found by alternating farthest-point sweeps from the centroid
// (exact for the ends of an elongated body, O(n) a sweep).
func farthestPair(pts []geometry.Point, sel []int32) (a, b int32) {
	var c geometry.Point
	for _, i := range sel {
		c = c.Add(pts[i])
	}
	c = c.Scale(1 / float64(len(sel)))
	far := func(from geometry.Point) (int32, float64) {
		best, bd := sel[0], -1.0
		for _, i := range sel {
			if d := fastDist(pts[i], from); d > bd {
				best, bd = i, d
			}
		}
		return best, bd
	}
	a, _ = far(c)
	b, db := far(pts[a])
	for range 4 {
		a2, da := far(pts[b])
		if da <= db {
			break
		}
		a, b, db = b, a2, da
	}
	return a, b
}

// loopWeights returns, by point index (len(pts); 0 off the loop), the
// length of the loop seq each of its points stands for: half the distance
// to its neighbours along the loop either side, or less where a point
// within loopReach of it along the loop stands for less. A probe slip
// lies far from both its neighbours, which lie close to theirs: it weighs
// no more than the surface beside it, while every point of a surface
// probed with a coarser step stands for that step.
func loopWeights(pts []geometry.Point, seq []int32) []float64 {
	n := len(seq)
	raw := make([]float64, n)
	for k, i := range seq {
		raw[k] = (pts[i].Dist(pts[seq[(k+n-1)%n]]) + pts[i].Dist(pts[seq[(k+1)%n]])) / 2
	}
	w := make([]float64, len(pts))
	for k, i := range seq {
		v := raw[k]
		for d := 1; d <= loopReach && 2*d < n; d++ {
			v = min(v, raw[(k+d)%n], raw[(k+n-d)%n])
		}
		w[i] = v
	}
	return w
}

// loopReach is how many neighbours along the loop, each way, loopWeights
// looks at: a slip's neighbours each lie next to it and to a surface
// point, the next ones beyond them only on the surface.
const loopReach = 2

// endWidth returns the width across the chord of the points of sel (in
// chord coordinates xs, ys, each standing for the length ws of outline;
// nil: alike) whose x lies in [lo, hi]: the spread between the 10 % and
// 90 % quantiles of their y by that length, or −1 when fewer than 4 points
// lie there. Quantiles by length, not by count, keep a surface probed far
// more coarsely than the other in the width.
func endWidth(xs, ys, ws []float64, lo, hi float64) float64 {
	var in []weighted
	for i, x := range xs {
		if x >= lo && x <= hi {
			in = append(in, weighted{v: ys[i], w: weightOf(ws, i)})
		}
	}
	if len(in) < 4 {
		return -1
	}
	a, b := trimmed(in, 0.1)
	return in[b].v - in[a].v
}

// weighted is a value with the length of outline it stands for (and,
// in a camber bin, the x of its point).
type weighted struct{ v, w, x float64 }

// weightOf returns ws[i], or 1 when ws is nil.
func weightOf(ws []float64, i int) float64 {
	if ws == nil {
		return 1
	}
	return ws[i]
}

// trimmed sorts vs by value and returns the first and last positions left
// when a share q of the total weight is trimmed off each end: with equal
// weights, the positions len/10 and len−1−len/10 for q = 0.1 (n·q rounded
// down points trimmed each end). Weights that sum to nothing count alike.
func trimmed(vs []weighted, q float64) (a, b int) {
	stableSortWeighted(vs)
	n := len(vs)
	var tot float64
	for _, v := range vs {
		tot += v.w
	}
	if !(tot > 0) || math.IsInf(tot, 0) {
		k := int(q * float64(n))
		return k, n - 1 - k
	}
	// A point is trimmed when the weight before it and its own lie wholly
	// within the share: with equal weights, ⌊n·q⌋ points, as a count.
	cut := q * tot * (1 + 1e-12)
	var acc float64
	for a = 0; a < n-1; a++ {
		if acc+vs[a].w > cut {
			break
		}
		acc += vs[a].w
	}
	acc = 0
	for b = n - 1; b > a; b-- {
		if acc+vs[b].w > cut {
			break
		}
		acc += vs[b].w
	}
	return a, b
}

// sectionFrame returns the coarse chord frame of the points sel: the ends
// of the farthest pair, the nose being the end where the body is wider
// between 2 % and 10 % of the chord inwards (a trailing edge is the thin
// end). ok is false when neither end can be judged.
func sectionFrame(pts []geometry.Point, sel []int32, ws []float64) (chordFrame, bool) {
	return sectionFrameWeighted(pts, sel, ws, 0.1)
}

// sectionFrameWeighted is sectionFrame with each point standing for the
// length ws[i] (by point index; nil: alike) of outline in the widths, and
// windows that widen up to 2 %–reach of the chord (0.1, 0.2, 0.3) until
// each end holds four points. Only a loop already found to be the section
// may widen them (the trailing-edge analysis): an open arc of few points
// would pass.
func sectionFrameWeighted(pts []geometry.Point, sel []int32, ws []float64, reach float64) (chordFrame, bool) {
	a, b := farthestPair(pts, sel)
	f := newChordFrame(pts[a], pts[b])
	if !(f.chord > 0) {
		return f, false
	}
	xs, ys := make([]float64, len(sel)), make([]float64, len(sel))
	var sw []float64
	if ws != nil {
		sw = make([]float64, len(sel))
	}
	for k, i := range sel {
		xs[k], ys[k] = f.at(pts[i])
		if ws != nil {
			sw[k] = ws[i]
		}
	}
	// Wider windows, the same at both ends, for sparse points (the
	// stations of a drawing, 20 a surface).
	var wa, wb float64
	for _, h := range [...]float64{0.1, 0.2, 0.3} {
		if h > reach+1e-9 {
			break
		}
		wa, wb = endWidth(xs, ys, sw, 0.02, h), endWidth(xs, ys, sw, 1-h, 0.98)
		if wa >= 0 && wb >= 0 {
			break
		}
	}
	if wa < 0 || wb < 0 {
		return f, false
	}
	if wb > wa {
		f = newChordFrame(pts[b], pts[a])
	}
	return f, true
}

// Sizes of the section ordering, in chord units.
const (
	noseCap  = 0.05 // the nose cap, ordered by angle, reaches this far from the nose
	tailCap  = 0.03 // the tail cap likewise from the tail
	tailSide = 0.15 // near the tail, the side of a point is judged by fits of both surfaces over this length
)

// camberLine is the coarse camber line of a section: the middle between
// the surfaces, tabulated on bins of x, linear between them.
type camberLine struct {
	x, y []float64
}

// at returns the camber at x (constant beyond the first and last
// points of the line).
func (c camberLine) at(x float64) float64 {
	n := len(c.x)
	switch {
	case n == 0:
		return 0
	case x <= c.x[0]:
		return c.y[0]
	case x >= c.x[n-1]:
		return c.y[n-1]
	}
	k, _ := slices.BinarySearch(c.x, x)
	f := (x - c.x[k-1]) / (c.x[k] - c.x[k-1])
	return c.y[k-1] + f*(c.y[k]-c.y[k-1])
}

// camber estimates the camber line of a section from the chord
// coordinates of its points. Each bin of x holds points of both
// surfaces; their middle is the middle of the largest gap between
// consecutive values of y inside the 10–90 % quantiles (the space between
// the surfaces; trimming keeps a far outlier from making the largest gap
// outside the body), and a bin counts only when that gap is wider than the
// spread of the values on either side of it and each side holds at least
// sideShare of the bin's outline or has points across a third of the bin
// (runsAcross: both surfaces run across the bin, a sparser one too; an
// outlier or a burst of a few beyond a thin tail, whose surfaces lie
// closer together than it lies from them, stands for a few points). The
// middles are then smoothed by a robust running line (Tukey's biweight,
// three rounds, common practice), which sets aside bins that a missing
// stretch left one-sided. Aft of the last counted bin the line is
// carried on along its slope over the bins whose points show both
// surfaces about it (tailBins: a thin tail under a steeply falling camber
// line, whose surfaces' values of y overlap within a bin). Beyond the
// first bin the line stays level, and beyond the last too unless that
// leaves more than tailSide of the chord
// without a middle (a thin tail whose bins a few points sided), where it
// runs on to the frame's tail end (1, 0). The frame's ends are the points
// farthest apart, which a slip off the nose, or a fixture's face standing
// a few per cent of the chord beyond the tail, can be until the outlier
// tests have judged them: the line is drawn to the tail end only over a
// stretch longer than such a face stands off.
func camber(xs, ys, ws []float64) camberLine {
	n := len(xs)
	nb := min(max(n/12, 8), 64)
	// The bins share one array, each point in the order of xs: counted
	// first, then placed (a slice grown per bin copied each point about
	// twice).
	binOf := func(x float64) int { return min(int(x*float64(nb)), nb-1) }
	at := make([]int, nb+1)
	for _, x := range xs {
		if x >= 0 && x <= 1 {
			at[binOf(x)+1]++
		}
	}
	for k := range nb {
		at[k+1] += at[k]
	}
	all := make([]weighted, at[nb])
	bins := make([][]weighted, nb)
	for k := range bins {
		bins[k] = all[at[k]:at[k]:at[k+1]]
	}
	for i, x := range xs {
		if x < 0 || x > 1 {
			continue
		}
		k := binOf(x)
		bins[k] = append(bins[k], weighted{v: ys[i], w: weightOf(ws, i), x: x})
	}
	var bx, by []float64
	var kb []int // each counted bin's index
	width := 1 / float64(nb)
	for k, b := range bins {
		if mid, ok := binMiddle(b, width); ok {
			bx = append(bx, (float64(k)+0.5)/float64(nb))
			by = append(by, mid)
			kb = append(kb, k)
		}
	}
	if len(bx) < 3 {
		return camberLine{x: []float64{0, 1}, y: []float64{0, 0}}
	}
	w := make([]float64, len(bx))
	for i := range w {
		w[i] = 1
	}
	fit := make([]float64, len(bx))
	const half = 3 // bins each side of the running line
	for round := range 4 {
		for i := range bx {
			var sw, sx, sy, sxx, sxy float64
			for j := max(0, i-half); j <= min(len(bx)-1, i+half); j++ {
				sw += w[j]
				sx += w[j] * bx[j]
				sy += w[j] * by[j]
				sxx += w[j] * bx[j] * bx[j]
				sxy += w[j] * bx[j] * by[j]
			}
			if sw == 0 {
				fit[i] = by[i]
				continue
			}
			mx, my := sx/sw, sy/sw
			vx := sxx/sw - mx*mx
			slope := 0.0
			if vx > 1e-12 {
				slope = (sxy/sw - mx*my) / vx
			}
			fit[i] = my + slope*(bx[i]-mx)
		}
		if round == 3 {
			break
		}
		res := make([]float64, len(bx))
		for i := range res {
			res[i] = math.Abs(by[i] - fit[i])
		}
		s := 1.4826 * median(slices.Clone(res))
		if s == 0 {
			break
		}
		for i, r := range res {
			u := r / (4.685 * s)
			if u >= 1 {
				w[i] = 0
			} else {
				w[i] = (1 - u*u) * (1 - u*u)
			}
		}
	}
	bx, fit = tailBins(bins, kb[len(kb)-1], bx, fit, width)
	if 1-bx[len(bx)-1] > tailSide {
		// No middle over the last stretch of the chord (a thin tail's
		// bins, sided by a few points): the line runs on to the frame's
		// tail end rather than stay level over it.
		return camberLine{x: append(bx, 1), y: append(fit, 0)}
	}
	return camberLine{x: bx, y: fit}
}

// binMiddle returns the middle between the surfaces in one camber bin
// of the given width: the middle of the largest gap between consecutive
// values v inside the bin's 10–90 % quantiles (by weight), when both
// surfaces are there (camber's rules). It sorts b by v.
func binMiddle(b []weighted, width float64) (float64, bool) {
	if len(b) < 4 {
		return 0, false
	}
	// Trimmed by the length of outline the points stand for, so that
	// the points of a surface probed far more coarsely than the other
	// are not all trimmed off as the extremes.
	lo, hi := trimmed(b, 0.1)
	gap, mid, at := -1.0, 0.0, 0
	for j := lo; j < hi; j++ {
		if g := b[j+1].v - b[j].v; g > gap {
			gap, mid, at = g, (b[j+1].v+b[j].v)/2, j
		}
	}
	// Both surfaces must be there: the gap between them wider than the
	// spread of either (a missing stretch leaves one surface alone, and
	// the largest gap in it is a gap along it).
	if gap < 0 || gap <= b[at].v-b[lo].v || gap <= b[hi].v-b[at+1].v {
		return 0, false
	}
	var below, above float64
	for j := lo; j <= hi; j++ {
		if j <= at {
			below += b[j].w
		} else {
			above += b[j].w
		}
	}
	// A side lighter than sideShare still counts when its points run
	// across the bin: a surface probed more sparsely than the other
	// (passes of unequal density, a coarse surface), not a burst of a
	// few points at one place.
	if below < sideShare*(below+above) && !runsAcross(b[:at+1], width) ||
		above < sideShare*(below+above) && !runsAcross(b[at+1:], width) {
		return 0, false
	}
	return mid, true
}

// tailBins carries the camber line (bin centres bx, smoothed middles
// fit) on over the bins aft of the last counted one, last, while their
// points show both surfaces about the line carried along its own slope.
// Where a thin section's camber line falls steeply to the tail, a bin's
// two surfaces fall across it by more than they lie apart, so the values
// of y alone overlap and the largest gap between them is no gap between
// the surfaces; measured from the line along its slope, the surfaces
// stand apart again. The line goes only as far aft as such bins run:
// where the points stop (the tail's end), or only one surface, a burst or
// a fixture's face remains, nothing is added, and the line stays level
// beyond its last middle as before.
func tailBins(bins [][]weighted, last int, bx, fit []float64, width float64) ([]float64, []float64) {
	const m = 4 // middles the slope is taken over
	for k := last + 1; k < len(bins); k++ {
		n := len(bx)
		if n < m || len(bins[k]) < 4 {
			continue
		}
		slope, y0, x0 := lineThrough(bx[n-m:], fit[n-m:])
		line := func(x float64) float64 { return y0 + slope*(x-x0) }
		d := make([]weighted, len(bins[k]))
		for j, p := range bins[k] {
			d[j] = weighted{v: p.v - line(p.x), w: p.w, x: p.x}
		}
		mid, ok := binMiddle(d, width)
		if !ok {
			continue
		}
		xc := (float64(k) + 0.5) * width
		bx = append(bx, xc)
		fit = append(fit, line(xc)+mid)
	}
	return bx, fit
}

// lineThrough fits y = y0 + slope·(x − x0) to the points by least
// squares, x0 their mean x.
func lineThrough(xs, ys []float64) (slope, y0, x0 float64) {
	var sx, sy float64
	for i := range xs {
		sx += xs[i]
		sy += ys[i]
	}
	n := float64(len(xs))
	x0, y0 = sx/n, sy/n
	var sxx, sxy float64
	for i := range xs {
		sxx += (xs[i] - x0) * (xs[i] - x0)
		sxy += (xs[i] - x0) * (ys[i] - y0)
	}
	if sxx > 0 {
		slope = sxy / sxx
	}
	return slope, y0, x0
}

// runsAcross reports whether the points of one side of a camber bin of
// the given width (trimmed or not) spread along x over at least a third
// of it: a surface crossing the bin does, even one probed so coarsely
// that it has two points in the bin; a burst of a few points at one
// place does not.
func runsAcross(side []weighted, width float64) bool {
	if len(side) < 2 {
		return false
	}
	lo, hi := side[0].x, side[0].x
	for _, p := range side[1:] {
		lo, hi = min(lo, p.x), max(hi, p.x)
	}
	return hi-lo >= width/3
}

// sideShare is the least share of a camber bin's outline (its points'
// weights, trimmed) that each side of the gap between the surfaces must
// hold: both surfaces run across the bin, about half each.
const sideShare = 0.25

// quadFit is y = c0 + c1·x + c2·x² fitted by least squares.
type quadFit struct {
	c  [3]float64
	ok bool
}

func (q quadFit) at(x float64) float64 { return q.c[0] + q.c[1]*x + q.c[2]*x*x }

// fitQuad fits y(x) to the points (xs[i], ys[i]) for i in idx, with weights
// w (nil: all 1). x is shifted by x0 inside for conditioning.
func fitQuad(xs, ys, w []float64, idx []int, x0 float64) quadFit {
	var a [3][3]float64
	var b [3]float64
	m := 0
	for _, i := range idx {
		wi := 1.0
		if w != nil {
			wi = w[i]
		}
		if wi == 0 {
			continue
		}
		m++
		u := xs[i] - x0
		v := [3]float64{1, u, u * u}
		for r := range 3 {
			b[r] += wi * v[r] * ys[i]
			for c := range 3 {
				a[r][c] += wi * v[r] * v[c]
			}
		}
	}
	if m < 3 {
		// Too few points for a parabola: a constant or a line through them.
		return fitLine(xs, ys, w, idx, x0)
	}
	var q quadFit
	sol, ok := solve3(a, b)
	if !ok {
		return fitLine(xs, ys, w, idx, x0)
	}
	// Back to the unshifted x: c0 + c1 (x − x0) + c2 (x − x0)².
	q.c = [3]float64{sol[0] - sol[1]*x0 + sol[2]*x0*x0, sol[1] - 2*sol[2]*x0, sol[2]}
	q.ok = true
	return q
}

// fitLine fits a straight line y(x) (or a constant for one point).
func fitLine(xs, ys, w []float64, idx []int, x0 float64) quadFit {
	var sw, sx, sy, sxx, sxy float64
	for _, i := range idx {
		wi := 1.0
		if w != nil {
			wi = w[i]
		}
		u := xs[i] - x0
		sw += wi
		sx += wi * u
		sy += wi * ys[i]
		sxx += wi * u * u
		sxy += wi * u * ys[i]
	}
	if sw == 0 {
		return quadFit{}
	}
	mx, my := sx/sw, sy/sw
	v := sxx/sw - mx*mx
	slope := 0.0
	if v > 1e-18 {
		slope = (sxy/sw - mx*my) / v
	}
	// y = my + slope (u − mx), u = x − x0.
	return quadFit{c: [3]float64{my - slope*(mx+x0), slope, 0}, ok: true}
}

// solve3 solves the 3×3 system a·x = b by Gaussian elimination with
// partial pivoting; ok is false when it is (nearly) singular. It runs once
// per round of every local fit, so it is written out step by step (the
// operations, in their order, of the loops of an elimination with row
// swaps and back substitution; the eliminated entries, never read again,
// are not formed).
func solve3(a [3][3]float64, b [3]float64) ([3]float64, bool) {
	scale := 0.0
	for r := range 3 {
		for c := range 3 {
			scale = max(scale, math.Abs(a[r][c]))
		}
	}
	if scale == 0 {
		return [3]float64{}, false
	}
	tiny := 1e-13 * scale
	r0, r1, r2 := a[0], a[1], a[2]
	b0, b1, b2 := b[0], b[1], b[2]
	// Column 0: the pivot row to the top.
	if math.Abs(r1[0]) > math.Abs(r0[0]) {
		if math.Abs(r2[0]) > math.Abs(r1[0]) {
			r0, r2, b0, b2 = r2, r0, b2, b0
		} else {
			r0, r1, b0, b1 = r1, r0, b1, b0
		}
	} else if math.Abs(r2[0]) > math.Abs(r0[0]) {
		r0, r2, b0, b2 = r2, r0, b2, b0
	}
	if math.Abs(r0[0]) <= tiny {
		return [3]float64{}, false
	}
	f := r1[0] / r0[0]
	r1[1] -= f * r0[1]
	r1[2] -= f * r0[2]
	b1 -= f * b0
	f = r2[0] / r0[0]
	r2[1] -= f * r0[1]
	r2[2] -= f * r0[2]
	b2 -= f * b0
	// Column 1.
	if math.Abs(r2[1]) > math.Abs(r1[1]) {
		r1, r2, b1, b2 = r2, r1, b2, b1
	}
	if math.Abs(r1[1]) <= tiny {
		return [3]float64{}, false
	}
	f = r2[1] / r1[1]
	r2[2] -= f * r1[2]
	b2 -= f * b1
	// Column 2.
	if math.Abs(r2[2]) <= tiny {
		return [3]float64{}, false
	}
	var x [3]float64
	x[2] = b2 / r2[2]
	x[1] = (b1 - r1[2]*x[2]) / r1[1]
	s := b0 - r0[1]*x[1]
	s -= r0[2] * x[2]
	x[0] = s / r0[0]
	return x, true
}

// tailSides decides, near the tail (x > 1 − tailSide), which points
// lie on the upper surface: starting from the side of the camber line,
// each surface is fitted by a parabola y(x) (weighted towards the tail by
// the biweight of its residuals) and every point joins the surface it lies
// nearer to, three times over. Where the surfaces are far apart beside the
// scatter this only confirms the camber line's verdict; near a thin
// trailing edge it corrects it.
func tailSides(xs, ys []float64, upper []bool) {
	var near []int
	for i, x := range xs {
		if x > 1-tailSide && x <= 1+tailSide {
			near = append(near, i)
		}
	}
	if len(near) < 8 {
		return
	}
	for range 3 {
		var us, ls []int
		for _, i := range near {
			if upper[i] {
				us = append(us, i)
			} else {
				ls = append(ls, i)
			}
		}
		if oneSurfaceAft(xs, ys, near, upper) {
			return
		}
		if len(us) < 3 || len(ls) < 3 {
			return
		}
		u, l := robustQuad(xs, ys, us, 1), robustQuad(xs, ys, ls, 1)
		if !u.ok || !l.ok {
			return
		}
		changed := false
		for _, i := range near {
			up := math.Abs(ys[i]-u.at(xs[i])) < math.Abs(ys[i]-l.at(xs[i]))
			if up != upper[i] {
				upper[i], changed = up, true
			}
		}
		if !changed {
			return
		}
	}
}

// oneSurfaceAft sides the points near (by position in xs, ys) when the
// camber line left few of them on one side, as near the tail of a surface
// probed far more coarsely than the other, where a cambered section's
// camber line, drawn from the fine surface alone, may pass on either side
// of it: one parabola fitted robustly to them all follows the fine
// surface, the points beyond oneSurfaceCut of its scatter are the other
// surface, and the side they lie on says which surface each is. It
// reports whether it sided them: not when fewer than two points lie
// apart, when points lie apart on both sides or when they are more than a third, nor
// when the parabola runs between two surfaces.
func oneSurfaceAft(xs, ys []float64, near []int, upper []bool) bool {
	q := robustQuad(xs, ys, near, 1)
	if !q.ok {
		return false
	}
	res := make([]float64, len(near))
	abs := make([]float64, len(near))
	for k, i := range near {
		res[k] = ys[i] - q.at(xs[i])
		abs[k] = math.Abs(res[k])
	}
	s := 1.4826 * median(abs)
	if !(s > 0) {
		return false
	}
	below, above := 0, 0
	for _, r := range res {
		switch {
		case r < -oneSurfaceCut*s:
			below++
		case r > oneSurfaceCut*s:
			above++
		}
	}
	if below+above < 2 || below > 0 && above > 0 || 3*(below+above) > len(near) {
		return false // no other surface apart, or not one surface's few points
	}
	// The other surface must lie clear of the fine one's scatter: a
	// normal scatter leaves no point between 4 and 10 of its scales
	// (odds 6e-5 a point), so more than a few there are a surface the
	// cut splits, not noise. A coarse surface of tens of points near
	// the tail pulls the one parabola and widens its scale until its
	// nearer points fall inside the cut (campaign seed 1941: some 40 upper
	// points against 110 lower, 0.034 c apart at 87 % of the chord,
	// the scale 0.0035 c; 37 of them were sided lower). The fits of
	// both surfaces (tailSides) tell those apart.
	between := 0
	for _, r := range abs {
		if r > 4*s && r <= oneSurfaceCut*s {
			between++
		}
	}
	if between > max(2, len(near)/20) {
		return false
	}
	// The fit must follow one surface, not run between two: then the
	// residuals of the points on it crowd about zero (a normal scatter
	// has 38 % of them within half its scale); between two surfaces
	// they crowd at plus and minus half the gap.
	close := 0
	for _, r := range abs {
		if r <= s/2 {
			close++
		}
	}
	if 5*close < len(near)-below-above {
		return false
	}
	fineUpper := below > 0
	for k, i := range near {
		upper[i] = fineUpper == (math.Abs(res[k]) <= oneSurfaceCut*s)
	}
	return true
}

// oneSurfaceCut is how far, in robust scatters of the fit, a point must
// lie off the fine surface near the tail to be taken for the other
// surface's: twice as far as Tukey's biweight gives a point no weight, so
// that in a noisy band whose surfaces close to within the noise at the
// tail the odd far point of the noise is not taken for another surface.
const oneSurfaceCut = 10

// robustQuad fits y(x) to the points idx by a parabola with Tukey's
// biweight (two rounds after a plain fit), so that a few points of the
// other surface or outliers do not pull it; x0 centres x.
func robustQuad(xs, ys []float64, idx []int, x0 float64) quadFit {
	// The points of idx alone, in their order (the sums run as over idx):
	// the weights then take len(idx), not one per point of the cloud.
	lx, ly, li := make([]float64, len(idx)), make([]float64, len(idx)), make([]int, len(idx))
	for k, i := range idx {
		lx[k], ly[k], li[k] = xs[i], ys[i], k
	}
	xs, ys, idx = lx, ly, li
	q := fitQuad(xs, ys, nil, idx, x0)
	if !q.ok {
		return q
	}
	w := make([]float64, len(xs))
	for range 2 {
		res := make([]float64, 0, len(idx))
		for _, i := range idx {
			res = append(res, math.Abs(ys[i]-q.at(xs[i])))
		}
		s := 1.4826 * median(res)
		if s == 0 {
			return q
		}
		for _, i := range idx {
			u := math.Abs(ys[i]-q.at(xs[i])) / (4.685 * s)
			if u >= 1 {
				w[i] = 0
			} else {
				w[i] = (1 - u*u) * (1 - u*u)
			}
		}
		if r := fitQuad(xs, ys, w, idx, x0); r.ok {
			q = r
		}
	}
	return q
}

// sides returns which of the points (xs, ys), chord coordinates with
// weights sw (nil: equal), lie on the upper surface, and the camber line
// that tells the surfaces apart (near the tail, fits of both surfaces do:
// tailSides).
func sides(xs, ys, sw []float64) ([]bool, camberLine) {
	n := len(xs)
	cl := camber(xs, ys, sw)
	upper := make([]bool, n)
	for k := range n {
		upper[k] = ys[k] >= cl.at(xs[k])
	}
	// Once more with each point standing for the stretch of its own
	// surface it covers (surfaceWeights): the neighbour distances of
	// spacingWeights mix the surfaces wherever the section is thinner than
	// a coarsely probed surface's step, and a surface probed 5–20 times
	// more coarsely than the other then weighs as a handful of points,
	// trimmed off the camber line's bins as extremes.
	cl = camber(xs, ys, surfaceWeights(xs, upper))
	for k := range n {
		upper[k] = ys[k] >= cl.at(xs[k])
	}
	tailSides(xs, ys, upper)
	return upper, cl
}

// sectionOrder orders the points sel of a section-like cloud into one loop
// without looking at their spacing: in the coarse chord frame every point
// gets a place u round the loop, and the loop is the points sorted by u.
//
//   - Between the caps (noseCap ≤ x ≤ 1 − tailCap) a point lies on the upper
//     surface when it is above the camber line (near the tail, above the
//     middle of fits of both surfaces: tailSides), and its place is its x:
//     u runs from 0 to 1 along the upper surface from the tail cap to the
//     nose cap, and from 2 to 3 along the lower surface back.
//   - In the nose cap (x < noseCap) the place is the angle about the
//     camber point at x = noseCap, from straight up (u = 1) round the nose to
//     straight down (u = 2); in the tail cap likewise about the camber point
//     at 1 − tailCap, from straight down (u = 3) round the tail to straight up
//     (u = 4, which is 0). A convex end is star-shaped about such a point, so
//     the angle grows along it; the angles need no point spacing at all.
//
// Noise and uneven spacing cannot tangle this order; only points closer
// along the chord than their scatter may swap, which a fit does not see.
// The loop starts in the tail cap, at the first point past the tail's
// direction, and runs counter-clockwise.
func sectionOrder(pts []geometry.Point, sel []int32, f chordFrame, ws []float64) ([]int32, *sectionCoords) {
	n := len(sel)
	xs, ys := make([]float64, n), make([]float64, n)
	var sw []float64
	if ws != nil {
		sw = make([]float64, n)
	}
	for k, i := range sel {
		xs[k], ys[k] = f.at(pts[i])
		if ws != nil {
			sw[k] = ws[i]
		}
	}
	upper, cl := sides(xs, ys, sw)
	// The centres of the caps: the camber line's points at their edges.
	xn, xt := noseCap, 1-tailCap
	yn, yt := cl.at(xn), cl.at(xt)
	if mid, ok := tailMiddle(xs, ys, upper, xt); ok {
		yt = mid
	}
	us := make([]float64, n)
	span := xt - xn
	sc := newSectionCoords(len(pts))
	sc.frame, sc.xn, sc.yn, sc.xt = f, xn, yn, xt
	for k := range n {
		x, y := xs[k], ys[k]
		i := sel[k]
		switch {
		case x < xn:
			us[k] = 1 + math.Atan2(xn-x, y-yn)/math.Pi
			sc.set(i, regionNose, us[k], math.Hypot(x-xn, y-yn))
		case x > xt:
			us[k] = 3 + math.Atan2(x-xt, -(y-yt))/math.Pi
			// Its residuals are y(x) along its surface: the radius about
			// the cap's centre turns too fast near the centre's line.
			if us[k] >= 3.5 {
				sc.set(i, regionUpper, x, y)
			} else {
				sc.set(i, regionLower, x, y)
			}
		case upper[k]:
			us[k] = (xt - x) / span
			sc.set(i, regionUpper, x, y)
		default:
			us[k] = 2 + (x-xn)/span
			sc.set(i, regionLower, x, y)
		}
	}
	// Start at the tail: places from 3.5 (straight behind the tail cap's
	// centre) on come first.
	for k := range us {
		if us[k] < 3.5 {
			us[k] += 4
		}
		sc.place[sel[k]] = us[k]
	}
	order := make([]int, n)
	for k := range order {
		order[k] = k
	}
	byPlace := func(a, b int) int {
		switch {
		case us[a] < us[b]:
			return -1
		case us[a] > us[b]:
			return 1
		}
		return 0
	}
	if slices.ContainsFunc(us, math.IsNaN) {
		// No strict weak order: keep the sort whose order it always was.
		slices.SortStableFunc(order, byPlace)
	} else {
		// Without NaN, byPlace is cmp.Compare.
		stableSortBy(order, us)
	}
	out := make([]int32, n)
	for k, o := range order {
		out[k] = sel[o]
	}
	return out, sc
}

// surfaceWeights returns, for each point (chord coordinates xs; upper
// tells its surface), the length along the chord its surface's points
// either side of it leave to it: half the distance between its
// neighbours by x on the same surface (the whole distance to the one
// neighbour at an end). The weights of a surface sum to its extent along
// the chord, and half its end steps, whatever its step; a point off the
// surface (a probe slip) weighs as little as the surface's points beside
// it.
func surfaceWeights(xs []float64, upper []bool) []float64 {
	w := make([]float64, len(xs))
	for _, side := range [2]bool{true, false} {
		var idx []int
		for k, u := range upper {
			if u == side {
				idx = append(idx, k)
			}
		}
		stableSortBy(idx, xs)
		for j, k := range idx {
			lo, hi := xs[k], xs[k]
			if j > 0 {
				lo = xs[idx[j-1]]
			}
			if j+1 < len(idx) {
				hi = xs[idx[j+1]]
			}
			d := hi - lo
			if j > 0 && j+1 < len(idx) {
				d /= 2
			}
			w[k] = d
		}
	}
	return w
}

// tailMiddle returns the middle between parabolas fitted to the upper and
// lower points near the tail, at x: a better centre for the tail cap than
// the binned camber line where the trailing edge is thin.
func tailMiddle(xs, ys []float64, upper []bool, x float64) (float64, bool) {
	var us, ls []int
	for i, xi := range xs {
		if xi > 1-tailSide && xi <= 1 {
			if upper[i] {
				us = append(us, i)
			} else {
				ls = append(ls, i)
			}
		}
	}
	if len(us) < 3 || len(ls) < 3 {
		return 0, false
	}
	u, l := robustQuad(xs, ys, us, 1), robustQuad(xs, ys, ls, 1)
	if !u.ok || !l.ok {
		return 0, false
	}
	yu, yl := u.at(x), l.at(x)
	if yu < yl {
		return 0, false
	}
	return (yu + yl) / 2, true
}
