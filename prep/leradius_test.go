package prep

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/scangen"
)

// leScan prepares one scan of a NACA 4-digit section (0.02 mm noise across
// the surface at a 152 mm chord, irregular spacing σ, twist) and returns
// the stated leading-edge radius in chord units.
func leScan(t *testing.T, ns scangen.NACASpec, points int, sigma, twist float64, seed uint64) float64 {
	t.Helper()
	r, _, err := leScanOf(scangen.ShapeSpec{Family: scangen.FamilyNACA, NACA: &ns}, scangen.Sampling{Points: points, Sigma: sigma, Wave: 0.2}, twist, seed)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// leScanOf prepares one scan of the section sh (0.02 mm noise across the
// surface at a 152 mm chord, the sampling given, twist in degrees) and
// returns the stated leading-edge radius in chord units and whether prep
// warned that the nose is sampled too sparsely.
func leScanOf(sh scangen.ShapeSpec, sm scangen.Sampling, twist float64, seed uint64) (r float64, sparse bool, err error) {
	spec := scangen.Spec{
		Category:  "general",
		Shape:     sh,
		Sampling:  sm,
		Noise:     scangen.Noise{MM: 0.02},
		Order:     scangen.Order{Mode: "loop"},
		Placement: scangen.Placement{ChordMM: 152, TwistDeg: twist, Orientation: "standard"},
		File:      scangen.FileSpec{Format: "csv", Units: "mm", Header: "names", Decimals: 4},
	}
	scan, err := scangen.Generate(spec, seed)
	if err != nil {
		return 0, false, err
	}
	p, err := Prepare("n", []File{NewFile(scan.Name, scan.Data)}, Settings{})
	if err != nil {
		return 0, false, fmt.Errorf("seed %d: %w", seed, err)
	}
	for _, w := range p.Section.Warnings {
		sparse = sparse || strings.Contains(w, "the nose is sampled too sparsely")
	}
	return p.Props.LERadius, sparse, nil
}

// leRadiusRatios returns the stated leading-edge radius over the exact
// one (shape.NACA4.LERadius; for a symmetric section NACA Report 824's
// 1.1019 t²) for scans of one section at σ 0.3 and 5° of twist, one per
// seed.
func leRadiusRatios(t *testing.T, camber, pos, thick float64, points int, seeds int) []float64 {
	t.Helper()
	var out []float64
	exact := shape.NACA4{Camber: camber, CamberPos: pos, Thickness: thick, SharpTE: true}.LERadius()
	for seed := 1; seed <= seeds; seed++ {
		ns := scangen.NACASpec{Camber: camber, CamberPos: pos, Thickness: thick, ClosedTE: true}
		out = append(out, leScan(t, ns, points, 0.3, 5, uint64(seed))/exact)
	}
	return out
}

// The leading-edge radius of scans of NACA 4-digit sections against the
// exact radius of the Report 824 outline (invented scans, internal/
// scangen: irregular spacing σ 0.3, 0.02 mm noise, 152 mm chord; 30 seeds
// each at 800 points, 9 at 150). For the symmetric sections the exact
// radius is NACA Report 824's 1.1019 t²; camber moves it (2412 −1.4 %,
// 4415 −2.1 %). Measured medians at 800 points, with the 10th and 90th
// percentiles: 0012 1.002 (0.906, 1.085), 0009 0.997 (0.784, 1.157), 2412
// 1.011 (0.948, 1.051), 4415 1.008 (0.987, 1.033). The nose's form with
// its corner searched apart from its axis read 0.965 (0.929, 1.022), 0.972
// (0.892, 1.024), 0.994 and 1.013: symmetric noses low, and less spread,
// as it could only read them low; a 0009's nose holds about ten points
// within a radius of the leading edge at 800 points. At 150 points, where
// most noses hold too few points for the form and keep the circle, 0012
// 1.086, 2412 1.062, 4415 1.051 (before 1.086, 1.083, 1.029). A 0009 at
// 150 points (a 1.35 mm nose radius between points 2 mm apart) is left
// out: its nose is not resolved (median 3.05); the two such scans looked
// at warn that the nose is sampled too sparsely.
func TestLERadiusOfScans(t *testing.T) {
	if testing.Short() {
		t.Skip("prepares 147 scans")
	}
	for _, tc := range []struct {
		code               string
		camber, pos, thick float64
		points, seeds      int
	}{
		{"0012", 0, 0, 0.12, 150, 9}, {"2412", 0.02, 0.4, 0.12, 150, 9}, {"4415", 0.04, 0.4, 0.15, 150, 9},
		{"0012", 0, 0, 0.12, 800, 30}, {"0009", 0, 0, 0.09, 800, 30}, {"2412", 0.02, 0.4, 0.12, 800, 30}, {"4415", 0.04, 0.4, 0.15, 800, 30},
	} {
		r := leRadiusRatios(t, tc.camber, tc.pos, tc.thick, tc.points, tc.seeds)
		slices.Sort(r)
		med := r[len(r)/2]
		t.Logf("NACA %s, %d points: LE radius / exact median %.3f (10th %.3f, 90th %.3f; %.3f to %.3f)", tc.code, tc.points, med, pct(r, 0.1), pct(r, 0.9), r[0], r[len(r)-1])
		tol := 0.10
		if tc.points >= 800 {
			tol = 0.03
		}
		if math.Abs(med-1) > tol {
			t.Errorf("NACA %s, %d points: LE radius median %.3f of the exact radius (NACA Report 824 outline), want within %.0f %%", tc.code, tc.points, med, 100*tol)
		}
	}
}

// leCase is one scan of the statistics: its section, sampling and twist,
// and the exact leading-edge radius (chord units).
type leCase struct {
	name  string
	shape scangen.ShapeSpec
	samp  scangen.Sampling
	twist float64
	truth float64
}

// randomNACA4 draws a NACA 4-digit section 6–24 % thick, with camber 0–6 %
// at 20–60 % of the chord in seven of ten (none in the others), an open or
// closed trailing edge, irregular spacing (log-normal gaps of σ 0 to 0.8
// in a slow density wave of amplitude 0 to 0.3) and twist −25° to 35°.
// The truth is the radius of curvature of the Report 824 outline at its
// leading edge (shape.NACA4.LERadius): 1.1019 t² when symmetric.
func randomNACA4(rng *rand.Rand, points int) leCase {
	ns := scangen.NACASpec{Thickness: 0.06 + 0.18*rng.Float64(), ClosedTE: rng.Float64() < 0.5}
	if rng.Float64() < 0.7 {
		ns.Camber, ns.CamberPos = 0.06*rng.Float64(), 0.2+0.4*rng.Float64()
	}
	sm := scangen.Sampling{Points: points, Sigma: 0.8 * rng.Float64(), Wave: 0.3 * rng.Float64()}
	n := shape.NACA4{Camber: ns.Camber, CamberPos: ns.CamberPos, Thickness: ns.Thickness, SharpTE: ns.ClosedTE}
	name := fmt.Sprintf("NACA %.1f-%.1f-%.1f %%", 100*ns.Camber, 10*ns.CamberPos, 100*ns.Thickness)
	return leCase{name, scangen.ShapeSpec{Family: scangen.FamilyNACA, NACA: &ns}, sm, -25 + 60*rng.Float64(), n.LERadius()}
}

// randomKT draws a Kármán–Trefftz section: circle centre x −0.04 to −0.16
// (about 6 % to 22 % thick), y 0 to 0.1 (none in three of ten),
// trailing-edge angle 0° to 20°, sampled as randomNACA4. The truth is the
// radius of curvature of the mapped circle at its leading edge
// (shape.KarmanTrefftz.LERadius): an exact solution.
func randomKT(t *testing.T, rng *rand.Rand, points int) leCase {
	kt := scangen.KTSpec{CentreX: -0.04 - 0.12*rng.Float64(), TEAngleDeg: 20 * rng.Float64()}
	if rng.Float64() < 0.7 {
		kt.CentreY = 0.1 * rng.Float64()
	}
	sm := scangen.Sampling{Points: points, Sigma: 0.8 * rng.Float64(), Wave: 0.3 * rng.Float64()}
	k := shape.KarmanTrefftz{Centre: geometry.Point{X: kt.CentreX, Y: kt.CentreY}, TEAngle: kt.TEAngleDeg * math.Pi / 180}
	truth, err := k.LERadius()
	if err != nil {
		t.Fatal(err)
	}
	name := fmt.Sprintf("KT (%.3f, %.3f) %.1f°", kt.CentreX, kt.CentreY, kt.TEAngleDeg)
	return leCase{name, scangen.ShapeSpec{Family: scangen.FamilyKT, KT: &kt}, sm, -25 + 60*rng.Float64(), truth}
}

// leResult is the stated radius of one scan over the exact one and
// whether prep warned that the nose is sampled too sparsely.
type leResult struct {
	ratio  float64
	sparse bool
}

// leStats prepares the scans and returns their results and the number of
// scans that failed to prepare.
func leStats(t *testing.T, cases []leCase) (out []leResult, failed int) {
	t.Helper()
	for i, c := range cases {
		r, sparse, err := leScanOf(c.shape, c.samp, c.twist, uint64(i+1))
		if err != nil {
			t.Logf("%s, %d points: %v", c.name, c.samp.Points, err)
			failed++
			continue
		}
		if testing.Verbose() {
			t.Logf("%s, %d points, σ %.2f: LE radius %.5f, exact %.5f (%.3f), nose sampled too sparsely: %v", c.name, c.samp.Points, c.samp.Sigma, r, c.truth, r/c.truth, sparse)
		}
		out = append(out, leResult{r / c.truth, sparse})
	}
	return out, failed
}

// ratios returns the ratios of the results that keep says, sorted.
func ratios(rs []leResult, keep func(leResult) bool) []float64 {
	var q []float64
	for _, r := range rs {
		if keep(r) {
			q = append(q, r.ratio)
		}
	}
	slices.Sort(q)
	return q
}

// pct returns the f-quantile of the sorted a (nearest rank below).
func pct(a []float64, f float64) float64 { return a[int(f*float64(len(a)-1))] }

// absErrors returns |q − 1| for each q, sorted.
func absErrors(q []float64) []float64 {
	out := make([]float64, len(q))
	for i, v := range q {
		out[i] = math.Abs(v - 1)
	}
	slices.Sort(out)
	return out
}

// The leading-edge radius over many scans of random NACA 4-digit sections
// (invented, internal/scangen; see randomNACA4: 6–24 % thick, camber 0–6 %,
// irregular spacing σ to 0.8 in a density wave, twist, 0.02 mm noise at a
// 152 mm chord; 80 scans at each count) against the exact radius of the
// NACA Report 824 outline at its leading edge (shape.NACA4.LERadius). The
// issue asks 3 % at 800 points and 10 % at 150; the median holds them;
// the spread of single scans is the noise's at the nose.
//
// Measured at 800 points: median 1.013, 10th and 90th percentiles 0.970
// and 1.091, |error| median 2.5 %, 90th percentile 10.0 %; two scans more
// than 20 % off, a 7.3 % section 20.5 % large and a symmetric 8.2 % one 21 %
// small. That one read 0.924 while the leading edge was the fitted
// curve's own farthest point; read from the form of the nose
// (frame/nose.go) the leading edge moves by 1e-4 chord on it, and the
// window leRadius picks by the knots within it changes (0.924 → 0.789)
// while every other scan reads within 1 % of before. Before that (the
// corner searched apart from the axis) median 1.001, 0.948 to 1.062,
// |error| 90th percentile 7.2 %, one scan more than 20 % off. On this mix of thicknesses the symmetric noses
// read only 1 % low before (thin noses little: the corner's fold grows
// with the nose's size in the window), TestLERadiusOfScans has them at
// 0012 and 0009.
//
// At 150 points a nose under about 12 % thick is not resolved: its radius
// of a few tenths of a millimetre lies between points 2 mm apart, and the
// curve's guess there reads it 1.2 to 5 times large. prep warns of that
// ("the nose is sampled too sparsely") on 20 of the 21 scans read more
// than 20 % off (the one it misses, a 10 % section at σ 0.65, reads 3.1
// times large: the gap test sees no gap there), so the figures at 150
// points are over the 51 scans of 80 it does not warn of: median 1.042,
// 10th and 90th percentiles 0.993 and 1.110, |error| 90th percentile
// 11.0 % (before: median 1.010, 0.975 to 1.123, 12.3 %); the curve
// between sparse points flattens the nose a little.
func TestLERadiusStatistics(t *testing.T) {
	if testing.Short() || raceEnabled {
		t.Skip("prepares 160 scans (the normal suite runs it; under the race detector it takes minutes)")
	}
	for _, tc := range []struct {
		points   int
		medTol   float64 // |median − 1|, of the scans not warned of
		p90Limit float64 // 90th percentile of |ratio − 1|, of the same; measured 0.100 and 0.111
		unwarned int     // most scans read more than 20 % off without the warning; measured 2 and 1
	}{
		{800, 0.03, 0.11, 2},
		{150, 0.10, 0.13, 1},
	} {
		rng := rand.New(rand.NewPCG(uint64(tc.points), 824))
		var cases []leCase
		for range 80 {
			cases = append(cases, randomNACA4(rng, tc.points))
		}
		rs, failed := leStats(t, cases)
		all := ratios(rs, func(leResult) bool { return true })
		q := ratios(rs, func(r leResult) bool { return !r.sparse })
		silent := len(ratios(rs, func(r leResult) bool { return !r.sparse && math.Abs(r.ratio-1) > 0.2 }))
		e := absErrors(q)
		med, p90 := pct(q, 0.5), pct(e, 0.9)
		t.Logf("NACA 4-digit, %d points, %d scans (%d failed), all: LE radius / exact median %.3f, 10th %.3f, 90th %.3f", tc.points, len(all), failed, pct(all, 0.5), pct(all, 0.1), pct(all, 0.9))
		t.Logf("NACA 4-digit, %d points, %d scans whose nose prep does not call too sparsely: median %.3f, 10th %.3f, 90th %.3f; |error| median %.3f, 90th pct %.3f; %d read more than 20 %% off without the warning", tc.points, len(q), med, pct(q, 0.1), pct(q, 0.9), pct(e, 0.5), p90, silent)
		if failed > 0 {
			t.Errorf("%d points: %d scans failed to prepare", tc.points, failed)
		}
		if math.Abs(med-1) > tc.medTol {
			t.Errorf("%d points: LE radius over the exact radius (NACA Report 824 outline): median %.3f, want within %.0f %%", tc.points, med, 100*tc.medTol)
		}
		if p90 > tc.p90Limit {
			t.Errorf("%d points: LE radius over the exact radius: |error| 90th percentile %.3f, want at most %.2f", tc.points, p90, tc.p90Limit)
		}
		if silent > tc.unwarned {
			t.Errorf("%d points: %d scans read their LE radius more than 20 %% off without warning that the nose is sampled too sparsely, want at most %d", tc.points, silent, tc.unwarned)
		}
	}
}

// The leading-edge radius over 40 scans of random Kármán–Trefftz sections
// (randomKT: smooth noses, no corner) at 800 points against the exact
// radius of the mapped circle at its leading edge (an exact solution).
// Measured: median 1.024, 10th and 90th percentiles 0.968 and 1.089,
// |error| 90th percentile 9.4 % (before: median 1.019, 0.971 to 1.088,
// 8.8 %). The form's |w − w₀|³ stands in for a curvature that falls away
// smoothly: on exact Kármán–Trefftz noses it reads +0.3 % at 0.5 radii of
// window and up to +2.3 % at 1.35 (the widest).
func TestLERadiusKarmanTrefftz(t *testing.T) {
	if testing.Short() || raceEnabled {
		t.Skip("prepares 40 scans (the normal suite runs it; under the race detector it takes minutes)")
	}
	rng := rand.New(rand.NewPCG(800, 1968))
	var cases []leCase
	for range 40 {
		cases = append(cases, randomKT(t, rng, 800))
	}
	rs, failed := leStats(t, cases)
	q := ratios(rs, func(leResult) bool { return true })
	e := absErrors(q)
	med, p90 := pct(q, 0.5), pct(e, 0.9)
	t.Logf("Kármán–Trefftz, 800 points, %d scans (%d failed): LE radius / exact median %.3f, 10th %.3f, 90th %.3f; |error| median %.3f, 90th pct %.3f", len(q), failed, med, pct(q, 0.1), pct(q, 0.9), pct(e, 0.5), p90)
	if failed > 0 {
		t.Errorf("%d scans failed to prepare", failed)
	}
	if math.Abs(med-1) > 0.03 {
		t.Errorf("Kármán–Trefftz: LE radius over the exact radius (the map's curvature): median %.3f, want within 3 %%", med)
	}
	if p90 > 0.12 {
		t.Errorf("Kármán–Trefftz: |error| 90th percentile %.3f, want at most 0.12 (measured 0.094)", p90)
	}
}
