package clean

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/par"
)

// Ordering strategies, as Report.Strategy names them.
const (
	// OrderFile keeps the order of the file (an ordered listing or
	// polyline whose every step is a local one).
	OrderFile = "file"
	// OrderSection places every point round a section by its chordwise
	// position and side (sectionOrder): one loop, whatever the spacing
	// and the noise.
	OrderSection = "section"
	// OrderLinked links points to their tangent-guided mutual neighbours
	// and joins the chains (link, join): any number of loops of any shape,
	// for points that lie on thin lines.
	OrderLinked = "linked"
	// OrderBand orders a dense noisy band by projection onto a thinned
	// curve (byBand): any number of loops.
	OrderBand = "band"
)

// spared marks, by point index, the points near the trailing edge of the
// loop seq, which the generic outlier test spares for the edge's models
// (findEdge): the edge is found on the loop without the points a first
// generic pass calls outliers, since one near the edge could pass for its
// end. It returns nil when no edge is found; and, in any case, the
// residuals of seq that pass started from (lf without spared points),
// which the outlier test of seq reuses wherever no spared point is in reach.
func (cl *cleaning) spared(seq []int32, sigma float64, lf localFits, extra float64) ([]bool, []float64) {
	pts := cl.pts
	r0 := make([]float64, len(seq))
	lf.residualsAt(pts, seq, nil, r0)
	_, _, _, first := dropOutliersFrom(pts, seq, sigma, true, lf, nil, slices.Clone(r0))
	out := make(map[int32]bool, len(first))
	for _, h := range first {
		out[h.idx] = true
	}
	reduced := slices.DeleteFunc(slices.Clone(seq), func(i int32) bool { return out[i] })
	if len(reduced) < minPoints {
		return nil, r0
	}
	ef, ok := findEdge(pts, orient(pts, reduced), 0)
	if !ok {
		return nil, r0
	}
	// The end zone, where the end models judge: within edgeZone of the
	// chord of the aftmost point, and near the edge (a point beside it,
	// off a surface, is the generic test's).
	exempt := make([]bool, len(pts))
	te, r := ef.edge.Upper.Add(ef.edge.Lower).Scale(0.5), edgeSpare*edgeZone*ef.edge.Chord
	if ef.edge.Kind == EdgeRounded {
		te = pts[ef.seq[0]]
	}
	zone := edgeZone
	if extra > 0 && ef.edge.Chord > 0 {
		r += extra
		zone += extra / ef.edge.Chord
	}
	for _, i := range seq {
		x, _ := ef.frame.at(pts[i])
		exempt[i] = x >= 1-zone && pts[i].Dist(te) <= r
	}
	if extra > 0 {
		// and the points no loop took, which placeRest then puts back
		for i := range pts {
			x, _ := ef.frame.at(pts[i])
			exempt[i] = exempt[i] || x >= 1-zone && pts[i].Dist(te) <= r
		}
	}
	return exempt, r0
}

// edgeSpare is the radius, in end zones (edgeZone of the chord), about
// the trailing edge within which the generic outlier test spares points.
const edgeSpare = 1.5

// compareMax is the most distinct points a cloud may hold for the
// linked order to be tried beside a section order that passed (see
// arrange): probe files and drawings hold a few hundred to a few thousand
// points, and a scan's slice of tens of thousands, whose outlier tests
// dominate the cleaning's time, is left to the section order alone.
const compareMax = 5000

// minCoverage is the least share of the distinct points the section loop
// must keep (gate "coverage"): outliers are a few per cent of a scan, so a
// loop that leaves more out has missed part of the outline.
const minCoverage = 0.9

// attempt is one ordering strategy carried through picking and outliers.
type attempt struct {
	strategy string
	loops    []LoopInfo
	seq      []int32 // the picked loop, outliers taken out (kept with KeepOutliers)
	hits     []hit   // outliers and strays
	scale    float64 // robust scale of the residuals (floored, see robustScale)
	raw      float64 // the same, not floored: the scatter of the points about local fits
	// feet, by point index, are the points' feet on local curves, where
	// hasFeet says so (a band in a section order; nil otherwise).
	feet    []geometry.Point
	hasFeet []bool
	fail    string // why a gate refused the loop, "" if none did
	err     error  // a failure that no other strategy can mend
}

// arrange orders the distinct points into loops, picks the section loop
// and drops its outliers, by the first strategy whose loop passes the
// gates: the file's own order when it is valid; linking when it finds
// several walls (or a loop other than the first is asked for); the
// section order; linking and band projection for one loop. It records the
// strategies refused, and why, in the report.
func (cl *cleaning) arrange(opts Options, sigma float64) (*attempt, error) {
	var refused []string
	pass := func(a *attempt) bool {
		if a == nil {
			return false
		}
		if a.fail == "" && a.err == nil {
			return true
		}
		why := a.fail
		if a.err != nil {
			why = a.err.Error()
		}
		refused = append(refused, fmt.Sprintf("%s order: %s", a.strategy, why))
		return false
	}
	finish := func(a *attempt) (*attempt, error) {
		cl.rep.Strategy = a.strategy
		cl.rep.Refused = refused
		return a, nil
	}
	cl.nb = neighbours(cl.pts, cl.lo, cl.hi)
	if opts.MergeTol == 0 && cl.mergeNear() {
		cl.nb = neighbours(cl.pts, cl.lo, cl.hi)
	}
	if len(cl.pts) < minPoints {
		return nil, fmt.Errorf("geometry: clean: %w: %d distinct point(s) after merging within %.3g, need at least %d", geometry.ErrTooFewPoints, len(cl.pts), cl.rep.MergeTol, minPoints)
	}
	if !opts.KeepOutliers {
		cl.dropRows()
	}
	if opts.Order != "" {
		return cl.only(opts, sigma)
	}
	if cl.c.Ordered {
		if a := cl.fromFile(opts, sigma); pass(a) {
			return finish(a)
		}
	}
	// Linking (with its loops' evaluation when it finds several walls or
	// is asked for a loop) and the section order read the points and
	// their neighbours only, and neither needs the other: they run at
	// once on two cores, and their attempts are judged below in the order
	// they always were (the section order's unused when linking passes).
	var loops, rest [][]int32
	var walls int
	var linked, sect *attempt
	link := func() {
		loops, rest = cl.linkLoops()
		walls = substantial(cl.pts, loops, cl.diag)
		if walls > 1 || opts.Loop > 0 {
			linked = cl.evaluate(OrderLinked, loops, rest, opts, sigma, localFits{}, true)
		}
	}
	if opts.Loop == 0 {
		par.For(2, 2, func(_, k int) {
			if k == 0 {
				sect = cl.bySection(opts, sigma)
			} else {
				link()
			}
		})
	} else {
		link()
	}
	if a := linked; a != nil {
		if pass(a) || a.err != nil {
			if a.err != nil {
				return nil, a.err
			}
			return finish(a)
		}
	}
	if opts.Loop == 0 {
		if pass(sect) {
			// The section order's sides and windows, and so which points
			// its outlier test keeps, can turn on a few points (a burst
			// at a sparse nose taken for the surface, the good points
			// beside it dropped). Where linking also closes one loop
			// whose outliers leave more of the points in it, that loop
			// is the one more of the points support, and it is taken.
			if walls == 1 && len(cl.pts) < compareMax && !opts.KeepOutliers {
				if a := cl.evaluate(OrderLinked, loops, rest, opts, sigma, localFits{}, true); a.fail == "" && a.err == nil && len(a.seq) > len(sect.seq) && a.raw <= sect.raw {
					refused = append(refused, fmt.Sprintf("%s order: its loop keeps %d of the %d points, the %s order's %d", OrderSection, len(sect.seq), len(cl.pts), OrderLinked, len(a.seq)))
					return finish(a)
				}
			}
			return finish(sect)
		}
		if walls == 1 {
			if a := cl.evaluate(OrderLinked, loops, rest, opts, sigma, localFits{}, true); pass(a) {
				return finish(a)
			}
		}
	}
	if a := cl.byBandLoops(opts, sigma); pass(a) {
		return finish(a)
	}
	if cl.fileOrder && !cl.c.Ordered {
		// Last, the order of a file that declares none but walks the
		// outline (looksOrdered): a sparse exact polyline whose stations
		// crowd at a thin trailing edge can defeat every reconstruction.
		a := cl.fromFile(opts, sigma)
		cl.rep.Reordered = "" // not the user's order to keep
		if pass(a) {
			return finish(a)
		}
	}
	cl.rep.Refused = refused
	if len(loops) == 0 {
		return nil, fmt.Errorf("geometry: clean: %w: %d points form no closed loop (%s)", geometry.ErrNoLoop, len(cl.pts), strings.Join(refused, "; "))
	}
	return nil, fmt.Errorf("geometry: clean: %w: no ordering of the %d points passes the checks (%s)", geometry.ErrNoLoop, len(cl.pts), strings.Join(refused, "; "))
}

// only orders by the one strategy opts.Order names, gates and all.
func (cl *cleaning) only(opts Options, sigma float64) (*attempt, error) {
	var a *attempt
	switch opts.Order {
	case OrderFile:
		if !cl.fileOrder {
			return nil, fmt.Errorf("geometry: clean: %w: the file's own order was asked for, but the points come in no order", geometry.ErrNoLoop)
		}
		a = cl.fromFile(opts, sigma)
	case OrderSection:
		a = cl.bySection(opts, sigma)
	case OrderLinked:
		loops, rest := cl.linkLoops()
		a = cl.evaluate(OrderLinked, loops, rest, opts, sigma, localFits{}, true)
	case OrderBand:
		a = cl.byBandLoops(opts, sigma)
	}
	if a.err != nil {
		return nil, a.err
	}
	if a.fail != "" {
		return nil, fmt.Errorf("geometry: clean: %w: %s order: %s", geometry.ErrNoLoop, a.strategy, a.fail)
	}
	cl.rep.Strategy = a.strategy
	return a, nil
}

// mergeSpacing is the share of the local point spacing within which a
// point is a duplicate of its nearest neighbour when the caller set no
// merge tolerance: a point written twice a hair apart (a re-probed point,
// a copy rounded differently) is a duplicate at any scale of the part, and
// kept apart it makes cross-validation take the pair for noise-free data
// and interpolate.
const mergeSpacing = 0.003

// mergeNear merges each point whose nearest neighbour lies within
// mergeSpacing of the distance to its next nearest (the local spacing,
// however uneven: cosine-spaced stations crowd at the ends, duplicates
// stand out everywhere) into that neighbour, the lower input index kept,
// and reports whether it merged any. The largest distance merged is
// recorded as the merge tolerance when it exceeds the one applied.
func (cl *cleaning) mergeNear() bool {
	pts, src, nb := cl.pts, cl.src, cl.nb
	n := len(pts)
	byInput := make([]int32, n)
	for i := range byInput {
		byInput[i] = int32(i)
	}
	sortByInput(byInput, src)
	gone := make([]bool, n)
	any := false
	for _, i := range byInput {
		if gone[i] {
			continue
		}
		row := nb.of(i)
		if len(row) < 2 {
			continue
		}
		q, r := row[0], row[1]
		if gone[q] || src[q] < src[i] {
			continue
		}
		d := fastDist(pts[i], pts[q])
		if d <= mergeSpacing*fastDist(pts[i], pts[r]) {
			gone[q] = true
			any = true
			cl.rep.Merged = append(cl.rep.Merged, Merged{Kept: cl.c.Origins[src[i]], Dropped: cl.c.Origins[src[q]], Distance: d})
			cl.rep.MergeTol = max(cl.rep.MergeTol, d)
		}
	}
	if !any {
		return false
	}
	k := 0
	for i := range n {
		if !gone[i] {
			pts[k], src[k] = pts[i], src[i]
			k++
		}
	}
	cl.pts, cl.src = pts[:k], src[:k]
	return true
}

// substantial counts the loops that enclose an area and hold at least
// loopShare of the points of the most populous loop.
func substantial(pts []geometry.Point, loops [][]int32, diag float64) int {
	most := 0
	for _, l := range loops {
		most = max(most, len(l))
	}
	k := 0
	for _, l := range loops {
		if math.Abs(area(pts, l)) > 1e-9*diag*diag && float64(len(l)) >= loopShare*float64(most) {
			k++
		}
	}
	return k
}

// fromFile tries the file's own runs as the loops.
func (cl *cleaning) fromFile(opts Options, sigma float64) *attempt {
	c, pts, src := cl.c, cl.pts, cl.src
	var runs [][]int32
	if c.Ordered {
		runs = runsOf(c, src)
		if a, b, ok := runsValid(pts, runs, cl.nb); !ok {
			cl.rep.Reordered = fmt.Sprintf("the step from %s to %s jumps %.3g, beyond the points' neighbourhoods", c.Origins[src[a]], c.Origins[src[b]], pts[a].Dist(pts[b]))
			return &attempt{strategy: OrderFile, fail: cl.rep.Reordered}
		}
	} else {
		// A file that declares no order but walks the outline: the points
		// were put along a Morton curve (localise), so their file order is
		// rebuilt, then cut into runs wherever a step jumps beyond the
		// points' neighbourhoods (two probe passes, a stretch measured
		// again), which are joined end to end as an ordered file's runs.
		order := make([]int32, len(src))
		for i := range order {
			order[i] = int32(i)
		}
		sortByInput(order, src)
		start := 0
		for k := 1; k <= len(order); k++ {
			if k < len(order) {
				if _, _, ok := runsValid(pts, [][]int32{order[k-1 : k+1]}, cl.nb); ok {
					continue
				}
			}
			if k-start >= 2 {
				runs = append(runs, order[start:k])
			}
			start = k
		}
	}
	g := newGraph(len(pts))
	for _, r := range runs {
		for k := 1; k < len(r); k++ {
			g.addEdge(r[k-1], r[k])
		}
	}
	join(pts, cl.nb, g)
	loops, rest := g.components(minPoints)
	a := cl.evaluate(OrderFile, loops, rest, opts, sigma, localFits{}, true)
	if a.fail == "" && a.err == nil {
		cl.rep.OrderKept = true
	}
	return a
}

// linkLoops links the points into chains and joins them into loops.
func (cl *cleaning) linkLoops() (loops, rest [][]int32) {
	g := cl.linked
	cl.linked = nil
	if g == nil {
		g = newGraph(len(cl.pts))
		link(cl.pts, cl.nb, g)
	}
	join(cl.pts, cl.nb, g)
	return g.components(minPoints)
}

// byBandLoops tries band projection.
func (cl *cleaning) byBandLoops(opts Options, sigma float64) *attempt {
	loops, rest, per := byBand(cl.pts, cl.nb, cl.lo, cl.hi)
	band := min(max(fitK, 2*per), maxBandFit)
	a := cl.evaluate(OrderBand, loops, rest, opts, sigma, localFits{band: band}, true)
	if a.fail == "" && a.err == nil {
		cl.rep.Band = true
	}
	return a
}

// bySection tries the section order: the chord frame of the points that
// are not isolated, the order, its outliers; then, with the outliers set
// aside, the frame and the order once more.
func (cl *cleaning) bySection(opts Options, sigma float64) *attempt {
	pts := cl.pts
	sel := dense(pts, cl.nb)
	ws := spacingWeights(pts, cl.nb)
	// Isolated points wait outside the loop, to be put back, dropped as
	// outliers or as strays by where they lie from it.
	rest := outside(len(pts), sel)
	// Twice: the first frame, drawn from the dense points, may still end
	// at a gross outlier off the trailing edge, which also pulls the fits
	// that tell the surfaces apart near it; the second pass orders only the
	// points the first kept, in a frame drawn from them, and spares the
	// points near the edge for the edge's models.
	var a *attempt
	for pass := range 2 {
		f, ok := sectionFrame(pts, sel, ws)
		if !ok {
			return &attempt{strategy: OrderSection, fail: "no thin end: the points do not look like a section"}
		}
		if pass == 0 && rest != nil && len(pts) < sparseRunsMax {
			// The isolated points within the chord's extent join the
			// order, to be judged by the fits along their surface: a
			// surface probed far more coarsely than the other across a
			// section thinner than its step has every point isolated
			// (its nearest neighbours lie on the other surface), and
			// put back by the loop's polygon they would meet the other
			// surface. Only the frame is drawn without them. As for
			// sparse runs (see dense), not in a scan's cloud of tens of
			// thousands, where isolated points are stray returns.
			in := withinChord(pts, rest[0], f)
			in = append(in, pastTail(pts, rest[0], sel, in, f, ws)...)
			if len(in) > 0 {
				sel = slices.Concat(sel, in)
				slices.Sort(sel)
				rest = outside(len(pts), sel)
			}
		}
		seq, sc := sectionOrder(pts, sel, f, ws)
		// Which end is the nose, judged again with each point standing
		// for the stretch of the loop it covers: spacingWeights mix the
		// surfaces where the section is thinner than a coarsely probed
		// surface's step, and both ends then measure the dense surface.
		if g, ok := sectionFrame(pts, seq, loopWeights(pts, seq)); ok && g.le != f.le {
			f = g
			seq, sc = sectionOrder(pts, sel, f, ws)
		}
		a = cl.evaluate(OrderSection, [][]int32{seq}, rest, opts, sigma, localFits{sc: sc, chord: f.chord}, true)
		if a.err != nil {
			break
		}
		if pass == 0 {
			// The second pass orders the points the first kept; the
			// others wait outside the loop.
			out := make(map[int32]bool, len(a.hits))
			for _, h := range a.hits {
				out[h.idx] = true
			}
			next := slices.DeleteFunc(slices.Clone(a.seq), func(i int32) bool { return out[i] })
			if len(next) < minPoints {
				break
			}
			slices.Sort(next)
			if !slices.Equal(next, sel) {
				sel = next
				rest = outside(len(pts), sel)
				continue
			}
			// The first pass kept exactly the points it ordered (none
			// dropped, none put back): the second would order them in the
			// same frame with the same points waiting outside, and find
			// what the first found.
		}
		{
			if len(a.seq) > len(seq) {
				// Points put back went in where they project onto the
				// loop's polygon, which near a thin edge may be the other
				// surface: their place is the section order's.
				kept := slices.Clone(a.seq)
				slices.Sort(kept)
				a.seq, sc = sectionOrder(pts, kept, f, ws)
			}
			if bandLike(pts, a.seq, a.scale) {
				// A band: the points are ordered by their feet on the
				// local curves, whose polygon gives the fit its parameter.
				a.feet, a.hasFeet = sc.feet(pts, a.seq)
				a.seq, _ = sc.byFeet(pts, a.seq, a.feet, a.hasFeet)
			}
			break
		}
	}
	return a
}

// withinChord returns the points of idx whose place in the chord frame f
// lies between the nose and the tail and less than maxHalfWidth of the
// chord from the chord line: where a section's surfaces may run.
func withinChord(pts []geometry.Point, idx []int32, f chordFrame) []int32 {
	var out []int32
	for _, i := range idx {
		if x, y := f.at(pts[i]); x >= 0 && x <= 1 && math.Abs(y) <= maxHalfWidth {
			out = append(out, i)
		}
	}
	return out
}

// maxHalfWidth bounds, in chords, how far from the chord line a point
// may lie to join a section order from outside the dense points: the
// thickest sections are 40 % thick, with camber a few per cent more.
const maxHalfWidth = 0.3

// dense returns the points whose fourth nearest neighbour is no farther
// than six times the median such distance, and the points of sparse runs:
// isolated points (gross outliers) are left out of the chord frame.
//
// A surface probed with a step 5–20 times coarser than the other's (a CMM
// program in two passes) has every point that far from its fourth
// neighbour, and it is no outlier: such points that are each other's near
// neighbours form a run along the outline (sparseRuns), whereas a gross
// outlier, or a burst of a few, stays within a few spacings of itself.
func dense(pts []geometry.Point, nb *nbrs) []int32 {
	d := fourthNeighbour(pts, nb)
	med := median(slices.Clone(d))
	lim := 6 * med
	far := make([]bool, len(pts))
	for i, v := range d {
		far[i] = !(v <= lim)
	}
	// Probe files (a CMM program's passes) hold at most a few thousand
	// points; in a scan's cloud of tens of thousands, far points that
	// follow one another are a streak of stray returns, not a surface.
	var keep []bool
	if len(pts) < sparseRunsMax {
		keep = sparseRuns(pts, nb, far, sparseReach*med)
	} else {
		keep = make([]bool, len(pts))
	}
	var sel []int32
	for i, v := range d {
		if v <= lim || keep[i] {
			sel = append(sel, int32(i))
		}
	}
	if len(sel) < minPoints {
		return allNeighbours(len(pts))
	}
	return sel
}

// fourthNeighbour returns, by point index, the distance of each point to
// its fourth nearest neighbour (+Inf when it has fewer).
func fourthNeighbour(pts []geometry.Point, nb *nbrs) []float64 {
	d := make([]float64, len(pts))
	for i := range pts {
		row := nb.of(int32(i))
		if len(row) < 4 {
			d[i] = math.Inf(1)
			continue
		}
		d[i] = fastDist(pts[i], pts[row[3]])
	}
	return d
}

// spacingWeights returns, by point index, the length of outline each point
// stands for: its fourth-neighbour distance, or a smaller one of its four
// nearest neighbours' (an outlier or a burst of a few, off a finely probed
// surface, stands for no more than the surface's points beside it). Counts
// of points weighted so measure length along the outline, whatever the
// step: a surface probed ten times more coarsely than the other weighs as
// much as it.
func spacingWeights(pts []geometry.Point, nb *nbrs) []float64 {
	d := fourthNeighbour(pts, nb)
	w := make([]float64, len(pts))
	for i := range pts {
		v := d[i]
		row := nb.of(int32(i))
		for _, q := range row[:min(4, len(row))] {
			v = min(v, d[q])
		}
		if math.IsInf(v, 1) {
			v = 0
		}
		w[i] = v
	}
	return w
}

// sparseReach is the least extent, in median fourth-neighbour distances,
// of a run of far-spaced points that counts as a stretch of outline: a
// burst of outliers is a few points at the local spacing (a run of more
// than four is no longer far-spaced: its own points are its neighbours),
// a coarsely probed surface spans a good part of the chord.
const sparseReach = 8

// sparseRunsMax is the most points a cloud may hold for its far-spaced
// runs to be kept as a coarsely probed surface (see dense).
const sparseRunsMax = 10000

// sparseRuns marks the points of far (by point index) that belong to a
// run of far points linked through their four nearest neighbours whose
// extent (the diagonal of its bounding box) is at least reach and which
// joins the dense points at two places or more.
func sparseRuns(pts []geometry.Point, nb *nbrs, far []bool, reach float64) []bool {
	n := len(pts)
	parent := make([]int32, n)
	for i := range parent {
		parent[i] = int32(i)
	}
	var find func(i int32) int32
	find = func(i int32) int32 {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	any := false
	for i := range n {
		if !far[i] {
			continue
		}
		any = true
		row := nb.of(int32(i))
		for _, q := range row[:min(4, len(row))] {
			if far[q] {
				if a, b := find(int32(i)), find(q); a != b {
					parent[a] = b
				}
			}
		}
	}
	keep := make([]bool, n)
	if !any {
		return keep
	}
	type box struct{ lo, hi geometry.Point }
	boxes := make(map[int32]*box)
	for i := range n {
		if !far[i] {
			continue
		}
		r := find(int32(i))
		b := boxes[r]
		if b == nil {
			boxes[r] = &box{pts[i], pts[i]}
			continue
		}
		b.lo = geometry.Point{X: min(b.lo.X, pts[i].X), Y: min(b.lo.Y, pts[i].Y)}
		b.hi = geometry.Point{X: max(b.hi.X, pts[i].X), Y: max(b.hi.Y, pts[i].Y)}
	}
	// A coarse surface joins the rest of the outline at both its ends
	// (the nose and the tail): points of the run with a point of the
	// dense part among their four nearest neighbours. A fixture's points,
	// or a streak of stray returns, stand apart from the part.
	joins := make(map[int32]int)
	for i := range n {
		if !far[i] {
			continue
		}
		row := nb.of(int32(i))
		for _, q := range row[:min(4, len(row))] {
			if !far[q] {
				joins[find(int32(i))]++
				break
			}
		}
	}
	for i := range n {
		if far[i] {
			r := find(int32(i))
			b := boxes[r]
			keep[i] = b.hi.Dist(b.lo) >= reach && joins[r] >= 2
		}
	}
	return keep
}

// insideShare returns the share of up to eight points of loop l, evenly
// spaced along it, that lie inside the polygon poly.
func insideShare(pts []geometry.Point, l []int32, poly []geometry.Point) float64 {
	m := min(8, len(l))
	if m == 0 {
		return 0
	}
	in := 0
	for k := range m {
		if geometry.InsideLoop(poly, pts[l[k*len(l)/m]]) {
			in++
		}
	}
	return float64(in) / float64(m)
}

// evaluate picks loop opts.Loop of loops (the rest are left over), drops
// its outliers and places the points left over, and applies the gates:
// the loop must keep at least minCoverage of the points.
func (cl *cleaning) evaluate(strategy string, loops, rest [][]int32, opts Options, sigma float64, lf localFits, spare bool) *attempt {
	a := &attempt{strategy: strategy}
	pts := cl.pts
	most := 0
	for _, l := range loops {
		most = max(most, len(l))
	}
	diag := cl.diag
	loops = slices.DeleteFunc(slices.Clone(loops), func(l []int32) bool {
		if math.Abs(area(pts, l)) <= 1e-9*diag*diag || float64(len(l)) < loopShare*float64(most) {
			rest = append(rest, l)
			return true
		}
		return false
	})
	if len(loops) == 0 {
		a.fail = fmt.Sprintf("%d points form %d open chain(s) and no closed loop", len(pts), len(rest))
		return a
	}
	seq, infos, err := cl.pick(loops, opts.Loop)
	a.loops = infos
	if err != nil {
		a.err = err
		return a
	}
	// The other loops nested with this one are walls of the part (a hollow
	// blade's inner wall), not points of this one; a loop beside it is a
	// piece of the same outline that the ordering broke off, whose points
	// the section must keep.
	walls := 0
	if len(loops) > 1 {
		poly := make([]geometry.Point, len(seq))
		for k, i := range seq {
			poly[k] = pts[i]
		}
		for _, l := range loops {
			if len(l) == len(seq) && l[0] == seq[0] {
				continue
			}
			// Nested either way: the inner wall of the outer one picked,
			// or the outer wall of the inner one the user asked for.
			wall := insideShare(pts, l, poly) >= 0.5
			if !wall {
				lp := make([]geometry.Point, len(l))
				for k, i := range l {
					lp[k] = pts[i]
				}
				wall = insideShare(pts, seq, lp) >= 0.5
			}
			if wall {
				walls += len(l)
			}
		}
	}
	// The trailing edge's end zone is left to the edge's model: found on
	// the loop without the points a first pass calls outliers (one near the
	// edge could pass for its end), it spares every point near the edge.
	var exempt []bool
	var r0 []float64
	if spare {
		var prior []float64
		exempt, prior = cl.spared(seq, sigma, lf, opts.EndSpare)
		if lf.sc != nil && exempt != nil {
			lf.sc.spared = exempt
			// A section order's fits leave the spared points out: only
			// the residuals with one in their window change.
			prior = respared(pts, seq, exempt, prior, lf)
		}
		r0 = prior
	}
	if r0 == nil {
		r0 = make([]float64, len(seq))
		lf.residualsAt(pts, seq, nil, r0)
	}
	seq, scale, raw, outs := dropOutliersFrom(pts, seq, sigma, opts.KeepOutliers, lf, exempt, r0)
	var restSpared []bool
	if opts.EndSpare > 0 {
		restSpared = exempt
	}
	seq, extra := placeRest(pts, seq, rest, cl.nb, sigma*scale, scale, opts.KeepOutliers, restSpared)
	a.seq, a.scale, a.raw, a.hits = seq, scale, raw, append(outs, extra...)
	kept := len(a.seq)
	if opts.KeepOutliers {
		for _, h := range a.hits {
			if h.kept {
				kept--
			}
		}
	}
	need := len(pts) - walls
	if float64(kept) < minCoverage*float64(need) {
		a.fail = fmt.Sprintf("the loop keeps %d of %d points (coverage %.0f %%, want at least %.0f %%)", kept, need, 100*float64(kept)/float64(need), 100*minCoverage)
	}
	if len(a.seq) < minPoints {
		a.fail = fmt.Sprintf("%d point(s) left in the loop, need at least %d", len(a.seq), minPoints)
	}
	return a
}

// outside returns the points of 0..n−1 not in sel as one group, or nil
// when sel holds them all.
func outside(n int, sel []int32) [][]int32 {
	if len(sel) >= n {
		return nil
	}
	in := make([]bool, n)
	for _, i := range sel {
		in[i] = true
	}
	var left []int32
	for i := range int32(n) {
		if !in[i] {
			left = append(left, i)
		}
	}
	if len(left) == 0 {
		return nil
	}
	return [][]int32{left}
}
