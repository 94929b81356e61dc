package curve

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

func TestIntegratedCorrelation(t *testing.T) {
	// A first-order autoregression xᵢ = φ xᵢ₋₁ + zᵢ has ρₖ = φᵏ and so the
	// exact integrated correlation τ = 1 + 2 Σ φᵏ = (1 + φ)/(1 − φ) (Box,
	// Jenkins and Reinsel, Time Series Analysis, 4th ed., Wiley (2008),
	// section 3.2.4). The estimate from 4000 values strays from it by the
	// spread the initial positive sequence leaves, about 10 % at φ = 0.9
	// (Geyer 1992); the tolerance is 25 %, set from a few seeds and rounded
	// out. White noise gives 1 (τ is at least 1) to within its spread.
	const n = 4000
	for _, tc := range []struct {
		phi, tol float64
	}{{0, 0.15}, {0.3, 0.2}, {0.6, 0.25}, {0.8, 0.25}, {0.9, 0.3}} {
		want := (1 + tc.phi) / (1 - tc.phi)
		for seed := range uint64(4) {
			rng := rand.New(rand.NewPCG(seed, 3))
			r := make([]float64, n)
			x := 0.0
			for i := range r {
				x = tc.phi*x + rng.NormFloat64()
				r[i] = x
			}
			got := integratedCorrelation(r, math.Inf(1))
			t.Logf("φ %.1f seed %d: τ %.3f (exact %.3f)", tc.phi, seed, got, want)
			if math.Abs(got-want) > tc.tol*want {
				t.Errorf("φ %.1f seed %d: τ %.3f, want %.3f ± %.0f %%", tc.phi, seed, got, want, 100*tc.tol)
			}
		}
	}
	// Too few values to tell: 1.
	if got := integratedCorrelation([]float64{1, -1, 2, 0.5}, math.Inf(1)); got != 1 {
		t.Errorf("four values: τ %g, want 1", got)
	}
	// Values beyond the clip (outliers) and NaN are left out: a series
	// alternating in sign (τ = 1 by the floor) stays so with a few gross
	// values planted in it.
	r := make([]float64, 400)
	for i := range r {
		r[i] = float64(1 - 2*(i%2))
	}
	r[50], r[51], r[52], r[200] = 1e6, 1e6, 1e6, math.NaN()
	if got := integratedCorrelation(r, 10); got != 1 {
		t.Errorf("alternating series with outliers: τ %g, want 1", got)
	}
}

func TestReplicaNoiseCorrelation(t *testing.T) {
	// setCorrelation on the fit of a NACA 0012 (Report 824), chord
	// 152.4 mm, 300 points a surface, 0.02 mm of independent noise on x
	// and y, given the three looks at τ by hand. The replicas' noise per
	// knot is the noise figure times √tauShort; the correlation beyond
	// (τ/tauShort, τ at most the knots per parameter of the fit) makes φ =
	// (ρ − 1)/(ρ + 1) for ρ = τ/tauShort at least corrVisible, else 0.
	// The draws (noise) then scatter by σ and correlate at lag 1 by φ, the
	// exact lag-1 correlation of a first-order autoregression (Box,
	// Jenkins and Reinsel 2008, section 3.2.4), to within the spread of
	// 200 draws of ~600 knots (0.03, from a few seeds, rounded out).
	n, _ := shape.ParseNACA4("0012")
	c := testfoil.Contour(testfoil.Loop(n, 300), testfoil.Part{Chord: 152.4, Noise: 0.02, Seed: 5})
	_, rep, err := Fit(c, FitOptions{})
	if err != nil {
		t.Fatal(err)
	}
	base := *rep.resampler
	k := float64(base.prob.n()) / rep.EffectiveParams
	for _, tc := range []struct {
		name                 string
		tauShort, tauLocal   float64
		wantScale, wantRatio float64 // σ over the figure; τ/tauShort (0: white)
	}{
		{"independent", 1, 1.1, 1, 0},
		{"a few neighbours", 2, 2.5, math.Sqrt(2), 0},
		{"drift", 2, 8, math.Sqrt(2), 4},
		{"drift beyond the smoothing", 1, 10 * k, 1, k},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rs := base
			rs.sigma, rs.phi = rep.NoiseEstimate, 0
			// No final residuals: only the τ given counts (the residuals'
			// own are those of white noise here, below the ones given).
			rs.setCorrelation(nil, tc.tauShort, tc.tauLocal, rep.EffectiveParams, math.Inf(1))
			if got := rs.sigma / rep.NoiseEstimate; math.Abs(got-tc.wantScale) > 1e-12 {
				t.Errorf("σ %.4g times the figure, want %.4g", got, tc.wantScale)
			}
			wantPhi := 0.0
			if tc.wantRatio > 0 {
				wantPhi = (tc.wantRatio - 1) / (tc.wantRatio + 1)
			}
			if math.Abs(rs.phi-wantPhi) > 1e-12 {
				t.Errorf("φ %.4f, want %.4f", rs.phi, wantPhi)
			}
			rng := rand.New(rand.NewPCG(9, 1))
			var s0, s1 float64
			var m int
			for range 200 {
				e := rs.noise(rng)
				for i := range e {
					s0 += e[i] * e[i]
					if i > 0 {
						s1 += e[i] * e[i-1]
					}
				}
				m += len(e)
			}
			sd := math.Sqrt(s0 / float64(m))
			lag1 := s1 / s0
			t.Logf("σ %.4f mm (want %.4f), lag-1 correlation %.3f (want %.3f)", sd, rs.sigma, lag1, wantPhi)
			if math.Abs(sd/rs.sigma-1) > 0.03 || math.Abs(lag1-wantPhi) > 0.03 {
				t.Errorf("draws scatter by %.4f mm and correlate by %.3f at lag 1; want %.4f mm and %.3f", sd, lag1, rs.sigma, wantPhi)
			}
		})
	}
}

func TestReplicasWhiteForIndependentNoise(t *testing.T) {
	// A NACA 0012 (Report 824), chord 152.4 mm, 1000 points a surface,
	// with 0.02 mm of independent noise on x and y: the residuals show
	// no correlation beyond chance, and the replicas' noise stays white
	// (φ = 0) and of the noise figure times at most √corrVisible (the
	// few neighbours that share noise by chance), over seeds.
	n, _ := shape.ParseNACA4("0012")
	for seed := range uint64(3) {
		c := testfoil.Contour(testfoil.Loop(n, 1000), testfoil.Part{Chord: 152.4, Noise: 0.02, Seed: seed})
		_, rep, err := Fit(c, FitOptions{})
		if err != nil {
			t.Fatal(err)
		}
		rs := rep.resampler
		if rs.phi != 0 || rs.sigma > math.Sqrt(corrVisible)*rep.NoiseEstimate {
			t.Errorf("seed %d: replicas φ %.3f, σ %.4f mm for a noise figure of %.4f mm; want white noise of the figure", seed, rs.phi, rs.sigma, rep.NoiseEstimate)
		}
	}
}
