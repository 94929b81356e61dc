package compare

import (
	"math"

	"github.com/foilwright/foilwright/compare/align"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
)

// Outline is the design's closed outline in the part frame: a spline in
// the node order of package geometry (trailing edge, upper surface,
// leading edge, lower surface), closed by a straight base from its end to
// its start when the trailing edge is blunt. It answers nearest-point
// questions (align.Outline) through a grid of samples and Newton's method
// on the spline. Positions along it are arc lengths from the start of the
// spline; the base follows the spline's end.
type Outline struct {
	cv     *curve.Curve
	base   bool    // a straight base joins End to Start
	corner bool    // the spline's ends meet at a corner (a sharp edge)
	length float64 // arc length of the spline
	leI    int     // the leading edge's piece and local parameter
	leU    float64
	grid   sampleGrid
}

// newOutline returns the outline of cv (counter-clockwise), with a base
// when base is set, and the leading edge at arc length sLE.
func newOutline(cv *curve.Curve, base bool, sLE float64) *Outline {
	o := &Outline{cv: cv, base: base, length: cv.Length()}
	if !base && cv.Closed() {
		ta, tb := cv.Tangent(o.length), cv.Tangent(0)
		o.corner = math.Abs(geometry.Turn(ta, tb)) > 1e-3
	}
	o.leI, o.leU = cv.Locate(sLE)
	o.grid = newSampleGrid(cv)
	return o
}

// Curve returns the spline of the outline.
func (o *Outline) Curve() *curve.Curve { return o.cv }

// Length returns the length of the outline: the spline and its base.
func (o *Outline) Length() float64 {
	if o.base {
		return o.length + o.cv.Start().Dist(o.cv.End())
	}
	return o.length
}

// Surface returns the surface of the foot at position s (see Nearest).
func (o *Outline) Surface(s float64) string {
	switch {
	case s > o.length:
		return SurfaceBase
	case s <= o.cv.PieceStart(o.leI)+o.leU/o.cv.Span(o.leI)*(o.cv.PieceStart(o.leI+1)-o.cv.PieceStart(o.leI)):
		return SurfaceUpper
	}
	return SurfaceLower
}

// position returns the arc length at piece i, local parameter u, taking
// the parameter as proportional to arc length within a piece (the spline's
// parameter is chord length, within a small fraction of arc length).
func (o *Outline) position(i int, u float64) float64 {
	a, b := o.cv.PieceStart(i), o.cv.PieceStart(i+1)
	return a + u/o.cv.Span(i)*(b-a)
}

// Nearest returns the foot of p on the outline (align.Outline): the
// nearest point, the signed distance (positive outside) and the direction
// in which it grows; Position is the arc length of the foot from the
// start of the spline, or beyond its length on the base.
func (o *Outline) Nearest(p geometry.Point) align.Foot {
	i0, u0 := o.grid.nearest(p)
	return o.nearestFrom(p, i0, u0)
}

// NearestFrom is Nearest, searching from the foot near of a point nearby
// (align.Tracker).
func (o *Outline) NearestFrom(p geometry.Point, near align.Foot) align.Foot {
	i := int(near.Hint[0])
	if i < 0 {
		// On the base: search the spline from its nearer end.
		return o.Nearest(p)
	}
	return o.nearestFrom(p, i, near.Hint[1])
}

// nearestFrom finds the foot of p by Newton's method on the spline from
// piece i0, local parameter u0, then against the base.
func (o *Outline) nearestFrom(p geometry.Point, i0 int, u0 float64) align.Foot {
	cv := o.cv
	i, u, dist := cv.ProjectFrom(p, i0, u0)
	q, d1, _ := cv.Eval(i, u)
	out := geometry.Point{X: d1.Y, Y: -d1.X}.Scale(1 / d1.Norm())
	last := cv.Pieces() - 1
	atStart := i == 0 && u <= 0
	atEnd := i == last && u >= cv.Span(last)
	foot := align.Foot{Point: q, Position: o.position(i, u), Hint: [2]float64{float64(i), u}}
	if o.base {
		a, b := cv.End(), cv.Start()
		e := b.Sub(a)
		t := min(max(p.Sub(a).Dot(e)/e.Dot(e), 0), 1)
		qb := a.Add(e.Scale(t))
		if db := p.Dist(qb); db < dist {
			nb := geometry.Point{X: e.Y, Y: -e.X}.Scale(1 / e.Norm())
			f := cornerFoot(p, qb, nb, t <= 0 || t >= 1, o.length+t*e.Norm(), o.baseCornerNormal(t >= 1, nb))
			f.Hint = [2]float64{-1, t}
			return f
		}
	}
	if atStart || atEnd {
		if o.base || o.corner {
			// A corner: the distance grows along the direction from it;
			// which side is out follows the mean of the normals there.
			var other geometry.Point
			switch {
			case o.base:
				e := cv.Start().Sub(cv.End())
				other = geometry.Point{X: e.Y, Y: -e.X}.Scale(1 / e.Norm())
			case atStart:
				_, d, _ := cv.Eval(last, cv.Span(last))
				other = geometry.Point{X: d.Y, Y: -d.X}.Scale(1 / d.Norm())
			default:
				_, d, _ := cv.Eval(0, 0)
				other = geometry.Point{X: d.Y, Y: -d.X}.Scale(1 / d.Norm())
			}
			f := cornerFoot(p, q, out, true, foot.Position, out.Add(other))
			f.Hint = foot.Hint
			return f
		}
	}
	foot.Normal = out
	foot.Distance = dist
	if p.Sub(q).Dot(out) < 0 {
		foot.Distance = -dist
	}
	return foot
}

// baseCornerNormal returns the mean of the base normal nb and the
// spline's normal at the corner the base meets at its start (atStart,
// the spline's start) or end.
func (o *Outline) baseCornerNormal(atStart bool, nb geometry.Point) geometry.Point {
	var d geometry.Point
	if atStart {
		_, d, _ = o.cv.Eval(0, 0)
	} else {
		last := o.cv.Pieces() - 1
		_, d, _ = o.cv.Eval(last, o.cv.Span(last))
	}
	return nb.Add(geometry.Point{X: d.Y, Y: -d.X}.Scale(1 / d.Norm()))
}

// cornerFoot returns the foot of p at q, where the outline's outward
// normal is n; when corner is set, q is a corner whose sides have the mean
// outward normal mean, and the distance grows along the direction from q
// to p, outward when that direction leans to mean.
func cornerFoot(p, q, n geometry.Point, corner bool, pos float64, mean geometry.Point) align.Foot {
	d := p.Sub(q)
	dist := d.Norm()
	f := align.Foot{Point: q, Position: pos, Normal: n, Distance: dist}
	if corner && dist > 0 {
		f.Normal = d.Scale(1 / dist)
		if d.Dot(mean) < 0 {
			f.Distance, f.Normal = -dist, f.Normal.Scale(-1)
		}
		return f
	}
	if d.Dot(n) < 0 {
		f.Distance = -dist
	}
	return f
}

// sampleGrid finds the sample of a spline nearest to a point: samples at
// quarters of every piece, binned in square cells.
type sampleGrid struct {
	x0, y0 float64
	cell   float64
	nx, ny int
	start  []int32 // cell k holds samples start[k] ≤ j < start[k+1]
	pts    []geometry.Point
	piece  []int32
	u      []float64
}

func newSampleGrid(cv *curve.Curve) sampleGrid {
	var g sampleGrid
	np := cv.Pieces()
	type sample struct {
		p     geometry.Point
		piece int32
		u     float64
	}
	ss := make([]sample, 0, 4*np+1)
	lo := geometry.Point{X: math.Inf(1), Y: math.Inf(1)}
	hi := geometry.Point{X: math.Inf(-1), Y: math.Inf(-1)}
	for i := range np {
		h := cv.Span(i)
		for _, f := range [...]float64{0, 0.25, 0.5, 0.75} {
			q, _, _ := cv.Eval(i, f*h)
			ss = append(ss, sample{q, int32(i), f * h})
		}
	}
	ss = append(ss, sample{cv.End(), int32(np - 1), cv.Span(np - 1)})
	for _, s := range ss {
		lo.X, lo.Y = math.Min(lo.X, s.p.X), math.Min(lo.Y, s.p.Y)
		hi.X, hi.Y = math.Max(hi.X, s.p.X), math.Max(hi.Y, s.p.Y)
	}
	// About four samples a cell on average along the curve.
	g.cell = 4 * cv.Length() / float64(len(ss))
	if !(g.cell > 0) {
		g.cell = 1
	}
	g.x0, g.y0 = lo.X, lo.Y
	g.nx = int((hi.X-lo.X)/g.cell) + 1
	g.ny = int((hi.Y-lo.Y)/g.cell) + 1
	counts := make([]int32, g.nx*g.ny+1)
	key := func(p geometry.Point) int {
		cx := min(int((p.X-g.x0)/g.cell), g.nx-1)
		cy := min(int((p.Y-g.y0)/g.cell), g.ny-1)
		return cy*g.nx + cx
	}
	for _, s := range ss {
		counts[key(s.p)+1]++
	}
	for k := 1; k < len(counts); k++ {
		counts[k] += counts[k-1]
	}
	g.start = counts
	g.pts = make([]geometry.Point, len(ss))
	g.piece = make([]int32, len(ss))
	g.u = make([]float64, len(ss))
	fill := append([]int32(nil), counts[:len(counts)-1]...)
	for _, s := range ss {
		k := key(s.p)
		j := fill[k]
		fill[k]++
		g.pts[j], g.piece[j], g.u[j] = s.p, s.piece, s.u
	}
	return g
}

// nearest returns the piece and local parameter of the sample nearest to
// p, searching rings of cells outward from p's cell until no closer sample
// can remain.
func (g *sampleGrid) nearest(p geometry.Point) (int, float64) {
	fx, fy := (p.X-g.x0)/g.cell, (p.Y-g.y0)/g.cell
	cx, cy := int(math.Floor(fx)), int(math.Floor(fy))
	best, bj := math.Inf(1), -1
	if cx < -2 || cy < -2 || cx > g.nx+1 || cy > g.ny+1 {
		// Far outside the grid: every sample is about as far; look at all.
		for j, q := range g.pts {
			if d := (q.X-p.X)*(q.X-p.X) + (q.Y-p.Y)*(q.Y-p.Y); d < best {
				best, bj = d, j
			}
		}
		return int(g.piece[bj]), g.u[bj]
	}
	// The ring beyond which every cell of the grid has been seen.
	far := max(abs(cx), abs(cx-(g.nx-1)), abs(cy), abs(cy-(g.ny-1)))
	for r := 0; r <= far; r++ {
		for y := cy - r; y <= cy+r; y++ {
			if y < 0 || y >= g.ny {
				continue
			}
			step := 2 * r
			if y == cy-r || y == cy+r || r == 0 {
				step = 1
			}
			for x := cx - r; x <= cx+r; x += max(step, 1) {
				if x < 0 || x >= g.nx {
					continue
				}
				k := y*g.nx + x
				for j := g.start[k]; j < g.start[k+1]; j++ {
					q := g.pts[j]
					if d := (q.X-p.X)*(q.X-p.X) + (q.Y-p.Y)*(q.Y-p.Y); d < best {
						best, bj = d, int(j)
					}
				}
			}
		}
		// Every cell of ring r+1 lies at least r cells from p.
		if bj >= 0 && best <= sq(float64(r)*g.cell) {
			break
		}
	}
	return int(g.piece[bj]), g.u[bj]
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}

func sq(v float64) float64 { return v * v }
