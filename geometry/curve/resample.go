package curve

import (
	"errors"
	"math"
	"math/rand/v2"

	"github.com/foilwright/foilwright/geometry"
)

// A fit's replicas serve its accuracy estimate (package accuracy): the
// fitted curve is taken for the truth, its points are displaced from it
// by simulated noise, and the replica is fitted with the same smoothing,
// weights and trailing-edge treatment; how far the replicas scatter about
// the fitted curve measures how far the fit may be from the part. Half
// fits the points of one parity alone: for exact samples, how much the
// curve changes when every second point is left out bounds the error
// between the points.

// resampler holds what a fit's replicas reuse: the final spline problem,
// the fitted values and normals at its knots, λ, the noise per knot and
// how the ends are treated.
type resampler struct {
	prob     *splineProblem
	gx, gy   []float64 // fitted values at the knots
	xd, yd   []float64 // the data at the knots
	nx, ny   []float64 // unit normals at the knots
	lambda   float64
	sigma    float64 // standard deviation of the simulated noise per knot
	open     bool
	freeEnds bool
	ends     endRebuild
	// corner: the ends are held at one sharp corner whose place is fitted
	// (cornerFit), knot 0 weighing cornerRatio of its pinned weight as a
	// data point.
	corner      bool
	cornerRatio float64
	// phi, when positive, makes the replicas' noise correlated from knot
	// to knot, a first-order autoregression (setCorrelation).
	phi float64
	// growth, when set, holds per knot how many times the local noise
	// exceeds the fit's (at least 1): the replicas' noise there.
	growth []float64
}

// growthMin is the least ratio of local noise to the fit's figure that
// the replicas follow: the robust scale of 21 offsets strays from the
// noise by ±17 % (one standard deviation, common practice), so 2 is not
// reached by chance where the noise is even, nor by the small bias of
// the local fits where the curvature changes fast (at 1.5 the stated
// surface bound's 95th percentile on the campaign's well-sampled cases of
// seeds 20001-20300 rose from 0.00559 to 0.00664 c, at 2 to 0.00603 c);
// a scanner's beam grazing the surface raises the noise 2 to 4 times.
const growthMin = 2

// setGrowth sets the replicas' noise per knot from the local noise of the
// points (profile, per knot; see noiseProfile) against the fit's noise
// figure noise: where the points scatter more than growthMin times the
// figure (a scanner's beam grazing the surface), the replicas scatter as
// much as they do; elsewhere, and never less than, the figure. Nothing is
// set without a profile of one value per knot or a noise figure.
func (r *resampler) setGrowth(profile []float64, noise float64) {
	if len(profile) != r.prob.n() || !(noise > 0) {
		return
	}
	g := make([]float64, len(profile))
	grows := false
	n := len(profile)
	for i, p := range profile {
		g[i] = 1
		// Knots within a window of the start and end, where a fit's
		// curve begins and ends at the trailing edge, are left at the
		// figure: a local fit across the edge's corner or round its
		// tip measures the shape, not the noise, and the edge's own
		// bounds (its spreads, the unseen corner) speak for it.
		if i < noiseProfileSide || i >= n-noiseProfileSide {
			continue
		}
		if p > growthMin*noise {
			g[i] = p / noise
		}
		grows = grows || g[i] > 1
	}
	if grows {
		r.growth = g
	}
}

// setCorrelation sets the replicas' noise from how the points' noise is
// correlated along the outline: white noise that neighbouring points
// share by chance (the few lags of tauShort, noiseCorrelation, which
// also sets the smoothing) is simulated as white noise of variance
// σ²·tauShort per knot, and a correlation that runs on further (a
// scanner that drifts as it sweeps) as a first-order autoregression of
// that noise along the knots, eᵢ = φ eᵢ₋₁ + √(1 − φ²) σ √tauShort zᵢ,
// whose integrated correlation (1 + φ)/(1 − φ) is τ/tauShort. The average
// of the replicas' noise over many knots then scatters as the points' do
// (variance σ²τ over the knots averaged), while one knot scatters no more
// than the points show: white noise of variance σ²τ would make replicas
// more wiggly than the section and send their edges astray.
//
// τ is the larger of tauLocal, the integratedCorrelation of the local
// fits' offsets, and that of the final fit's residuals at the knots
// (criterion weights c ≥ 1, residuals beyond clip left out): the local
// fits take up a correlation that runs over more points than their
// windows hold, the final fit one that runs over more points than it
// smooths over, and each sees what the other misses. A correlation over
// more knots than the fit smooths over (k = n/tr H, trace being tr H) is
// shape to it, and the fit follows the replicas' as it followed the
// points': τ is taken no larger than k.
func (r *resampler) setCorrelation(c []float64, tauShort, tauLocal, trace, clip float64) {
	n := r.prob.n()
	r.sigma *= math.Sqrt(tauShort)
	tau := math.Max(tauShort, tauLocal)
	if len(c) == n && r.lambda > 0 {
		res := make([]float64, 0, n)
		for i := 0; i < n; i++ {
			if c[i] >= 1 {
				res = append(res, (r.xd[i]-r.gx[i])*r.nx[i]+(r.yd[i]-r.gy[i])*r.ny[i])
			}
		}
		tau = math.Max(tau, integratedCorrelation(res, clip))
	}
	if trace > 0 {
		tau = math.Min(tau, float64(n)/trace)
	}
	if rest := tau / tauShort; rest > corrVisible {
		r.phi = (rest - 1) / (rest + 1)
	}
}

// corrVisible is the least ratio of τ to tauShort that setCorrelation
// takes for a correlation beyond the few neighbours: the estimate of
// white noise's τ over a few hundred values strays to about 1.1
// (TestIntegratedCorrelation); 1.5 clears it (common practice).
const corrVisible = 1.5

// ErrNoNoise means a fit has no noise to simulate: it interpolates.
var ErrNoNoise = errors.New("the fit interpolates: no noise to simulate")

func newResampler(p *splineProblem, f *splineFit, xd, yd []float64, lambda, sigma float64, open, freeEnds bool) *resampler {
	n := p.n()
	r := &resampler{prob: p, gx: f.gs[0], gy: f.gs[1], xd: xd, yd: yd, lambda: lambda, sigma: sigma, open: open, freeEnds: freeEnds,
		nx: make([]float64, n), ny: make([]float64, n)}
	for i := 0; i < n; i++ {
		var dx, dy float64
		if i < len(p.hs) {
			dx, dy = p.piece(f.gs[0], f.gams[0], i)[1], p.piece(f.gs[1], f.gams[1], i)[1]
		} else {
			j := len(p.hs) - 1
			_, dx, _ = poly(p.piece(f.gs[0], f.gams[0], j), p.hs[j])
			_, dy, _ = poly(p.piece(f.gs[1], f.gams[1], j), p.hs[j])
		}
		if l := math.Hypot(dx, dy); l > 0 {
			r.nx[i], r.ny[i] = dy/l, -dx/l
		}
	}
	return r
}

// EndGap returns, for an open fit whose ends are pinned to the last
// points either side of a gap (a blunt edge without base points), the
// spacing of the points at the ends that may hide the part's end (the
// length-biased mean of the spacings, endStretch): the surfaces may run on
// that far beyond them unseen. It returns 0 for other fits.
func (r *FitReport) EndGap() float64 {
	rs := r.resampler
	if rs == nil || !rs.open || rs.freeEnds {
		return 0
	}
	return rs.ends.reach
}

// EndSteps returns, for an open fit, the distances from each end of the
// curve to the first data point inside it (in the fit's parameter, which
// is arc length): how far each surface runs on unsampled to an end the
// fit was given (a corner found where the surfaces meet). It returns
// zeros for a closed fit.
func (r *FitReport) EndSteps() (first, last float64) {
	rs := r.resampler
	if rs == nil || !rs.open {
		return 0, 0
	}
	ts := rs.prob.ts
	n := len(ts)
	if n < 2 {
		return 0, 0
	}
	return ts[1] - ts[0], ts[n-1] - ts[n-2]
}

// ReplicaNoise returns the standard deviation of the noise a replica simulates
// at each knot (input units; 0 when the fit interpolates).
func (r *FitReport) ReplicaNoise() float64 {
	if r.resampler == nil {
		return 0
	}
	return r.resampler.sigma
}

// Replica returns a replica of the fit: its curve's knot values displaced
// along the normal by Gaussian noise of the fit's noise (the noise the
// points show, or the noise given, inflated for noise shared between a
// few neighbours and correlated along the outline as the residuals are;
// see setCorrelation), fitted with the same λ and weights, its ends
// treated as the fit's were. It returns ErrNoNoise for an interpolating
// fit.
func (r *FitReport) Replica(rng *rand.Rand) (*Curve, error) {
	rs := r.resampler
	if rs == nil || rs.sigma == 0 || rs.lambda == 0 {
		return nil, ErrNoNoise
	}
	n := rs.prob.n()
	e := rs.noise(rng)
	xs, ys := make([]float64, n), make([]float64, n)
	for i := 0; i < n; i++ {
		xs[i], ys[i] = rs.gx[i]+e[i]*rs.nx[i], rs.gy[i]+e[i]*rs.ny[i]
	}
	// The base line of a blunt edge is fitted to noisy base points too:
	// shift and turn it by what their noise allows.
	ends := rs.ends
	if ends.base && ends.nBase > 0 {
		sp := r.NoiseEstimate / math.Sqrt(float64(ends.nBase))
		nrm := geometry.Point{X: -ends.dir.Y, Y: ends.dir.X}
		ends.o = ends.o.Add(nrm.Scale(sp * rng.NormFloat64()))
		if ends.spread > 0 {
			ends.dir = ends.dir.Rotate(sp / ends.spread * rng.NormFloat64())
		}
	}
	return rs.refitEnds(rs.prob, xs, ys, rs.lambda, ends)
}

// noise returns a draw of the replicas' noise at the knots, normal to
// the curve: Gaussian of standard deviation sigma, correlated from knot
// to knot as a first-order autoregression of coefficient phi (white when
// phi is 0), times the growth of each knot.
func (rs *resampler) noise(rng *rand.Rand) []float64 {
	n := rs.prob.n()
	e := make([]float64, n)
	innov := math.Sqrt(1 - rs.phi*rs.phi)
	var z float64
	for i := range e {
		if i == 0 {
			z = rng.NormFloat64()
		} else {
			z = rs.phi*z + innov*rng.NormFloat64()
		}
		e[i] = rs.sigma * z
		if rs.growth != nil {
			e[i] *= rs.growth[i]
		}
	}
	return e
}

// Half returns the curve of the fit's knots of one parity (phase 0 or 1)
// alone, the ends of an open fit kept, fitted with the same smoothing
// (weights doubled, for half the points).
func (r *FitReport) Half(phase int) (*Curve, error) {
	rs := r.resampler
	if rs == nil {
		return nil, errors.New("geometry: no fit to resample")
	}
	p := rs.prob
	n := p.n()
	var ts, ws, xs, ys []float64
	for i := 0; i < n; i++ {
		if i%2 != phase && !(rs.open && (i == 0 || i == n-1)) {
			continue
		}
		ts = append(ts, p.ts[i])
		ws = append(ws, 2*p.ws[i])
		xs = append(xs, rs.xd[i])
		ys = append(ys, rs.yd[i])
	}
	if len(ts) < splineMinKnots {
		return nil, errors.New("geometry: too few points for half a fit")
	}
	period := 0.0
	if p.periodic {
		period = p.hs[len(p.hs)-1] + p.ts[n-1] - p.ts[0]
	}
	return rs.refit(splineNewProblem(ts, ws, p.periodic, period), xs, ys, rs.lambda)
}

// refit fits p to (xs, ys) at λ and treats the ends as the fit did.
func (rs *resampler) refit(p *splineProblem, xs, ys []float64, lambda float64) (*Curve, error) {
	return rs.refitEnds(p, xs, ys, lambda, rs.ends)
}

// refitEnds is refit with the ends rebuilt as ends says.
func (rs *resampler) refitEnds(p *splineProblem, xs, ys []float64, lambda float64, ends endRebuild) (*Curve, error) {
	var f *splineFit
	var err error
	if rs.corner && lambda > 0 {
		f, err = cornerFit(p, lambda, xs, ys, rs.cornerRatio*p.ws[0], false)
	} else {
		f, err = p.fit(lambda, [][]float64{xs, ys}, false)
	}
	if err != nil {
		return nil, err
	}
	if rs.open && rs.freeEnds && lambda > 0 {
		if fc, ok := endCorrected(p, xs, ys, lambda, f); ok {
			f = fc
		}
	}
	cv := fromFit(p, f, !rs.open)
	p.release(f) // the curve holds its own pieces
	if rs.open && lambda > 0 {
		cv = rebuildEnds(cv, ends)
	}
	return cv, nil
}
