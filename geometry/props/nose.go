package props

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"gonum.org/v1/gonum/mat"
)

// This file measures the leading-edge radius: the radius of curvature of
// the section at its leading edge.
//
// A circle fitted over an arc of the nose reads the mean curvature of the
// arc, and a round nose is no circle: on the NACA 4-digit nose the
// half-thickness a√x + bx + … makes the curvature change in proportion to
// |s| on both sides of the nose (the series of x in y holds |y|³, whose
// second derivative has a corner at the nose) and fall away further out
// as a parabola's does. The circle then reads large by an amount that
// grows with its arc (+2 % at ±0.5 r, +11 % at ±r), while a short arc
// keeps the noise left in the curve.
//
// So the nose is read as a graph v(u) in a frame at the leading edge, u
// along the chord of the nose arc and v across it, of the form
//
//	v = c₀ + c₁u + c₂u² + c₃u³ + d|u − uₖ|³
//
// with the corner uₖ of the cubic searched near the leading edge (on a
// cambered nose it lies where the thickness meets the mean line, a few
// degrees round from the leading edge). The radius is 1/κ at u = 0, κ =
// v''/(1 + v'²)^{3/2}. On exact NACA 4-digit noses (0012, 2412, 4424,
// 6606, 6209; the curvature of the Report 824 curve at the leading edge as
// the truth) this reads within 0.3 % over ±0.5 r and within 1 % over ±r
// but on 6209, where the circle read +2 % to +18 %. The arc grows with the
// noise: the smallest of noseArcs (in radii) whose standard error of the
// curvature, for the noise and the points the nose holds, is below
// noseRelSE.
//
// On noisy scans the search for the corner takes some of the noise for a
// corner, and the radius of a symmetric nose then reads low: about −4 %
// at 0.02 mm on a 152 mm chord (prep/leradius_test.go), against +0 % for
// the circle, which the noise and its own arc's bias happen to cancel
// there; on cambered noses the circle read +4 % to +9 % and this 0 to
// −1 %.

// noseKinkSpan is the reach of the search for the corner uₖ, in
// window half-widths either side of the leading edge.
const noseKinkSpan = 0.5

// noseArcs are the half-widths of the window, in leading-edge radii,
// leRadius tries, smallest first.
var noseArcs = []float64{0.5, 0.6, 0.75, 0.9, 1.05, 1.2}

const (
	// noseRelSE is the standard error of the curvature, relative, at
	// which leRadius stops widening its window.
	noseRelSE = 0.015
	// noseSamples is the number of samples of the curve over the window.
	noseSamples = 201
	// noseKnots is the least number of knots of the curve (points
	// fitted) in the window: a nose sampled more sparsely keeps the
	// circle.
	noseKnots = 6
)

// leRadius returns the radius of curvature of c at arc length sLE read as
// above, with r0 a first estimate (the circle) and noise the noise of the
// points the curve was fitted to (chord units; 0 for an exact curve). ok
// is false when the nose cannot be read so (fewer than noseKnots points in
// every window, a fit that is not convex): the caller keeps the circle.
//
// The standard error that chooses the window counts the knots of the
// curve in the window as independent points, each with the noise given:
// it is a lower bound (measured on scans, the spread of the radius is a
// few times larger, from the leading edge's own place on the nose and the
// corner's search), so it only orders the windows and is not reported.
func leRadius(c *curve.Curve, sLE, r0, noise float64) (r float64, ok bool) {
	L := c.Length()
	p0 := c.At(sLE)
	for k, m := range noseArcs {
		a := m * r0
		if 2.5*a >= math.Min(sLE, L-sLE) {
			return 0, false
		}
		// The frame: u along the chord of the nose arc, v inward.
		ch := c.At(sLE + 1.2*a).Sub(c.At(sLE - 1.2*a))
		if ch.Norm() == 0 {
			return 0, false
		}
		t := ch.Scale(1 / ch.Norm())
		in := geometry.Point{X: -t.Y, Y: t.X}
		pts := make([]geometry.Point, noseSamples)
		for j := range pts {
			pts[j] = c.At(sLE + 2.5*a*(2*float64(j)/float64(noseSamples-1)-1))
		}
		// The points the nose holds: the knots of the curve in the
		// window, each one point of the fit (or one bin of a dense scan).
		knots := knotsWithin(c, p0, t, a)
		if knots < noseKnots {
			continue
		}
		var kinks []float64
		for j := -10; j <= 10; j++ {
			kinks = append(kinks, noseKinkSpan*a*float64(j)/10)
		}
		kappa, sens, fitted := graphCurvature(pts, p0, t, in, a, kinks)
		if !fitted || !(kappa > 0) {
			continue
		}
		// Standard error of κ from noise on knots points alone: the
		// fitted samples stand for them, noseSamples/knots each.
		rel := 0.0
		if noise > 0 {
			rel = noise * sens * math.Sqrt(float64(len(pts))/float64(knots)) / kappa
		}
		if rel <= noseRelSE || k == len(noseArcs)-1 {
			return 1 / kappa, true
		}
	}
	return 0, false
}

// knotsWithin counts the knots of c (the starts of its pieces) within
// |u| ≤ a of p0 along t, on the nose.
func knotsWithin(c *curve.Curve, p0, t geometry.Point, a float64) int {
	n := 0
	for i := 0; i <= c.Pieces(); i++ {
		d := c.At(c.PieceStart(i)).Sub(p0)
		if math.Abs(d.Dot(t)) <= a && d.Norm() <= 2*a {
			n++
		}
	}
	return n
}

// graphCurvature fits v(u) (see the top of the file) by least squares to
// the points within |u| ≤ a in the frame (p0, t, in), with the corner at
// each of kinks (lengths along u) in turn, and returns, for the corner
// that fits best, the curvature at u = 0 and its
// sensitivity to noise: the standard error of the curvature per unit
// standard deviation of v at every point.
func graphCurvature(pts []geometry.Point, p0, t, in geometry.Point, a float64, kinks []float64) (kappa, sens float64, ok bool) {
	var us, vs []float64
	for _, p := range pts {
		d := p.Sub(p0)
		u, v := d.Dot(t)/a, d.Dot(in)/a
		if math.Abs(u) > 1 || v > 2 || v < -0.5 {
			continue
		}
		us, vs = append(us, u), append(vs, v)
	}
	const nb = 5
	n := len(us)
	if n < 2*nb {
		return 0, 0, false
	}
	type cand struct{ rss, k, sens float64 }
	var cs []cand
	for _, uk := range kinks {
		uk /= a
		A := mat.NewDense(n, nb, nil)
		b := mat.NewVecDense(n, vs)
		for i, u := range us {
			e := math.Abs(u - uk)
			A.SetRow(i, []float64{1, u, u * u, u * u * u, e * e * e})
		}
		var qr mat.QR
		qr.Factorize(A)
		var c mat.VecDense
		if err := qr.SolveVecTo(&c, false, b); err != nil {
			continue
		}
		var res mat.VecDense
		res.MulVec(A, &c)
		res.SubVec(b, &res)
		rss := mat.Dot(&res, &res)
		// v' and v'' at u = 0: the gradient of each in the coefficients.
		g1 := []float64{0, 1, 0, 0, -3 * uk * math.Abs(uk)}
		g2 := []float64{0, 0, 2, 0, 6 * math.Abs(uk)}
		var d1, d2 float64
		for i := range nb {
			d1 += g1[i] * c.AtVec(i)
			d2 += g2[i] * c.AtVec(i)
		}
		q := math.Pow(1+d1*d1, 1.5)
		k := d2 / q / a
		// Noise sensitivity: √(g₂ᵀ (AᵀA)⁻¹ g₂) in units of v, scaled back
		// (v and κ in window units).
		var ata mat.SymDense
		ata.SymOuterK(1, A.T())
		var inv mat.Dense
		if err := inv.Inverse(&ata); err != nil {
			if _, cond := err.(mat.Condition); !cond {
				continue
			}
		}
		var vk float64
		for i := range nb {
			for j := range nb {
				vk += g2[i] * g2[j] * inv.At(i, j)
			}
		}
		cs = append(cs, cand{rss, k, math.Sqrt(vk) / q / (a * a)})
	}
	if len(cs) == 0 {
		return 0, 0, false
	}
	best := 0
	for i, c := range cs {
		if c.rss < cs[best].rss {
			best = i
		}
	}
	return cs[best].k, cs[best].sens, true
}
