package clean

import (
	"fmt"
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// A dense cloud (a laser scan's slice of 1e5 or 1e6 points) holds far more
// points than its outline needs to be ordered, its loops picked and its
// trailing edge found: a subset of denseSubset points spread over the
// whole cloud shows the same outline, noise and defects. cleanDense runs
// every step on such a subset, then places each point of the cloud by
// where it projects onto the subset's outline: its order along the loop
// is the order of its foot, and a point farther from the outline than
// the outlier threshold, in robust sigmas of the distances of its
// neighbours along the loop, is an outlier. The cost is that of a clean
// of denseSubset points plus O(n log n) for the projection and the sort,
// against O(n·k) local fits for every point.
const (
	// denseFrom is the number of points from which a cloud is cleaned on
	// a subset.
	denseFrom = 30000
	// denseSubset is the number of points of the subset.
	denseSubset = 12000
	// denseBlock is the number of neighbouring points (in loop order) whose
	// median distance from the outline is one sample of the local scale;
	// the scale at a point is the median of denseBlocks such samples about
	// it.
	denseBlock  = 64
	denseBlocks = 9
	// denseSmooth is the half-width of the moving average that smooths the
	// subset's outline before the points are projected onto it, in robust
	// sigmas of the subset's residuals: wide enough to average the noise of
	// a band of points across it, far narrower than a nose.
	denseSmooth = 2
)

// pick reports whether point i of a dense cloud belongs to the subset,
// about one in every stride: a hash of the index rather than every
// stride-th point, so that no pattern of the file (scan lines, passes)
// aliases with the choice.
func densePick(i, stride int) bool {
	z := uint64(i) + 0x9e3779b97f4a7c15
	z = (z ^ z>>30) * 0xbf58476d1ce4e5b9
	z = (z ^ z>>27) * 0x94d049bb133111eb
	z ^= z >> 31
	return z%uint64(stride) == 0
}

// cleanDense cleans the dense cloud c (validated by Clean) on a subset and
// places every point by its projection; see the constants above.
func cleanDense(c *geometry.Cloud, opts Options, sigma float64) (*geometry.Contour, *Report, error) {
	n := len(c.Points)
	// Duplicates first, over the whole cloud (a spatial hash, O(n log n)).
	all := make([]geometry.Point, n)
	for i, p := range c.Points {
		all[i] = geometry.Point{X: p.X, Y: p.Y}
	}
	lo, hi := bounds(all)
	tol := opts.MergeTol
	if tol == 0 {
		tol = DefaultMergeRel * hi.Dist(lo)
	}
	_, pairs := merge(all, tol)
	gone := make([]bool, n)
	for _, pr := range pairs {
		gone[pr.dropped] = true
	}
	stride := max(1, n/denseSubset)
	sub := &geometry.Cloud{Dim: c.Dim, Units: c.Units, Ordered: c.Ordered}
	inSub := make([]bool, n)
	for i := range n {
		if !gone[i] && densePick(i, stride) {
			inSub[i] = true
			sub.Points = append(sub.Points, c.Points[i])
			sub.Origins = append(sub.Origins, c.Origins[i])
		}
	}
	ct, rep, err := Clean(sub, opts)
	if rep != nil {
		rep.Read = n
		rep.Subset = len(sub.Points)
	}
	if err != nil {
		return nil, rep, err
	}
	// Points of the subset the clean dropped or merged keep that verdict.
	settled := make(map[geometry.Origin]bool, len(rep.Dropped)+len(rep.Merged))
	for _, d := range rep.Dropped {
		settled[d.Origin] = true
	}
	for _, m := range rep.Merged {
		settled[m.Dropped] = true
	}
	for _, pr := range pairs {
		rep.Merged = append(rep.Merged, Merged{Kept: c.Origins[pr.kept], Dropped: c.Origins[pr.dropped], Distance: pr.dist})
	}
	rep.MergeTol = tol

	ref := smoothOutline(ct, denseSmooth*rep.Sigma)
	m := len(ref)
	tree := newKDTree(ref)

	// Project every point not settled: the nearest vertex of the outline,
	// then the segments about it.
	type foot struct {
		seg  int32
		t, d float64
		q    geometry.Point
	}
	feet := make([]foot, n)
	parallel(n, func(a, b int) {
		for i := a; i < b; i++ {
			p := all[i]
			if gone[i] || inSub[i] && settled[c.Origins[i]] {
				feet[i].seg = -1
				continue
			}
			v := tree.nearest(p)
			best := foot{seg: -1, d: math.Inf(1)}
			for dj := -2; dj <= 1; dj++ {
				j := ((v+dj)%m + m) % m
				a, b := ref[j], ref[(j+1)%m]
				ab := b.Sub(a)
				l2 := ab.X*ab.X + ab.Y*ab.Y
				t := 0.0
				if l2 > 0 {
					t = math.Max(0, math.Min(1, ((p.X-a.X)*ab.X+(p.Y-a.Y)*ab.Y)/l2))
				}
				q := a.Add(ab.Scale(t))
				if d := fastDist(p, q); d < best.d {
					best = foot{seg: int32(j), t: t, d: d, q: q}
				}
			}
			feet[i] = best
		}
	})
	order := make([]int32, 0, n)
	for i := range n {
		if feet[i].seg >= 0 {
			order = append(order, int32(i))
		}
	}
	slices.SortFunc(order, func(a, b int32) int {
		fa, fb := &feet[a], &feet[b]
		switch {
		case fa.seg != fb.seg:
			return int(fa.seg - fb.seg)
		case fa.t < fb.t:
			return -1
		case fa.t > fb.t:
			return 1
		}
		return int(a - b)
	})

	// The local scale: medians of blocks of neighbours along the loop,
	// and the median of the blocks about each point (a stretch where a
	// scanner grazes the surface is noisier than the rest).
	nb := (len(order) + denseBlock - 1) / denseBlock
	blocks := make([]float64, nb)
	buf := make([]float64, 0, denseBlock)
	for k := range nb {
		buf = buf[:0]
		for _, i := range order[k*denseBlock : min(len(order), (k+1)*denseBlock)] {
			buf = append(buf, feet[i].d)
		}
		blocks[k] = median(buf)
	}
	floor := 0.5 * rep.Sigma
	scale := make([]float64, nb)
	win := make([]float64, 0, denseBlocks)
	for k := range nb {
		win = win[:0]
		for j := k - denseBlocks/2; j <= k+denseBlocks/2; j++ {
			win = append(win, blocks[((j%nb)+nb)%nb])
		}
		// The median of |d| is 0.6745 σ for Gaussian distances.
		scale[k] = math.Max(floor, 1.4826*median(win))
	}

	out := &geometry.Contour{Units: c.Units}
	out.Points = make([]geometry.Point, 0, len(order))
	out.Origins = make([]geometry.Origin, 0, len(order))
	out.Along = make([]float64, 0, len(order))
	var dropped []Drop
	base := -1 // the first segment on a blunt base
	if e := rep.Edge; e != nil && e.Kind == EdgeBlunt {
		base = m - e.Base - 1
	}
	nBase := 0
	var prev geometry.Point
	along := 0.0
	for k, i := range order {
		f := &feet[i]
		s := scale[k/denseBlock]
		if f.d > sigma*s {
			dropped = append(dropped, Drop{Origin: c.Origins[i], Point: all[i], Reason: "outlier", Distance: f.d, Sigmas: f.d / s})
			continue
		}
		if len(out.Points) > 0 {
			along += fastDist(f.q, prev)
		}
		prev = f.q
		out.Points = append(out.Points, all[i])
		out.Origins = append(out.Origins, c.Origins[i])
		out.Along = append(out.Along, along)
		if base >= 0 && int(f.seg) >= base {
			nBase++
		}
	}
	if len(out.Points) < minPoints {
		return nil, rep, fmt.Errorf("geometry: clean: %w: %d point(s) left in the loop, need at least %d", geometry.ErrTooFewPoints, len(out.Points), minPoints)
	}
	if base >= 0 {
		e := *rep.Edge
		e.Base = nBase
		rep.Edge = &e
	}
	rep.Dropped = append(rep.Dropped, dropped...)
	rep.Band = true
	return out, rep, nil
}

// smoothOutline returns the points of ct averaged over neighbours within
// h along it (by ct.Along, or the distances between neighbours), without
// wrapping round its ends: the loop starts and ends at the trailing edge,
// whose corners the average must not cut.
func smoothOutline(ct *geometry.Contour, h float64) []geometry.Point {
	m := len(ct.Points)
	s := ct.Along
	if len(s) != m {
		s = make([]float64, m)
		for k := 1; k < m; k++ {
			s[k] = s[k-1] + fastDist(ct.Points[k], ct.Points[k-1])
		}
	}
	out := make([]geometry.Point, m)
	if !(h > 0) {
		copy(out, ct.Points)
		return out
	}
	var sx, sy float64
	a, b := 0, 0 // the window [a, b)
	for k := range m {
		for b < m && s[b] <= s[k]+h {
			sx += ct.Points[b].X
			sy += ct.Points[b].Y
			b++
		}
		for s[a] < s[k]-h {
			sx -= ct.Points[a].X
			sy -= ct.Points[a].Y
			a++
		}
		w := float64(b - a)
		out[k] = geometry.Point{X: sx / w, Y: sy / w}
	}
	return out
}

// kdTree is a static 2-d tree of points for nearest-point queries at any
// distance (an outlier far from the outline costs what a point on it
// costs): node k of the implicit tree over order[lo:hi] is its median.
type kdTree struct {
	pts   []geometry.Point
	order []int32
}

func newKDTree(pts []geometry.Point) *kdTree {
	t := &kdTree{pts: pts, order: make([]int32, len(pts))}
	for i := range t.order {
		t.order[i] = int32(i)
	}
	t.build(0, len(pts), 0)
	return t
}

// build puts the median of order[lo:hi] along axis (0: x, 1: y) in the
// middle, the smaller before it and the larger after it, and recurses.
func (t *kdTree) build(lo, hi, axis int) {
	if hi-lo <= 1 {
		return
	}
	mid := (lo + hi) / 2
	key := func(i int32) float64 {
		if axis == 0 {
			return t.pts[i].X
		}
		return t.pts[i].Y
	}
	// Quickselect of the median.
	a, b := lo, hi-1
	for a < b {
		pv := key(t.order[(a+b)/2])
		i, j := a, b
		for i <= j {
			for key(t.order[i]) < pv {
				i++
			}
			for key(t.order[j]) > pv {
				j--
			}
			if i <= j {
				t.order[i], t.order[j] = t.order[j], t.order[i]
				i++
				j--
			}
		}
		switch {
		case mid <= j:
			b = j
		case mid >= i:
			a = i
		default:
			a = b
		}
	}
	t.build(lo, mid, 1-axis)
	t.build(mid+1, hi, 1-axis)
}

// nearest returns the index of the point nearest to p.
func (t *kdTree) nearest(p geometry.Point) int {
	best, bd := -1, math.Inf(1)
	var walk func(lo, hi, axis int)
	walk = func(lo, hi, axis int) {
		if hi <= lo {
			return
		}
		mid := (lo + hi) / 2
		i := t.order[mid]
		q := t.pts[i]
		if d := fastDist(p, q); d < bd {
			best, bd = int(i), d
		}
		diff := p.X - q.X
		if axis == 1 {
			diff = p.Y - q.Y
		}
		near, far := [2]int{lo, mid}, [2]int{mid + 1, hi}
		if diff > 0 {
			near, far = far, near
		}
		walk(near[0], near[1], 1-axis)
		if math.Abs(diff) < bd {
			walk(far[0], far[1], 1-axis)
		}
	}
	walk(0, len(t.order), 0)
	return best
}
