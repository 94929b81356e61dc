package scangen

import (
	"math"
	"math/rand/v2"
	"sort"
)

// The forms of correlated noise (Correlated.Form).
const (
	// CorrelatedWander is a smooth random offset along the outline: a
	// hand-held scanner that drifts slowly while it sweeps the part, a
	// registration that bends a stitched scan.
	CorrelatedWander = "wander"
	// CorrelatedMesh is the slice of a triangle mesh whose vertices carry
	// the scanner's noise: each point of the cut interpolates the noise of
	// the vertices of the triangle it crosses, so neighbouring points
	// share it.
	CorrelatedMesh = "mesh"
)

// Correlated is scatter normal to the surface that is correlated along the
// outline, on top of the independent scatter of Noise. The local fits of
// neighbouring points cannot see it: the points wander together.
type Correlated struct {
	// Form is CorrelatedWander or CorrelatedMesh.
	Form string `json:"form"`
	// MM is the standard deviation in millimetres: of the wander, or of
	// the noise of each vertex of the mesh.
	MM float64 `json:"mm"`
	// Gaps is the correlation length of the wander (of its Gaussian
	// covariance) in mean gaps between neighbouring points. A mesh's
	// vertices are the points the sampling places (Sampling), and the cut
	// leaves two points between neighbouring vertices.
	Gaps float64 `json:"gaps,omitempty"`
	// Cut, for a mesh, is where the cutting plane crosses the strip of
	// triangles between two rows of vertices: 0 on the first row, 1 on
	// the second.
	Cut float64 `json:"cut,omitempty"`
}

// wanderModes is the number of random Fourier modes of the wander.
const wanderModes = 64

// cutJitter is the standard deviation of where the cut crosses each edge
// of a mesh about Correlated.Cut: the vertices' own scatter across the
// cutting plane moves the crossings.
const cutJitter = 0.005

// field is a realisation of correlated noise along the outline.
type field struct {
	c   Correlated
	sd  float64 // σ, chord units
	rng *rand.Rand
	// The wander, a normal offset in chord units as a function of arc
	// length: amp·Σ cos(ωⱼ s + φⱼ).
	omega, phase []float64
	amp          float64
}

// newField draws the correlated noise c of a case whose outline has
// length L (chord units), n points and a chord of chordMM, with the draws
// of its own stream, derived from seed (so that no other draw of the case
// changes). It returns nil when c is nil or of no known form.
func newField(c *Correlated, L float64, n int, chordMM float64, seed uint64) *field {
	if c == nil || c.MM <= 0 || n < 1 || (c.Form != CorrelatedWander && c.Form != CorrelatedMesh) {
		return nil
	}
	f := &field{c: *c, sd: c.MM / chordMM, rng: rand.New(rand.NewPCG(seed, 0xc0e2))}
	if c.Form != CorrelatedWander {
		return f
	}
	// Random Fourier features of a Gaussian covariance exp(−d²/2ℓ²):
	// frequencies ω ~ N(0, 1/ℓ²), rounded to whole waves round the loop
	// so that the offset closes on itself.
	ell := math.Max(c.Gaps*L/float64(n), 1e-9)
	f.omega, f.phase = make([]float64, wanderModes), make([]float64, wanderModes)
	for j := range f.omega {
		k := math.Max(1, math.Round(math.Abs(f.rng.NormFloat64())*L/(2*math.Pi*ell)))
		f.omega[j] = 2 * math.Pi * k / L
		f.phase[j] = 2 * math.Pi * f.rng.Float64()
	}
	// Scaled so that its RMS round the loop is σ.
	f.amp = 1
	var ss float64
	const grid = 4096
	for i := range grid {
		v := f.wander(L * (float64(i) + 0.5) / grid)
		ss += v * v
	}
	if ss > 0 {
		f.amp = f.sd / math.Sqrt(ss/grid)
	}
	return f
}

// wander returns the wander's offset at arc length s, chord units.
func (f *field) wander(s float64) float64 {
	var v float64
	for j, w := range f.omega {
		v += math.Cos(w*s + f.phase[j])
	}
	return f.amp * v
}

// meshCut returns the points where a plane cuts a strip of triangles
// whose first row of vertices lies at the loop parameters vs (in loop
// order, round the loop) and whose second row lies beside it, each vertex
// with its own noise normal to the surface: their loop parameters, the
// offsets they carry (chord units) and the offsets' standard deviations.
//
// The strip between vertex i and i+1 is cut into the triangles (aᵢ, aᵢ₊₁,
// bᵢ₊₁) and (aᵢ, bᵢ₊₁, bᵢ); the plane crosses the rows at height c (0 on
// row a, 1 on row b; Cut, with a jitter of cutJitter per edge), so it
// meets the edge aᵢbᵢ and the diagonal aᵢbᵢ₊₁: two points an interval,
// the second a fraction c of the way to the next vertex. Each carries the
// noise of the edge's ends weighted as the crossing divides it. A cut near
// a row leaves the points in near pairs. No point is cut in an interval
// over three times the median (a hole in the scan, a missing stretch). The
// points lie on the outline plus their offsets: the facets' own departure
// from the surface is the mesh's, not the noise's, and is left out.
func (f *field) meshCut(sh *Shape, vs []float64) (ts, offs, sds []float64) {
	n := len(vs)
	if n < 3 {
		return vs, make([]float64, n), make([]float64, n)
	}
	L := sh.Length()
	arcs := make([]float64, n)
	for i, t := range vs {
		arcs[i] = sh.ArcAt(t)
	}
	step := func(i int) float64 { return math.Mod(arcs[(i+1)%n]-arcs[i]+2*L, L) }
	steps := make([]float64, n)
	for i := range steps {
		steps[i] = step(i)
	}
	sort.Float64s(steps)
	hole := 3 * steps[n/2]
	na, nb := make([]float64, n), make([]float64, n)
	for i := range n {
		na[i], nb[i] = f.sd*f.rng.NormFloat64(), f.sd*f.rng.NormFloat64()
	}
	cut := func() float64 { return min(1, max(0, f.c.Cut+cutJitter*f.rng.NormFloat64())) }
	add := func(t, a, b, c float64) {
		ts = append(ts, t)
		offs = append(offs, (1-c)*a+c*b)
		sds = append(sds, f.sd*math.Hypot(1-c, c))
	}
	for i := range n {
		j := (i + 1) % n
		c := cut()
		add(vs[i], na[i], nb[i], c) // the edge aᵢbᵢ
		if g := step(i); g > 0 && g <= hole {
			c = cut()
			add(sh.ParamAt(math.Mod(arcs[i]+c*g, L)), na[i], nb[j], c) // the diagonal aᵢbᵢ₊₁
		}
	}
	return ts, offs, sds
}

// drawCorrelated decides, with the draws of its own stream derived from
// seed, whether the case s carries correlated noise, and its form and
// size: slices of scans (a mesh's or a drifting scanner's) in the
// categories that imitate scans. The other draws of the case are those of
// Draw without it.
func drawCorrelated(s *Spec, seed uint64) {
	d := drawer{rand.New(rand.NewPCG(seed, 0xc0e1))}
	var p, pMesh float64
	switch s.Category {
	case "scan":
		p, pMesh = 0.5, 0.6
	case "voxel":
		p, pMesh = 0.3, 0.5
	case "dense":
		p, pMesh = 0.3, 0
	case "general":
		p, pMesh = 0.15, 0.5
	default:
		return
	}
	if !d.coin(p) {
		return
	}
	// The scale of the scatter the category drew, in millimetres, at
	// least 5 µm.
	base := math.Max(s.Noise.MM+s.Noise.Chord*s.Placement.ChordMM, 0.005)
	c := &Correlated{Form: CorrelatedWander}
	if d.coin(pMesh) {
		// The scanner's noise sits on the mesh's vertices; what is left
		// independent from point to point is small.
		// The cut's points come two an interval of the vertices the
		// sampling places (Field.meshCut): half as many vertices.
		c.Form, c.MM, c.Cut = CorrelatedMesh, base*d.uniform(0.7, 1.5), d.uniform(0, 1)
		if d.coin(0.5) {
			// A station placed at a row of the scan's sweeps: the cut
			// passes near the vertices and leaves near pairs.
			c.Cut = d.uniform(0, 0.03)
			if d.coin(0.5) {
				c.Cut = 1 - c.Cut
			}
		}
		s.Noise.MM *= d.uniform(0, 0.3)
		s.Noise.Chord *= d.uniform(0, 0.3)
		s.Sampling.Points = max(3, s.Sampling.Points/2)
		// The cut chains its segments round the loop.
		s.Order.Mode = "loop"
	} else {
		c.MM, c.Gaps = base*d.uniform(0.5, 2), d.logUniform(3, 30)
	}
	s.Noise.Correlated = c
}
