package curve

import "math"

// A sharp trailing edge that the caller found on the points (FitOptions.Edge)
// is a corner where the two surfaces meet. Pinning both ends of a smoothed
// open fit to that corner pins the curve to whatever error the corner was
// found with: the caller's corner comes from short fits of each surface
// near the edge, carried beyond the last points, and on noisy points it
// sits a good part of the noise above or below where the surfaces meet.
// The fitted surfaces then bend over one smoothing length to reach it, and
// a panel method reads that bend as a small flap at the trailing edge,
// where the Kutta condition makes the lift most sensitive to the shape
// (a corner 1e-5 chord too high or low moves Cl by about 0.2 % on a thin
// section).
//
// So the smoothed fit takes the corner as one more unknown. Both ends of
// the open spline are held at a common point c, each side keeping its own
// tangent, and c is the point that minimises the fit's own criterion
//
//	J(c) = Σ wᵢ (yᵢ − g(tᵢ))² + λ ∫ g''(t)² dt
//
// over the data points only: a smoothing spline with a corner whose
// position the two surfaces choose together, using every point the
// smoothing reaches. The fit is linear in its data, so with the ends
// pinned (endWeight) at c, g = g₀ + c·g₁, where g₀ is the fit of the data
// with the pinned values 0 and g₁ the fit of nothing but the pinned
// values 1; J is quadratic in c and its minimum closes in form, for x and
// y apart (they share the knots, weights and λ). It costs one fit of three
// columns instead of two. The caller's corner still places the ends in the
// parameter (the length of the unsampled stretch either side) and says
// whether a point sampled the corner, which then counts as a data point.

// Twicing at the corner. With its ends at the corner, the smoothing
// still rounds what the surfaces do in their last smoothing length: it
// straightens a surface whose curvature grows towards the edge (a
// Kármán–Trefftz edge, whose surfaces run like d^1.5 from the corner,
// and any section whose camber line turns near its edge), and the corner
// lands on the straightened surfaces, off the true one by several times
// the noise even on exact points; on a cambered section the surfaces
// droop less than they do, and Cl comes out low. Within cornerTwiceZone
// of either end (a share of the curve's parameter length, fading out
// over as much again) the residuals are added back to the data and the
// data fitted again, the bias correction known as twicing (Tukey,
// Exploratory Data Analysis, 1977): the smoother's bias at the corner
// drops from first to second order, for the price of a little more noise
// there only. Elsewhere the fit is the one the risk estimate chose.

// cornerTwiceZone is the share of the parameter length at each end over
// which cornerFit twices the fit; the correction fades out over as much
// again.
const cornerTwiceZone = 0.01

// cornerFit returns the smoothing fit of xs, ys on the open problem p at λ
// with both ends (knots 0 and n−1, pinned by their weights) held at the
// common point that minimises the criterion over the data. dataW is the
// weight of knot 0 as a data point (a point that sampled the corner), 0
// when no point did; knot n−1 is then the same point again and never
// data.
func cornerFit(p *splineProblem, lambda float64, xs, ys []float64, dataW float64, wantTrace bool) (*splineFit, error) {
	f, err := cornerFitOnce(p, lambda, xs, ys, dataW, wantTrace)
	if err != nil {
		return nil, err
	}
	// Twicing at the ends: the residuals within the zone added back.
	n := p.n()
	ts := p.ts
	span := ts[n-1] - ts[0]
	x2, y2 := append([]float64(nil), xs...), append([]float64(nil), ys...)
	for i := 1; i < n-1; i++ {
		d := math.Min(ts[i]-ts[0], ts[n-1]-ts[i]) / span
		b := math.Min(1, math.Max(0, 2-d/cornerTwiceZone))
		x2[i] += b * (xs[i] - f.gs[0][i])
		y2[i] += b * (ys[i] - f.gs[1][i])
	}
	if dataW > 0 {
		x2[0] += xs[0] - f.gs[0][0]
		y2[0] += ys[0] - f.gs[1][0]
	}
	g, err := cornerFitOnce(p, lambda, x2, y2, dataW, false)
	if err != nil {
		return nil, err
	}
	g.trace = f.trace
	return g, nil
}

// cornerFitOnce is cornerFit without the twicing.
func cornerFitOnce(p *splineProblem, lambda float64, xs, ys []float64, dataW float64, wantTrace bool) (*splineFit, error) {
	n := p.n()
	x0, y0 := append([]float64(nil), xs...), append([]float64(nil), ys...)
	x0[0], x0[n-1], y0[0], y0[n-1] = 0, 0, 0, 0
	e := make([]float64, n)
	e[0], e[n-1] = 1, 1
	f, err := p.fit(lambda, [][]float64{x0, y0, e}, wantTrace)
	if err != nil {
		return nil, err
	}
	g1, gam1 := f.gs[2], f.gams[2]
	c11 := lambda * penaltyProduct(p.hs, gam1, gam1)
	for i := 1; i < n-1; i++ {
		c11 += p.ws[i] * g1[i] * g1[i]
	}
	c11 += dataW * g1[0] * g1[0]
	out := &splineFit{gs: make([][]float64, 2), gams: make([][]float64, 2), trace: f.trace}
	for k, data := range [][]float64{xs, ys} {
		g0, gam0 := f.gs[k], f.gams[k]
		b := -lambda * penaltyProduct(p.hs, gam0, gam1)
		for i := 1; i < n-1; i++ {
			b += p.ws[i] * (data[i] - g0[i]) * g1[i]
		}
		b += dataW * (data[0] - g0[0]) * g1[0]
		c := b / c11
		g, gam := make([]float64, n), make([]float64, n)
		for i := range g {
			g[i] = g0[i] + c*g1[i]
			gam[i] = gam0[i] + c*gam1[i]
		}
		out.gs[k], out.gams[k] = g, gam
	}
	return out, nil
}

// penaltyProduct returns ∫ a(t) b(t) dt for the piecewise linear
// functions with values a and b at knots spaced hs (open: one piece fewer
// than knots): the penalty's inner product of two fits by their second
// derivatives.
func penaltyProduct(hs, a, b []float64) float64 {
	var s float64
	for i := 0; i+1 < len(a); i++ {
		s += hs[i] / 6 * (2*a[i]*b[i] + a[i]*b[i+1] + a[i+1]*b[i] + 2*a[i+1]*b[i+1])
	}
	return s
}
