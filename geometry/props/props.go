package props

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/internal/enum"
	"github.com/foilwright/foilwright/internal/numeric"
)

// Thickness and camber modes (Options).
const (
	ThicknessChord  = "chord"     // perpendicular to the chord line: yᵤ(x) − yₗ(x)
	ThicknessCamber = "camber"    // along the normal to the mean camber line
	CamberMean      = "mean"      // mean of the surfaces at equal x
	CamberInscribed = "inscribed" // centres of circles inscribed between the surfaces
)

// ThicknessModes lists the thickness modes (Options.Thickness) in the order
// help texts, completions, the pipeline file's checks and messages give
// them.
func ThicknessModes() []enum.Choice {
	return []enum.Choice{{Name: ThicknessChord}, {Name: ThicknessCamber}}
}

// CamberModes lists the camber modes (Options.Camber), with what each
// measures, in the same order.
func CamberModes() []enum.Choice {
	return []enum.Choice{
		{Name: CamberMean, Doc: "of the surfaces at equal x"},
		{Name: CamberInscribed, Doc: "centres of inscribed circles, for blades"},
	}
}

// Options controls Compute. The zero value measures
// thickness perpendicular to the chord line and the camber line as the mean
// of the surfaces at equal x, on 200 cosine-spaced stations.
type Options struct {
	Thickness string // ThicknessChord (default, "") or ThicknessCamber
	Camber    string // CamberMean (default, "") or CamberInscribed
	Stations  int    // chord stations for the camber line; 0 means 200
	// Noise is the noise of the measured points about the section, in
	// chord units (FitReport.NoiseEstimate divided by the chord); 0 means
	// an exact curve. It widens the arc of the leading-edge circle.
	Noise float64
}

// Properties are the geometric properties of a normalised section, in chord
// units.
type Properties struct {
	Thickness   float64    `json:"thickness"`
	ThicknessAt float64    `json:"thickness_at"`
	Camber      float64    `json:"camber"`
	CamberAt    float64    `json:"camber_at"`
	LERadius    float64    `json:"le_radius"`
	TEAngleDeg  float64    `json:"te_angle_deg"`
	Area        float64    `json:"area"`
	Centroid    [2]float64 `json:"centroid"`
	Ixx         float64    `json:"ixx"`
	Iyy         float64    `json:"iyy"`
	Ixy         float64    `json:"ixy"`
	Perimeter   float64    `json:"perimeter"`
}

// SectionProperties holds the document properties of a normalised section
// and the extra figures behind them. All lengths are chord units.
type SectionProperties struct {
	Properties
	ThicknessMode, CamberMode string
	TEThickness               float64        // distance between the trailing-edge ends
	LECenter                  geometry.Point // centre of the leading-edge circle
	// Imin and Imax are the principal second moments about the centroid;
	// PrincipalDeg is the angle (degrees, counter-clockwise from +x) of the
	// axis about which the moment is Imin (the axis closest to the chord
	// line for a slender section).
	Imin, Imax, PrincipalDeg float64
}

// CamberLine is the camber line of a section with the thickness at each
// station, in chord units. X holds the chord stations; Y the camber; for
// CamberInscribed, (X, Y) are the centres of the inscribed circles and
// Thickness their diameters.
type CamberLine struct {
	Mode      string
	X, Y      []float64
	Thickness []float64
}

// ErrNotNormalized means a path given to Compute is not a
// normalised section.
var ErrNotNormalized = errors.New("path is not a normalised section")

// curveOf returns p as a *Curve: p itself, or an interpolating spline
// through 4000 points equally spaced in arc length.
func curveOf(p geometry.Path) *curve.Curve {
	if c, ok := p.(*curve.Curve); ok {
		return c
	}
	const n = 4000
	L := p.Length()
	pts := make([]geometry.Point, n+1)
	for k := range pts {
		pts[k] = p.At(L * float64(k) / n)
	}
	return curve.Interpolate(pts, false).WithClosed(pts[0].Dist(pts[n]) <= 1e-12*L)
}

// side is one surface of a curve, from parameter position (i0, u0) to
// (i1, u1) (pieces in order; i0 ≤ i1).
type side struct {
	c      *curve.Curve
	i0, i1 int
	u0, u1 float64
}

// sides splits c at arc length sLE into the upper side (start to sLE)
// and the lower side (sLE to the end).
func sides(c *curve.Curve, sLE float64) (upper, lower side) {
	i, u := c.Locate(sLE)
	last := c.Pieces() - 1
	return side{c, 0, i, 0, u}, side{c, i, last, u, c.Span(last)}
}

// bounds returns the local parameter range of piece i on the side.
func (ps side) bounds(i int) (float64, float64) {
	a, b := 0.0, ps.c.Span(i)
	if i == ps.i0 {
		a = ps.u0
	}
	if i == ps.i1 {
		b = ps.u1
	}
	return a, b
}

// cross finds where g changes sign along the side, taking it to change sign
// once: binary search over the pieces, then bisection in the piece. It
// returns the piece, local parameter and point, and false when g has the
// same sign at both ends.
func (ps side) cross(g func(geometry.Point) float64) (int, float64, geometry.Point, bool) {
	c := ps.c
	at := func(i int, u float64) geometry.Point { return c.PointAt(i, u) }
	a0, _ := ps.bounds(ps.i0)
	_, b1 := ps.bounds(ps.i1)
	ga, gb := g(at(ps.i0, a0)), g(at(ps.i1, b1))
	if (ga > 0) == (gb > 0) {
		return 0, 0, geometry.Point{}, false
	}
	lo, hi := ps.i0, ps.i1 // g changes sign within pieces lo..hi
	for hi > lo {
		mid := (lo + hi + 1) / 2
		a, _ := ps.bounds(mid)
		if (g(at(mid, a)) > 0) == (ga > 0) {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
	a, b := ps.bounds(lo)
	fa := g(at(lo, a))
	for range 60 {
		m := (a + b) / 2
		if (g(at(lo, m)) > 0) == (fa > 0) {
			a = m
		} else {
			b = m
		}
	}
	u := (a + b) / 2
	return lo, u, at(lo, u), true
}

// atX returns the point of the side at chord station x.
func (ps side) atX(x float64) (int, float64, geometry.Point, bool) {
	return ps.cross(func(p geometry.Point) float64 { return p.X - x })
}

// Compute returns the geometric properties of the normalised
// section p (chord units, package node order, leading edge at arc length
// sLE) and its camber line.
//
// Thickness is yᵤ(x) − yₗ(x), perpendicular to the chord line, or in
// ThicknessCamber mode the distance between the surfaces along the normal to
// the mean camber line; camber is the mean of the surfaces at equal x, or in
// CamberInscribed mode the centre line of the circles inscribed between the
// surfaces (blade sections). Both maxima are refined by golden-section
// search between stations. The leading-edge radius is the radius of
// curvature at the leading edge, read from a fit of the nose's own form
// over a window that grows with opts.Noise (leRadius, nose.go); where the
// nose holds too few points for that, the circle fitted by least squares
// (geometric distance) to the nose within ±leArc (0.15) osculating radii
// of arc of the leading edge, over a wider arc when opts.Noise says the
// points were noisy (leCircle). The
// trailing-edge angle is the angle between the surface tangents at the
// trailing edge; for a
// rounded edge (a closed path, smooth through the tip) it is the angle
// between the straight continuations of the surfaces just ahead of the
// rounding, and TEThickness the distance between the surfaces where the
// rounding starts (see frame.Normalize). Area,
// centroid and second moments about the centroid (Ixx = ∫∫(y−ȳ)² dA,
// Iyy = ∫∫(x−x̄)² dA, Ixy = ∫∫(x−x̄)(y−ȳ) dA) come from Green's theorem on
// the curve, with Gauss–Legendre quadrature per piece (gonum quad); an open
// (blunt) section is closed by its straight base for these and for the
// perimeter.
//
// It returns an error wrapping ErrNotNormalized if sLE is not inside the
// path or the surfaces do not span the chord.
func Compute(p geometry.Path, sLE float64, opts Options) (*SectionProperties, *CamberLine, error) {
	if opts.Thickness == "" {
		opts.Thickness = ThicknessChord
	}
	if !enum.Has(ThicknessModes(), opts.Thickness) {
		return nil, nil, fmt.Errorf("geometry: thickness mode %q: want %s", opts.Thickness, enum.Or(enum.Names(ThicknessModes())...))
	}
	if opts.Camber == "" {
		opts.Camber = CamberMean
	}
	if !enum.Has(CamberModes(), opts.Camber) {
		return nil, nil, fmt.Errorf("geometry: camber mode %q: want %s", opts.Camber, enum.Or(enum.Names(CamberModes())...))
	}
	if opts.Stations == 0 {
		opts.Stations = 200
	}
	if opts.Stations < 10 {
		return nil, nil, fmt.Errorf("geometry: %d camber stations: want at least 10", opts.Stations)
	}
	c := curveOf(p)
	L := c.Length()
	if !(sLE > 0 && sLE < L) {
		return nil, nil, fmt.Errorf("geometry: %w: leading edge at arc length %g outside (0, %g)", ErrNotNormalized, sLE, L)
	}
	xEnd := math.Min(c.Start().X, c.End().X)
	if !(xEnd > 0.5) || c.At(sLE).Norm() > 1e-3 {
		return nil, nil, fmt.Errorf("geometry: %w: surfaces end at x = %.4g, leading edge at (%.4g, %.4g)", ErrNotNormalized, xEnd, c.At(sLE).X, c.At(sLE).Y)
	}
	sp := &SectionProperties{ThicknessMode: opts.Thickness, CamberMode: opts.Camber}
	o := outline{c: c, xEnd: xEnd}
	o.up, o.lo = sides(c, sLE)
	st := make([]float64, opts.Stations+1)
	for k := range st {
		st[k] = xEnd * (1 - math.Cos(math.Pi*float64(k)/float64(opts.Stations))) / 2
	}
	thick := o.thickness(opts.Thickness)
	sp.Thickness, sp.ThicknessAt = maxOn(thick, st[1:len(st)-1])
	cl := o.camberLine(opts.Camber, st, thick, sp)
	sp.LECenter, sp.LERadius = leCircle(c, sLE, opts.Noise)
	if r, ok := leRadius(c, sLE, sp.LERadius, opts.Noise); ok && r > sp.LERadius/2 && r < 2*sp.LERadius {
		// The radius of curvature read from the nose's own form
		// (nose.go); the circle stays where that cannot be read, and
		// bounds it (a reading off by 2× is a failed fit, not a nose).
		sp.LERadius = r
		sp.LECenter = c.At(sLE).Sub(c.Normal(sLE).Scale(r))
	}
	trailingEdge(c, sp)
	if err := areaAndMoments(c, sp); err != nil {
		return nil, nil, err
	}
	return sp, cl, nil
}

// outline is a normalised section split at its leading edge into its
// upper and lower side, whose surfaces end at chord station xEnd.
type outline struct {
	c      *curve.Curve
	up, lo side
	xEnd   float64
}

func (o outline) yu(x float64) float64     { _, _, p, _ := o.up.atX(x); return p.Y }
func (o outline) yl(x float64) float64     { _, _, p, _ := o.lo.atX(x); return p.Y }
func (o outline) camber(x float64) float64 { return (o.yu(x) + o.yl(x)) / 2 }

// thickness returns the thickness at chord station x in the given mode:
// yᵤ(x) − yₗ(x), or the distance between the surfaces along the normal to
// the mean camber line.
func (o outline) thickness(mode string) func(x float64) float64 {
	if mode == ThicknessChord {
		return func(x float64) float64 { return o.yu(x) - o.yl(x) }
	}
	return func(x float64) float64 {
		const dx = 1e-4
		xa, xb := math.Max(0, x-dx), math.Min(o.xEnd, x+dx)
		slope := (o.camber(xb) - o.camber(xa)) / (xb - xa)
		m := geometry.Point{X: x, Y: o.camber(x)}
		t := geometry.Point{X: 1, Y: slope}.Scale(1 / math.Hypot(1, slope))
		along := func(p geometry.Point) float64 { return p.Sub(m).Dot(t) }
		_, _, pu, ok1 := o.up.cross(along)
		_, _, pl, ok2 := o.lo.cross(along)
		if !ok1 || !ok2 {
			return 0 // the normal misses a surface
		}
		return pu.Dist(pl)
	}
}

// camberLine returns the camber line at the stations st in the given mode
// (the mean of the surfaces, or the centres of inscribed circles) and
// records the maximum camber and where it is in sp.
func (o outline) camberLine(mode string, st []float64, thick func(float64) float64, sp *SectionProperties) *CamberLine {
	cl := &CamberLine{Mode: mode}
	if mode == CamberMean {
		for _, x := range st {
			cl.X = append(cl.X, x)
			cl.Y = append(cl.Y, o.camber(x))
			cl.Thickness = append(cl.Thickness, thick(x))
		}
		abs := func(x float64) float64 { return math.Abs(o.camber(x)) }
		_, at := maxOn(abs, st[1:len(st)-1])
		at = vertex(abs, at, math.Min(camberWindow, math.Min(at, o.xEnd-at)))
		sp.Camber, sp.CamberAt = o.camber(at), at
		return cl
	}
	best := -1
	for _, x := range st[1 : len(st)-1] {
		if x < 0.005 || x > o.xEnd-0.005 {
			continue
		}
		m, d := inscribed(o.c, o.up, o.lo, geometry.Point{X: x, Y: o.camber(x)}, x)
		cl.X = append(cl.X, m.X)
		cl.Y = append(cl.Y, m.Y)
		cl.Thickness = append(cl.Thickness, d)
		if best < 0 || math.Abs(m.Y) > math.Abs(cl.Y[best]) {
			best = len(cl.Y) - 1
		}
	}
	if best >= 0 {
		sp.Camber, sp.CamberAt = cl.Y[best], cl.X[best]
	}
	return cl
}

// trailingEdge records the trailing-edge thickness and included angle of
// c in sp: between the end tangents, or for a kept rounded edge (a path
// smooth through the tip) between the surfaces just ahead of the rounding.
func trailingEdge(c *curve.Curve, sp *SectionProperties) {
	L := c.Length()
	sp.TEThickness = c.Start().Dist(c.End())
	tu, tl := c.Tangent(0), c.Tangent(L).Scale(-1)
	sp.TEAngleDeg = math.Acos(math.Max(-1, math.Min(1, tu.Dot(tl)))) * 180 / math.Pi
	if ta, tb := c.Tangent(L), c.Tangent(0); sp.TEThickness <= 1e-9 && math.Abs(geometry.Turn(ta, tb)) <= frame.CornerTurn {
		// A rounded edge, kept: the path runs smoothly through the tip, so
		// the end tangents are one line. Measure the surfaces just ahead of
		// the rounding instead.
		if r, ok := frame.AnalyseRounded(c, 0, 1); ok {
			sp.TEAngleDeg = r.Angle * 180 / math.Pi
			sp.TEThickness = r.Thickness
		}
	}
}

// areaAndMoments records the area, centroid, second moments about the
// centroid, principal moments and perimeter of c in sp. It returns an
// error wrapping ErrNotNormalized when the area is not positive.
func areaAndMoments(c *curve.Curve, sp *SectionProperties) error {
	g := c.AreaIntegrals()
	if !(g.A > 0) {
		return fmt.Errorf("geometry: %w: enclosed area %g is not positive (not counter-clockwise?)", ErrNotNormalized, g.A)
	}
	sp.Area = g.A
	cx, cy := g.Sx/g.A, g.Sy/g.A
	sp.Centroid = [2]float64{cx, cy}
	sp.Ixx = g.Ixx - g.A*cy*cy
	sp.Iyy = g.Iyy - g.A*cx*cx
	sp.Ixy = g.Ixy - g.A*cx*cy
	mean, half := (sp.Ixx+sp.Iyy)/2, (sp.Ixx-sp.Iyy)/2
	r := math.Hypot(half, sp.Ixy)
	sp.Imin, sp.Imax = mean-r, mean+r
	sp.PrincipalDeg = 0.5 * math.Atan2(2*sp.Ixy, sp.Iyy-sp.Ixx) * 180 / math.Pi
	sp.Perimeter = c.Length() + c.Start().Dist(c.End())
	return nil
}

// maxOn returns the maximum of f and where it is: the best of the
// stations, refined by golden-section search between its neighbours.
func maxOn(f func(float64) float64, st []float64) (float64, float64) {
	best := 0
	vals := make([]float64, len(st))
	for k, x := range st {
		vals[k] = f(x)
		if vals[k] > vals[best] {
			best = k
		}
	}
	a, b := st[max(best-1, 0)], st[min(best+1, len(st)-1)]
	x := numeric.Golden(func(x float64) float64 { return -f(x) }, a, b, 50)
	if v := f(x); v >= vals[best] {
		return v, x
	}
	return vals[best], st[best]
}

// inscribed moves the point m0 (between the surfaces at station x) to
// the centre of the circle touching both surfaces, and returns the centre
// and the diameter.
func inscribed(c *curve.Curve, up, lo side, m0 geometry.Point, x float64) (geometry.Point, float64) {
	iu, uu, _, _ := up.atX(x)
	il, ul, _, _ := lo.atX(x)
	m := m0
	var du, dl float64
	for range 50 {
		var pu, pl geometry.Point
		iu, uu, du = c.ProjectFrom(m, iu, uu)
		il, ul, dl = c.ProjectFrom(m, il, ul)
		pu = c.PointAt(iu, uu)
		pl = c.PointAt(il, ul)
		e := pu.Sub(pl)
		n := e.Norm()
		if n == 0 {
			break
		}
		step := 0.5 * (du - dl)
		m = m.Add(e.Scale(step / n))
		if math.Abs(step) < 1e-13 {
			break
		}
	}
	return m, du + dl
}

// leCircle returns the leading-edge circle of c (leading edge at arc
// length sLE): the circle fitted by least squares (geometric distance) to
// 41 points of the nose within ±a of arc, a = leArc osculating radii
// on an exact curve. When the points scattered by noise (chord units), the
// curve keeps wiggles of about that size, and the curvature over a short
// arc a changes by about noise/a²; so a grows to at least √(noise·r/
// leNoiseTol), which keeps that error near leNoiseTol of the
// curvature, and to at least leKnots knot spacings at the nose, which
// averages out the sag of straight facets between the points of a cut
// mesh. The wider arc costs a bias on a nose whose curvature falls away
// from the leading edge (measured on NACA 4-digit noses: +2 % at ±0.5 r,
// +5 % at ±0.7 r, +11 % at ±r), so the noise term stops at leNoiseArc
// radii and the knot term, which on sparse points would reach far round
// the nose, at leKnotArc.
// The radius is refined three times, each from the last. It returns a zero
// radius when the nose is not convex.
func leCircle(c *curve.Curve, sLE, noise float64) (geometry.Point, float64) {
	k := c.Curvature(sLE)
	L := c.Length()
	fit := func(a, r float64) (geometry.Point, float64) {
		a = math.Min(a, math.Min(sLE, L-sLE)/2)
		center := c.At(sLE).Sub(c.Normal(sLE).Scale(r))
		var pts []geometry.Point
		for j := -20; j <= 20; j++ {
			pts = append(pts, c.At(sLE+a*float64(j)/20))
		}
		return numeric.RefineCircle(pts, center, r)
	}
	if noise == 0 {
		if !(k > 0) {
			return geometry.Point{}, 0
		}
		return fit(leArc/k, 1/k)
	}
	// Knot spacing at the nose: the mean over leKnotSpan pieces either
	// side (cut meshes pair their points, so single pieces mislead).
	i, _ := c.Locate(sLE)
	lo, hi := max(0, i-leKnotSpan), min(c.Pieces(), i+leKnotSpan+1)
	h := (c.PieceStart(hi) - c.PieceStart(lo)) / float64(hi-lo)
	// A noisy osculating radius is only a start: take the circle through
	// the nose over the knot span, then widen the arc from the radius.
	center, r, _, ok := numeric.FitCircle(func() []geometry.Point {
		var pts []geometry.Point
		for j := -20; j <= 20; j++ {
			pts = append(pts, c.At(sLE+leKnotSpan*h*float64(j)/20))
		}
		return pts
	}())
	if !ok || !(r > 0 && r < L) {
		if !(k > 0) {
			return geometry.Point{}, 0
		}
		center, r = c.At(sLE).Sub(c.Normal(sLE).Scale(1/k)), 1/k
	}
	for range 3 {
		a := math.Max(leArc*r, math.Max(math.Min(math.Sqrt(noise*r/leNoiseTol), leNoiseArc*r), math.Min(leKnots*h, leKnotArc*r)))
		c2, r2 := fit(a, r)
		if !(r2 > 0 && r2 < L) {
			break
		}
		center, r = c2, r2
	}
	return center, r
}

// Limits of the leading-edge circle on noisy curves (leCircle).
const (
	leNoiseTol = 0.03 // curvature error the noise may cause, relative
	leKnots    = 2    // least half-arc, in knot spacings at the nose
	leKnotSpan = 5    // pieces either side over which the knot spacing is averaged
	leNoiseArc = 1    // largest half-arc for the noise, in radii (bias +11 % on NACA 4-digit noses)
	leKnotArc  = 0.5  // largest half-arc for the knot spacing, in radii (bias +2 %)
)

// leArc is the half-width of the nose arc, in osculating radii at the
// leading edge, to which the leading-edge circle is fitted.
const leArc = 0.15

// camberWindow is the half-width (chord units) of the window over which
// the position of maximum camber is taken as the vertex of a least-squares
// parabola. The camber line is flat near its maximum, so the plain maximum
// wanders with measurement noise; the parabola steadies it at the cost of
// a bias towards the flatter side of an asymmetric peak (+0.008 chord for
// the NACA 2412, whose camber parabolas differ fore and aft).
const camberWindow = 0.04

// vertex returns the vertex of the least-squares parabola through f at
// 41 points within x0 ± w, or x0 if the parabola has no maximum there.
func vertex(f func(float64) float64, x0, w float64) float64 {
	if !(w > 0) {
		return x0
	}
	var s [5]float64
	var r [3]float64
	for k := -20; k <= 20; k++ {
		u := w * float64(k) / 20
		y := f(x0 + u)
		p := 1.0
		for j := 0; j < 5; j++ {
			s[j] += p
			if j < 3 {
				r[j] += p * y
			}
			p *= u
		}
	}
	a := [3][3]float64{{s[0], s[1], s[2]}, {s[1], s[2], s[3]}, {s[2], s[3], s[4]}}
	c, ok := numeric.Solve3(a, r)
	if !ok || !(c[2] < 0) {
		return x0
	}
	u := -c[1] / (2 * c[2])
	if math.Abs(u) > w {
		return x0
	}
	return x0 + u
}
