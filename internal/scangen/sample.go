package scangen

import (
	"math"
	"math/rand/v2"
	"sort"
)

// densityCells is the number of cells of the tabulated point density.
const densityCells = 8192

// sampler places points along an outline.
type sampler struct {
	sh  *Shape
	sm  Sampling
	rng *rand.Rand
	// fixStart puts the first point at loop parameter start ("nose" or
	// "te" starts); otherwise the loop starts anywhere.
	fixStart bool
	start    float64
}

// params returns the loop parameters of the points, in loop order from a
// random start, and the arc lengths of the missing stretches' starts.
//
// The model: N gaps gᵢ = exp(σ zᵢ), zᵢ standard normal, are laid end to
// end in a uniform parameter u ∈ [0, 1) from a random start; u is then
// carried to arc length s through the inverse of the normalised
// cumulative density ∫ρ, where
//
//	log ρ(s) = W Σⱼ aⱼ sin(2π kⱼ s/L + φⱼ) + log zone(s),  Σ|aⱼ| = 1
//
// is a slow random wave (kⱼ ∈ 1..4) times a Gaussian bump or dip
// 1 + (F − 1) exp(−(d/ℓ)²) at the zone (d its arc distance). Each local
// gap is thus log-normal with σ about a slowly varying mean. Points inside
// a missing stretch are then removed.
func (s *sampler) params() []float64 {
	L := s.sh.Length()
	rho := s.density(L)
	cdf := make([]float64, densityCells+1)
	for i := range densityCells {
		cdf[i+1] = cdf[i] + rho[i]
	}
	for i := range cdf {
		cdf[i] /= cdf[densityCells]
	}
	n := s.sm.Points
	gaps := make([]float64, n)
	var total float64
	for i := range gaps {
		gaps[i] = math.Exp(s.sm.Sigma * s.rng.NormFloat64())
		total += gaps[i]
	}
	u0 := s.rng.Float64()
	fixed := s.fixStart
	if fixed {
		// The cumulative density at the start's arc length, so that the
		// first point falls on it.
		x := s.sh.ArcAt(s.start) / L * densityCells
		k := min(int(x), densityCells-1)
		u0 = cdf[k] + (x-float64(k))*(cdf[k+1]-cdf[k])
	}
	missing := s.missing(L)
	ts := make([]float64, 0, n)
	var acc float64
	for i := range n {
		u := math.Mod(u0+acc/total, 1)
		acc += gaps[i]
		k := sort.SearchFloat64s(cdf, u)
		k = min(max(k, 1), densityCells)
		f := (u - cdf[k-1]) / (cdf[k] - cdf[k-1])
		sv := (float64(k-1) + f) / densityCells * L
		if s.inStretch(sv, missing, L) {
			continue
		}
		if i == 0 && fixed {
			ts = append(ts, s.start) // exactly there
			continue
		}
		ts = append(ts, s.sh.ParamAt(sv))
	}
	return ts
}

// density returns the relative point density on densityCells equal cells
// of arc length.
func (s *sampler) density(L float64) []float64 {
	var amp [3]float64
	var k [3]float64
	var ph [3]float64
	var sum float64
	for j := range amp {
		amp[j] = s.rng.NormFloat64()
		sum += math.Abs(amp[j])
		k[j] = float64(1 + s.rng.IntN(4))
		ph[j] = 2 * math.Pi * s.rng.Float64()
	}
	var centre, width float64
	switch s.sm.Zone {
	case "nose":
		centre, width = s.sh.ArcAt(s.sh.LE()), 0.03+0.05*s.rng.Float64()
	case "sparse":
		// A grazing stretch: at the nose in a third of the cases, anywhere
		// otherwise.
		if s.rng.Float64() < 1.0/3 {
			centre = s.sh.ArcAt(s.sh.LE())
		} else {
			centre = L * s.rng.Float64()
		}
		width = 0.02 + 0.08*s.rng.Float64()
	}
	rho := make([]float64, densityCells)
	surface := PieceKind(s.sm.Surface)
	for i := range rho {
		sv := (float64(i) + 0.5) / densityCells * L
		var w float64
		for j := range amp {
			w += amp[j] / sum * math.Sin(2*math.Pi*k[j]*sv/L+ph[j])
		}
		r := math.Exp(s.sm.Wave * w)
		if s.sm.Zone != "" {
			d := math.Abs(sv - centre)
			d = math.Min(d, L-d)
			r *= 1 + (s.sm.ZoneFactor-1)*math.Exp(-(d/width)*(d/width))
		}
		if surface != "" && s.sh.Kind(s.sh.ParamAt(sv)) == surface {
			r *= s.sm.SurfaceFactor
		}
		rho[i] = r
	}
	return rho
}

// missing returns the starts of the missing stretches, in arc length.
func (s *sampler) missing(L float64) []float64 {
	out := make([]float64, s.sm.Missing)
	for i := range out {
		out[i] = L * s.rng.Float64()
	}
	return out
}

// inStretch reports whether arc length sv lies in one of the stretches
// [start, start + MissingLen·L), taken round the loop.
func (s *sampler) inStretch(sv float64, starts []float64, L float64) bool {
	for _, a := range starts {
		if d := math.Mod(sv-a+2*L, L); d < s.sm.MissingLen*L {
			return true
		}
	}
	return false
}

// cadParams returns the loop parameters of a CAD export: the stations of
// the family (cosine) or even arc-length steps (uniform), from the upper
// trailing edge to the lower one. A sharp section's last point is its
// first; it is left out here (Defects.CloseLoop repeats it).
func (s *sampler) cadParams(family string) []float64 {
	n := s.sm.PerSurface
	var ts []float64
	switch {
	case s.sm.CAD == "uniform":
		end := s.sh.ArcAt(2)
		for i := 0; i <= 2*n; i++ {
			ts = append(ts, s.sh.ParamAt(end*float64(i)/float64(2*n)))
		}
	case family != FamilyKT: // every closed form in the chord station
		ts = nacaStations(n, true)
	default:
		ts = ktStations(n)
	}
	if s.sh.Pieces() == 2 { // sharp: the last station is the first point
		ts = ts[:len(ts)-1]
	}
	return ts
}
