package curve

import (
	"math"
	"slices"
	"sort"

	"github.com/foilwright/foilwright/internal/numeric"
	"github.com/foilwright/foilwright/internal/par"
)

// This file holds how much the fit smooths, and where.
//
// One smoothing parameter for the whole outline smooths every part over
// about the same number of points. A section has features of very
// different size, a nose a few hundredths of the chord round and surfaces
// that turn slowly over half the chord, and points whose density follows
// neither (a cut mesh is dense where its triangles are small, a scan
// dense where the beam met the surface square on). Smoothing enough to
// take the noise out of the long, flat stretches then rounds off the nose,
// and smoothing little enough to keep the nose leaves the noise in the
// flat stretches as wiggles of the curvature, which a panel method turns
// into ripples of the pressure.
//
// So the smoothing length is made proportional to the local feature
// scale T(s), the arc over which the outline's tangent turns by
// turnAngle: small at the nose and at a rounded trailing edge, large
// along the surfaces. A smoothing spline with weights wᵢ smooths about
// point i over ℓ = (λ/(ρ w))^¼ (ρ the number of points per unit length;
// Silverman, Ann. Statist. 12 (1984) 898–916), so weights
//
//	wᵢ ∝ hᵢ / Tᵢ⁴    (hᵢ the arc each point stands for)
//
// make ℓ = β·T(s) with one factor β for the whole outline. The factor hᵢ
// also counts the points per unit of arc rather than one by one: a
// cluster of points a mesh cut leaves near one vertex, which share one
// vertex's noise, weighs as much as one point there.
//
// β is chosen by the unbiased risk estimate (Mallows' Cp; Craven and
// Wahba, Numer. Math. 31 (1979) 377–403)
//
//	U(β) = RSS/n + 2σ²·tr H/n
//
// with σ the noise: given by the user, or measured as the scatter of the
// points about a pilot fit that smooths over pilotBeta·T, wider than the
// spacing of a cut mesh's vertices along the surfaces, so that noise
// shared by neighbouring points is not taken up by the pilot and counted
// as shape.

// Limits of the smoothing choice.
const (
	// turnAngle is the turn of the tangent (radians) over the arc that
	// defines the feature scale T.
	turnAngle = 0.5
	// featureMax is the largest feature scale, as a fraction of the
	// length of the outline: a straight stretch is smoothed like a gently
	// curved one.
	featureMax = 1.0 / 8
	// spacingCap is the largest arc a point stands for, in median
	// spacings of its neighbourhood (spacingWindow points either side): a
	// point beside a gap does not pull the curve harder than its
	// neighbours.
	spacingCap    = 3
	spacingWindow = 8
	// spacingFloor is the least arc a point stands for, in mean spacings
	// of its neighbourhood: the spline system stays well conditioned when
	// points crowd together (the feet of dense, noisy points), while a
	// cluster of a cut mesh still weighs about as much as one point.
	spacingFloor = 0.05
	// featureFloor is the least feature scale, in mean spacings of the
	// neighbourhood.
	featureFloor = 2
	// betaMin and betaMax bound the search for β.
	betaMin, betaMax = 1e-3, 3
)

// featureScales returns the feature scale T at each of the arc positions
// s (increasing, measured along cv from its start): the arc, centred on
// s, over which the tangent of cv turns by turnAngle, at most featureMax
// of the length. On an open curve the tangent is held constant beyond the
// ends.
func featureScales(cv *Curve, s []float64, open bool) []float64 {
	L := cv.Length()
	// The tangent angle, unwrapped, on a grid of arc length.
	ng := max(8*len(s), 1024)
	ds := L / float64(ng)
	// The directions, on two cores in chunks, then unwrapped in order.
	th := make([]float64, ng+1)
	chunks(ng+1, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			t := cv.Tangent(ds * float64(k))
			th[k] = math.Atan2(t.Y, t.X)
		}
	})
	for k := 1; k <= ng; k++ {
		th[k] = th[k-1] + math.Remainder(th[k]-th[k-1], 2*math.Pi)
	}
	total := th[ng] - th[0] // 2π for a closed loop turning once
	angle := func(x float64) float64 {
		var wraps float64
		if open {
			x = math.Max(0, math.Min(L, x))
		} else {
			wraps = math.Floor(x / L)
			x -= wraps * L
		}
		f := x / ds
		k := min(int(f), ng-1)
		f -= float64(k)
		return th[k]*(1-f) + th[k+1]*f + wraps*total
	}
	tmax := featureMax * L
	// The windows tried, from the largest down by featureStep, to a
	// millionth of the length.
	var sizes []float64
	for a := tmax; a > 1e-6*L; a *= featureStep {
		sizes = append(sizes, a)
	}
	out := make([]float64, len(s))
	chunks(len(s), func(lo, hi int) {
		for i := lo; i < hi; i++ {
			si := s[i]
			// T is the smallest window such that every window from it up
			// to tmax turns by turnAngle or more. The turn of a bump
			// (noise, an outlier the pilot followed) comes back over a
			// window that holds it all, so it never sets T; a nose's turn
			// only grows with the window.
			out[i] = tmax
			for _, a := range sizes {
				if math.Abs(angle(si+a/2)-angle(si-a/2)) < turnAngle {
					break
				}
				out[i] = a
			}
		}
	})
	return out
}

// chunks calls f on consecutive ranges [lo, hi) that cover [0, n), on two
// cores (par.For) when n is large enough to pay for it: for loops whose
// iterations are independent and write only their own index.
func chunks(n int, f func(lo, hi int)) {
	const minChunk = 512
	k := min(8, n/minChunk)
	if k < 2 {
		f(0, n)
		return
	}
	par.For(k, 2, func(_, c int) {
		f(c*n/k, (c+1)*n/k)
	})
}

// featureStep is the ratio of successive windows featureScales tries.
const featureStep = 0.9

// noiseCorrelation returns τ = 1 + 2 Σₖ ρₖ, the factor by which noise
// shared between neighbouring points inflates the variance of an average
// over many of them (the integrated autocorrelation), from the lag
// correlations ρₖ of the pilot residuals rs along the outline, one
// point of each tight cluster (thinned), summed while they stay above
// corrMin. Residuals of down-weighted points (c < 1) and beyond clip are
// left out. White noise gives 1 (residuals of a smoother correlate
// slightly negatively; τ is at least 1); a plane's cut through a mesh,
// whose neighbouring points share the noise of a vertex, gives about 2.
func noiseCorrelation(rs, c []float64, clip float64) (tau float64, lags int) {
	var r []float64
	for i, v := range rs {
		if c[i] < 1 || math.IsNaN(v) || math.Abs(v) > clip {
			continue
		}
		r = append(r, v)
	}
	n := len(r)
	if n < 4*corrLags {
		return 1, 0
	}
	var mean, v0 float64
	for _, x := range r {
		mean += x
	}
	mean /= float64(n)
	for _, x := range r {
		v0 += (x - mean) * (x - mean)
	}
	if v0 == 0 {
		return 1, 0
	}
	tau = 1.0
	for k := 1; k <= corrLags; k++ {
		var ck float64
		for i := 0; i+k < n; i++ {
			ck += (r[i] - mean) * (r[i+k] - mean)
		}
		rho := ck / v0
		if rho < corrMin {
			break
		}
		tau += 2 * rho
		lags = k
	}
	return tau, lags
}

// Limits of noiseCorrelation: lags summed, and the least correlation
// that counts.
const (
	corrLags = 6
	corrMin  = 0.1
)

// integratedCorrelation returns τ = 1 + 2 Σₖ ρₖ of the series r (its lag
// correlations ρₖ about its mean), at least 1, summed by the initial
// positive sequence estimator: the sums Γₘ = ρ₂ₘ + ρ₂ₘ₊₁ (ρ₀ = 1) of
// a stationary series are positive and decrease, so they are added while
// they stay positive, each capped at the one before (the initial
// monotone sequence), and τ = 2 Σₘ Γₘ − 1. Unlike a fixed number of lags
// with a threshold (noiseCorrelation, which sets the smoothing), it
// follows a correlation that fades slowly over tens of points, a scanner
// that drifts as it sweeps. Lags are summed up to len(r)/4 and
// integratedLags. Values that are NaN or beyond clip are left out.
//
// References:
//
//	Geyer, C. J. (1992). Practical Markov chain Monte Carlo.
//	Statistical Science 7(4), 473–483, section 3.3.
func integratedCorrelation(r []float64, clip float64) float64 {
	var v []float64
	for _, x := range r {
		if !math.IsNaN(x) && math.Abs(x) <= clip {
			v = append(v, x)
		}
	}
	n := len(v)
	if n < 4*corrLags {
		return 1
	}
	var mean float64
	for _, x := range v {
		mean += x
	}
	mean /= float64(n)
	var v0 float64
	for i := range v {
		v[i] -= mean
		v0 += v[i] * v[i]
	}
	if v0 == 0 {
		return 1
	}
	rho := func(k int) float64 {
		var ck float64
		for i := 0; i+k < n; i++ {
			ck += v[i] * v[i+k]
		}
		return ck / v0
	}
	maxLag := min(n/4, integratedLags)
	sum, prev := 0.0, math.Inf(1)
	for m := 0; 2*m+1 <= maxLag; m++ {
		g := rho(2*m + 1)
		if m == 0 {
			g++
		} else {
			g += rho(2 * m)
		}
		if !(g > 0) {
			break
		}
		g = math.Min(g, prev)
		sum += g
		prev = g
	}
	return math.Max(1, 2*sum-1)
}

// integratedLags is the most lags integratedCorrelation sums: a
// correlation over more points than this is shape to any fit.
const integratedLags = 200

// arcWeights returns the weights of the points at parameters ts for
// smoothing lengths ℓᵢ = β·L·(Tᵢ/L)^featurePower·(hᵢ/h̄)^spacingPower (L
// the parameter length, h̄ its mean spacing): wᵢ = hᵢ/ℓᵢ⁴ at β = 1,
// divided by their mean so that they average 1, and that mean. hᵢ is half
// the parameter span to the neighbours (one-sided at the ends of an open
// fit; across the closing gap of a periodic one), capped at spacingCap
// median spacings of the neighbourhood.
func arcWeights(ts, T []float64, periodic bool, period, featurePower, spacingPower float64) ([]float64, float64) {
	m := len(ts)
	gap := make([]float64, m) // gap[i]: from point i to i+1 (the closing gap last)
	for i := 0; i+1 < m; i++ {
		gap[i] = ts[i+1] - ts[i]
	}
	L := ts[m-1] - ts[0]
	if periodic {
		gap[m-1] = period - (ts[m-1] - ts[0])
		L = period
	} else {
		gap[m-1] = gap[m-2]
	}
	hbar := L / float64(m)
	// Median spacing of each neighbourhood, from a sorted window.
	win := make([]float64, 0, 2*spacingWindow+1)
	at := func(i int) float64 {
		if periodic {
			return gap[((i%m)+m)%m]
		}
		return gap[max(0, min(m-1, i))]
	}
	w := make([]float64, m)
	var sum float64
	for i := 0; i < m; i++ {
		win = win[:0]
		for k := i - spacingWindow; k <= i+spacingWindow; k++ {
			win = append(win, at(k))
		}
		var wsum float64
		for _, g := range win {
			wsum += g
		}
		floorH := spacingFloor * wsum / float64(len(win))
		slices.Sort(win)
		capH := spacingCap * win[len(win)/2]
		var h float64
		switch {
		case periodic:
			h = (at(i-1) + at(i)) / 2
		case i == 0:
			h = gap[0] / 2
		case i == m-1:
			h = gap[m-2] / 2
		default:
			h = (gap[i-1] + gap[i]) / 2
		}
		h = math.Max(math.Min(h, capH), floorH)
		// A feature narrower than a few spacings cannot be resolved; the
		// floor also bounds the range of the weights, which keeps the
		// spline system well conditioned.
		t := math.Max(T[i], featureFloor*floorH/spacingFloor)
		ell := L * math.Pow(t/L, featurePower)
		if spacingPower != 0 {
			ell *= math.Pow(h/hbar, spacingPower)
		}
		l2 := ell * ell
		w[i] = h / (l2 * l2)
	}
	for i := range w {
		sum += w[i]
	}
	mean := sum / float64(m)
	for i := range w {
		w[i] /= mean
	}
	return w, mean
}

// The powers of the smoothing length along the outline, ℓ ∝
// T^featurePower·h^spacingPower. The fit's are the powers that balance the
// smoothing's bias against the noise it leaves, point by point, for a
// cubic smoothing spline (bias ∝ ℓ⁴ g⁗ with g⁗ ∝ T⁻³, variance ∝ σ²h/ℓ,
// both for the curve and for its curvature: ℓ⁹ ∝ σ²hT⁶).
var featurePower, spacingPower = 2.0 / 3, 1.0 / 9

// lambdaOfBeta converts a smoothing factor β (see arcWeights) into λ for weights
// that were divided by mean (arcWeights).
func lambdaOfBeta(beta, mean float64) float64 { b2 := beta * beta; return b2 * b2 / mean }

// betaOfLambda is the inverse of lambdaOfBeta.
func betaOfLambda(lambda, mean float64) float64 { return math.Pow(lambda*mean, 0.25) }

// riskFit is one evaluation of the risk estimate.
type riskFit struct {
	rss   float64 // Σ cᵢ|rᵢ|² / Σ cᵢ
	trace float64
	n     float64 // Σ cᵢ
}

// evalRisk fits p at λ and returns the weighted mean squared residual
// and tr H. c holds the criterion weight of each point: 1, or less for a
// point that is down-weighted as an outlier (its weight in p, capped at
// 1). Residuals are capped at clip (0: not capped).
func evalRisk(p *splineProblem, xs, ys, c []float64, lambda, clip float64) (riskFit, error) {
	f, err := p.fit(lambda, [][]float64{xs, ys}, true)
	if err != nil {
		return riskFit{}, err
	}
	var ss, sc float64
	for i := range xs {
		dx, dy := xs[i]-f.gs[0][i], ys[i]-f.gs[1][i]
		r2 := dx*dx + dy*dy
		if clip > 0 {
			r2 = math.Min(r2, clip*clip)
		}
		ss += c[i] * r2
		sc += c[i]
	}
	p.release(f)
	return riskFit{rss: ss / sc, trace: f.trace, n: sc}, nil
}

// riskLambda returns the λ in [lo, hi] (logarithms) that minimises the
// unbiased risk estimate U(λ) = RSS/n + 2τσ²·tr H/n for noise σ (normal to
// the outline; the residual vectors are nearly normal, so RSS sums both
// coordinates against σ² once). A positive hint narrows the search to e³
// either side of it. Residuals beyond outlierSigmas·σ are capped, so that
// a few gross outliers are not taken for noise.
func riskLambda(p *splineProblem, xs, ys, c []float64, sigma, tau, lo, hi, hint float64) float64 {
	clip := outlierSigmas * sigma
	crit := func(ll float64) float64 {
		r, err := evalRisk(p, xs, ys, c, math.Exp(ll), clip)
		if err != nil {
			return math.Inf(1)
		}
		return r.rss + 2*tau*sigma*sigma*r.trace/r.n
	}
	ll, _ := minimiseLog(crit, lo, hi, hint, 3)
	return math.Exp(ll)
}

// critWeights returns the criterion weight of each point: its weight in ws
// capped at 1, so that ends pinned by a large weight count as one point
// and outliers down-weighted to almost nothing hardly count.
func critWeights(ws []float64) []float64 {
	c := make([]float64, len(ws))
	for i, w := range ws {
		c[i] = math.Min(w, 1)
	}
	return c
}

// localNoise returns the noise of the points (xs, ys) at arc positions s
// along a pilot curve (increasing; a loop of length period when closed,
// period 0 when open), measured by local regression: each point's normal
// offset from a cubic fitted by least squares to the points within
// noiseWindow·T of it (at least noiseMinSide points either side), in
// the frame of the chord across the window, divided by √(1 − hᵢᵢ) (hᵢᵢ
// its leverage), so that white noise of standard deviation σ gives σ.
// Local fits are unbiased where the feature scale changes fast (behind a
// nose), which a smoothing spline with weights that change as fast is
// not. The robust scale of the standardised offsets (1.4826 × median) of
// the points with c ≥ 1 is the noise; τ is noiseCorrelation of the raw
// offsets, tauLong their integratedCorrelation (for the replicas). profile
// holds, per point, the robust scale of the standardised offsets of the
// noiseProfileSide points either side of it (see noiseProfile), nil when
// there are too few.
func localNoise(xs, ys, s, T, c []float64, period float64) (sigma, tau, tauLong float64, lags int, profile []float64) {
	m := len(xs)
	closed := period > 0
	pos := func(j int) (float64, int) { // arc position and index of neighbour j (may wrap)
		if !closed {
			return s[j], j
		}
		k := ((j % m) + m) % m
		return s[k] + period*math.Floor(float64(j)/float64(m)), k
	}
	// Each point's window and fit on its own, on two cores in chunks; the
	// standardised offsets are gathered in order after.
	raw := make([]float64, m)
	stdAt := make([]float64, m)
	hasStd := make([]bool, m)
	chunks(m, func(i0, i1 int) {
		for i := i0; i < i1; i++ {
			a := noiseWindow * T[i]
			lo, hi := i, i
			for {
				grew := false
				if (closed || lo > 0) && i-lo < m/2 {
					if p, _ := pos(lo - 1); s[i]-p <= a || i-lo < noiseMinSide {
						lo--
						grew = true
					}
				}
				if (closed || hi < m-1) && hi-i < m/2 {
					if p, _ := pos(hi + 1); p-s[i] <= a || hi-i < noiseMinSide {
						hi++
						grew = true
					}
				}
				if !grew || hi-lo >= noiseMaxPoints {
					break
				}
			}
			if hi-lo < 2*noiseMinSide {
				raw[i] = math.NaN()
				continue
			}
			_, klo := pos(lo)
			_, khi := pos(hi)
			dx, dy := xs[khi]-xs[klo], ys[khi]-ys[klo]
			l := math.Hypot(dx, dy)
			if l == 0 {
				raw[i] = math.NaN()
				continue
			}
			dx, dy = dx/l, dy/l
			// Normal equations of v = c₀ + c₁u + c₂u² + c₃u³, u scaled by l.
			// The sums of the products of (1, u, u², u³) taken in pairs, each
			// formed once (x·y = y·x in floating point, and 1·y = y, so these
			// are the sums of the full 4×4 loop, added in the same order).
			var a00, a01, a02, a03, a11, a12, a13, a22, a23, a33 float64
			var b0, b1, b2, b3 float64
			var ui, vi float64
			for j := lo; j <= hi; j++ {
				_, k := pos(j)
				px, py := xs[k]-xs[klo], ys[k]-ys[klo]
				u := (px*dx + py*dy) / l
				v := dx*py - dy*px
				if j == i {
					ui, vi = u, v
				}
				u2 := u * u
				u3 := u2 * u
				b0 += v
				b1 += u * v
				b2 += u2 * v
				b3 += u3 * v
				a00++
				a01 += u
				a02 += u2
				a03 += u3
				a11 += u * u
				a12 += u * u2
				a13 += u * u3
				a22 += u2 * u2
				a23 += u2 * u3
				a33 += u3 * u3
			}
			ata := [4][4]float64{{a00, a01, a02, a03}, {a01, a11, a12, a13}, {a02, a12, a22, a23}, {a03, a13, a23, a33}}
			atb := [4]float64{b0, b1, b2, b3}
			coef, inv, ok := solve4(ata, atb)
			if !ok {
				raw[i] = math.NaN()
				continue
			}
			x := [4]float64{1, ui, ui * ui, ui * ui * ui}
			var fit, lev float64
			for r := range 4 {
				fit += coef[r] * x[r]
				for q := range 4 {
					lev += x[r] * inv[r][q] * x[q]
				}
			}
			raw[i] = vi - fit
			if c[i] >= 1 && lev < 1 {
				stdAt[i], hasStd[i] = math.Abs(raw[i])/math.Sqrt(1-lev), true
			}
		}
	})
	var std []float64
	for i, ok := range hasStd {
		if ok {
			std = append(std, stdAt[i])
		}
	}
	if len(std) == 0 {
		return 0, 1, 1, 0, nil
	}
	sigma = 1.4826 * median(std)
	tau, lags = noiseCorrelation(raw, c, outlierSigmas*sigma)
	kept := make([]float64, 0, m)
	for i, v := range raw {
		if c[i] >= 1 {
			kept = append(kept, v)
		}
	}
	tauLong = integratedCorrelation(kept, outlierSigmas*sigma)
	return sigma, tau, tauLong, lags, noiseProfile(stdAt, hasStd, closed)
}

// noiseProfileSide is the number of points either side of a point whose
// standardised offsets give its local noise (noiseProfile): 21 offsets
// give a robust scale to about ±25 % (a median of 21, common practice).
const noiseProfileSide = 10

// noiseProfile returns, per point, the robust scale (1.4826 × median) of
// the standardised offsets std (those with has set) of the
// noiseProfileSide points either side of it (the loop wrapping when
// closed): the noise where the point lies. A scanner's noise grows where
// its beam grazes the surface (round the nose, behind a steep shoulder),
// and one figure for the whole outline leaves it out there. nil when
// there are fewer than 2·noiseProfileSide + 1 points.
func noiseProfile(std []float64, has []bool, closed bool) []float64 {
	m := len(std)
	if m < 2*noiseProfileSide+1 {
		return nil
	}
	out := make([]float64, m)
	win := make([]float64, 0, 2*noiseProfileSide+1)
	for i := range m {
		win = win[:0]
		for j := i - noiseProfileSide; j <= i+noiseProfileSide; j++ {
			k := j
			if closed {
				k = ((j % m) + m) % m
			} else if k < 0 || k >= m {
				continue
			}
			if has[k] {
				win = append(win, std[k])
			}
		}
		if len(win) > noiseProfileSide {
			out[i] = 1.4826 * median(win)
		}
	}
	return out
}

// Windows of localNoise.
const (
	noiseWindow    = 0.3 // half-width of the window, in feature scales
	noiseMinSide   = 4   // least points either side
	noiseMaxPoints = 400 // most points in a window
)

// solve4 solves the symmetric positive definite 4×4 system a·x = b by
// Cholesky factorisation and returns x and a⁻¹; ok is false when a is not
// positive definite.
func solve4(a [4][4]float64, b [4]float64) (x [4]float64, inv [4][4]float64, ok bool) {
	c, ok := numeric.FactorSPD4(a)
	if !ok {
		return x, inv, false
	}
	x = c.Solve(b)
	for j := range 4 {
		var e [4]float64
		e[j] = 1
		col := c.Solve(e)
		for i := range 4 {
			inv[i][j] = col[i]
		}
	}
	return x, inv, true
}

// searchSorted returns the index of the first element of a that is ≥ x.
func searchSorted(a []float64, x float64) int { return sort.SearchFloat64s(a, x) }
