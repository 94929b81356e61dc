package clean

import (
	"cmp"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
)

// Options control Clean. The zero value gives the documented defaults.
type Options struct {
	// MergeTol merges points closer than this to an earlier kept point, in
	// input units. 0 means DefaultMergeRel times the diagonal of the
	// bounding box (1e-6: far below any measurement noise, far above
	// rounding in a written file).
	MergeTol float64
	// OutlierSigma is the threshold, in robust sigmas, beyond which a point
	// is a gross outlier. 0 means DefaultOutlierSigma.
	OutlierSigma float64
	// KeepOutliers reports outliers in Report.Dropped but keeps them in
	// the contour.
	KeepOutliers bool
	// Loop picks the section loop: 0 is the loop of largest enclosed area,
	// k the k-th largest after it (1 = second largest).
	Loop int
	// EndSpare widens the zone about the trailing edge whose points the
	// generic outlier test leaves to the end's models, by this much
	// (input units) round the edge and along the chord, and puts back
	// the points no loop took that lie in it: the path of a probe ball's
	// centre rounds the end, and each corner of a base, on arcs of the
	// ball's radius or more, whose few points a local fit that cannot
	// follow so tight a turn would call outliers. 0 leaves the zone as
	// it is.
	EndSpare float64
	// Order, when set (OrderFile, OrderSection, OrderLinked or
	// OrderBand), is the only ordering tried; "" tries them in turn (see
	// Clean). A caller whose later checks refuse the loop tries another.
	Order string
}

// Defaults of Options.
const (
	// DefaultMergeRel is the default merge tolerance as a fraction of the
	// bounding-box diagonal.
	DefaultMergeRel = 1e-6
	// DefaultOutlierSigma is the default outlier threshold in robust sigmas.
	// For Gaussian noise a good point lies beyond 6σ with probability 2e-9,
	// so clean scans of a million points lose none, while a probe that
	// slipped by a few tenths of a millimetre on a 0.02 mm CMM is still
	// caught (common practice: 3σ rules drop too many good points on large
	// scans).
	DefaultOutlierSigma = 6
)

// minPoints is the fewest usable points Clean accepts.
const minPoints = 8

// loopShare is the least share of the points of the most populous
// loop that another loop needs to count as a wall of the part.
const loopShare = 0.1

// maxBandFit bounds the half-width, in points, of the local fits that
// test a band of points for outliers.
const maxBandFit = 30

// Merged records one input point merged into an earlier one.
type Merged struct {
	Kept, Dropped geometry.Origin
	Distance      float64 // input units
}

// Drop records one input point that is not in the contour.
type Drop struct {
	Origin geometry.Origin
	Point  geometry.Point
	Reason string // "outlier" or "stray"
	// Distance is the residual against the local fit along the curve, input
	// units; 0 for a stray point.
	Distance float64
	// Sigmas is Distance in robust sigmas of the loop's residuals.
	Sigmas float64
	// Kept reports that the point was an outlier kept at the user's request
	// (Options.KeepOutliers).
	Kept bool
}

// LoopInfo describes one closed loop found in the cloud.
type LoopInfo struct {
	Points int             // number of points in the loop as found, before outliers are tested
	Area   float64         // enclosed area, input units squared, positive
	Picked bool            // this loop is the contour returned
	First  geometry.Origin // origin of the loop's point that comes first in the input
}

// Report is the record of what Clean did.
type Report struct {
	Read    int      // points in the cloud
	Merged  []Merged // duplicates and near-duplicates merged
	Dropped []Drop   // outliers and stray points, with reasons
	Loops   []LoopInfo
	// OrderKept reports that the input's own order was valid and kept.
	OrderKept bool
	// Strategy names the ordering that made the loop: OrderFile,
	// OrderSection, OrderLinked or OrderBand.
	Strategy string
	// Refused lists the orderings tried before it and why a gate refused
	// each ("section order: the loop keeps 812 of 3000 points ...").
	Refused []string
	// Edge is the trailing edge found on the points (see findEdge), nil
	// when the loop shows no thin end to analyse; the contour then starts
	// at the provisional trailing edge of step 5.
	Edge *Edge
	// Reordered holds why an ordered input was reordered, "" otherwise.
	Reordered string
	// Band reports that the points form a band (their scatter is at least
	// bandScatter of their spacing, as in a dense scan), so that only their
	// order along the curve, not their order across the band, is
	// meaningful.
	Band     bool
	MergeTol float64 // merge tolerance used, input units
	// Subset, when positive, is the number of points of a dense cloud the
	// ordering, the loops and the trailing edge were found on; every point
	// of the cloud was then placed by where it projects onto the outline
	// they gave (see cleanDense), and Loops count the subset's points.
	Subset int
	// Sigma is the robust scale of the residuals of the picked loop against
	// the local fit (1.4826 × median absolute residual, at least 0.02 × the
	// median point spacing so that exact coordinates lose nothing), input
	// units.
	Sigma float64
	// Passes lists the passes of a probe program that measured a stretch
	// twice and disagree there by more than the noise (see PassOffset).
	Passes []PassOffset
	// Reseat, when not nil, is a file of two whole passes whose second
	// lies moved from the first (see Reseat); the points Clean ordered,
	// and the contour's, are each pass moved half the way to the other.
	Reseat *Reseat
}

// Clean merges duplicates, orders the cloud into loops, picks the section
// loop, drops gross outliers and orients it. c must be planar (Dim 2, Z
// ignored); Clean does not modify c.
//
// The steps are:
//
//  1. Merge: points within MergeTol of an earlier point are merged into it
//     (the lowest input index is kept), found by a spatial hash with cells of
//     size 2·MergeTol, checking the 2×2 cells a point's tolerance disk reaches.
//  2. Order: an ordered cloud (c.Ordered) keeps its runs when every step of
//     every run is a local one; otherwise, and for unordered clouds, the
//     points are linked by tangent-guided mutual neighbours (see link)
//     into chains, and chain ends are joined into loops (see join).
//     A dense scan whose noise is comparable to its spacing is a band, not
//     a line (see isBand); it is thinned to centroids that link as a
//     line, and every point is ordered by where it projects onto them (see
//     byBand; Report.Band is set).
//  3. Pick: the loops are ranked by enclosed area and opts.Loop picks one.
//     Loops with less than a tenth of the points of the most populous loop
//     are not walls but chance chains of stray points, and are not ranked.
//  4. Outliers: each point of the loop is tested against a local fit of its
//     neighbours along the loop (see residuals); points beyond
//     OutlierSigma robust sigmas are dropped, and their neighbours close up.
//     Points that joined no loop are tested against the picked loop and put
//     back, dropped as outliers, or dropped as "stray" when no loop point is
//     near.
//  5. Orient (provisional; a later step refines the edges): the two points
//     of the loop farthest apart are the edge candidates; the trailing edge
//     is the one where the loop is thinner 5% of that distance inwards. The
//     loop is rotated to start at the trailing-edge point (for a blunt edge,
//     its upper corner) and run counter-clockwise (positive signed area) in
//     the input frame.
//
// Clean returns an error wrapping ErrNonFinite for a NaN or infinite
// coordinate, ErrTooFewPoints when fewer than 8 points remain, ErrCollinear
// when all points lie on one line, and ErrNoLoop when no closed loop forms or
// opts.Loop asks for a loop that does not exist. It panics if
// len(c.Origins) != len(c.Points).
//
// The cost is O(n log n) in time (sorts for the spatial hashes; every
// neighbour search and fit is local) and O(n) in memory; the neighbour
// searches and fits run on every CPU.
func Clean(c *geometry.Cloud, opts Options) (*geometry.Contour, *Report, error) {
	if len(c.Origins) != len(c.Points) {
		panic("geometry: Clean: len(Origins) != len(Points)")
	}
	n := len(c.Points)
	rep := &Report{Read: n}
	if opts.MergeTol < 0 || math.IsNaN(opts.MergeTol) || math.IsInf(opts.MergeTol, 0) {
		return nil, rep, fmt.Errorf("geometry: clean: merge tolerance %g: must be a finite value ≥ 0", opts.MergeTol)
	}
	if opts.OutlierSigma < 0 || math.IsNaN(opts.OutlierSigma) {
		return nil, rep, fmt.Errorf("geometry: clean: outlier threshold %g: must be ≥ 0", opts.OutlierSigma)
	}
	if opts.Loop < 0 {
		return nil, rep, fmt.Errorf("geometry: clean: loop %d: must be ≥ 0", opts.Loop)
	}
	switch opts.Order {
	case "", OrderFile, OrderSection, OrderLinked, OrderBand:
	default:
		return nil, rep, fmt.Errorf("geometry: clean: order %q: want %s, %s, %s or %s", opts.Order, OrderFile, OrderSection, OrderLinked, OrderBand)
	}
	all := make([]geometry.Point, n)
	for i, p := range c.Points {
		all[i] = geometry.Point{X: p.X, Y: p.Y}
		if !all[i].IsFinite() {
			return nil, rep, fmt.Errorf("geometry: clean: point at %s: %w", c.Origins[i], geometry.ErrNonFinite)
		}
	}
	if n < minPoints {
		return nil, rep, fmt.Errorf("geometry: clean: %w: %d point(s), need at least %d", geometry.ErrTooFewPoints, n, minPoints)
	}
	lo, hi := bounds(all)
	diag := hi.Dist(lo)
	tol := opts.MergeTol
	if tol == 0 {
		tol = DefaultMergeRel * diag
	}
	rep.MergeTol = tol
	sigma := opts.OutlierSigma
	if sigma == 0 {
		sigma = DefaultOutlierSigma
	}

	if n >= denseFrom && !opts.KeepOutliers && opts.Order != OrderFile {
		return cleanDense(c, opts, sigma)
	}
	// 0. Two whole passes of a part re-clamped between them: each moved
	// half the way towards the other.
	rep.Reseat = reseat(all, c.Origins, diag)
	// 1. Merge.
	cl := &cleaning{c: c, rep: rep, lo: lo, hi: hi, diag: diag}
	if err := cl.merge(all, tol); err != nil {
		return nil, rep, err
	}
	// 2–4. Order, pick, outliers: the first strategy whose loop passes the
	// gates.
	a, err := cl.arrange(opts, sigma)
	if err != nil {
		return nil, rep, err
	}
	if !opts.KeepOutliers {
		// 4b. A point or two of a fixture's run that stayed in the loop
		// among the run's dropped points (see apexes).
		if seq, more := apexes(cl.pts, a.seq, a.hits, a.scale, false); len(more) > 0 {
			a.seq, a.hits = seq, append(a.hits, more...)
		}
	}
	cl.commit(a)
	// 5. Orient: start at the trailing edge found on the points; failing
	// that, at the provisional one.
	seq := orient(cl.pts, a.seq)
	// With KeepOutliers the edge is analysed without the outliers kept,
	// which go back in beside their neighbours afterwards.
	kept := make(map[int32]bool)
	for _, h := range a.hits {
		if h.kept {
			kept[h.idx] = true
		}
	}
	work := slices.DeleteFunc(slices.Clone(seq), func(i int32) bool { return kept[i] })
	if len(work) >= minPoints {
		if ef, ok := findEdge(cl.pts, work, a.raw); ok {
			if len(ef.outliers) > 0 {
				// Outliers of the end model: drop them and look again.
				cl.record(ef.outliers, opts.KeepOutliers)
				out := make(map[int32]bool, len(ef.outliers))
				for _, h := range ef.outliers {
					out[h.idx] = true
					if opts.KeepOutliers {
						kept[h.idx] = true
					}
				}
				work = slices.DeleteFunc(work, func(i int32) bool { return out[i] })
				if !opts.KeepOutliers {
					// The end model's outliers may leave a fixture's
					// point beyond the edge on the fixture's face (see
					// apexes).
					all := append(slices.Clone(a.hits), ef.outliers...)
					if w, more := apexes(cl.pts, work, all, a.scale, true); len(more) > 0 {
						cl.record(more, false)
						work = w
					}
				}
				if len(work) < minPoints {
					return nil, rep, fmt.Errorf("geometry: clean: %w: %d point(s) left in the loop, need at least %d", geometry.ErrTooFewPoints, len(work), minPoints)
				}
				ef, ok = findEdge(cl.pts, orient(cl.pts, work), a.raw)
			}
			if ok {
				e := ef.edge
				seq = reinsert(ef.seq, seq, kept, &e)
				rep.Edge = &e
			}
		}
	}
	rep.Passes = passOffsets(cl.pts, cl.src, seq, c.Origins, rep.Sigma)
	ct := cl.contour(seq)
	if a.feet != nil {
		ct.Along = alongFeet(cl.pts, seq, a.feet, a.hasFeet)
	}
	return ct, rep, nil
}

// cleaning is one Clean under way: the cloud, the distinct points left
// after merging (pts, compact) with the input index of each (src), their
// bounds and neighbours, and the report.
type cleaning struct {
	c      *geometry.Cloud
	rep    *Report
	lo, hi geometry.Point
	diag   float64
	pts    []geometry.Point
	src    []int32 // src[i] is the input index of pts[i]
	nb     *nbrs
	// fileOrder is set for a cloud that is ordered (c.Ordered) or whose
	// points, in the file's order, walk a path a few times the part's
	// size at most (looksOrdered): its own order is tried, first when the
	// format orders the points, last otherwise.
	fileOrder bool
	// linked, when not nil, is the graph of the distinct points linked
	// (see link) and not yet joined, which the search for stray rows drew
	// and linkLoops takes.
	linked *graph
}

// orderedWalk is the longest path, in diagonals of the points' bounding
// box, that the points of an unordered cloud may walk in the file's order
// for that order to be tried as a loop: a section's perimeter is about two
// diagonals, a probe program in two passes walks about three, noise as
// large as the spacing adds a third or so; a shuffled file of n points
// walks about n/3 diagonals.
const orderedWalk = 8

// looksOrdered reports whether the points pts[src[0]], pts[src[1]], ...
// walk a path no longer than orderedWalk diagonals of their bounding box:
// a coordinate file written along the outline (or in a few runs), whose
// order the file's own strategy then tries, gates and all, when the
// others cannot reconstruct one.
func looksOrdered(pts []geometry.Point, src []int32) bool {
	if len(src) < 2*minPoints {
		return false
	}
	lo, hi := geometry.Point{X: math.Inf(1), Y: math.Inf(1)}, geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for _, i := range src {
		p := pts[i]
		lo.X, lo.Y = math.Min(lo.X, p.X), math.Min(lo.Y, p.Y)
		hi.X, hi.Y = math.Max(hi.X, p.X), math.Max(hi.Y, p.Y)
	}
	limit := orderedWalk * hi.Dist(lo)
	var walk float64
	for k := 1; k < len(src); k++ {
		walk += pts[src[k]].Dist(pts[src[k-1]])
		if walk > limit {
			return false
		}
	}
	return limit > 0
}

// merge merges the points within tol of an earlier one (the lowest input
// index is kept) and keeps the distinct points, in the cloud's order or, for
// an unordered cloud, along a Morton curve. It refuses too few points and
// points on one line.
func (cl *cleaning) merge(all []geometry.Point, tol float64) error {
	c, rep := cl.c, cl.rep
	src, pairs := merge(all, tol)
	for _, m := range pairs {
		rep.Merged = append(rep.Merged, Merged{Kept: c.Origins[m.kept], Dropped: c.Origins[m.dropped], Distance: m.dist})
	}
	m := len(src)
	if m < minPoints {
		return fmt.Errorf("geometry: clean: %w: %d distinct point(s) after merging within %.3g, need at least %d", geometry.ErrTooFewPoints, m, tol, minPoints)
	}
	cl.fileOrder = c.Ordered || looksOrdered(all, src)
	if !c.Ordered {
		localise(all, src)
	}
	pts := make([]geometry.Point, m)
	for i, s := range src {
		pts[i] = all[s]
	}
	if dev, ok := collinear(pts, cl.diag); ok {
		return fmt.Errorf("geometry: clean: %w: %d points lie within %.3g of one line (extent %.3g)", geometry.ErrCollinear, m, dev, cl.diag)
	}
	cl.pts, cl.src = pts, src
	return nil
}

// pick ranks the loops by enclosed area (ties by the first input point)
// and returns loop k of the ranking, with a record of every loop.
func (cl *cleaning) pick(loops [][]int32, k int) ([]int32, []LoopInfo, error) {
	pts, src := cl.pts, cl.src
	type ranked struct {
		seq   []int32
		area  float64
		first int32
	}
	rs := make([]ranked, len(loops))
	for i, l := range loops {
		first := l[0]
		for _, j := range l {
			if src[j] < src[first] {
				first = j
			}
		}
		rs[i] = ranked{seq: l, area: math.Abs(area(pts, l)), first: first}
	}
	slices.SortStableFunc(rs, func(a, b ranked) int {
		switch {
		case a.area > b.area:
			return -1
		case a.area < b.area:
			return 1
		}
		return int(src[a.first] - src[b.first])
	})
	if k >= len(rs) {
		return nil, nil, fmt.Errorf("geometry: clean: %w: loop %d asked for, %d loop(s) found", geometry.ErrNoLoop, k, len(rs))
	}
	infos := make([]LoopInfo, len(rs))
	for i, r := range rs {
		infos[i] = LoopInfo{Points: len(r.seq), Area: r.area, Picked: i == k, First: cl.c.Origins[src[r.first]]}
	}
	return rs[k].seq, infos, nil
}

// commit records the accepted attempt in the report: its loops and the
// points it dropped, in file order.
func (cl *cleaning) commit(a *attempt) {
	pts, rep := cl.pts, cl.rep
	rep.Loops = a.loops
	rep.Sigma = a.scale
	rep.Band = rep.Band || bandLike(pts, a.seq, a.scale)
	cl.record(a.hits, false)
}

// record adds the points hits to the report's dropped points (kept, if
// keep), in file order.
func (cl *cleaning) record(hits []hit, keep bool) {
	pts, src, rep := cl.pts, cl.src, cl.rep
	for _, o := range hits {
		rep.Dropped = append(rep.Dropped, Drop{
			Origin: cl.c.Origins[src[o.idx]], Point: pts[o.idx], Reason: o.reason,
			Distance: o.dist, Sigmas: o.sigmas, Kept: o.kept || keep,
		})
	}
	slices.SortFunc(rep.Dropped, func(a, b Drop) int { return originCmp(a.Origin, b.Origin) })
}

// contour returns the contour of the loop seq, with each point's origin.
func (cl *cleaning) contour(seq []int32) *geometry.Contour {
	out := &geometry.Contour{Points: make([]geometry.Point, len(seq)), Origins: make([]geometry.Origin, len(seq)), Units: cl.c.Units}
	for k, i := range seq {
		out.Points[k] = cl.pts[i]
		out.Origins[k] = cl.c.Origins[cl.src[i]]
	}
	return out
}

// reinsert puts the points kept back into the loop work (which starts at
// the trailing edge), each right after the point that precedes it in the
// loop full; a kept point among the base points at the end of work counts
// as one of them.
func reinsert(work, full []int32, kept map[int32]bool, e *Edge) []int32 {
	if len(kept) == 0 {
		return work
	}
	after := make(map[int32][]int32) // a point of work → the kept points that follow it in full
	n := len(full)
	start := 0
	for start < n && kept[full[start]] {
		start++
	}
	if start == n {
		return work
	}
	prev := full[start]
	for k := 1; k <= n; k++ {
		i := full[(start+k)%n]
		if kept[i] {
			after[prev] = append(after[prev], i)
			continue
		}
		prev = i
	}
	out := make([]int32, 0, len(work)+len(kept))
	baseFrom := len(work) - e.Base
	for k, i := range work {
		out = append(out, i)
		if ins := after[i]; len(ins) > 0 {
			out = append(out, ins...)
			if k >= baseFrom-1 && k < len(work)-1 && e.Base > 0 {
				e.Base += len(ins)
			}
		}
	}
	return out
}

// bandLike reports whether the robust scale of the residuals of the loop
// seq is at least bandScatter of its point spacing along the curve (the
// length of the polygon through every tenth point, which noise hardly
// lengthens, shared among the points): then the points form a band.
func bandLike(pts []geometry.Point, seq []int32, scale float64) bool {
	n := len(seq)
	const step = 10
	if n < 4*step {
		return false
	}
	var length float64
	for k := 0; k < n; k += step {
		length += fastDist(pts[seq[k]], pts[seq[(k+step)%n]])
	}
	length *= float64(n) / float64(step*((n+step-1)/step))
	return scale >= bandScatter*length/float64(n)
}

// bandScatter is the scatter, in point spacings, from which points along
// a curve form a band (see Report.Band).
const bandScatter = 0.3

// originCmp orders origins by file, line and entity.
func originCmp(a, b geometry.Origin) int {
	switch {
	case a.File != b.File:
		if a.File < b.File {
			return -1
		}
		return 1
	case a.Line != b.Line:
		return a.Line - b.Line
	}
	return a.Entity - b.Entity
}

// bounds returns the corners of the bounding box of pts.
func bounds(pts []geometry.Point) (lo, hi geometry.Point) {
	lo = geometry.Point{X: math.Inf(1), Y: math.Inf(1)}
	hi = geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for _, p := range pts {
		lo.X, lo.Y = min(lo.X, p.X), min(lo.Y, p.Y)
		hi.X, hi.Y = max(hi.X, p.X), max(hi.Y, p.Y)
	}
	return lo, hi
}

// collinear reports whether all pts lie within 1e-9·diag of their
// principal line, and the largest distance from it.
func collinear(pts []geometry.Point, diag float64) (float64, bool) {
	var cx, cy float64
	for _, p := range pts {
		cx += p.X
		cy += p.Y
	}
	cx /= float64(len(pts))
	cy /= float64(len(pts))
	var sxx, sxy, syy float64
	for _, p := range pts {
		dx, dy := p.X-cx, p.Y-cy
		sxx += dx * dx
		sxy += dx * dy
		syy += dy * dy
	}
	t := principal(sxx, sxy, syy)
	var dev float64
	for _, p := range pts {
		dev = max(dev, math.Abs(geometry.Point{X: p.X - cx, Y: p.Y - cy}.Cross(t)))
	}
	return dev, dev <= 1e-9*diag
}

// principal returns the unit principal direction of the symmetric 2×2
// matrix [[sxx, sxy], [sxy, syy]].
func principal(sxx, sxy, syy float64) geometry.Point {
	th := 0.5 * math.Atan2(2*sxy, sxx-syy)
	s, c := math.Sincos(th)
	return geometry.Point{X: c, Y: s}
}

// orient rotates the loop seq to start at its trailing-edge point and
// run counter-clockwise. The edge candidates are the two points farthest
// apart (found by two farthest-point sweeps from the centroid); the trailing
// edge is the candidate where the loop is thinner at 5% of their distance
// inwards. While the first step from the start runs more than 45° off the
// direction to the leading edge (the start is the lower corner of a blunt
// trailing edge, or a point on its base), the start moves on, up to 3
// points, so that the walk starts at the upper corner.
func orient(pts []geometry.Point, seq []int32) []int32 {
	var c geometry.Point
	for _, i := range seq {
		c = c.Add(pts[i])
	}
	c = c.Scale(1 / float64(len(seq)))
	far := func(from geometry.Point) int {
		best, bd := 0, -1.0
		for k, i := range seq {
			if d := pts[i].Dist(from); d > bd {
				best, bd = k, d
			}
		}
		return best
	}
	a := far(c)
	b := far(pts[seq[a]])
	a = far(pts[seq[b]])
	pa, pb := pts[seq[a]], pts[seq[b]]
	te := a
	if thickness(pts, seq, pb, pa) < thickness(pts, seq, pa, pb) {
		te = b
	}
	out := make([]int32, 0, len(seq))
	out = append(out, seq[te:]...)
	out = append(out, seq[:te]...)
	if area(pts, out) < 0 {
		slices.Reverse(out[1:])
	}
	// At a blunt trailing edge the farthest point may be the lower corner or
	// a point of the base; the walk should start at the upper corner, so move
	// on while the first step runs across the chord.
	le := pts[seq[b]]
	if te == b {
		le = pts[seq[a]]
	}
	start := 0
	for range 3 {
		p, q := pts[out[start]], pts[out[(start+1)%len(out)]]
		step, toLE := q.Sub(p), le.Sub(p)
		if step.Dot(toLE) >= math.Sqrt(0.5)*step.Norm()*toLE.Norm() {
			break
		}
		start++
	}
	if start > 0 {
		out = append(out[start:], out[:start]...)
	}
	return out
}

// thickness returns the width of the loop across the line perpendicular
// to end→other at 5% of their distance from end.
func thickness(pts []geometry.Point, seq []int32, end, other geometry.Point) float64 {
	d := other.Sub(end)
	l := d.Norm()
	u := d.Scale(1 / l)
	at := 0.05 * l
	lo, hi := math.Inf(1), math.Inf(-1)
	n := len(seq)
	for k := range n {
		p, q := pts[seq[k]].Sub(end), pts[seq[(k+1)%n]].Sub(end)
		sp, sq := p.Dot(u)-at, q.Dot(u)-at
		if (sp < 0) == (sq < 0) {
			continue
		}
		f := sp / (sp - sq)
		v := p.Add(q.Sub(p).Scale(f)).Cross(u)
		lo, hi = min(lo, v), max(hi, v)
	}
	if hi < lo {
		return 0
	}
	return hi - lo
}

// parallel calls f on [lo, hi) slices of [0, n) on every CPU and waits.
func parallel(n int, f func(lo, hi int)) {
	w := runtime.GOMAXPROCS(0)
	if n < 4096 || w == 1 {
		f(0, n)
		return
	}
	var wg sync.WaitGroup
	chunk := (n + w - 1) / w
	for lo := 0; lo < n; lo += chunk {
		hi := min(lo+chunk, n)
		wg.Add(1)
		go func() {
			defer wg.Done()
			f(lo, hi)
		}()
	}
	wg.Wait()
}

// grid is a spatial hash of a set of points: cells of size h, the point
// indices of a cell stored contiguously.
type grid struct {
	h      float64
	x0, y0 float64
	idx    []int32 // point indices sorted by cell
	cells  cellTable
}

// cellTable maps a grid's cell keys to start<<32 | count in idx: open
// addressing with linear probing in a power-of-two table, the empty slot
// marked by noCell (the key of cell (−1, −1), which no point has). It
// answers as a Go map would, without the map's hashing and groups: the
// grid's look-ups are the inner loop of the neighbour searches.
type cellTable struct {
	keys, vals []uint64
	shift      uint
	count      int
}

const noCell = ^uint64(0)

func newCellTable(n int) cellTable {
	size, shift := 8, uint(61)
	for size < 2*n {
		size *= 2
		shift--
	}
	keys := make([]uint64, size)
	for i := range keys {
		keys[i] = noCell
	}
	return cellTable{keys: keys, vals: make([]uint64, size), shift: shift}
}

func (t *cellTable) slot(k uint64) uint64 {
	return (k * 0x9e3779b97f4a7c15) >> t.shift
}

func (t *cellTable) put(k, v uint64) {
	mask := uint64(len(t.keys) - 1)
	for i := t.slot(k); ; i = (i + 1) & mask {
		if t.keys[i] == noCell {
			t.keys[i], t.vals[i] = k, v
			t.count++
			return
		}
		if t.keys[i] == k {
			t.vals[i] = v
			return
		}
	}
}

func (t *cellTable) get(k uint64) (uint64, bool) {
	if k == noCell {
		return 0, false
	}
	mask := uint64(len(t.keys) - 1)
	for i := t.slot(k); ; i = (i + 1) & mask {
		switch t.keys[i] {
		case k:
			return t.vals[i], true
		case noCell:
			return 0, false
		}
	}
}

// newGrid hashes the points sel of pts (all of pts when sel is nil)
// into cells of size h, enlarged if need be so that a cell index fits in 30
// bits.
func newGrid(pts []geometry.Point, sel []int32, h float64, lo, hi geometry.Point) *grid {
	ext := max(hi.X-lo.X, hi.Y-lo.Y)
	h = max(h, ext/(1<<30), math.SmallestNonzeroFloat64)
	g := &grid{h: h, x0: lo.X, y0: lo.Y}
	if sel == nil {
		sel = make([]int32, len(pts))
		for i := range sel {
			sel[i] = int32(i)
		}
	}
	kvs := make([]keyed, len(sel))
	for j, i := range sel {
		kvs[j] = keyed{g.key(g.cell(pts[i])), i}
	}
	sortKeyed(kvs)
	g.idx = make([]int32, len(kvs))
	cells := 0
	for j := range kvs {
		if j+1 == len(kvs) || kvs[j+1].k != kvs[j].k {
			cells++
		}
	}
	g.cells = newCellTable(cells)
	start := 0
	for j := range kvs {
		g.idx[j] = kvs[j].i
		if j+1 == len(kvs) || kvs[j+1].k != kvs[j].k {
			g.cells.put(kvs[j].k, uint64(start)<<32|uint64(j+1-start))
			start = j + 1
		}
	}
	return g
}

// cell returns the cell coordinates of p.
func (g *grid) cell(p geometry.Point) (int64, int64) {
	return int64(math.Floor((p.X - g.x0) / g.h)), int64(math.Floor((p.Y - g.y0) / g.h))
}

// key packs cell coordinates; out-of-range neighbours (−1) get keys no
// point has.
func (g *grid) key(ix, iy int64) uint64 {
	return uint64(uint32(iy))<<32 | uint64(uint32(ix))
}

// at returns the point indices in cell (ix, iy).
func (g *grid) at(ix, iy int64) []int32 {
	v, ok := g.cells.get(g.key(ix, iy))
	if !ok {
		return nil
	}
	s := v >> 32
	return g.idx[s : s+v&0xffffffff]
}

// localise reorders the input indices idx of points of pts along a
// Morton (Z-order) curve, so that points near each other in the plane are
// near each other in memory: a shuffled cloud is then walked with few cache
// misses.
func localise(pts []geometry.Point, idx []int32) {
	lo, hi := bounds(pts)
	ext := max(hi.X-lo.X, hi.Y-lo.Y)
	if ext == 0 {
		return
	}
	const bits = 21
	f := float64(1<<bits-1) / ext
	spread := func(v uint64) uint64 {
		v &= 1<<bits - 1
		v = (v | v<<16) & 0x0000ffff0000ffff
		v = (v | v<<8) & 0x00ff00ff00ff00ff
		v = (v | v<<4) & 0x0f0f0f0f0f0f0f0f
		v = (v | v<<2) & 0x3333333333333333
		v = (v | v<<1) & 0x5555555555555555
		return v
	}
	kvs := make([]keyed, len(idx))
	for j, i := range idx {
		p := pts[i]
		kvs[j] = keyed{spread(uint64((p.X-lo.X)*f)) | spread(uint64((p.Y-lo.Y)*f))<<1, i}
	}
	sortKeyed(kvs)
	for j := range kvs {
		idx[j] = kvs[j].i
	}
}

// fastDist returns |p − q|, faster than Point.Dist where overflow cannot
// happen (coordinates of a measured part).
func fastDist(p, q geometry.Point) float64 {
	dx, dy := p.X-q.X, p.Y-q.Y
	return math.Sqrt(dx*dx + dy*dy)
}

// median returns the median of xs, reordering xs. It selects rather than
// sorts: the value is the one a full sort would give (NaN ordered first,
// as slices.Sort orders it), at linear expected cost; up to 16 values ≥ 0
// (the residuals of a local fit's window) go through a sorting network.
func median(xs []float64) float64 {
	n := len(xs)
	if n == 0 {
		return 0
	}
	if n <= 16 && sortNonNegative(xs) {
		// Sorted by a network, without a branch on the values.
	} else if n <= 32 {
		// Insertion sort; with no NaN among them, cmp.Less is <.
		plain := true
		for _, x := range xs {
			plain = plain && x == x
		}
		for i := 1; i < n; i++ {
			x := xs[i]
			j := i
			if plain {
				for ; j > 0 && x < xs[j-1]; j-- {
					xs[j] = xs[j-1]
				}
			} else {
				for ; j > 0 && cmp.Less(x, xs[j-1]); j-- {
					xs[j] = xs[j-1]
				}
			}
			xs[j] = x
		}
	} else {
		numeric.Nth(xs, n/2)
		if n%2 == 0 {
			// The lower middle is the largest of the half below.
			lo := xs[0]
			for _, x := range xs[1 : n/2] {
				if cmp.Less(lo, x) {
					lo = x
				}
			}
			xs[n/2-1] = lo
		}
	}
	if n%2 == 1 {
		return xs[n/2]
	}
	return (xs[n/2-1] + xs[n/2]) / 2
}
