package clean

import "github.com/foilwright/foilwright/geometry"

// pair is one point merged into an earlier kept one.
type pair struct {
	kept, dropped int
	dist          float64
}

// merge merges points of pts that lie within tol of an earlier kept
// point. It returns the input indices of the kept points in increasing order
// and the merges made. Each point is compared only with the points of the
// 2×2 cells nearest to it in a spatial hash with cells of size 2·tol (the
// cells that its tolerance disk can reach), so
// the cost is O(n log n) (the sort that builds the hash), not O(n²). The
// lowest input index of a group is kept; a point is merged when it lies
// within tol of a kept point (not transitively through another merged point).
func merge(pts []geometry.Point, tol float64) (kept []int32, pairs []pair) {
	n := len(pts)
	if tol <= 0 {
		kept = make([]int32, n)
		for i := range kept {
			kept[i] = int32(i)
		}
		return kept, nil
	}
	lo, hi := bounds(pts)
	g := newGrid(pts, nil, 2*tol, lo, hi)
	gone := make([]bool, n)
	kept = make([]int32, 0, n)
	tol2 := tol * tol
	for i := range n {
		if gone[i] {
			continue
		}
		kept = append(kept, int32(i))
		p := pts[i]
		// The disk of radius tol about p lies in the 2×2 cells nearest to p.
		ix, iy := g.cell(geometry.Point{X: p.X - tol, Y: p.Y - tol})
		for dy := int64(0); dy <= 1; dy++ {
			for dx := int64(0); dx <= 1; dx++ {
				for _, j := range g.at(ix+dx, iy+dy) {
					if int(j) <= i || gone[j] {
						continue
					}
					q := pts[j]
					ddx, ddy := q.X-p.X, q.Y-p.Y
					if d2 := ddx*ddx + ddy*ddy; d2 <= tol2 {
						gone[j] = true
						pairs = append(pairs, pair{kept: i, dropped: int(j), dist: p.Dist(q)})
					}
				}
			}
		}
	}
	return kept, pairs
}
