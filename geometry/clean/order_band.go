package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// bandShare is the share of points whose two nearest neighbours lie
// on the same side of them (less than 90° apart) above which a cloud is a
// band (its noise is comparable to its point spacing) rather than a line.
// Along a line, even a curved or unevenly spaced one, the two nearest
// neighbours of a point lie on either side of it, save at corners; in a
// band they lie in any direction, on the same side about half the time.
const bandShare = 0.2

// bandSample is the number of points isBand looks at.
const bandSample = 2000

// isBand reports whether the points form a band rather than a thin
// line, judged on up to bandSample evenly chosen points by
// bandShare, leaving out points whose nearest neighbour is more than
// three times the median nearest-neighbour distance away.
func isBand(pts []geometry.Point, nb *nbrs) bool {
	n := len(pts)
	step := max(1, n/bandSample)
	var d0s, sames []float64
	for i := 0; i < n; i += step {
		row := nb.of(int32(i))
		if len(row) < 2 {
			continue
		}
		same := 0.0
		if pts[row[0]].Sub(pts[i]).Dot(pts[row[1]].Sub(pts[i])) > 0 {
			same = 1
		}
		d0s = append(d0s, fastDist(pts[i], pts[row[0]]))
		sames = append(sames, same)
	}
	if len(d0s) == 0 {
		return false
	}
	// Isolated points (outliers, or their lone centroids when thinning)
	// have both neighbours on the side of the curve; leave them out.
	lim := 3 * median(slices.Clone(d0s))
	var same, all float64
	for j, d := range d0s {
		if d <= lim {
			same += sames[j]
			all++
		}
	}
	return same > bandShare*all
}

// byBand orders a band of points (a dense scan whose noise is comparable
// to its spacing, where no point-to-point order is meaningful) into loops.
// The points are thinned by thin, the radius doubled from twice the
// median neighbourhood radius until the centroids link into loops as a thin
// line does (bandLinked). The centroids are
// linked and joined as a thin cloud would be (link, join); then
// every point takes the place along its centroid's loop where it projects
// onto the polyline of centroids next to it, and each loop is sorted by
// that place. It returns the loops, the points whose centroid joined no
// loop, and the mean number of points per centroid.
func byBand(pts []geometry.Point, nb *nbrs, lo, hi geometry.Point) (loops, rest [][]int32, per int) {
	n := len(pts)
	var radii []float64
	for i := 0; i < n; i += max(1, n/bandSample) {
		if row := nb.of(int32(i)); len(row) > 0 {
			radii = append(radii, fastDist(pts[i], pts[row[len(row)-1]]))
		}
	}
	h := 2 * median(radii)
	diag := hi.Dist(lo)
	var (
		reps []geometry.Point
		cell []int32 // cell[i] is the centroid of point i
		rnb  *nbrs
	)
	var rloops [][]int32
	for h < diag {
		reps, cell = thin(pts, h)
		if len(reps) < minPoints {
			break
		}
		rlo, rhi := bounds(reps)
		rnb = &nbrs{k: knnK, idx: knn(reps, nil, knnK, rlo, rhi)}
		rg := newGraph(len(reps))
		link(reps, rnb, rg)
		join(reps, rnb, rg)
		rloops, _ = rg.components(minPoints)
		if bandLinked(cell, len(reps), rloops) {
			break
		}
		h *= 2
	}
	if len(reps) < minPoints || len(rloops) == 0 {
		return nil, [][]int32{allNeighbours(n)}, 0
	}
	// Place every point along its centroid's loop.
	which := make([]int32, len(reps)) // loop of each centroid, −1 none
	at := make([]int32, len(reps))    // position in it
	for i := range which {
		which[i] = -1
	}
	cums := make([][]float64, len(rloops))
	for l, rl := range rloops {
		cum := make([]float64, len(rl)+1)
		for k, r := range rl {
			which[r], at[r] = int32(l), int32(k)
			cum[k+1] = cum[k] + fastDist(reps[r], reps[rl[(k+1)%len(rl)]])
		}
		cums[l] = cum
	}
	type placed struct {
		s float64
		i int32
	}
	byLoop := make([][]placed, len(rloops))
	var left []int32
	for i := range int32(n) {
		r := cell[i]
		l := which[r]
		if l < 0 {
			left = append(left, i)
			continue
		}
		rl, cum := rloops[l], cums[l]
		m := int32(len(rl))
		k := at[r]
		best, bs := math.Inf(1), cum[k]
		for _, e := range [2]int32{(k - 1 + m) % m, k} {
			a, b := reps[rl[e]], reps[rl[(e+1)%m]]
			ab := b.Sub(a)
			t := 0.0
			if l2 := ab.Dot(ab); l2 > 0 {
				t = min(1, max(0, pts[i].Sub(a).Dot(ab)/l2))
			}
			if d := fastDist(pts[i], a.Add(ab.Scale(t))); d < best {
				best, bs = d, cum[e]+t*(cum[e+1]-cum[e])
			}
		}
		byLoop[l] = append(byLoop[l], placed{bs, i})
	}
	for _, ps := range byLoop {
		slices.SortFunc(ps, func(a, b placed) int {
			switch {
			case a.s < b.s:
				return -1
			case a.s > b.s:
				return 1
			}
			return int(a.i - b.i)
		})
		seq := make([]int32, len(ps))
		for k, p := range ps {
			seq[k] = p.i
		}
		loops = append(loops, seq)
	}
	if len(left) > 0 {
		rest = append(rest, left)
	}
	return loops, rest, (n + len(reps) - 1) / len(reps)
}

// bandLinked reports whether the loops of centroids hold the
// centroids of at least 90% of the points (of), so that the thinned band
// links as a line does. Counting points rather than centroids keeps
// outliers, each its own centroid, from swaying the vote.
func bandLinked(of []int32, nreps int, loops [][]int32) bool {
	in := make([]bool, nreps)
	for _, l := range loops {
		for _, r := range l {
			in[r] = true
		}
	}
	k := 0
	for _, r := range of {
		if in[r] {
			k++
		}
	}
	return float64(k) >= 0.9*float64(len(of))
}

// allNeighbours returns 0, 1, …, n−1.
func allNeighbours(n int) []int32 {
	s := make([]int32, n)
	for i := range s {
		s[i] = int32(i)
	}
	return s
}

// thin thins pts to centroids at least about r apart: in index order,
// a point farther than r from every seed so far becomes a seed (a greedy
// Poisson-disk sample, found with a hash of cells of size r); every point
// then joins its nearest seed, and each seed is replaced by the centroid of
// its points. It returns the centroids and, for each point, its centroid.
func thin(pts []geometry.Point, r float64) (reps []geometry.Point, of []int32) {
	lo, _ := bounds(pts)
	g := &grid{h: r, x0: lo.X, y0: lo.Y}
	cells := make(map[uint64][]int32)
	var seeds []int32
	r2 := r * r
	near := func(p geometry.Point) (int32, float64) {
		ix, iy := g.cell(p)
		best, bd := int32(-1), math.Inf(1)
		for dy := int64(-1); dy <= 1; dy++ {
			for dx := int64(-1); dx <= 1; dx++ {
				for _, s := range cells[g.key(ix+dx, iy+dy)] {
					q := pts[seeds[s]]
					ex, ey := q.X-p.X, q.Y-p.Y
					if d2 := ex*ex + ey*ey; d2 < bd {
						best, bd = s, d2
					}
				}
			}
		}
		return best, bd
	}
	for i, p := range pts {
		if _, d2 := near(p); d2 <= r2 {
			continue
		}
		k := g.key(g.cell(p))
		cells[k] = append(cells[k], int32(len(seeds)))
		seeds = append(seeds, int32(i))
	}
	sum := make([]geometry.Point, len(seeds))
	cnt := make([]int, len(seeds))
	of = make([]int32, len(pts))
	for i, p := range pts {
		s, _ := near(p)
		of[i] = s
		sum[s] = sum[s].Add(p)
		cnt[s]++
	}
	reps = make([]geometry.Point, len(seeds))
	for s := range reps {
		reps[s] = sum[s].Scale(1 / float64(cnt[s]))
	}
	return reps, of
}
