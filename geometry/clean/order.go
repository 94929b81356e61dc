package clean

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// knnK is the number of nearest neighbours kept per point.
const knnK = 12

// occupancy is the number of points per occupied cell knn aims
// at: for points along a curve, enough that the 3×3 cells about a point
// usually hold its 12 nearest neighbours.
const occupancy = 8

// maxRing bounds the ring search of knn, so that an isolated point
// costs at most (2·maxRing+1)² cell look-ups; such a point keeps the
// neighbours found so far (perhaps none).
const maxRing = 8

// nbrs holds the k nearest neighbours of each point, nearest first,
// padded with −1 where fewer were found.
type nbrs struct {
	k   int
	idx []int32
}

// of returns the neighbours of point i.
func (nb *nbrs) of(i int32) []int32 {
	row := nb.idx[int(i)*nb.k : int(i+1)*nb.k]
	for j, q := range row {
		if q < 0 {
			return row[:j]
		}
	}
	return row
}

// neighbours returns the knnK nearest neighbours of every point.
func neighbours(pts []geometry.Point, lo, hi geometry.Point) *nbrs {
	return &nbrs{k: knnK, idx: knn(pts, nil, knnK, lo, hi)}
}

// knn returns, for each point sel[j] (every point when sel is nil), its
// k nearest neighbours among sel, nearest first, in a len(sel)·k slice padded
// with −1. The points are hashed into a grid whose cells hold about
// occupancy points (the cell size is first guessed for points along a curve of length
// twice the bounding-box half-perimeter, then corrected from the observed
// occupancy), and each query searches rings of cells outwards until no
// unsearched cell can hold a nearer point. The queries run on every CPU.
func knn(pts []geometry.Point, sel []int32, k int, lo, hi geometry.Point) []int32 {
	n := len(pts)
	if sel != nil {
		n = len(sel)
	}
	out := make([]int32, n*k)
	for i := range out {
		out[i] = -1
	}
	if n < 2 {
		return out
	}
	w, h := hi.X-lo.X, hi.Y-lo.Y
	cell := occupancy * 2 * (w + h) / float64(n)
	var g *grid
	for range 4 {
		g = newGrid(pts, sel, cell, lo, hi)
		occ := float64(n) / float64(g.cells.count)
		if occ >= occupancy/2 && occ <= 2*occupancy {
			break
		}
		cell = g.h * min(10, max(0.1, occupancy/occ))
	}
	query := func(j int) int32 {
		if sel != nil {
			return sel[j]
		}
		return int32(j)
	}
	parallel(n, func(a, b int) {
		d2s := make([]float64, k)
		for j := a; j < b; j++ {
			nearest(g, pts, query(j), out[j*k:(j+1)*k], d2s)
		}
	})
	return out
}

// nearest fills nbr with the nearest points to pts[self] in g, nearest
// first; d2s is scratch space of the same length.
func nearest(g *grid, pts []geometry.Point, self int32, nbr []int32, d2s []float64) {
	k := len(nbr)
	cnt := 0
	p := pts[self]
	ix, iy := g.cell(p)
	for r := int64(0); r <= maxRing; r++ {
		if r == 0 {
			cnt = nearestIn(g.at(ix, iy), pts, p, self, nbr, d2s, cnt)
		} else {
			for dx := -r; dx <= r; dx++ {
				cnt = nearestIn(g.at(ix+dx, iy-r), pts, p, self, nbr, d2s, cnt)
				cnt = nearestIn(g.at(ix+dx, iy+r), pts, p, self, nbr, d2s, cnt)
			}
			for dy := -r + 1; dy <= r-1; dy++ {
				cnt = nearestIn(g.at(ix-r, iy+dy), pts, p, self, nbr, d2s, cnt)
				cnt = nearestIn(g.at(ix+r, iy+dy), pts, p, self, nbr, d2s, cnt)
			}
		}
		if reach := float64(r) * g.h; cnt == k && d2s[k-1] <= reach*reach {
			break
		}
	}
	for j := cnt; j < k; j++ {
		nbr[j] = -1
	}
}

// nearestIn adds the points of one cell (cell) to the cnt nearest to p
// found so far (nbr, their squared distances d2s, nearest first) and
// returns their new count: a plain function whose count stays in a
// register, where a closure kept it in the caller's frame.
func nearestIn(cell []int32, pts []geometry.Point, p geometry.Point, self int32, nbr []int32, d2s []float64, cnt int) int {
	k := len(nbr)
	for _, q := range cell {
		if q == self {
			continue
		}
		dx, dy := pts[q].X-p.X, pts[q].Y-p.Y
		d2 := dx*dx + dy*dy
		if cnt == k && d2 >= d2s[k-1] {
			continue
		}
		j := min(cnt, k-1)
		for j > 0 && d2s[j-1] > d2 {
			d2s[j], nbr[j] = d2s[j-1], nbr[j-1]
			j--
		}
		d2s[j], nbr[j] = d2, q
		if cnt < k {
			cnt++
		}
	}
	return cnt
}

// runsOf returns the ordered runs of c in compact indices: src maps
// compact indices to input indices and increases.
func runsOf(c *geometry.Cloud, src []int32) [][]int32 {
	starts := c.Segments
	if len(starts) == 0 {
		starts = []int{0}
	}
	var runs [][]int32
	k := 0
	for s := range starts {
		end := len(c.Points)
		if s+1 < len(starts) {
			end = starts[s+1]
		}
		var run []int32
		for k < len(src) && int(src[k]) < end {
			if int(src[k]) >= starts[s] {
				run = append(run, int32(k))
			}
			k++
		}
		if len(run) > 0 {
			runs = append(runs, run)
		}
	}
	return runs
}

// runsValid checks the input's own order: every step of a run must be
// local, no longer than twice the larger radius of the two points'
// knnK-neighbourhoods. A valid order of a curve passes (consecutive points
// are near neighbours, however uneven the spacing); a shuffled cloud fails
// at once. It returns the first bad step, or ok.
func runsValid(pts []geometry.Point, runs [][]int32, nb *nbrs) (a, b int32, ok bool) {
	radius := func(i int32) float64 {
		row := nb.of(i)
		if len(row) == 0 {
			return math.Inf(1)
		}
		return pts[i].Dist(pts[row[len(row)-1]])
	}
	for _, r := range runs {
		for k := 1; k < len(r); k++ {
			p, q := r[k-1], r[k]
			if pts[p].Dist(pts[q]) > 2*max(radius(p), radius(q)) {
				return p, q, false
			}
		}
	}
	return 0, 0, true
}

// tangentSeed is the number of nearest neighbours whose directions are
// tried as a first tangent.
const tangentSeed = 6

// tangentCone is tan² of the half-angle (about 27°) of the double cone
// about a first tangent within which neighbours refine it.
const tangentCone = 0.25

// maxTan2 is tan² of the widest angle (60°) between the tangent and the
// step to a linked neighbour.
const maxTan2 = 3

// link links an unordered cloud into chains, adding the links to g.
//
// The method is a tangent-guided form of the nearest-neighbour curve
// reconstruction of
//
//	Dey, T. K. and Kumar, P., A simple provable algorithm for curve
//	reconstruction, Proc. 10th ACM-SIAM Symposium on Discrete Algorithms
//	(1999), pp. 893–894,
//
// which joins each point to its nearest neighbour and to its nearest
// neighbour on the other side. That rule fails near a thin trailing edge,
// where a point of the opposite surface is nearer than the next point of the
// same surface. Here, instead:
//
//  1. Each point gets a tangent t. The first is the direction towards one of
//     its 6 nearest neighbours, the one with the most support: the number
//     of its 12 nearest neighbours that lie within 27° of that line (a
//     single point across a thin trailing edge, however near, is outvoted
//     by the points along the surface). It is refined twice as the principal
//     direction (second moments about the point itself) of the neighbours
//     within 27° of the current tangent, each weighted by
//     1/(d²·(1 + (4·h/d)²)),
//     d its distance and h its offset normal to the tangent. The points of
//     an opposite surface, or of the other corner of a blunt trailing edge,
//     lie across the tangent and are left out.
//  2. Among its 12 nearest neighbours, each point picks a best forward
//     (along +t) and a best backward (along −t) neighbour, minimising
//     d·(1 + 4·tan²φ), where φ is the angle between t and the step, over
//     steps within 60° of the tangent. A point of the opposite surface sits
//     nearly across the tangent and loses to the next point along.
//  3. A link is kept only when it is mutual: q is a pick of p and p a pick of
//     q. Every point then has at most two links, so the links form chains
//     and cycles. At a sharp corner (the trailing edge) both neighbours lie
//     on one side of the tangent, so a chain ends there; join joins the
//     chain ends.
func link(pts []geometry.Point, nb *nbrs, g *graph) {
	n := len(pts)
	tan := make([]geometry.Point, n)
	fwd := make([]int32, n)
	bwd := make([]int32, n)
	parallel(n, func(a, b int) {
		for i := a; i < b; i++ {
			tan[i] = tangent(pts, int32(i), nb.of(int32(i)))
		}
	})
	parallel(n, func(a, b int) {
		for i := a; i < b; i++ {
			p, t := pts[i], tan[i]
			f, bk := int32(-1), int32(-1)
			fc, bc := math.Inf(1), math.Inf(1)
			for _, q := range nb.of(int32(i)) {
				d := pts[q].Sub(p)
				al, ac := d.Dot(t), d.Cross(t)
				if al == 0 {
					continue
				}
				t2 := (ac * ac) / (al * al)
				if t2 > maxTan2 {
					continue
				}
				cost := math.Sqrt(d.Dot(d)) * (1 + 4*t2)
				if al > 0 && cost < fc {
					f, fc = q, cost
				} else if al < 0 && cost < bc {
					bk, bc = q, cost
				}
			}
			fwd[i], bwd[i] = f, bk
		}
	})
	for i := range n {
		for _, q := range [2]int32{fwd[i], bwd[i]} {
			if q > int32(i) && (fwd[q] == int32(i) || bwd[q] == int32(i)) {
				g.addEdge(int32(i), q)
			}
		}
	}
}

// tangent returns the unit tangent at pts[i] fitted to its nearest
// neighbours nbrs, as described at link.
func tangent(pts []geometry.Point, i int32, nbrs []int32) geometry.Point {
	p := pts[i]
	if len(nbrs) == 0 {
		return geometry.Point{X: 1, Y: 0}
	}
	// Seed: the direction towards one of the nearest neighbours that the
	// most neighbours agree with (the nearest such on a tie).
	var ds [knnK]geometry.Point
	var ls [knnK]float64
	nbrs = nbrs[:min(len(nbrs), knnK)]
	for j, q := range nbrs {
		ds[j] = pts[q].Sub(p)
		ls[j] = math.Sqrt(ds[j].Dot(ds[j]))
	}
	var t geometry.Point
	bestScore := -1.0
	for j := range min(len(nbrs), tangentSeed) {
		if ls[j] == 0 {
			continue
		}
		u := ds[j].Scale(1 / ls[j])
		var score float64
		for r := range nbrs {
			a, h := ds[r].Dot(u), ds[r].Cross(u)
			if h*h <= tangentCone*a*a && ls[r] > 0 {
				score++
			}
		}
		if score > bestScore {
			t, bestScore = u, score
		}
	}
	if bestScore < 0 {
		return geometry.Point{X: 1, Y: 0}
	}
	for range 2 {
		var sxx, sxy, syy float64
		for j := range nbrs {
			d := ds[j]
			a, h := d.Dot(t), d.Cross(t)
			l2 := ls[j] * ls[j]
			if h*h > tangentCone*a*a || l2 == 0 {
				continue
			}
			w := 1 / (l2 * (1 + 16*h*h/l2))
			sxx += w * d.X * d.X
			sxy += w * d.X * d.Y
			syy += w * d.Y * d.Y
		}
		if sxx+syy == 0 {
			break
		}
		t = principal(sxx, sxy, syy)
	}
	return t
}
