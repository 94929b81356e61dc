package clean

import (
	"math"
	"slices"

	"github.com/foilwright/foilwright/geometry"
)

// graph is an undirected graph on the points in which every point has
// at most two links: its components are chains and cycles.
type graph struct {
	adj [][2]int32 // −1 marks a free slot
}

// newGraph returns a graph of n points with no links.
func newGraph(n int) *graph {
	g := &graph{adj: make([][2]int32, n)}
	for i := range g.adj {
		g.adj[i] = [2]int32{-1, -1}
	}
	return g
}

// deg returns the number of links of i.
func (g *graph) deg(i int32) int {
	d := 0
	for _, q := range g.adj[i] {
		if q >= 0 {
			d++
		}
	}
	return d
}

// linked reports whether i and j are linked.
func (g *graph) linked(i, j int32) bool { return g.adj[i][0] == j || g.adj[i][1] == j }

// addEdge links i and j. It panics if either already has two links, or if
// i == j.
func (g *graph) addEdge(i, j int32) {
	if i == j || g.linked(i, j) {
		panic("geometry: loop graph: bad link")
	}
	g.addSlot(i, j)
	g.addSlot(j, i)
}

func (g *graph) addSlot(i, j int32) {
	switch {
	case g.adj[i][0] < 0:
		g.adj[i][0] = j
	case g.adj[i][1] < 0:
		g.adj[i][1] = j
	default:
		panic("geometry: loop graph: point has two links already")
	}
}

// walk returns the points reached from start, marking them in seen.
func (g *graph) walk(start int32, seen []bool) []int32 {
	var seq []int32
	prev, cur := int32(-1), start
	for cur >= 0 && !seen[cur] {
		seen[cur] = true
		seq = append(seq, cur)
		a := g.adj[cur]
		next := a[0]
		if next < 0 || next == prev || seen[next] {
			next = a[1]
		}
		prev, cur = cur, next
	}
	return seq
}

// components returns the cycles of at least minLoop points, each in walk
// order, and the remaining points as chains (open chains and short cycles).
func (g *graph) components(minLoop int) (loops, rest [][]int32) {
	n := len(g.adj)
	seen := make([]bool, n)
	for i := range int32(n) {
		if !seen[i] && g.deg(i) < 2 {
			rest = append(rest, g.walk(i, seen))
		}
	}
	for i := range int32(n) {
		if !seen[i] {
			c := g.walk(i, seen)
			if len(c) >= minLoop {
				loops = append(loops, c)
			} else {
				rest = append(rest, c)
			}
		}
	}
	return loops, rest
}

// area returns the signed area of the polygon pts[seq[0]], pts[seq[1]], …
func area(pts []geometry.Point, seq []int32) float64 {
	var a float64
	n := len(seq)
	if n == 0 {
		return 0
	}
	o := pts[seq[0]]
	for k := range n {
		p, q := pts[seq[k]].Sub(o), pts[seq[(k+1)%n]].Sub(o)
		a += p.Cross(q)
	}
	return a / 2
}

// joinReach is how far, in local point spacings, a chain end looks for
// another end to join.
const joinReach = 5

// selfClose is the largest gap, as a fraction of the chain's length,
// across which a chain that met no other end is closed on itself (an open
// trailing edge with dense points on either side).
const selfClose = 0.25

// join joins the ends of the chains of g into loops. Each end e has an
// outward direction u (from the chain point three links in, towards e) and a
// local spacing h (its last link; for a lone point, its nearest-neighbour
// distance). Every pair of ends (e, f) within joinReach·min(h_e, h_f) of
// each other is a candidate, with cost
//
//	|e − f| · w_e · w_f,   w_e = 1 + (1 − cos θ_e)/2,
//
// where θ_e is the angle between u_e and the step e → f (w = 1.5 for a lone
// point). A join that continues both chains straight costs its length; a
// corner such as a sharp trailing edge, where one chain turns back onto the
// other, costs up to twice as much, which is still cheaper than a jump to a
// point off the surface. Candidates are taken greedily, cheapest first; a
// join that closes a chain into a loop needs at least minPoints points.
// Finally every open chain of at least minPoints points whose ends are
// less than selfClose of its length apart is closed on itself.
func join(pts []geometry.Point, nb *nbrs, g *graph) {
	n := len(pts)
	parent := make([]int32, n)
	size := make([]int32, n)
	for i := range parent {
		parent[i], size[i] = int32(i), 1
	}
	var find func(int32) int32
	find = func(i int32) int32 {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	union := func(a, b int32) {
		a, b = find(a), find(b)
		if a == b {
			return
		}
		if size[a] < size[b] {
			a, b = b, a
		}
		parent[b] = a
		size[a] += size[b]
	}
	var ends []int32
	for i := range int32(n) {
		for _, q := range g.adj[i] {
			if q > i {
				union(i, q)
			}
		}
		if g.deg(i) < 2 {
			ends = append(ends, i)
		}
	}
	if len(ends) == 0 {
		return
	}
	// The direction and spacing at each end, by its place in ends (endAt
	// gives the place of a point): slices, not maps keyed by point, since
	// a dense band has ends by the hundred thousand.
	endAt := make([]int32, n)
	for i := range endAt {
		endAt[i] = -1
	}
	for j, e := range ends {
		endAt[e] = int32(j)
	}
	dir := make([]geometry.Point, len(ends))
	hasDir := make([]bool, len(ends))
	spc := make([]float64, len(ends))
	for je, e := range ends {
		switch g.deg(e) {
		case 1:
			in := g.adj[e][0]
			if in < 0 {
				in = g.adj[e][1]
			}
			spc[je] = pts[e].Dist(pts[in])
			prev, cur := e, in
			for range 2 {
				a := g.adj[cur]
				next := a[0]
				if next == prev {
					next = a[1]
				}
				if next < 0 || next == e {
					break
				}
				prev, cur = cur, next
			}
			d := pts[e].Sub(pts[cur])
			if l := d.Norm(); l > 0 {
				dir[je], hasDir[je] = d.Scale(1/l), true
			}
		default:
			row := nb.of(e)
			if len(row) > 0 {
				spc[je] = pts[e].Dist(pts[row[0]])
			}
		}
	}
	lo, hi := bounds(pts)
	const m = 8
	near := knn(pts, ends, m, lo, hi)
	weight := func(je int32, step geometry.Point) float64 {
		if !hasDir[je] {
			return 1.5
		}
		return 1 + (1-dir[je].Dot(step))/2
	}
	candidates := func() []cand {
		cs := make([]cand, 0, len(near)) // at most m per end: no regrowth
		for j, e := range ends {
			for _, f := range near[j*m : (j+1)*m] {
				if f < 0 {
					break
				}
				jf := endAt[f]
				d := pts[f].Sub(pts[e])
				l := d.Norm()
				if l == 0 || l > joinReach*min(spc[j], spc[jf]) {
					continue
				}
				s := d.Scale(1 / l)
				cs = append(cs, cand{e, f, l * weight(int32(j), s) * weight(jf, s.Scale(-1))})
			}
		}
		return cs
	}
	cs := candidates()
	if !radixSortCands(cs) {
		cs = candidates() // in the order slices.SortFunc is to start from
		slices.SortFunc(cs, candCmp)
	}
	for _, c := range cs {
		if g.deg(c.e) == 2 || g.deg(c.f) == 2 || g.linked(c.e, c.f) {
			continue
		}
		if find(c.e) == find(c.f) && size[find(c.e)] < minPoints {
			continue
		}
		g.addEdge(c.e, c.f)
		union(c.e, c.f)
	}
	// Close long open chains on themselves.
	seen := make([]bool, n)
	for _, e := range ends {
		if seen[e] || g.deg(e) != 1 {
			continue
		}
		ch := g.walk(e, seen)
		if len(ch) < minPoints {
			continue
		}
		var length float64
		for k := 1; k < len(ch); k++ {
			length += pts[ch[k-1]].Dist(pts[ch[k]])
		}
		a, b := ch[0], ch[len(ch)-1]
		if pts[a].Dist(pts[b]) <= selfClose*length {
			g.addEdge(a, b)
		}
	}
}

// cand is a join of the ends e and f at a cost.
type cand struct {
	e, f int32
	cost float64
}

// candCmp orders candidates by cost, then by their first end.
func candCmp(a, b cand) int {
	switch {
	case a.cost < b.cost:
		return -1
	case a.cost > b.cost:
		return 1
	}
	return int(a.e - b.e)
}

// radixSortCands sorts cs as slices.SortFunc(cs, candCmp) would and
// reports true, where it can: where every cost is a number ≥ 0 (whose bits
// order as it does) and no two candidates share both cost and first end,
// that order is the only one candCmp allows, and a radix sort on (cost, e),
// linear in the number of candidates (eight an end, by the hundred
// thousand in a dense band), finds it. Otherwise it reports false and cs
// is left in some order: the caller sorts the candidates as made.
func radixSortCands(cs []cand) bool {
	if len(cs) < 256 {
		slices.SortFunc(cs, candCmp)
		return true
	}
	for _, c := range cs {
		if math.Float64bits(c.cost) > 0x7ff0000000000000 || c.e < 0 {
			return false
		}
	}
	buf := make([]cand, len(cs))
	var count [1 << 16]int
	// Least significant digit first: e's two 16-bit digits, then the
	// cost's four; each pass is stable, so the result is ordered by cost
	// and, within a cost, by e.
	digit := func(c cand, d int) int {
		if d < 2 {
			return int(uint32(c.e) >> (16 * d) & 0xffff)
		}
		return int(math.Float64bits(c.cost) >> (16 * (d - 2)) & 0xffff)
	}
	src, dst := cs, buf
	for d := range 6 {
		clear(count[:])
		for _, c := range src {
			count[digit(c, d)]++
		}
		if count[digit(src[0], d)] == len(src) {
			continue // one digit throughout: the pass would change nothing
		}
		at := 0
		for k, c := range count {
			count[k] = at
			at += c
		}
		for _, c := range src {
			k := digit(c, d)
			dst[count[k]] = c
			count[k]++
		}
		src, dst = dst, src
	}
	copy(cs, src)
	for k := 1; k < len(cs); k++ {
		if cs[k].cost == cs[k-1].cost && cs[k].e == cs[k-1].e {
			return false // a tie, which candCmp leaves to the sort's own order
		}
	}
	return true
}
