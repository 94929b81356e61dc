package scangen

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// PieceKind says which part of a section a piece of its outline is.
type PieceKind string

// The pieces an outline is made of.
const (
	Upper PieceKind = "upper" // upper surface, from the trailing edge to the leading edge
	Lower PieceKind = "lower" // lower surface, from the leading edge to the trailing edge
	Base  PieceKind = "base"  // the flat base of a blunt trailing edge, lower to upper corner
	Round PieceKind = "round" // the rounded end of a printed part, lower to upper surface
)

// piece is one smooth stretch of a closed outline: at maps u ∈ [0, 1] to a
// point of the raw (unnormalised) shape.
type piece struct {
	at   func(u float64) geometry.Point
	kind PieceKind
}

// Shape is the true closed outline of a section in the normalised frame of
// the tool's convention: the trailing-edge point (the corner of a sharp
// edge, the midpoint of a blunt base, the tip of a rounded end) at (1, 0)
// and the leading edge, the outline point farthest from it, at (0, 0).
//
// The outline is a chain of exact pieces (closed-form surfaces, straight
// bases, circular arcs) with a loop parameter t ∈ [0, P): piece k covers
// [k, k+1). It runs counter-clockwise: upper surface from the trailing
// edge to the leading edge, lower surface back, then the base or the
// rounded end. A dense polyline with an arc-length table serves sampling
// and nearest-point queries; the queries are refined on the exact pieces.
type Shape struct {
	pieces []piece
	origin geometry.Point // raw leading edge
	turn   float64        // raw chord-line angle
	scale  float64        // 1 / raw chord
	tLE    float64
	tTE    float64
	verts  []vertex
	grid   *vertexGrid
	angle  func(t float64) float64 // circle angle of a Kármán–Trefftz outline, or nil
}

// vertex is a point of the dense polyline: position, loop parameter and
// arc length from t = 0.
type vertex struct {
	p    geometry.Point
	t, s float64
}

// teRule says where the trailing-edge point of an outline lies.
type teRule int

const (
	teCorner  teRule = iota // the start of the first piece (a sharp edge)
	teBaseMid               // the midpoint of the base, piece 2
	teTip                   // the point farthest from the leading edge (a rounded end)
)

// newShape builds the Shape of the raw pieces. The trailing-edge point
// follows rule; the leading edge is the outline point farthest from it
// (common practice); a rounded end's tip is the point farthest from the
// leading edge, so the two are the ends of the outline's diameter.
func newShape(pieces []piece, rule teRule) *Shape {
	sh := &Shape{pieces: pieces, scale: 1}
	n := float64(len(pieces))
	var te geometry.Point
	switch rule {
	case teCorner:
		sh.tTE, te = 0, pieces[0].at(0)
	case teBaseMid:
		sh.tTE, te = 2.5, pieces[2].at(0.5)
	case teTip:
		sh.tTE, te = 2.5, pieces[2].at(0.5) // the middle of the arc, near the tip
	}
	sh.tLE = sh.farthest(te)
	le := sh.rawAt(sh.tLE)
	if rule == teTip {
		for range 30 {
			tTE := sh.farthest(le)
			te = sh.rawAt(tTE)
			tLE := sh.farthest(te)
			done := math.Abs(tLE-sh.tLE) < 1e-13 && math.Abs(tTE-sh.tTE) < 1e-13
			sh.tLE, sh.tTE = tLE, tTE
			le = sh.rawAt(tLE)
			if done {
				break
			}
		}
	}
	d := te.Sub(le)
	sh.origin, sh.turn, sh.scale = le, math.Atan2(d.Y, d.X), 1/d.Norm()
	sh.tLE, sh.tTE = wrap(sh.tLE, n), wrap(sh.tTE, n)
	sh.densify()
	sh.grid = newVertexGrid(sh.verts)
	return sh
}

// wrap returns t modulo n in [0, n).
func wrap(t, n float64) float64 {
	t = math.Mod(t, n)
	if t < 0 {
		t += n
	}
	if t >= n {
		t = 0
	}
	return t
}

// rawAt returns the raw point at loop parameter t (taken modulo P).
func (sh *Shape) rawAt(t float64) geometry.Point {
	n := len(sh.pieces)
	t = wrap(t, float64(n))
	k := int(t)
	if k >= n {
		k = n - 1
	}
	return sh.pieces[k].at(math.Min(t-float64(k), 1))
}

// normalise maps a raw point into the normalised frame.
func (sh *Shape) normalise(p geometry.Point) geometry.Point {
	return p.Sub(sh.origin).Rotate(-sh.turn).Scale(sh.scale)
}

// farthest returns the loop parameter of the outline point farthest from
// q: a scan of every piece, then golden-section search about the best
// sample.
func (sh *Shape) farthest(q geometry.Point) float64 {
	const per = 600
	n := len(sh.pieces)
	best, bestD := 0.0, -1.0
	for k := range n {
		for i := range per {
			t := float64(k) + float64(i)/per
			if d := sh.rawAt(t).Dist(q); d > bestD {
				best, bestD = t, d
			}
		}
	}
	h := 2.0 / per
	return golden(best-h, best+h, func(t float64) float64 { return -sh.rawAt(t).Dist(q) })
}

// golden returns the minimiser of f on [a, b] by golden-section search,
// to about 1e-14 in the argument.
func golden(a, b float64, f func(float64) float64) float64 {
	g := (math.Sqrt(5) - 1) / 2
	c, d := b-g*(b-a), a+g*(b-a)
	fc, fd := f(c), f(d)
	for range 200 {
		if b-a < 1e-14*math.Max(1, math.Abs(a)) {
			break
		}
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - g*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + g*(b-a)
			fd = f(d)
		}
	}
	return (a + b) / 2
}

// RawFrame returns the similarity between the raw shape the pieces are
// written in (the mapping plane of a Kármán–Trefftz section) and the
// normalised frame: the raw leading edge, the angle of the raw chord line
// and the raw chord. A raw point z lies at R(−turn)(z − le)/chord.
func (sh *Shape) RawFrame() (le geometry.Point, turn, chord float64) {
	return sh.origin, sh.turn, 1 / sh.scale
}

// Pieces returns P, the number of pieces: the loop parameter runs over
// [0, P).
func (sh *Shape) Pieces() int { return len(sh.pieces) }

// At returns the point of the outline at loop parameter t (taken modulo P),
// in the normalised frame.
func (sh *Shape) At(t float64) geometry.Point { return sh.normalise(sh.rawAt(t)) }

// Kind returns the kind of the piece that holds loop parameter t.
func (sh *Shape) Kind(t float64) PieceKind {
	n := len(sh.pieces)
	k := int(wrap(t, float64(n)))
	return sh.pieces[min(k, n-1)].kind
}

// LE returns the loop parameter of the leading edge, (0, 0).
func (sh *Shape) LE() float64 { return sh.tLE }

// TE returns the loop parameter of the trailing-edge point, (1, 0).
func (sh *Shape) TE() float64 { return sh.tTE }

// Normal returns the outward unit normal at loop parameter t, from a
// difference quotient taken inside t's piece (one-sided at its ends).
func (sh *Shape) Normal(t float64) geometry.Point {
	n := len(sh.pieces)
	t = wrap(t, float64(n))
	k := min(int(t), n-1)
	u := t - float64(k)
	const h = 1e-7
	u0, u1 := math.Max(u-h, 0), math.Min(u+h, 1)
	d := sh.normalise(sh.pieces[k].at(u1)).Sub(sh.normalise(sh.pieces[k].at(u0)))
	l := d.Norm()
	return geometry.Point{X: d.Y / l, Y: -d.X / l}
}

// Length returns the perimeter of the outline, in chord units.
func (sh *Shape) Length() float64 { return sh.verts[len(sh.verts)-1].s }

// ArcAt returns the arc length from t = 0 to loop parameter t ∈ [0, P].
func (sh *Shape) ArcAt(t float64) float64 {
	i := searchVerts(sh.verts, func(v vertex) float64 { return v.t }, t)
	a, b := sh.verts[i], sh.verts[i+1]
	return a.s + (b.s-a.s)*(t-a.t)/(b.t-a.t)
}

// ParamAt returns the loop parameter at arc length s ∈ [0, Length()] from
// t = 0, interpolated on the dense polyline (the point At returns lies
// exactly on the outline; its arc length is right to about 1e-9 chord).
func (sh *Shape) ParamAt(s float64) float64 {
	i := searchVerts(sh.verts, func(v vertex) float64 { return v.s }, s)
	a, b := sh.verts[i], sh.verts[i+1]
	if b.s == a.s {
		return a.t
	}
	return a.t + (b.t-a.t)*(s-a.s)/(b.s-a.s)
}

// searchVerts returns i with key(verts[i]) ≤ x ≤ key(verts[i+1]), clamped
// to the first and last interval.
func searchVerts(verts []vertex, key func(vertex) float64, x float64) int {
	lo, hi := 0, len(verts)-1
	for hi-lo > 1 {
		m := (lo + hi) / 2
		if key(verts[m]) <= x {
			lo = m
		} else {
			hi = m
		}
	}
	return lo
}

// Dense returns the dense polyline of the outline (normalised frame), in
// loop order, its last point equal to its first.
func (sh *Shape) Dense() []geometry.Point {
	out := make([]geometry.Point, len(sh.verts))
	for i, v := range sh.verts {
		out[i] = v.p
	}
	return out
}

// CircleAngle returns the circle angle φ (radians) of the point at loop
// parameter t of a Kármán–Trefftz outline, for the exact flow solution;
// ok is false for other outlines.
func (sh *Shape) CircleAngle(t float64) (phi float64, ok bool) {
	if sh.angle == nil {
		return 0, false
	}
	return sh.angle(wrap(t, float64(len(sh.pieces)))), true
}

// Densification limits: the polyline departs from the outline by at most
// sagTol between vertices and no segment is longer than segMax (chord
// units).
const (
	sagTol = 1e-7
	segMax = 2e-3
)

// densify fills sh.verts: each piece is split until every segment is short
// and close to the outline.
func (sh *Shape) densify() {
	sh.verts = sh.verts[:0]
	var s float64
	add := func(p geometry.Point, t float64) {
		if n := len(sh.verts); n > 0 {
			s += p.Dist(sh.verts[n-1].p)
		}
		sh.verts = append(sh.verts, vertex{p: p, t: t, s: s})
	}
	for k, pc := range sh.pieces {
		at := func(u float64) geometry.Point { return sh.normalise(pc.at(u)) }
		var split func(u0, u1 float64, p0, p1 geometry.Point, depth int)
		split = func(u0, u1 float64, p0, p1 geometry.Point, depth int) {
			um := (u0 + u1) / 2
			pm := at(um)
			if depth < 40 && (p0.Dist(p1) > segMax || pm.Dist(p0.Add(p1).Scale(0.5)) > sagTol) {
				split(u0, um, p0, pm, depth+1)
				split(um, u1, pm, p1, depth+1)
				return
			}
			add(p1, float64(k)+u1)
		}
		const start = 64
		prev := at(0)
		if k == 0 {
			add(prev, 0)
		}
		for i := 1; i <= start; i++ {
			u0, u1 := float64(i-1)/start, float64(i)/start
			p1 := at(u1)
			split(u0, u1, prev, p1, 0)
			prev = p1
		}
	}
}
