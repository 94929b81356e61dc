package props

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/internal/numeric"
)

// This file measures the leading-edge radius: the radius of curvature of
// the section at its leading edge.
//
// A circle fitted over an arc of the nose reads the mean curvature of the
// arc, and a round nose is no circle: on the NACA 4-digit nose the
// half-thickness a√x + bx + … makes the curvature change in proportion to
// |s| on both sides of the nose's vertex (the series of x in y holds |y|³,
// whose second derivative has a corner there) and fall away further out
// as a parabola's does. The circle then reads large by an amount that
// grows with its arc (+2 % at ±0.5 r, +11 % at ±r), while a short arc
// keeps the noise left in the curve.
//
// So the nose is read from a local form. A section is a thickness laid off
// either side of a mean line, so round its nose it is symmetric about an
// axis, the mean line's direction there, which passes through the vertex
// where the thickness starts; on a symmetric section the vertex is the
// leading edge, on a cambered one it lies a few degrees round from it
// (the chord convention's leading edge is the point farthest from the
// trailing edge, not the mean line's end). In a frame turned by φ from the
// frame at the leading edge (u along the chord of the nose arc, v inward),
// w across the axis and z along it, the nose is the graph
//
//	z = c₀ + c₂(w − w₀)² + d|w − w₀|³
//
// with its vertex at w₀ on the axis. The fit searches φ (the axis), finds
// w₀ for each φ as the place where the fitted parabola has its vertex (a
// free linear term that the search drives to zero), and reads the radius
// as 1/κ at w = 0, the leading edge: κ = z''/(1 + z'²)^{3/2}.
//
// The form before this one was a cubic in u with the corner |u − uₖ|³
// searched on its own. Noise leaves the corner's place barely determined
// (at 0.02 mm on a 152 mm chord the place chosen spread over the whole
// search), and the curvature read at the leading edge grows with the
// corner's distance from it on either side: a symmetric nose, whose
// corner is at the leading edge, could only read its radius low (−4 % to
// −5 %, prep/leradius_test.go). Here the vertex is tied to the axis, and
// the axis to the nose's asymmetry over the whole window, which the
// points fix well (the vertex's place spread by ±0.03 window widths on
// the same scans, measured with an unweighted form of this fit).
//
// The points are weighted (1 − (u/a)²)² over the window |u| ≤ a, so that
// the ends of the window, where the form departs most from the nose, count
// least. On exact NACA 4-digit noses (0012, 0006, 2412, 4415, 4424, 6606,
// 6209, 6206; the curvature of the Report 824 curve at the leading edge
// as the truth) this reads within 0.3 % at a = 0.5 r and within 2.6 % at
// a = 1.35 r (0012 +1.2 %, 4424, 24 % thick, +2.5 %, 6209 −1.7 %); on
// exact Kármán–Trefftz noses, smooth, with no corner, within 0.3 % at
// 0.5 r and 2.3 % at 1.35 r. The window grows with the noise: the
// smallest of noseArcs (in radii) whose standard error of the curvature,
// for the noise and the points the nose holds, is below noseRelSE.
//
// What this costs: at 0.02 mm on a 152 mm chord the window is the widest
// and the reading of one scan spreads by about ±7 % (the noise at the
// nose), more on symmetric noses than the corner searched on its own,
// which could only read them low. Over random NACA 4-digit scans at 800
// points (prep/leradius_test.go): median 1.014 of the exact radius,
// |error| 90th percentile 9.1 %, against 1.001 and 7.2 % before (the
// symmetric noses of that mix read 1 % low before; a 0012 and a 0009 at
// σ 0.3, 30 scans each, 3.5 % and 2.8 % low before, 0.2 % high and 0.3 %
// low now, with 10th to 90th percentiles 0.906–1.085 and 0.784–1.157
// against 0.929–1.022 and 0.892–1.024).

// noseArcs are the half-widths of the window, in leading-edge radii,
// leRadius tries, smallest first. The widest trades bias for spread:
// windows to 1.5 r read exact symmetric Kármán–Trefftz noses, whose
// curvature falls away as s², not as |s|, 3 % large (their median on
// scans +3.3 %); to 1.2 r they spread the readings of sparse, noisy noses
// wider and read a cut blade's 5 % low on average; a quartic term to carry
// the form further spread the readings more than it took off.
var noseArcs = []float64{0.5, 0.6, 0.75, 0.9, 1.05, 1.2, 1.35}

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
	// noseTilt is the largest angle (radians) between the nose's axis
	// and the normal at the leading edge that the search tries: 40°, the
	// axis of a NACA 6209 nose, 6 % camber at 20 % of the chord, is 24°
	// from it.
	noseTilt = 40 * math.Pi / 180
	// noseTiltSteps is the number of steps of the coarse search over
	// ±noseTilt, before the golden-section refinement.
	noseTiltSteps = 40
	// noseVertexIters is the number of times the vertex w₀ is moved to
	// the fitted parabola's vertex.
	noseVertexIters = 6
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
// axis's search), so it only orders the windows and is not reported.
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
		// The points the nose holds: the knots of the curve in the
		// window, each one point of the fit (or one bin of a dense scan).
		knots := knotsWithin(c, p0, t, a)
		if knots < noseKnots {
			continue
		}
		var us, vs []float64
		for j := range noseSamples {
			d := c.At(sLE + 2.5*a*(2*float64(j)/float64(noseSamples-1)-1)).Sub(p0)
			u, v := d.Dot(t)/a, d.Dot(in)/a
			if math.Abs(u) > 1 || v > 2 || v < -0.5 {
				continue
			}
			us, vs = append(us, u), append(vs, v)
		}
		kappa, sens, fitted := axisCurvature(us, vs)
		if !fitted || !(kappa > 0) {
			continue
		}
		kappa, sens = kappa/a, sens/(a*a)
		// Standard error of κ from noise on knots points alone: the
		// fitted samples stand for them, len(us)/knots each.
		rel := 0.0
		if noise > 0 {
			rel = noise * sens * math.Sqrt(float64(len(us))/float64(knots)) / kappa
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

// axisFit is the nose's form fitted with its axis at one angle: the
// weighted residual sum of squares, the vertex w₀, the coefficients of
// 1, (w − w₀), (w − w₀)², |w − w₀|³, the weighted normal matrix of the
// last fit, and the points' w and weights.
type axisFit struct {
	rss, w0 float64
	coef    [4]float64
	normal  [4][4]float64 // Σ W φφᵀ, φ = (1, e, e², |e|³), e = w − w₀
	ws, wt  []float64
	ok      bool
}

// axisScratch holds the per-point buffers of fitAxis, reused over the
// angles of one window.
type axisScratch struct {
	ws, zs, wt []float64
}

// axisCurvature fits the form at the top of the file to the points (us,
// vs) of the nose (window units: |u| ≤ 1, the leading edge at the origin)
// and returns the curvature at the leading edge and its sensitivity to
// noise: the standard error of the curvature per unit standard deviation
// of v at every point (window units both). ok is false when no angle gives
// a convex fit.
func axisCurvature(us, vs []float64) (kappa, sens float64, ok bool) {
	if len(us) < 10 {
		return 0, 0, false
	}
	n := len(us)
	sc := axisScratch{ws: make([]float64, n), zs: make([]float64, n), wt: make([]float64, n)}
	rss := func(phi float64) float64 {
		if f := fitAxis(us, vs, phi, &sc); f.ok {
			return f.rss
		}
		return math.Inf(1)
	}
	// Coarse search over the angle, then golden section within a step
	// either side of the best.
	h := 2 * noseTilt / noseTiltSteps
	best, bestRSS := 0.0, math.Inf(1)
	for j := 0; j <= noseTiltSteps; j++ {
		phi := -noseTilt + h*float64(j)
		if r := rss(phi); r < bestRSS {
			best, bestRSS = phi, r
		}
	}
	if math.IsInf(bestRSS, 1) {
		return 0, 0, false
	}
	// Golden-section search of the bracket down to 1e-5 rad.
	iters := int(math.Ceil(math.Log(1e-5/(2*h)) / math.Log((math.Sqrt(5)-1)/2)))
	if phi := numeric.Golden(rss, best-h, best+h, iters); rss(phi) <= bestRSS {
		best = phi
	}
	f := fitAxis(us, vs, best, &sc)
	if !f.ok {
		return 0, 0, false
	}
	// z' and z'' at the leading edge, w = 0, and the gradient of z'' in
	// the coefficients.
	e := -f.w0
	ae := math.Abs(e)
	d1 := f.coef[1] + 2*f.coef[2]*e + 3*f.coef[3]*e*ae
	g2 := [4]float64{0, 0, 2, 6 * ae}
	var d2 float64
	for i := range g2 {
		d2 += g2[i] * f.coef[i]
	}
	q := math.Pow(1+d1*d1, 1.5)
	// Noise sensitivity of the weighted fit, of 2c₂ alone (the part of
	// z'' that does not hang on the vertex's fitted place, so that the
	// window is not chosen by the noise of that place): the coefficients
	// are (AᵀWA)⁻¹AᵀW v, so Var(hᵀc) = σ² |W A (AᵀWA)⁻¹ h|² with h = (0,
	// 0, 2, 0), A the design (rows φ at each point).
	x, solved := numeric.SolveSPD4(f.normal, [4]float64{0, 0, 2, 0})
	if !solved {
		return 0, 0, false
	}
	var vk float64
	for i, w := range f.ws {
		phi := axisRow(w - f.w0)
		s := f.wt[i] * (phi[0]*x[0] + phi[1]*x[1] + phi[2]*x[2] + phi[3]*x[3])
		vk += s * s
	}
	return d2 / q, math.Sqrt(vk) / q, true
}

// axisRow returns the row of the design at e = w − w₀: 1, e, e², |e|³.
func axisRow(e float64) [4]float64 {
	e2 := e * e
	return [4]float64{1, e, e2, math.Abs(e) * e2}
}

// fitAxis fits z = c₀ + c₁(w − w₀) + c₂(w − w₀)² + d|w − w₀|³ by weighted
// least squares to the points turned by phi (w = u cos φ + v sin φ, z =
// −u sin φ + v cos φ), moving w₀ to the parabola's vertex, w₀ − c₁/(2c₂),
// noseVertexIters times. The fit is not ok when the parabola does not
// open inward, the vertex leaves the window or the normal equations are
// singular.
//
// It solves the 4×4 normal equations, which hold the answer to about
// 1e-12 here: the columns of the design, on |w − w₀| ≤ 2, are within
// a factor of about 100 of independent (a condition number ~1e4 for the
// normal matrix), and the residual sum of squares that the search over φ
// compares is computed from the residuals themselves. A QR factorisation
// of the design (the first form of this fit) read the same radius to 14
// digits on the 1e4-point bench scan (internal/prepbench), and the same
// radii to the digits printed in prep/leradius_test.go, at about eight
// times the instructions.
func fitAxis(us, vs []float64, phi float64, sc *axisScratch) axisFit {
	s, c := math.Sincos(phi)
	ws, zs, wt := sc.ws[:len(us)], sc.zs[:len(us)], sc.wt[:len(us)]
	for i, u := range us {
		ws[i] = u*c + vs[i]*s
		zs[i] = -u*s + vs[i]*c
		wt[i] = (1 - u*u) * (1 - u*u)
	}
	var f axisFit
	for it := 0; ; it++ {
		// The sums of the normal equations, written out: the matrix
		// holds nine distinct moments of e (its (1,1) and (2,0)
		// entries are both Σ W e²).
		var m00, m10, m11, m21, m22, m30, m31, m32, m33 float64
		var b0, b1, b2, b3 float64
		for i, w := range ws {
			e := w - f.w0
			e2 := e * e
			a3 := math.Abs(e) * e2
			wi := wt[i]
			we, we2, wa3 := wi*e, wi*e2, wi*a3
			m00 += wi
			m10 += we
			m11 += we2
			m21 += we2 * e
			m22 += we2 * e2
			m30 += wa3
			m31 += wa3 * e
			m32 += wa3 * e2
			m33 += wa3 * a3
			z := zs[i]
			b0 += wi * z
			b1 += we * z
			b2 += we2 * z
			b3 += wa3 * z
		}
		m := [4][4]float64{
			{m00, m10, m11, m30},
			{m10, m11, m21, m31},
			{m11, m21, m22, m32},
			{m30, m31, m32, m33},
		}
		cf, ok := numeric.SolveSPD4(m, [4]float64{b0, b1, b2, b3})
		if !ok || !(cf[2] > 0) {
			return axisFit{}
		}
		if it == noseVertexIters {
			for i, w := range ws {
				r := axisRow(w - f.w0)
				e := zs[i] - (cf[0]*r[0] + cf[1]*r[1] + cf[2]*r[2] + cf[3]*r[3])
				f.rss += wt[i] * e * e
			}
			f.coef, f.normal, f.ws, f.wt, f.ok = cf, m, ws, wt, true
			return f
		}
		f.w0 -= cf[1] / (2 * cf[2])
		if math.Abs(f.w0) > 1 {
			return axisFit{}
		}
	}
}
