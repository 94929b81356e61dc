package scangen

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// gridCell is the cell size of the vertex grid, chord units.
const gridCell = 0.01

// vertexGrid buckets the vertices of a dense polyline by square cells for
// nearest-vertex queries.
type vertexGrid struct {
	lo     geometry.Point
	nx, ny int
	cells  [][]int32
	verts  []vertex
}

func newVertexGrid(verts []vertex) *vertexGrid {
	lo := geometry.Point{X: math.Inf(1), Y: math.Inf(1)}
	hi := geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for _, v := range verts {
		lo.X, lo.Y = math.Min(lo.X, v.p.X), math.Min(lo.Y, v.p.Y)
		hi.X, hi.Y = math.Max(hi.X, v.p.X), math.Max(hi.Y, v.p.Y)
	}
	g := &vertexGrid{lo: lo, verts: verts}
	g.nx = int((hi.X-lo.X)/gridCell) + 1
	g.ny = int((hi.Y-lo.Y)/gridCell) + 1
	g.cells = make([][]int32, g.nx*g.ny)
	for i, v := range verts[:len(verts)-1] { // the last vertex repeats the first
		cx, cy := g.cell(v.p)
		g.cells[cy*g.nx+cx] = append(g.cells[cy*g.nx+cx], int32(i))
	}
	return g
}

// cell returns the cell of p, clamped to the grid.
func (g *vertexGrid) cell(p geometry.Point) (int, int) {
	cx := int(math.Floor((p.X - g.lo.X) / gridCell))
	cy := int(math.Floor((p.Y - g.lo.Y) / gridCell))
	return min(max(cx, 0), g.nx-1), min(max(cy, 0), g.ny-1)
}

// nearest returns the index of the vertex nearest to q.
func (g *vertexGrid) nearest(q geometry.Point) int {
	cx, cy := g.cell(q)
	// A point off the grid by more than a few cells: look at every vertex.
	inside := q.X >= g.lo.X-gridCell && q.Y >= g.lo.Y-gridCell &&
		q.X <= g.lo.X+float64(g.nx+1)*gridCell && q.Y <= g.lo.Y+float64(g.ny+1)*gridCell
	best, bestD := -1, math.Inf(1)
	look := func(i int32) {
		if d := g.verts[i].p.Dist(q); d < bestD {
			best, bestD = int(i), d
		}
	}
	if !inside {
		for i := range g.verts[:len(g.verts)-1] {
			look(int32(i))
		}
		return best
	}
	// Rings of cells about q's cell: every vertex beyond ring r is at least
	// r cells away, since q lies inside its own cell.
	for r := 0; ; r++ {
		if r > g.nx && r > g.ny {
			return best
		}
		for y := cy - r; y <= cy+r; y++ {
			if y < 0 || y >= g.ny {
				continue
			}
			for x := cx - r; x <= cx+r; x++ {
				if x < 0 || x >= g.nx || (max(abs(x-cx), abs(y-cy)) != r) {
					continue
				}
				for _, i := range g.cells[y*g.nx+x] {
					look(i)
				}
			}
		}
		if best >= 0 && bestD <= float64(r)*gridCell {
			return best
		}
	}
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// Nearest returns the distance from q (normalised frame) to the outline
// and the loop parameter of the nearest outline point: the nearest vertex
// of the dense polyline, refined by golden-section search on the exact
// pieces between its neighbours.
func (sh *Shape) Nearest(q geometry.Point) (dist, t float64) {
	i := sh.grid.nearest(q)
	last := len(sh.verts) - 1
	p := float64(len(sh.pieces))
	var a, b float64
	if i == 0 {
		a, b = sh.verts[last-1].t-p, sh.verts[1].t
	} else {
		a, b = sh.verts[i-1].t, sh.verts[i+1].t
	}
	f := func(t float64) float64 { return sh.At(t).Dist(q) }
	t = golden(a, b, f)
	// Keep the vertex itself when the search does no better (a corner).
	if f(t) > f(sh.verts[i].t) {
		t = sh.verts[i].t
	}
	return f(t), wrap(t, p)
}
