package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
)

// fitK is the number of loop neighbours on each side of a point that its
// local fit uses.
const fitK = 3

// scaleFloor is the least robust scale, as a fraction of the median point
// spacing of the loop. It keeps noise-free input (exact coordinates, whose
// residuals are only the local fits' own approximation error) from having
// every slightly curved stretch called an outlier.
const scaleFloor = 0.02

// dropRounds bounds the detect-and-drop rounds of dropOutliers.
const dropRounds = 10

// indepRatio is, for independent noise, about the largest ratio of the
// spread of the left-out residuals of the narrowest window of the cluster
// test to the robust scale of the point-to-point residuals: measured 1.0
// to 2.1 on NACA 2412 contours of 80 to 1500 points with Gaussian noise
// (the point-to-point residual is the least of three fits', so it runs
// low). Where it is exceeded a little, the threshold rises a little; a
// mesh slice's near pairs make it 50 or more.
const indepRatio = 2

// hit is one point found to be an outlier or a stray.
type hit struct {
	idx          int32
	reason       string
	dist, sigmas float64
	kept         bool
}

// localFits says how the residuals of a loop are found: point to point
// (localFit), over band neighbours in a band (bandFit), or, for a section
// order, by robust fits along its regions (sectionCoords).
type localFits struct {
	band  int
	sc    *sectionCoords
	chord float64 // the chord of sc's coordinates, input units
}

// residualsAt sets r at the positions at (every position when nil).
func (lf localFits) residualsAt(pts []geometry.Point, seq []int32, at []int, r []float64) {
	if lf.sc != nil {
		lf.sc.residualsAt(pts, seq, at, r, lf.chord)
		return
	}
	residualsAt(pts, seq, lf.band, at, r)
}

// residuals returns, for each position of the loop seq, the residual
// of its point against local fits of its fitK neighbours on each side
// (the point itself excluded): the least of
//
//   - the normal distance to a parametric quadratic (x(s), y(s)) fitted by
//     least squares to both sides, s the chord length along the neighbours,
//     evaluated where the point projects between its two nearest
//     neighbours;
//   - the distances to the straight lines fitted to either side alone.
//
// The one-sided fits let a corner (a sharp trailing edge, the corners of a
// blunt one) be predicted from the side it continues; a point off the
// surface is far from all three. The work runs on every CPU.
//
// When band > 0 the loop is a band of points ordered only along the curve
// (byBand), and the fits are those of bandFit over band
// neighbours on each side.
func residuals(pts []geometry.Point, seq []int32, band int) []float64 {
	r := make([]float64, len(seq))
	residualsAt(pts, seq, band, nil, r)
	return r
}

// residualsAt sets r[i] to the residual of position i of seq for
// each i in at (every position when at is nil), as residuals does.
func residualsAt(pts []geometry.Point, seq []int32, band int, at []int, r []float64) {
	n := len(seq)
	k := min(fitK, (n-1)/2)
	if band > 0 {
		k = min(band, (n-1)/2)
	}
	m := n
	if at != nil {
		m = len(at)
	}
	parallel(m, func(a, b int) {
		for j := a; j < b; j++ {
			i := j
			if at != nil {
				i = at[j]
			}
			if band > 0 {
				r[i] = bandFit(pts, seq, i, k)
			} else {
				r[i] = localFit(pts, seq, i, k)
			}
		}
	})
}

// bandFit returns the residual of position i of a band-ordered loop
// seq: the least of its distances from a quadratic y(x) fitted by least
// squares to its k neighbours on each side, in their principal frame, and
// from the principal lines of either side alone. Across a band the order of
// the points is arbitrary, so no chord-length parameter exists; the window
// spans several band widths, so its principal frame follows the curve.
func bandFit(pts []geometry.Point, seq []int32, i, k int) float64 {
	n := len(seq)
	p0 := pts[seq[i]]
	// The window, relative to p0: w[0:k] the left side, w[k:2k] the right.
	var buf [2 * maxBandFit]geometry.Point
	w := buf[:2*k]
	for j := 1; j <= k; j++ {
		l, r := i-j, i+j
		if l < 0 {
			l += n
		}
		if r >= n {
			r -= n
		}
		w[k-j], w[k+j-1] = pts[seq[l]].Sub(p0), pts[seq[r]].Sub(p0)
	}
	// frame returns the centroid and principal direction of ps.
	frame := func(ps []geometry.Point) (c, u geometry.Point) {
		var sx, sy, sxx, sxy, syy float64
		for _, q := range ps {
			sx += q.X
			sy += q.Y
			sxx += q.X * q.X
			sxy += q.X * q.Y
			syy += q.Y * q.Y
		}
		m := float64(len(ps))
		c = geometry.Point{X: sx / m, Y: sy / m}
		return c, principal(sxx-sx*c.X, sxy-sx*c.Y, syy-sy*c.Y)
	}
	best := math.Inf(1)
	for _, side := range [2][]geometry.Point{w[:k], w[k:]} {
		c, u := frame(side)
		best = min(best, math.Abs(c.Scale(-1).Cross(u)))
	}
	c, u := frame(w)
	// y = a + b x + c x² in the frame (x along u, y across), x scaled by
	// the window's extent.
	span := 0.0
	for _, q := range w {
		span = max(span, math.Abs(q.Sub(c).Dot(u)))
	}
	if span == 0 {
		return best
	}
	var a [3][3]float64
	var by [3]float64
	for _, q := range w {
		d := q.Sub(c)
		v, y := d.Dot(u)/span, u.Cross(d)
		v2 := v * v
		a[0][1] += v
		a[0][2] += v2
		a[1][2] += v2 * v
		a[2][2] += v2 * v2
		by[0] += y
		by[1] += v * y
		by[2] += v2 * y
	}
	a[0][0] = float64(len(w))
	a[1][0], a[1][1], a[2][0], a[2][1] = a[0][1], a[0][2], a[0][2], a[1][2]
	a[0][1], a[0][2] = a[1][0], a[2][0]
	if cf, ok := numeric.Cramer3(a, by, 1e-12); ok {
		d := c.Scale(-1)
		v := d.Dot(u) / span
		best = min(best, math.Abs(u.Cross(d)-(cf[0]+cf[1]*v+cf[2]*v*v)))
	}
	return best
}

// localFit returns the residual of position i of seq, described at
// residuals.
func localFit(pts []geometry.Point, seq []int32, i, k int) float64 {
	n := len(seq)
	at := func(j int) geometry.Point { return pts[seq[((i+j)%n+n)%n]] }
	p0 := at(0)
	pm, pp := at(-1), at(1)
	gap := pp.Sub(pm)
	g := math.Sqrt(gap.Dot(gap))
	best := math.Inf(1)
	// Two-sided parametric quadratic.
	if g > 0 {
		var ss [2 * fitK]float64
		var ps [2 * fitK]geometry.Point
		m := 0
		s := -g / 2
		for j := 1; j <= k; j++ {
			if j > 1 {
				s -= fastDist(at(-j+1), at(-j))
			}
			ss[m], ps[m] = s, at(-j)
			m++
		}
		s = g / 2
		for j := 1; j <= k; j++ {
			if j > 1 {
				s += fastDist(at(j-1), at(j))
			}
			ss[m], ps[m] = s, at(j)
			m++
		}
		span := max(-ss[k-1], ss[m-1])
		t := p0.Sub(pm).Dot(gap) / (g * g)
		u := (-g/2 + min(1, max(0, t))*g) / span
		if c, d, ok := quadratic(ss[:m], ps[:m], span, u); ok {
			if l := d.Norm(); l > 0 {
				best = math.Abs(p0.Sub(c).Cross(d.Scale(1 / l)))
			} else {
				best = p0.Dist(c)
			}
		}
	}
	// One-sided lines.
	for _, side := range [2]int{-1, 1} {
		var c geometry.Point
		for j := 1; j <= k; j++ {
			c = c.Add(at(side * j))
		}
		c = c.Scale(1 / float64(k))
		var sxx, sxy, syy float64
		for j := 1; j <= k; j++ {
			d := at(side * j).Sub(c)
			sxx += d.X * d.X
			sxy += d.X * d.Y
			syy += d.Y * d.Y
		}
		if sxx+syy == 0 {
			continue
		}
		t := principal(sxx, sxy, syy)
		best = min(best, math.Abs(p0.Sub(c).Cross(t)))
	}
	return best
}

// sagitta returns how far a smooth curve may bulge from the chord
// between the neighbours i−1 and i+1 of position i of seq, given how much
// it turns from the step i−2 → i−1 to the step i+1 → i+2: a circular arc
// over a chord g that turns by τ has sagitta g/2 · tan(τ/4). Where the
// points are sparse for the curvature (a nose sampled more coarsely than its
// radius) a good point can be that far from any local fit; a point off a
// gently curved surface cannot hide behind it.
func sagitta(pts []geometry.Point, seq []int32, i int) float64 {
	n := len(seq)
	at := func(j int) geometry.Point { return pts[seq[((i+j)%n+n)%n]] }
	a, b := at(-1).Sub(at(-2)), at(2).Sub(at(1))
	g := fastDist(at(1), at(-1))
	la, lb := a.Norm(), b.Norm()
	if la == 0 || lb == 0 {
		return 0
	}
	tau := math.Atan2(math.Abs(a.Cross(b)), a.Dot(b))
	return g / 2 * math.Tan(tau/4)
}

// inBulge reports whether the point at position i of seq lies within
// the bulge of every chord across it out to the local fits' reach: for
// j = 1, …, fitK, on the side of the chord between positions i−j and i+j
// that a curve turning as the steps i−j−1 → i−j and i+j → i+j+1 do bulges
// to, no farther from that chord than the bulge may reach (sagitta). The
// local fits across a sparsely sampled bend whose curvature changes (a
// flat bottom's knee, where the nose's lower side swings below the flat
// and up into it) miss the bend's own points by more than the bulge,
// though they lie within it: the chord, not the fit, is what the bulge is
// measured from. The wider chords leave a run of points off the surface
// together (a burst) to the residuals: each of its points lies near the
// chord that ends at its fellow, but outside the bulge of the chords that
// reach past the run (campaign 5065: two points 0.55 mm off, which the
// first chord alone kept, and the section crossed itself).
func inBulge(pts []geometry.Point, seq []int32, i int) bool {
	n := len(seq)
	if n < 2*fitK+3 {
		return false
	}
	at := func(j int) geometry.Point { return pts[seq[((i+j)%n+n)%n]] }
	for j := 1; j <= fitK; j++ {
		a, b := at(-j).Sub(at(-j-1)), at(j+1).Sub(at(j))
		turn := a.Cross(b)
		chord := at(j).Sub(at(-j))
		g := chord.Norm()
		la, lb := a.Norm(), b.Norm()
		if turn == 0 || g == 0 || la == 0 || lb == 0 {
			return false
		}
		off := chord.Cross(at(0).Sub(at(-j))) / g
		// A left turn bulges to the right of the chord, a right turn to
		// the left.
		if turn > 0 {
			off = -off
		}
		tau := math.Atan2(math.Abs(turn), a.Dot(b))
		if off < 0 || off > g/2*math.Tan(tau/4) {
			return false
		}
	}
	return true
}

// quadratic fits x(u) and y(u), u = s/span, by least-squares
// quadratics to the points ps at parameters ss and returns the point and the
// derivative at u. ok is false when the normal equations are singular.
func quadratic(ss []float64, ps []geometry.Point, span, u float64) (c, d geometry.Point, ok bool) {
	var a [3][3]float64
	var bx, by [3]float64
	for j, s := range ss {
		v := s / span
		b := [3]float64{1, v, v * v}
		for r := range 3 {
			for q := range 3 {
				a[r][q] += b[r] * b[q]
			}
			bx[r] += b[r] * ps[j].X
			by[r] += b[r] * ps[j].Y
		}
	}
	cx, okx := numeric.Cramer3(a, bx, 1e-12)
	cy, oky := numeric.Cramer3(a, by, 1e-12)
	if !okx || !oky {
		return c, d, false
	}
	c = geometry.Point{X: cx[0] + cx[1]*u + cx[2]*u*u, Y: cy[0] + cy[1]*u + cy[2]*u*u}
	d = geometry.Point{X: cx[1] + 2*cx[2]*u, Y: cy[1] + 2*cy[2]*u}
	return c, d, true
}

// localWindow is the half-width, in points, of the window whose
// residuals make a point's local scale (localScales).
const localWindow = 10

// localScales returns, by point index, the local robust scale of the
// residuals r of the loop seq: 1.4826 × the median absolute residual of
// the localWindow points on either side of each point (itself left out).
// Where the local fits cannot follow the outline as well as elsewhere (a
// nose or an edge sampled by few points, exact data whose only residual is
// the fits' own error) the good points' residuals rise together, and the
// threshold with them; a gross outlier stands out from its neighbours
// wherever it is.
func localScales(pts []geometry.Point, seq []int32, r []float64) []float64 {
	n := len(seq)
	loc := make([]float64, len(pts))
	w := min(localWindow, (n-1)/2)
	if w > 0 && nonNegative(r) {
		// The window slides: from one point to the next two values leave
		// it and two come in, kept in order, instead of a sort a point.
		parallel(n, func(a, b int) {
			win := make([]float64, 0, 2*w+1)
			for d := 1; d <= w; d++ {
				win = insertSorted(win, r[((a-d)%n+n)%n])
				win = insertSorted(win, r[(a+d)%n])
			}
			for i := a; i < b; i++ {
				if i > a {
					win = removeSorted(win, r[i])               // the new centre
					win = removeSorted(win, r[((i-1-w)%n+n)%n]) // off the left
					win = insertSorted(win, r[i-1])             // the old centre
					win = insertSorted(win, r[(i+w)%n])         // on at the right
				}
				loc[seq[i]] = 1.4826 * ((win[w-1] + win[w]) / 2) // as median(window)
			}
		})
		return loc
	}
	parallel(n, func(a, b int) {
		buf := make([]float64, 0, 2*localWindow)
		for i := a; i < b; i++ {
			buf = buf[:0]
			for d := 1; d <= w; d++ {
				buf = append(buf, r[((i-d)%n+n)%n], r[(i+d)%n])
			}
			loc[seq[i]] = 1.4826 * median(buf)
		}
	})
	return loc
}

// nonNegative reports whether every value of r is ≥ 0 and none is NaN or
// −0: such values are equal only when their bits are, so any of equal
// values may stand for another in a sorted window.
func nonNegative(r []float64) bool {
	for _, x := range r {
		if math.Float64bits(x) > 0x7ff0000000000000 {
			return false
		}
	}
	return true
}

// insertSorted inserts x into the sorted s.
func insertSorted(s []float64, x float64) []float64 {
	k, _ := slices.BinarySearch(s, x)
	return slices.Insert(s, k, x)
}

// removeSorted removes one value equal to x from the sorted s, which holds
// one.
func removeSorted(s []float64, x float64) []float64 {
	k, _ := slices.BinarySearch(s, x)
	return slices.Delete(s, k, k+1)
}

// robustScale returns the robust scale of residuals r, 1.4826 × their
// median absolute value (the MAD of a residual centred on the curve; 1.4826
// makes it σ for Gaussian noise, common practice), floored at scaleFloor × the median spacing
// of seq.
func robustScale(pts []geometry.Point, seq []int32, r []float64) (floored, raw float64) {
	abs := slices.Clone(r)
	s := 1.4826 * median(abs)
	gaps := make([]float64, len(seq))
	for k := range seq {
		gaps[k] = fastDist(pts[seq[k]], pts[seq[(k+1)%len(seq)]])
	}
	return max(s, scaleFloor*median(gaps)), s
}

// dropOutliers finds the gross outliers of the loop seq. Residuals come from
// residuals and the scale from robustScale, both from the first
// round (the scale floored, and raw). In each round the points beyond sigma·scale that have the largest
// residual within fitK positions are taken out (a point next to an
// outlier has a large residual too, through the outlier in its fit), and the
// residuals are computed again with the outliers' neighbours joined. The
// rounds stop when no point is beyond the threshold. A point within the
// sagitta bound of sagitta is never an outlier. Then the cluster test
// (clusterOutliers, cluster.go) takes out the runs of points that lie off
// the surface together, which these residuals cannot see. It returns the
// loop without the outliers (with them, if keep), the scale and the
// outliers.
// Points marked in exempt (by point index; nil for none) are never
// outliers here: the trailing edge's end zone, whose tight turns the end
// model of findEdge judges instead.
//
// band > 0 marks a band-ordered loop (see residuals); the sagitta
// bound is then not used. (The local maxima are still taken over fitK
// positions: in a wide band fit one outlier moves its neighbours' fits
// little.)
func dropOutliers(pts []geometry.Point, seq []int32, sigma float64, keep bool, lf localFits, exempt []bool) ([]int32, float64, float64, []hit) {
	if len(seq) < minPoints {
		return seq, 0, 0, nil
	}
	r := make([]float64, len(seq))
	lf.residualsAt(pts, seq, nil, r)
	return dropOutliersFrom(pts, seq, sigma, keep, lf, exempt, r)
}

// dropOutliersFrom is dropOutliers given the residuals r of every position
// of seq under lf (which it overwrites).
func dropOutliersFrom(pts []geometry.Point, seq []int32, sigma float64, keep bool, lf localFits, exempt []bool, r []float64) ([]int32, float64, float64, []hit) {
	if len(seq) < minPoints {
		return seq, 0, 0, nil
	}
	band := lf.band
	scale, raw := robustScale(pts, seq, r)
	loc := localScales(pts, seq, r)
	// The sagitta bound needs neighbours in their true order: point to
	// point fits on a thin line, or a section order of points that do not
	// form a band.
	useSagitta := band == 0 && (lf.sc == nil || !bandLike(pts, seq, scale))
	// The cluster test's windows and the spread of its own residuals at
	// each (clusterScale), on the loop as it comes. Point-to-point fits
	// judge a point by its nearest neighbours, which may share its noise
	// (a mesh cut near a row of its vertices leaves its points in near
	// pairs, each the other's copy): their residuals then shrink to
	// nothing while the loop wanders by its whole noise. The narrowest
	// left-out window sees past a point's next neighbours; for
	// independent noise its spread is at most indepRatio times the
	// point-to-point scale, and the threshold here is never below that
	// spread over indepRatio.
	ws, wsc := clusterCalibration(pts, seq, sigma*scale, exempt)
	pscale := scale
	if band == 0 && lf.sc == nil && len(ws) > 0 {
		pscale = max(scale, wsc.at(0)/indepRatio)
	}
	work := seq
	var hits []hit
	for range dropRounds {
		n := len(work)
		var out []bool
		for i := range n {
			if r[i] <= sigma*max(pscale, loc[work[i]]) || useSagitta && (r[i] <= sagitta(pts, work, i) || inBulge(pts, work, i)) || exempt != nil && exempt[work[i]] {
				continue
			}
			top := true
			for j := -fitK; j <= fitK && top; j++ {
				q := ((i+j)%n + n) % n
				if j != 0 && (r[q] > r[i] || r[q] == r[i] && q < i) {
					top = false
				}
			}
			if !top {
				continue
			}
			if out == nil {
				out = make([]bool, n)
			}
			out[i] = true
			hits = append(hits, hit{idx: work[i], reason: "outlier", dist: r[i], sigmas: r[i] / pscale, kept: keep})
		}
		if out == nil {
			break
		}
		// Take the outliers out; only the residuals of points whose fits
		// reached one change.
		reach := fitK + 2
		switch {
		case lf.sc != nil:
			reach = sectionWindow + 2
		case band > 0:
			reach = band + 2
		}
		next := make([]int32, 0, n)
		nr := make([]float64, 0, n)
		var cuts []int
		for i, p := range work {
			if out[i] {
				cuts = append(cuts, len(next))
				continue
			}
			next = append(next, p)
			nr = append(nr, r[i])
		}
		work, r = next, nr
		nn := len(work)
		if nn < minPoints {
			break
		}
		dirty := make([]bool, nn)
		var at []int
		for _, c := range cuts {
			for d := -reach; d < reach; d++ {
				if q := ((c+d)%nn + nn) % nn; !dirty[q] {
					dirty[q] = true
					at = append(at, q)
				}
			}
		}
		if 2*reach+1 >= nn {
			at = nil
		}
		lf.residualsAt(pts, work, at, r)
	}
	// Runs of points off the surface together, which the residuals
	// above cannot see (each point's fit follows its companions).
	work, more := clusterOutliers(pts, work, sigma, scale, keep, exempt, ws, wsc)
	hits = append(hits, more...)
	if keep {
		return seq, scale, raw, hits
	}
	return work, scale, raw, hits
}

// respared updates the residuals r of the loop seq, found by the section
// fits of lf with no point spared, for the spared points exempt now set in
// lf.sc: it recomputes those of the positions within sectionWindow of a
// spared point (the only fits that change: a fit walks at most
// sectionWindow positions each way) and returns r.
func respared(pts []geometry.Point, seq []int32, exempt []bool, r []float64, lf localFits) []float64 {
	n := len(seq)
	if 2*sectionWindow+1 >= n {
		lf.residualsAt(pts, seq, nil, r)
		return r
	}
	mark := make([]bool, n)
	var at []int
	for k, p := range seq {
		if !exempt[p] {
			continue
		}
		for d := -sectionWindow; d <= sectionWindow; d++ {
			if q := ((k+d)%n + n) % n; !mark[q] {
				mark[q] = true
				at = append(at, q)
			}
		}
	}
	if len(at) > 0 {
		lf.residualsAt(pts, seq, at, r)
	}
	return r
}

// placeRest deals with the points of rest, which joined no loop. A point
// none of whose nearest neighbours is on the loop seq is a stray. Otherwise
// its residual is its distance from the loop's polyline next to its nearest
// loop neighbour: beyond thr it is an outlier (put in only if keep), and
// within thr it is put back into the loop where it projects. A point
// marked in spared (by point index; nil for none) is put back at any
// distance: the end zone of a probe ball's path (Options.EndSpare).
func placeRest(pts []geometry.Point, seq []int32, rest [][]int32, nb *nbrs, thr, scale float64, keep bool, spared []bool) ([]int32, []hit) {
	if len(rest) == 0 {
		return seq, nil
	}
	n := len(seq)
	pos := make([]int32, len(pts))
	for i := range pos {
		pos[i] = -1
	}
	for k, i := range seq {
		pos[i] = int32(k)
	}
	type ins struct {
		at  int32 // insert after this position
		t   float64
		idx int32
	}
	var adds []ins
	var hits []hit
	for _, ch := range rest {
		for _, i := range ch {
			p := pts[i]
			j := int32(-1)
			for _, q := range nb.of(i) {
				if pos[q] >= 0 {
					j = pos[q]
					break
				}
			}
			if j < 0 {
				hits = append(hits, hit{idx: i, reason: "stray"})
				continue
			}
			best, at, bt := math.Inf(1), int32(0), 0.0
			for _, e := range [2]int32{(j - 1 + int32(n)) % int32(n), j} {
				a, b := pts[seq[e]], pts[seq[(e+1)%int32(n)]]
				ab := b.Sub(a)
				t := 0.0
				if l2 := ab.Dot(ab); l2 > 0 {
					t = min(1, max(0, p.Sub(a).Dot(ab)/l2))
				}
				if d := p.Dist(a.Add(ab.Scale(t))); d < best {
					best, at, bt = d, e, t
				}
			}
			if best > thr && (spared == nil || !spared[i]) {
				sg := 0.0
				if scale > 0 {
					sg = best / scale
				}
				hits = append(hits, hit{idx: i, reason: "outlier", dist: best, sigmas: sg, kept: keep})
				if !keep {
					continue
				}
			}
			adds = append(adds, ins{at, bt, i})
		}
	}
	if len(adds) == 0 {
		return seq, hits
	}
	slices.SortFunc(adds, func(a, b ins) int {
		switch {
		case a.at != b.at:
			return int(a.at - b.at)
		case a.t < b.t:
			return -1
		case a.t > b.t:
			return 1
		}
		return int(a.idx - b.idx)
	})
	out := make([]int32, 0, n+len(adds))
	k := 0
	for e := range int32(n) {
		out = append(out, seq[e])
		for k < len(adds) && adds[k].at == e {
			out = append(out, adds[k].idx)
			k++
		}
	}
	return out, hits
}
