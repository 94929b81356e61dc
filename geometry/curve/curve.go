package curve

import (
	"math"
	"sync"
	"sync/atomic"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/numeric"
	"gonum.org/v1/gonum/integrate/quad"
)

// Curve is a parametric piecewise-cubic curve in the plane, the result of a
// fit or of normalisation. It implements Path: At, Curvature and the other
// methods that take s use arc length s in [0, Length()], measured from the
// start of the curve, and clamp s to that range.
//
// A closed curve ends where it starts (Closed reports it); a curve fitted to
// a loop with a smooth (rounded) trailing edge is also smooth across its
// start, while a curve with a sharp trailing edge has a corner there. An open
// curve (a blunt trailing edge kept as it is) runs from the upper
// trailing-edge corner to the lower one; the base between them is not part
// of the curve.
//
// Internally a Curve is a sequence of pieces, each a cubic polynomial in its
// own parameter u ∈ [0, hᵢ]; the parameter is close to, but not exactly,
// arc length. Arc length is integrated per piece by 8-point Gauss–Legendre
// quadrature. A Curve is immutable; the zero Curve is not usable.
type Curve struct {
	ts     []float64    // parameter at the start of each piece; len = pieces+1
	xs, ys [][4]float64 // coefficients of each piece in u = t − ts[i]
	ss     []float64    // arc length at ts
	pl     []float64    // arc length of each piece
	// The leaves of the adaptive quadrature of each piece (see newCurve):
	// piece i has leaves leafAt[i] ≤ k < leafAt[i+1], leaf k ending at
	// parameter leafU[k] with arc length leafS[k] from the start of the
	// piece to there.
	leafAt       []int32
	leafU, leafS []float64
	closed       bool
}

// glOrder is the order of the Gauss–Legendre rule used per piece:
// exact for polynomials of degree 15, which covers the Green's-theorem
// integrands of cubic pieces (degree ≤ 11).
const glOrder = 8

// glRule returns Gauss–Legendre nodes and weights on [0, 1].
var glRule = sync.OnceValue(func() [2][]float64 {
	x := make([]float64, glOrder)
	w := make([]float64, glOrder)
	quad.Legendre{}.FixedLocations(x, w, 0, 1)
	return [2][]float64{x, w}
})

// newCurve builds a curve from piece coefficients. ts has one more entry
// than xs and ys. It computes the arc-length table.
//
// The length of each piece comes from Gauss–Legendre rules on a bisection
// of the piece, refined where the speed is far from smooth (a piece that
// nearly folds back on itself) until the rule on every part agrees with the
// sum of its halves. The finest parts, the leaves, are kept, so that the
// arc length to any parameter u needs one rule, over the part of its leaf
// before u (see partial).
func newCurve(ts []float64, xs, ys [][4]float64, closed bool) *Curve {
	if len(xs) == 0 || len(xs) != len(ys) || len(ts) != len(xs)+1 {
		panic("geometry: inconsistent curve pieces")
	}
	np := len(xs)
	c := &Curve{ts: ts, xs: xs, ys: ys, closed: closed}
	c.ss = make([]float64, np+1)
	c.pl = make([]float64, np)
	c.leafAt = make([]int32, np+1)
	if np >= parallelPieces {
		// The pieces are independent; the table does not depend on the
		// split. Rough pieces, which cost most, bunch together, so two
		// goroutines take chunks in turn rather than half each.
		nc := (np + measureChunk - 1) / measureChunk
		chunks := make([]leaves, nc)
		var next atomic.Int64
		work := func() {
			for {
				k := int(next.Add(1)) - 1
				if k >= nc {
					return
				}
				chunks[k] = c.measure(k*measureChunk, min((k+1)*measureChunk, np))
			}
		}
		var wg sync.WaitGroup
		wg.Go(work)
		work()
		wg.Wait()
		total := 0
		for _, ch := range chunks {
			total += len(ch.u)
		}
		c.leafU, c.leafS = make([]float64, 0, total), make([]float64, 0, total)
		for k, ch := range chunks {
			off := int32(len(c.leafU))
			for i := k*measureChunk + 1; i <= min((k+1)*measureChunk, np); i++ {
				c.leafAt[i] += off
			}
			c.leafU = append(c.leafU, ch.u...)
			c.leafS = append(c.leafS, ch.s...)
		}
	} else {
		all := c.measure(0, np)
		c.leafU, c.leafS = all.u, all.s
	}
	for i, l := range c.pl {
		c.ss[i+1] = c.ss[i] + l
	}
	return c
}

// parallelPieces is the least number of pieces for which newCurve
// measures the pieces on two goroutines.
const parallelPieces = 2048

// measureChunk is the number of pieces a goroutine of newCurve measures at a
// time.
const measureChunk = 512

// leaves collects the leaves of a run of pieces.
type leaves struct {
	u, s []float64
	sum  float64 // arc length from the start of the current piece
}

// add records a leaf ending at u with arc length l. The storage doubles
// when full: a curve with many rough pieces has many leaves.
func (lv *leaves) add(u, l float64) {
	if len(lv.u) == cap(lv.u) {
		k := 2*cap(lv.u) + 16
		lv.u = append(make([]float64, 0, k), lv.u...)
		lv.s = append(make([]float64, 0, k), lv.s...)
	}
	lv.sum += l
	lv.u, lv.s = append(lv.u, u), append(lv.s, lv.sum)
}

// measure sets pl[i] and leafAt[i+1] for pieces lo ≤ i < hi, with leaf
// indices counted from the first leaf of piece lo, and returns their
// leaves.
func (c *Curve) measure(lo, hi int) leaves {
	lv := leaves{u: make([]float64, 0, 2*(hi-lo)+16), s: make([]float64, 0, 2*(hi-lo)+16)}
	for i := lo; i < hi; i++ {
		h := c.Span(i)
		lv.sum = 0
		c.pl[i] = c.partialOn(i, 0, h, c.glOn(i, 0, h), 0, &lv)
		c.leafAt[i+1] = int32(len(lv.u))
	}
	return lv
}

// poly evaluates a cubic and its first two derivatives at u.
func poly(k [4]float64, u float64) (v, d1, d2 float64) {
	v = k[0] + u*(k[1]+u*(k[2]+u*k[3]))
	d1 = k[1] + u*(2*k[2]+3*u*k[3])
	d2 = 2*k[2] + 6*u*k[3]
	return v, d1, d2
}

// Pieces returns the number of cubic pieces of c.
func (c *Curve) Pieces() int { return len(c.xs) }

// Closed reports whether c ends where it starts.
func (c *Curve) Closed() bool { return c.closed }

// Length returns the arc length of c.
func (c *Curve) Length() float64 { return c.ss[len(c.ss)-1] }

func (c *Curve) Span(i int) float64 { return c.ts[i+1] - c.ts[i] }

func (c *Curve) speed(i int, u float64) float64 {
	return speedOf(&c.xs[i], &c.ys[i], u)
}

// speedOf returns |(x'(u), y'(u))| for pieces x and y. The components
// are of the order of 1 (the parameter is close to arc length), so the
// plain root of the sum of squares neither overflows nor underflows.
func speedOf(x, y *[4]float64, u float64) float64 {
	dx := x[1] + u*(2*x[2]+3*u*x[3])
	dy := y[1] + u*(2*y[2]+3*u*y[3])
	return math.Sqrt(dx*dx + dy*dy)
}

// partial returns the arc length of piece i from u = 0 to u: the length
// up to the start of the leaf holding u plus the Gauss–Legendre rule over
// the part of the leaf before u. A leaf is a part of the piece on which the
// rule agrees with the bisected rule, so the rule is as accurate on any part
// of it.
func (c *Curve) partial(i int, u float64) float64 {
	if u >= c.Span(i) {
		if u == c.Span(i) {
			return c.pl[i]
		}
		return c.pl[i] + c.glOn(i, c.Span(i), u)
	}
	if !(u > 0) {
		return c.glOn(i, 0, u)
	}
	k0, k1 := int(c.leafAt[i]), int(c.leafAt[i+1])
	us := c.leafU[k0:k1]
	// The leaf holding u is the first that ends after u.
	k := 0
	if len(us) <= 8 {
		for k < len(us)-1 && us[k] <= u {
			k++
		}
	} else {
		k = searchAfter(us[:len(us)-1], u)
	}
	var a, before float64
	if k > 0 {
		a, before = us[k-1], c.leafS[k0+k-1]
	}
	return before + c.glOn(i, a, u)
}

func (c *Curve) glOn(i int, a, b float64) float64 {
	// speedOf with the coefficients in registers.
	x1, x2, x3 := c.xs[i][1], 2*c.xs[i][2], c.xs[i][3]
	y1, y2, y3 := c.ys[i][1], 2*c.ys[i][2], c.ys[i][3]
	w := b - a
	var l float64
	for k, t := range glNodes {
		u := a + t*w
		dx := x1 + u*(x2+3*u*x3)
		dy := y1 + u*(y2+3*u*y3)
		l += glWeights[k] * math.Sqrt(dx*dx+dy*dy)
	}
	return l * w
}

// glNodes and glWeights are glRule in arrays, for the hot loop
// of glOn.
var glNodes, glWeights = func() (x, w [glOrder]float64) {
	gl := glRule()
	copy(x[:], gl[0])
	copy(w[:], gl[1])
	return x, w
}()

// partialOn returns the length of piece i from a to b, given the rule over
// the whole of [a, b], bisecting until the halves agree with the whole.
// It records the halves of every accepted part as leaves in lv.
func (c *Curve) partialOn(i int, a, b, whole float64, depth int, lv *leaves) float64 {
	m := (a + b) / 2
	l, r := c.glOn(i, a, m), c.glOn(i, m, b)
	if depth >= maxDepth || math.Abs(l+r-whole) <= 1e-11*math.Abs(whole) {
		lv.add(m, l)
		lv.add(b, r)
		return l + r
	}
	return c.partialOn(i, a, m, l, depth+1, lv) + c.partialOn(i, m, b, r, depth+1, lv)
}

// maxDepth bounds the bisection of partial.
const maxDepth = 20

// Locate returns the piece and local parameter at arc length s.
func (c *Curve) Locate(s float64) (int, float64) {
	L := c.Length()
	switch {
	case !(s > 0):
		return 0, 0
	case s >= L:
		i := len(c.xs) - 1
		return i, c.Span(i)
	}
	i := searchAtLeast(c.ss, s) - 1
	if i < 0 {
		i = 0
	}
	if i >= len(c.xs) {
		i = len(c.xs) - 1
	}
	target := s - c.ss[i]
	h := c.Span(i)
	pl := c.ss[i+1] - c.ss[i]
	if pl <= 0 {
		return i, 0
	}
	u := h * target / pl
	tol := 1e-14 * (L + 1)
	for range 12 {
		f := c.partial(i, u) - target
		if math.Abs(f) <= tol {
			return i, u
		}
		sp := c.speed(i, u)
		if sp <= 0 {
			break
		}
		u = min(h, max(0, u-f/sp)) // math.Min and math.Max, inline
	}
	if math.Abs(c.partial(i, u)-target) <= 1e3*tol {
		return i, u
	}
	// Newton stalled (a piece with nearly zero speed): bisect, the arc
	// length being monotone in u.
	a, b := 0.0, h
	for range 100 {
		u = (a + b) / 2
		if c.partial(i, u) < target {
			a = u
		} else {
			b = u
		}
		if b-a <= 1e-15*h {
			break
		}
	}
	return i, (a + b) / 2
}

// searchAtLeast is sort.SearchFloat64s(a, x), the least index i with
// a[i] >= x (len(a) if none), by the same halving with the comparison
// inline rather than through a function value.
func searchAtLeast(a []float64, x float64) int {
	i, j := 0, len(a)
	for i < j {
		h := int(uint(i+j) >> 1)
		if !(a[h] >= x) {
			i = h + 1
		} else {
			j = h
		}
	}
	return i
}

// searchAfter is sort.Search(len(a), func(j int) bool { return a[j] > x }),
// the least index i with a[i] > x (len(a) if none), the comparison inline.
func searchAfter(a []float64, x float64) int {
	i, j := 0, len(a)
	for i < j {
		h := int(uint(i+j) >> 1)
		if !(a[h] > x) {
			i = h + 1
		} else {
			j = h
		}
	}
	return i
}

// arc returns the arc length at piece i, local parameter u.
func (c *Curve) arc(i int, u float64) float64 { return c.ss[i] + c.partial(i, u) }

func (c *Curve) Eval(i int, u float64) (p, d1, d2 geometry.Point) {
	x, dx, ddx := poly(c.xs[i], u)
	y, dy, ddy := poly(c.ys[i], u)
	return geometry.Point{X: x, Y: y}, geometry.Point{X: dx, Y: dy}, geometry.Point{X: ddx, Y: ddy}
}

// PointAt returns the point of piece i at local parameter u: Eval's
// point, the same to the bit, without the derivatives (and inlined where
// it is called).
func (c *Curve) PointAt(i int, u float64) geometry.Point {
	k, m := &c.xs[i], &c.ys[i]
	return geometry.Point{X: k[0] + u*(k[1]+u*(k[2]+u*k[3])), Y: m[0] + u*(m[1]+u*(m[2]+u*m[3]))}
}

// At returns the point at arc length s.
func (c *Curve) At(s float64) geometry.Point {
	i, u := c.Locate(s)
	return c.PointAt(i, u)
}

// nearerThan reports whether the squared distance d2 of a point (its
// coordinates' differences squared and summed) may make its distance,
// as math.Hypot gives it, less than d: false only when the distance is
// certainly no less (d2 beyond d² by far more than the rounding of
// either), so that a caller skipping the Hypot of such points keeps the
// same nearest point, to the bit. Distances below 1e-100 are always
// measured.
func nearerThan(d2, d float64) bool {
	return !(d > 1e-100 && d2 > d*d*(1+1e-9))
}

// fartherThan is nearerThan the other way: false only when the distance
// is certainly less than d.
func fartherThan(d2, d float64) bool {
	return !(d > 1e-100 && d2 < d*d*(1-1e-9))
}

// Tangent returns the unit tangent (direction of increasing s) at arc
// length s.
func (c *Curve) Tangent(s float64) geometry.Point {
	i, u := c.Locate(s)
	_, d, _ := c.Eval(i, u)
	return d.Scale(1 / d.Norm())
}

// Derivatives returns the first and second derivatives of the point with
// respect to arc length at s: the unit tangent T and κ·N, where N is T
// turned counter-clockwise and κ the signed curvature.
func (c *Curve) Derivatives(s float64) (d1, d2 geometry.Point) {
	i, u := c.Locate(s)
	_, p1, _ := c.Eval(i, u)
	t := p1.Scale(1 / p1.Norm())
	k := c.curvatureAt(i, u)
	return t, geometry.Point{X: -t.Y, Y: t.X}.Scale(k)
}

// Normal returns the outward unit normal at s: the tangent turned clockwise,
// which points out of a counter-clockwise loop.
func (c *Curve) Normal(s float64) geometry.Point {
	t := c.Tangent(s)
	return geometry.Point{X: t.Y, Y: -t.X}
}

// Curvature returns the signed curvature dθ/ds at arc length s, positive
// where c turns counter-clockwise.
func (c *Curve) Curvature(s float64) float64 {
	i, u := c.Locate(s)
	return c.curvatureAt(i, u)
}

func (c *Curve) curvatureAt(i int, u float64) float64 {
	_, d1, d2 := c.Eval(i, u)
	sp := d1.Norm()
	return d1.Cross(d2) / (sp * sp * sp)
}

// PieceStart returns the arc length at the start of piece i, for
// 0 ≤ i ≤ Pieces() (PieceStart(Pieces()) is Length()).
func (c *Curve) PieceStart(i int) float64 { return c.ss[i] }

// WithClosed returns c marked as closed or not: a curve that ends where it
// starts is closed. It shares c's pieces and tables.
func (c *Curve) WithClosed(closed bool) *Curve {
	d := *c
	d.closed = closed
	return &d
}

// Start returns the first point of c.
func (c *Curve) Start() geometry.Point { return geometry.Point{X: c.xs[0][0], Y: c.ys[0][0]} }

// End returns the last point of c.
func (c *Curve) End() geometry.Point {
	i := len(c.xs) - 1
	return c.PointAt(i, c.Span(i))
}

// Project returns the arc length of the point of c nearest to p and the
// distance to it. It scans the start and middle of every piece for the
// nearest one, then refines by Newton's method from there and from the
// neighbouring samples.
func (c *Curve) Project(p geometry.Point) (s, dist float64) {
	np := len(c.xs)
	bi, bu, bd := 0, 0.0, math.Inf(1)
	for i := range c.xs {
		for _, f := range [...]float64{0, 0.5} {
			u := f * c.Span(i)
			q := c.PointAt(i, u)
			dx, dy := q.X-p.X, q.Y-p.Y
			if !nearerThan(dx*dx+dy*dy, bd) {
				continue
			}
			if d := q.Dist(p); d < bd {
				bi, bu, bd = i, u, d
			}
		}
	}
	if e := c.End(); e.Dist(p) < bd {
		bi, bu, bd = np-1, c.Span(np-1), e.Dist(p)
	}
	starts := [][2]float64{{float64(bi), bu}, {float64(bi), 0}, {float64(bi), c.Span(bi)}}
	if bi > 0 {
		starts = append(starts, [2]float64{float64(bi - 1), c.Span(bi-1) / 2})
	}
	if bi < np-1 {
		starts = append(starts, [2]float64{float64(bi + 1), c.Span(bi+1) / 2})
	}
	fi, fu, fd := bi, bu, bd
	for _, st := range starts {
		if i, u, d := c.ProjectFrom(p, int(st[0]), st[1]); d < fd {
			fi, fu, fd = i, u, d
		}
	}
	return c.arc(fi, fu), fd
}

// ProjectFrom finds a local minimum of |C − p| starting at piece i, local
// parameter u, moving across pieces as needed. It returns the piece, local
// parameter and distance.
func (c *Curve) ProjectFrom(p geometry.Point, i int, u float64) (int, float64, float64) {
	np := len(c.xs)
	for range 40 {
		q, d1, d2 := c.Eval(i, u)
		r := q.Sub(p)
		f := r.Dot(d1)
		fp := d1.Dot(d1) + r.Dot(d2)
		if fp <= 0 {
			fp = d1.Dot(d1)
		}
		step := -f / fp
		h := c.Span(i)
		un := u + step
		switch {
		case un < 0:
			if i > 0 || c.closed {
				if i == 0 {
					i = np - 1
				} else {
					i--
				}
				u = c.Span(i)
				if step > -1e-300 {
					break
				}
				continue
			}
			un = 0
		case un > h:
			if i < np-1 || c.closed {
				if i == np-1 {
					i = 0
				} else {
					i++
				}
				u = 0
				continue
			}
			un = h
		}
		done := math.Abs(un-u) <= 1e-13*(h+math.Abs(u))
		u = un
		if done {
			break
		}
	}
	return i, u, c.PointAt(i, u).Dist(p)
}

// residual returns the arc length of the foot of p on c, found by Newton's
// method from piece i, local parameter u, and the signed distance of p from
// c there: positive outside a counter-clockwise loop (on the side of the
// outward normal).
func (c *Curve) residual(p geometry.Point, i int, u float64) (s, d float64) {
	fi, fu, dist := c.ProjectFrom(p, i, u)
	q, d1, _ := c.Eval(fi, fu)
	n := geometry.Point{X: d1.Y, Y: -d1.X}
	sign := 1.0
	if p.Sub(q).Dot(n) < 0 {
		sign = -1
	}
	return c.arc(fi, fu), sign * dist
}

// Transform returns the image of c under x ↦ m·x + b (m a 2×2 matrix given
// by rows). Affine maps carry cubic pieces to cubic pieces exactly. When m
// reverses orientation (det m < 0) the direction of travel is kept; use
// Reverse to restore counter-clockwise order.
func (c *Curve) Transform(m [2][2]float64, b geometry.Point) *Curve {
	xs := make([][4]float64, len(c.xs))
	ys := make([][4]float64, len(c.ys))
	for i := range c.xs {
		for k := 0; k < 4; k++ {
			xs[i][k] = m[0][0]*c.xs[i][k] + m[0][1]*c.ys[i][k]
			ys[i][k] = m[1][0]*c.xs[i][k] + m[1][1]*c.ys[i][k]
		}
		xs[i][0] += b.X
		ys[i][0] += b.Y
	}
	ts := append([]float64(nil), c.ts...)
	// Scale the parameter with the map so that it stays close to arc length.
	f := math.Sqrt(math.Abs(m[0][0]*m[1][1] - m[0][1]*m[1][0]))
	fu := 1.0 // factor of the parameter
	if f > 0 && f != 1 {
		fu = f
		for i := range ts {
			ts[i] *= f
		}
		// f⁻ᵏ for k = 1, 2, 3, the same for every piece.
		var p [4]float64
		for k := 1; k < 4; k++ {
			p[k] = math.Pow(f, -float64(k))
		}
		for i := range xs {
			for k := 1; k < 4; k++ {
				xs[i][k] *= p[k]
				ys[i][k] *= p[k]
			}
		}
	}
	// A similarity (rotation, reflection, uniform scale) multiplies every
	// arc length by its scale: the image keeps the quadrature of c, scaled.
	a, b2, cc, d := m[0][0], m[0][1], m[1][0], m[1][1]
	sq := a*a + b2*b2 + cc*cc + d*d
	if sq > 0 && math.Abs(a*a+cc*cc-b2*b2-d*d) <= 1e-13*sq && math.Abs(a*b2+cc*d) <= 1e-13*sq {
		fs := math.Sqrt(sq / 2)
		pl := make([]float64, len(c.pl))
		for i, l := range c.pl {
			pl[i] = fs * l
		}
		lu := make([]float64, len(c.leafU))
		ls := make([]float64, len(c.leafS))
		for k := range lu {
			lu[k] = fu * c.leafU[k]
			ls[k] = fs * c.leafS[k]
		}
		// The leaves' indices are shared: no curve changes them once made.
		out := withTables(ts, xs, ys, c.closed, pl, c.leafAt, lu, ls)
		out.fixEnds(func(i int) float64 { return fu * c.Span(i) })
		return out
	}
	return newCurve(ts, xs, ys, c.closed)
}

// fixEnds corrects tables carried over from another curve for the
// rounding of the piece parameters: piece i was measured over [0, want(i)]
// but its parameter, a difference of cumulative values, spans [0, h(i)].
// The length of the sliver between them is added (midpoint rule: the
// sliver is a few units of rounding wide) and the arc-length table redone.
func (c *Curve) fixEnds(want func(int) float64) {
	changed := false
	for i := range c.pl {
		h, w := c.Span(i), want(i)
		if h == w {
			continue
		}
		changed = true
		dl := (h - w) * c.speed(i, (h+w)/2)
		c.pl[i] += dl
		last := int(c.leafAt[i+1]) - 1
		c.leafU[last] = h
		c.leafS[last] += dl
	}
	if changed {
		for i, l := range c.pl {
			c.ss[i+1] = c.ss[i] + l
		}
	}
}

// withTables returns the curve with the given pieces, piece lengths
// and quadrature leaves (see Curve), which must be those newCurve would
// find up to rounding.
func withTables(ts []float64, xs, ys [][4]float64, closed bool, pl []float64, leafAt []int32, leafU, leafS []float64) *Curve {
	c := &Curve{ts: ts, xs: xs, ys: ys, closed: closed, pl: pl, leafAt: leafAt, leafU: leafU, leafS: leafS}
	c.ss = make([]float64, len(pl)+1)
	for i, l := range pl {
		c.ss[i+1] = c.ss[i] + l
	}
	return c
}

// Reverse returns c traversed the other way.
func (c *Curve) Reverse() *Curve {
	np := len(c.xs)
	xs := make([][4]float64, np)
	ys := make([][4]float64, np)
	ts := make([]float64, np+1)
	// Piece j is piece i = np−1−j run backwards: its leaves end where
	// those of piece i begin, seen from the other end.
	pl := make([]float64, np)
	leafAt := make([]int32, np+1)
	leafU := make([]float64, 0, len(c.leafU))
	leafS := make([]float64, 0, len(c.leafS))
	for j := 0; j < np; j++ {
		i := np - 1 - j
		h := c.Span(i)
		xs[j] = flip(c.xs[i], h)
		ys[j] = flip(c.ys[i], h)
		ts[j+1] = ts[j] + h
		pl[j] = c.pl[i]
		k0, k1 := int(c.leafAt[i]), int(c.leafAt[i+1])
		for k := k1 - 2; k >= k0; k-- {
			leafU = append(leafU, h-c.leafU[k])
			leafS = append(leafS, c.pl[i]-c.leafS[k])
		}
		leafU = append(leafU, ts[j+1]-ts[j])
		leafS = append(leafS, c.pl[i])
		leafAt[j+1] = int32(len(leafU))
	}
	out := withTables(ts, xs, ys, c.closed, pl, leafAt, leafU, leafS)
	out.fixEnds(func(j int) float64 { return c.Span(np - 1 - j) })
	return out
}

// flip returns the coefficients of P(h − v).
func flip(k [4]float64, h float64) [4]float64 {
	a, b, cc, d := k[0], k[1], k[2], k[3]
	return [4]float64{
		a + h*(b+h*(cc+h*d)),
		-b - 2*cc*h - 3*d*h*h,
		cc + 3*d*h,
		-d,
	}
}

// shiftPoly returns the coefficients of P(u₀ + v).
func shiftPoly(k [4]float64, u0 float64) [4]float64 {
	v, d1, d2 := poly(k, u0)
	return [4]float64{v, d1, d2 / 2, k[3]}
}

// Farthest returns the arc length in [s0, s1] (s1 < s0 wraps through the
// start of a closed curve) of the point of cv farthest from p, and the
// distance, refined by golden-section search between the neighbours of the
// best sample.
func (cv *Curve) Farthest(p geometry.Point, s0, s1 float64) (float64, float64) {
	L := cv.Length()
	in := func(s float64) bool {
		if s0 <= s1 {
			return s >= s0 && s <= s1
		}
		return s >= s0 || s <= s1
	}
	best, bestD := math.NaN(), -1.0
	step := L / float64(4*cv.Pieces())
	// The arc length of a sample is measured only where it matters: a
	// sample no farther than the best so far is not taken whatever its
	// place, and every sample of a piece that lies wholly in [s0, s1] is
	// in it (the arc length within a piece runs from ss[i] to ss[i+1]).
	// The best sample's place is measured once, at the end.
	bestI, bestU, bestAt0 := -1, 0.0, false
	for i := 0; i < cv.Pieces(); i++ {
		whole := in(cv.ss[i]) && in(cv.ss[i+1]) && (s0 <= s1 || cv.ss[i] >= s0 || cv.ss[i+1] <= s1)
		for _, f := range [...]float64{0, 0.25, 0.5, 0.75} {
			u := f * cv.Span(i)
			q := cv.PointAt(i, u)
			dx, dy := q.X-p.X, q.Y-p.Y
			if !fartherThan(dx*dx+dy*dy, bestD) {
				continue
			}
			d := q.Dist(p)
			if !(d > bestD) {
				continue
			}
			if !whole {
				s := cv.ss[i]
				if f != 0 {
					s = cv.arc(i, u)
				}
				if !in(s) {
					continue
				}
			}
			bestI, bestU, bestAt0, bestD = i, u, f == 0, d
		}
	}
	if bestI >= 0 {
		best = cv.ss[bestI]
		if !bestAt0 {
			best = cv.arc(bestI, bestU)
		}
	}
	if e := cv.End(); in(L) && e.Dist(p) > bestD {
		best, bestD = L, e.Dist(p)
	}
	if math.IsNaN(best) {
		return s0, cv.At(s0).Dist(p)
	}
	// Refine on [best − 2 step, best + 2 step] (the largest sample gap is
	// below a quarter piece, so this brackets the maximum).
	span := 0.0
	for i := 0; i < cv.Pieces(); i++ {
		span = math.Max(span, cv.ss[i+1]-cv.ss[i])
	}
	span = math.Max(span/2, step)
	a, b := best-span, best+span
	wrap := func(s float64) float64 {
		if cv.closed {
			return math.Mod(math.Mod(s, L)+L, L)
		}
		return math.Max(0, math.Min(L, s))
	}
	s := numeric.Golden(func(s float64) float64 { return -cv.At(wrap(s)).Dist(p) }, a, b, 60)
	s = wrap(s)
	if d := cv.At(s).Dist(p); d > bestD {
		return s, d
	}
	return best, bestD
}

// SnapEnds moves both ends of an open curve whose ends (nearly) meet to
// their midpoint, fading the move out over the first and last piece, and
// returns the closed curve and the shift.
func (cv *Curve) SnapEnds() (*Curve, float64) {
	m := cv.Start().Add(cv.End()).Scale(0.5)
	d0, d1 := m.Sub(cv.Start()), m.Sub(cv.End())
	xs := append([][4]float64(nil), cv.xs...)
	ys := append([][4]float64(nil), cv.ys...)
	// Add δ(1 − u/h)³ to the first piece and δ(u/h)³ to the last.
	h0 := cv.Span(0)
	xs[0] = addCube(xs[0], d0.X, h0, true)
	ys[0] = addCube(ys[0], d0.Y, h0, true)
	k := len(xs) - 1
	hk := cv.Span(k)
	xs[k] = addCube(xs[k], d1.X, hk, false)
	ys[k] = addCube(ys[k], d1.Y, hk, false)
	return newCurve(append([]float64(nil), cv.ts...), xs, ys, true), math.Max(d0.Norm(), d1.Norm())
}

// addCube adds δ(1 − u/h)³ (falling) or δ(u/h)³ (rising) to k.
func addCube(k [4]float64, delta, h float64, falling bool) [4]float64 {
	if falling {
		k[0] += delta
		k[1] -= 3 * delta / h
		k[2] += 3 * delta / (h * h)
		k[3] -= delta / (h * h * h)
	} else {
		k[3] += delta / (h * h * h)
	}
	return k
}

// Builder collects pieces of a new curve: straight segments and arcs of
// other curves, in order. The zero value is empty and ready to use.
type Builder struct {
	ts     []float64
	xs, ys [][4]float64
}

func (b *Builder) add(x, y [4]float64, h float64) {
	if h <= 0 {
		return
	}
	if len(b.ts) == 0 {
		b.ts = append(b.ts, 0)
	}
	b.xs = append(b.xs, x)
	b.ys = append(b.ys, y)
	b.ts = append(b.ts, b.ts[len(b.ts)-1]+h)
}

// addPiece adds the part [u0, u1] of piece i of c.
func (b *Builder) addPiece(c *Curve, i int, u0, u1 float64) {
	if u1-u0 <= 1e-15*c.Span(i) {
		return
	}
	b.add(shiftPoly(c.xs[i], u0), shiftPoly(c.ys[i], u0), u1-u0)
}

// AddLine adds the straight segment from p to q, parametrised by length.
func (b *Builder) AddLine(p, q geometry.Point) {
	l := p.Dist(q)
	if l == 0 {
		return
	}
	d := q.Sub(p).Scale(1 / l)
	b.add([4]float64{p.X, d.X}, [4]float64{p.Y, d.Y}, l)
}

// AddArc adds the part of c from arc length s0 to s1, as Sub takes it: for
// a closed curve s1 < s0 wraps through the start. It panics for an open
// curve unless s0 < s1.
func (b *Builder) AddArc(c *Curve, s0, s1 float64) {
	i0, u0 := c.Locate(s0)
	i1, u1 := c.Locate(s1)
	c.subTo(b, i0, u0, i1, u1)
}

// Curve returns the curve of the pieces added, closed or not.
func (b *Builder) Curve(closed bool) *Curve { return newCurve(b.ts, b.xs, b.ys, closed) }

// Sub returns the part of c from arc length s0 to s1 as a new curve. For a
// closed curve s1 < s0 wraps through the start; s0 == s1 on a closed curve
// returns the whole loop starting at s0, closed. It panics for an open curve
// unless s0 < s1.
func (c *Curve) Sub(s0, s1 float64) *Curve {
	var b Builder
	b.AddArc(c, s0, s1)
	return b.Curve(c.closed && s0 == s1)
}

func (c *Curve) subTo(b *Builder, i0 int, u0 float64, i1 int, u1 float64) {
	np := len(c.xs)
	if i0 == i1 && u1 > u0 {
		b.addPiece(c, i0, u0, u1)
		return
	}
	if !c.closed && (i1 < i0 || (i1 == i0 && u1 <= u0)) {
		panic("geometry: Sub of an open curve needs s0 < s1")
	}
	b.addPiece(c, i0, u0, c.Span(i0))
	for i := (i0 + 1) % np; i != i1; i = (i + 1) % np {
		b.addPiece(c, i, 0, c.Span(i))
	}
	b.addPiece(c, i1, 0, u1)
}

// Interpolate returns the interpolating cubic spline through pts with
// a chord-length parameter: periodic when closed (pts holds each point once,
// the last joins the first), natural at both ends otherwise. It panics if
// fewer than splineMinKnots points are given; coincident neighbours are
// skipped.
func Interpolate(pts []geometry.Point, closed bool) *Curve {
	keep := []geometry.Point{pts[0]}
	for _, p := range pts[1:] {
		if p.Dist(keep[len(keep)-1]) > 0 {
			keep = append(keep, p)
		}
	}
	if closed && len(keep) > 1 && keep[len(keep)-1].Dist(keep[0]) == 0 {
		keep = keep[:len(keep)-1]
	}
	ts := make([]float64, len(keep))
	for i := 1; i < len(keep); i++ {
		ts[i] = ts[i-1] + keep[i].Dist(keep[i-1])
	}
	period := 0.0
	if closed {
		period = ts[len(ts)-1] + keep[len(keep)-1].Dist(keep[0])
	}
	prob := splineNewProblem(ts, nil, closed, period)
	xs, ys := make([]float64, len(keep)), make([]float64, len(keep))
	for i, p := range keep {
		xs[i], ys[i] = p.X, p.Y
	}
	f, err := prob.fit(0, [][]float64{xs, ys}, false)
	if err != nil {
		panic("geometry: interpolation failed: " + err.Error())
	}
	return fromFit(prob, f, closed)
}

// fromFit builds the curve of a spline fit with columns x and y.
func fromFit(p *splineProblem, f *splineFit, closed bool) *Curve {
	px := p.pieces(f.gs[0], f.gams[0])
	py := p.pieces(f.gs[1], f.gams[1])
	ts := make([]float64, len(px)+1)
	ts[0] = p.ts[0]
	for i, h := range p.hs {
		ts[i+1] = ts[i] + h
	}
	return newCurve(ts, px, py, closed)
}

// Samples returns the curve points at n+1 arc lengths equally spaced from 0
// to Length(). It panics if n < 1.
func (c *Curve) Samples(n int) []geometry.Point {
	if n < 1 {
		panic("geometry: Samples needs n ≥ 1")
	}
	out := make([]geometry.Point, n+1)
	L := c.Length()
	for k := range out {
		out[k] = c.At(L * float64(k) / float64(n))
	}
	return out
}
