package scangen

import (
	"math"
	"slices"
	"testing"
)

// Correlated noise: the offsets of neighbouring points go together (a
// wander over tens of gaps, a mesh's vertices shared by the points cut
// between them), their size is the one asked for, and they come from a
// stream of their own: the same case without them has the same
// independent scatter, point for point.
func TestCorrelatedNoise(t *testing.T) {
	// offsets returns the signed normal offsets of the good points, in
	// loop order, chord units.
	offsets := func(spec Spec) ([]float64, *Truth) {
		t.Helper()
		sc, err := Generate(spec, 31)
		if err != nil {
			t.Fatal(err)
		}
		pts := readBack(t, sc.Data, spec.File)
		sh := sc.Truth.Section.Shape
		var out []float64
		for _, l := range sc.Truth.Lines {
			if l.Kind == LineGood {
				q, _ := toChord(sc.Truth, pts[l.No])
				out = append(out, q.Sub(sh.At(l.T)).Dot(sh.Normal(l.T)))
			}
		}
		return out, sc.Truth
	}
	// stats returns the RMS and the correlation of neighbours (lag 1).
	stats := func(xs []float64) (rms, lag1 float64) {
		var s2, s11 float64
		for i, x := range xs {
			s2 += x * x
			s11 += x * xs[(i+1)%len(xs)]
		}
		return math.Sqrt(s2 / float64(len(xs))), s11 / s2
	}
	const chordMM = 200
	for _, tc := range []struct {
		name     string
		c        Correlated
		rms      [2]float64 // bounds of the RMS, in units of c.MM
		lag1     float64    // least correlation of neighbours
		noiseMax float64    // largest Truth.Noise over the σ asked for
	}{
		// Wander: RMS σ by construction; neighbours 10 gaps apart in
		// correlation length correlate by about exp(−1/200) (Gaussian
		// covariance, calculated by hand).
		{"wander", Correlated{Form: CorrelatedWander, MM: 0.02, Gaps: 10}, [2]float64{0.8, 1.2}, 0.95, 1.01},
		// Mesh cut at 0.3 of the way between its rows: each point mixes
		// two vertices by 0.7 and 0.3 (variance 0.58 of a vertex's, RMS
		// 0.76 σ); an edge's point and the next diagonal's share a vertex
		// by 0.7 (correlation 0.84), the diagonal's and the next edge's
		// by 0.3 (0.16): 0.5 on average (calculated by hand).
		{"mesh", Correlated{Form: CorrelatedMesh, MM: 0.02, Cut: 0.3}, [2]float64{0.65, 0.87}, 0.35, 1.01},
	} {
		spec := hazardSpec()
		spec.Noise.MM = 0
		spec.Noise.Correlated = &tc.c
		xs, tr := offsets(spec)
		rms, lag1 := stats(xs)
		sd := tc.c.MM / chordMM
		t.Logf("%s: RMS %.3g σ, neighbours correlate %.3f, truth's noise %.3g σ", tc.name, rms/sd, lag1, tr.Noise/sd)
		if rms < tc.rms[0]*sd || rms > tc.rms[1]*sd || lag1 < tc.lag1 {
			t.Errorf("%s: RMS %.3g c (σ %.3g c), neighbours correlate %.3f, want RMS within %v σ and correlation ≥ %g", tc.name, rms, sd, lag1, tc.rms, tc.lag1)
		}
		if tr.Noise > tc.noiseMax*sd || tr.Noise < 0.5*sd || tr.NoiseMax < tr.Noise {
			t.Errorf("%s: truth's noise %.3g c RMS, %.3g at most; σ %.3g c", tc.name, tr.Noise, tr.NoiseMax, sd)
		}
	}

	// A mesh cut close to a row of its vertices leaves its points in near
	// pairs, two a vertex: the pairs' gaps are tiny beside the vertices'.
	spec := hazardSpec()
	spec.Noise = Noise{Correlated: &Correlated{Form: CorrelatedMesh, MM: 0.02, Cut: 0.01}}
	sc, err := Generate(spec, 31)
	if err != nil {
		t.Fatal(err)
	}
	sh := sc.Truth.Section.Shape
	var gaps []float64
	for i, l := range sc.Truth.Lines[1:] {
		gaps = append(gaps, math.Abs(sh.ArcAt(l.T)-sh.ArcAt(sc.Truth.Lines[i].T)))
	}
	if len(gaps) < 2*spec.Sampling.Points-10 {
		t.Errorf("mesh cut: %d points from %d vertices, want two a vertex", len(gaps)+1, spec.Sampling.Points)
	}
	slices.Sort(gaps)
	if small, big := gaps[len(gaps)/4], gaps[3*len(gaps)/4]; small > 0.05*big {
		t.Errorf("mesh cut near a row: gaps' quartiles %.3g and %.3g c, want near pairs", small, big)
	}

	// Independent scatter alone: neighbours do not correlate.
	spec = hazardSpec()
	xs, _ := offsets(spec)
	if _, lag1 := stats(xs); math.Abs(lag1) > 0.15 {
		t.Errorf("independent scatter: neighbours correlate %.3f", lag1)
	}
	// With the wander added, every point moves by the wander alone: the
	// independent draws are the same.
	with := hazardSpec()
	with.Noise.Correlated = &Correlated{Form: CorrelatedWander, MM: 0.02, Gaps: 10}
	ys, _ := offsets(with)
	if len(ys) != len(xs) {
		t.Fatalf("%d good points with the wander, %d without", len(ys), len(xs))
	}
	diff := make([]float64, len(xs))
	for i := range xs {
		diff[i] = ys[i] - xs[i]
	}
	// The written numbers carry 5 decimals in mm: 5e-6 mm of rounding.
	if rms, lag1 := stats(diff); rms < 0.8*0.02/chordMM || lag1 < 0.95 {
		t.Errorf("the difference the wander makes: RMS %.3g c, neighbours correlate %.3f; want the wander alone", rms, lag1)
	}
}

// Draw gives correlated noise to some cases of the scan-like categories
// only, and keeps the other draws of those cases: a wander leaves the rest
// of the spec as it was.
func TestDrawCorrelated(t *testing.T) {
	forms := map[string]int{}
	for s := uint64(1); s <= 300; s++ {
		sp := Draw(s)
		c := sp.Noise.Correlated
		if c == nil {
			continue
		}
		forms[c.Form]++
		switch sp.Category {
		case "scan", "voxel", "dense", "general":
		default:
			t.Fatalf("seed %d: correlated noise in a %s case", s, sp.Category)
		}
		if !(c.MM > 0 && (c.Gaps > 0) == (c.Form == CorrelatedWander) && c.Cut >= 0 && c.Cut <= 1) {
			t.Fatalf("seed %d: %+v", s, *c)
		}
	}
	if forms[CorrelatedWander] < 8 || forms[CorrelatedMesh] < 8 {
		t.Errorf("forms drawn in 300 seeds: %v", forms)
	}
}
