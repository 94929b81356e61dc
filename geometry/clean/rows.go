package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// A slice of a part's scan often holds a straight row of points that is no
// part of the section: the edge of the table the part lay on, or the face
// of a fixture, cut by the same plane. Such a row is as dense as the
// outline, so the local fits along a loop that takes it in do not stand it
// out, and the orderings weave it into the nearer surface. strayRows finds
// it before any ordering: a chain of linked points that is straight within
// its own scatter, long, and apart from every other point (none lies
// within a per cent of the points' extent, or three of the row's steps,
// of any point of it, its ends included), with nothing beyond its ends
// along its line. A stretch of the outline never stands apart: a straight
// surface (a flat bottom, a flatback base, the flat aft part of a cambered
// lower surface) runs on into the rest of the outline at its ends, and
// where holes in the sampling cut it off, the rest lies on along its line.

// rowMin is the least number of points in a stray row.
const rowMin = 12

// rowLength is the least length of a stray row, as a share of the
// diagonal of the points' bounding box: shorter straight runs are a
// fixture's few points, which the outlier tests drop.
const rowLength = 0.15

// rowFree is the least clearance between a stray row and every other
// point, in the row's median steps.
const rowFree = 3

// rowReach is the widest gap within one row, as a share of the diagonal
// of the points' bounding box.
const rowReach = rowLength

// rowClear is the least clearance, as a share of the diagonal of the
// points' bounding box, between a stray row and every other point: a
// table's edge or a fixture's face a per cent or more of the part's size
// off it.
const rowClear = 0.01

// rowBand is the half-width of a row's band, in its scatter about its
// line; points within twice that are taken into it.
const rowBand = 4

// rowThin bounds a row's scatter about its line, as a share of its
// length: a scanner's noise is a small fraction of a millimetre on rows
// tens of millimetres long, whereas a stretch of curve with a bow hidden in
// a large scatter (a whole loop's chain, folded on itself) is not a row.
const rowThin = 0.01

// rowLine is a straight line fitted to a row of points: the foot o, the
// unit direction d, and the scatter about it.
type rowLine struct {
	o, d    geometry.Point
	scatter float64 // RMS of the residuals of a parabola along d
	sagitta float64 // the parabola's bow over the row's length
	lo, hi  float64 // extent along d, from o
}

// fitRow fits a line to the points idx and reports whether they are
// straight: the bow of the best parabola across their length is within
// twice their scatter about it (a curve's stretch bows more than its
// noise), and that scatter is within rowThin of their length. For points on a line with independent noise σ the bow's own
// scatter is about 3.4 σ/√n, under σ from rowMin points on.
func fitRow(pts []geometry.Point, idx []int32) (rowLine, bool) {
	var cx, cy float64
	for _, i := range idx {
		cx += pts[i].X
		cy += pts[i].Y
	}
	n := float64(len(idx))
	cx /= n
	cy /= n
	var sxx, sxy, syy float64
	for _, i := range idx {
		dx, dy := pts[i].X-cx, pts[i].Y-cy
		sxx += dx * dx
		sxy += dx * dy
		syy += dy * dy
	}
	d := principal(sxx, sxy, syy)
	o := geometry.Point{X: cx, Y: cy}
	l := rowLine{o: o, d: d, lo: math.Inf(1), hi: math.Inf(-1)}
	// v = a + b·u + c·u² by least squares (normal equations in u scaled
	// to the row's half-length, so that they stay well conditioned).
	us := make([]float64, len(idx))
	vs := make([]float64, len(idx))
	for k, i := range idx {
		p := pts[i].Sub(o)
		us[k], vs[k] = p.Dot(d), d.Cross(p)
		l.lo, l.hi = min(l.lo, us[k]), max(l.hi, us[k])
	}
	half := (l.hi - l.lo) / 2
	mid := (l.hi + l.lo) / 2
	if half <= 0 {
		return l, false
	}
	var m [3][3]float64
	var rhs [3]float64
	for k := range us {
		t := (us[k] - mid) / half
		b := [3]float64{1, t, t * t}
		for r := range 3 {
			for c := range 3 {
				m[r][c] += b[r] * b[c]
			}
			rhs[r] += b[r] * vs[k]
		}
	}
	coef, ok := solve3(m, rhs)
	if !ok {
		return l, false
	}
	var ss float64
	for k := range us {
		t := (us[k] - mid) / half
		r := vs[k] - (coef[0] + coef[1]*t + coef[2]*t*t)
		ss += r * r
	}
	l.scatter = math.Sqrt(ss / max(n-3, 1))
	l.sagitta = math.Abs(coef[2])
	return l, l.sagitta <= 2*l.scatter && l.scatter <= rowThin*(l.hi-l.lo)
}

// strayRows returns, sorted, the points of the straight rows of pts that
// stand apart from every other point (see the comment at the top of this
// file), given the graph of their links (see link) and the diagonal of
// their bounding box. It returns nil when it finds none, or when taking them out would leave too
// few points for a section.
func strayRows(pts []geometry.Point, g *graph, diag float64) []int32 {
	_, chains := g.components(minPoints)
	in := make([]bool, len(pts))
	var rows []int32
	for _, c := range chains {
		if len(c) < rowMin || in[c[0]] {
			continue
		}
		// Noise or an uneven step breaks a row into several chains: a
		// straight third of a row is grown along its line to the rest.
		l, ok := fitRow(pts, c)
		if !ok || l.hi-l.lo < rowLength*diag/3 {
			continue
		}
		row := growRow(pts, c, l, rowReach*diag)
		if len(row) < rowMin {
			continue
		}
		if l, ok = fitRow(pts, row); !ok || l.hi-l.lo < rowLength*diag || !isolated(pts, row, l, rowClear*diag) ||
			continued(pts, row, l, diag) {
			continue
		}
		for _, i := range row {
			if !in[i] {
				in[i] = true
				rows = append(rows, i)
			}
		}
	}
	if len(pts)-len(rows) < 2*rowMin {
		return nil
	}
	slices.Sort(rows)
	return rows
}

// growRow returns the points within twice rowBand scatters of the line l
// (the chain's scatter: a row's own stray hits lie farther out) that
// form one run along it with the chain c (no gap in it wider than reach),
// in order along the line. The reach is generous: an uneven row's widest
// gaps are many times its median step, and a straight stretch of the
// outline grown across a hole in the sampling only meets the rest of the
// outline sooner.
func growRow(pts []geometry.Point, c []int32, l rowLine, reach float64) []int32 {
	w := 2 * rowBand * l.scatter
	type at struct {
		i int32
		u float64
	}
	var band []at
	for i, p := range pts {
		q := p.Sub(l.o)
		if math.Abs(l.d.Cross(q)) <= w {
			band = append(band, at{int32(i), q.Dot(l.d)})
		}
	}
	slices.SortFunc(band, func(a, b at) int {
		switch {
		case a.u < b.u:
			return -1
		case a.u > b.u:
			return 1
		}
		return int(a.i - b.i)
	})
	// The run through the chain's middle point.
	mid := c[len(c)/2]
	k := slices.IndexFunc(band, func(b at) bool { return b.i == mid })
	if k < 0 {
		return nil
	}
	a, b := k, k
	for a > 0 && band[a].u-band[a-1].u <= reach {
		a--
	}
	for b < len(band)-1 && band[b+1].u-band[b].u <= reach {
		b++
	}
	row := make([]int32, 0, b-a+1)
	for _, x := range band[a : b+1] {
		row = append(row, x.i)
	}
	return row
}

// isolated reports whether no point off the row lies within clear (at
// least rowFree of the row's median steps), and twice the row's band's
// width, of any point of it (its ends included), row being in order along
// its line l.
func isolated(pts []geometry.Point, row []int32, l rowLine, clear float64) bool {
	us := make([]float64, len(row))
	for k, i := range row {
		us[k] = pts[i].Sub(l.o).Dot(l.d)
	}
	steps := make([]float64, 0, len(row))
	for k := 1; k < len(row); k++ {
		steps = append(steps, pts[row[k]].Dist(pts[row[k-1]]))
	}
	clear = max(clear, rowFree*median(steps))
	// A noisy band's points lie closer along it than across: a point of
	// the same surface just outside the band is within twice its width.
	reach := clear + 2*rowBand*l.scatter
	if !slices.IsSorted(us) {
		return false // growRow puts the row in order along its line
	}
	on := make(map[int32]bool, len(row))
	for _, i := range row {
		on[i] = true
	}
	across := reach + rowBand*l.scatter
	for i, p := range pts {
		if on[int32(i)] {
			continue
		}
		q := p.Sub(l.o)
		u := q.Dot(l.d)
		if math.Abs(l.d.Cross(q)) > across || u < us[0]-reach || u > us[len(us)-1]+reach {
			continue
		}
		k, _ := slices.BinarySearch(us, u-reach)
		for ; k < len(us) && us[k] <= u+reach; k++ {
			if p.Dist(pts[row[k]]) <= reach {
				return false
			}
		}
	}
	return true
}

// rowCone is the slope of the cone beyond each end of a row, about its
// line, within which a point carries it on (see continued).
const rowCone = 0.1

// continued reports whether a point off the row lies beyond either end of
// it, within rowLength of the diagonal diag along its line l and within
// the cone of slope rowCone about the line (widened by rowClear of the
// diagonal and the row's band): a straight stretch of the outline that
// holes in the sampling cut off at both ends still points at the rest of
// the outline along its line, as a flat bottom does at the trailing edge
// and where it bends up into the nose; a table's edge or a fixture's face
// beside the part does not.
func continued(pts []geometry.Point, row []int32, l rowLine, diag float64) bool {
	on := make(map[int32]bool, len(row))
	for _, i := range row {
		on[i] = true
	}
	width := rowClear*diag + 2*rowBand*l.scatter
	for i, p := range pts {
		if on[int32(i)] {
			continue
		}
		q := p.Sub(l.o)
		u := q.Dot(l.d)
		var d float64
		switch {
		case u > l.hi:
			d = u - l.hi
		case u < l.lo:
			d = l.lo - u
		default:
			continue
		}
		if d <= rowLength*diag && math.Abs(l.d.Cross(q)) <= rowCone*d+width {
			return true
		}
	}
	return false
}

// dropRows takes the stray rows (see strayRows) out of the distinct
// points, recording each as a "stray" point dropped, and finds the
// neighbours of the points left; when it finds none, it leaves the links
// it drew for linkLoops.
func (cl *cleaning) dropRows() {
	g := newGraph(len(cl.pts))
	link(cl.pts, cl.nb, g)
	rows := strayRows(cl.pts, g, cl.diag)
	if len(rows) == 0 {
		cl.linked = g // the points stay: linkLoops takes their links
		return
	}
	hits := make([]hit, len(rows))
	out := make([]bool, len(cl.pts))
	for k, i := range rows {
		hits[k] = hit{idx: i, reason: "stray"}
		out[i] = true
	}
	cl.record(hits, false)
	pts, src := cl.pts[:0:0], cl.src[:0:0]
	for i, p := range cl.pts {
		if !out[i] {
			pts = append(pts, p)
			src = append(src, cl.src[i])
		}
	}
	cl.pts, cl.src = pts, src
	cl.nb = neighbours(cl.pts, cl.lo, cl.hi)
}
