package prep

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/scangen"
)

// leScan prepares one scan of a NACA 4-digit section (0.02 mm noise across
// the surface at a 152 mm chord, irregular spacing σ, twist) and returns
// the stated leading-edge radius in chord units.
func leScan(t *testing.T, ns scangen.NACASpec, points int, sigma, twist float64, seed uint64) float64 {
	t.Helper()
	spec := scangen.Spec{
		Category:  "general",
		Shape:     scangen.ShapeSpec{Family: "naca4", NACA: &ns},
		Sampling:  scangen.Sampling{Points: points, Sigma: sigma, Wave: 0.2},
		Noise:     scangen.Noise{MM: 0.02},
		Order:     scangen.Order{Mode: "loop"},
		Placement: scangen.Placement{ChordMM: 152, TwistDeg: twist, Orientation: "standard"},
		File:      scangen.FileSpec{Format: "csv", Units: "mm", Header: "names", Decimals: 4},
	}
	scan, err := scangen.Generate(spec, seed)
	if err != nil {
		t.Fatal(err)
	}
	p, err := Prepare("n", []File{NewFile(scan.Name, scan.Data)}, Settings{})
	if err != nil {
		t.Fatalf("seed %d: %v", seed, err)
	}
	return p.Props.LERadius
}

// leRadiusRatios returns the stated leading-edge radius over the one of
// NACA Report 824, 1.1019 t², for scans of one section at σ 0.3 and 5° of
// twist, one per seed.
func leRadiusRatios(t *testing.T, camber, pos, thick float64, points int, seeds int) []float64 {
	t.Helper()
	var out []float64
	for seed := 1; seed <= seeds; seed++ {
		ns := scangen.NACASpec{Camber: camber, CamberPos: pos, Thickness: thick, ClosedTE: true}
		out = append(out, leScan(t, ns, points, 0.3, 5, uint64(seed))/(1.1019*thick*thick))
	}
	return out
}

// The leading-edge radius of scans of NACA 4-digit sections against NACA
// Report 824's 1.1019 t² (invented scans, internal/scangen: irregular
// spacing σ 0.3, 0.02 mm noise, 152 mm chord, nine seeds each). Measured
// medians of the ratio at 800 points: 0012 0.995, 2412 1.033, 4415 0.993,
// 0009 0.982 (the nose's form with its corner searched apart from its
// axis gave 0.948, 0.996, 0.991, 0.955: symmetric noses read 4–5 % low;
// the circle fitted over a noise-widened arc before it 0.999, 1.071,
// 1.013, 1.054); at 150 points, where most noses hold too few points for
// the form and keep the circle, 0012 1.086, 2412 1.050, 4415 1.029. Nine
// seeds leave each median about ±2 % uncertain. A 0009 at 150 points (a 1.35 mm
// nose radius between points 2 mm apart) is left out: its nose is not
// resolved (median 3.05); the two such scans looked at warn that the nose
// is sampled too sparsely.
func TestLERadiusOfScans(t *testing.T) {
	if testing.Short() {
		t.Skip("prepares 63 scans")
	}
	for _, tc := range []struct {
		code               string
		camber, pos, thick float64
		points             int
	}{
		{"0012", 0, 0, 0.12, 150}, {"2412", 0.02, 0.4, 0.12, 150}, {"4415", 0.04, 0.4, 0.15, 150},
		{"0012", 0, 0, 0.12, 800}, {"2412", 0.02, 0.4, 0.12, 800}, {"4415", 0.04, 0.4, 0.15, 800}, {"0009", 0, 0, 0.09, 800},
	} {
		r := leRadiusRatios(t, tc.camber, tc.pos, tc.thick, tc.points, 9)
		slices.Sort(r)
		med := r[len(r)/2]
		t.Logf("NACA %s, %d points: LE radius / 1.1019 t² median %.3f (%.3f to %.3f)", tc.code, tc.points, med, r[0], r[len(r)-1])
		tol := 0.10
		if tc.points >= 800 {
			tol = 0.06
		}
		if math.Abs(med-1) > tol {
			t.Errorf("NACA %s, %d points: LE radius median %.3f of Report 824's 1.1019 t², want within %.0f %%", tc.code, tc.points, med, 100*tol)
		}
	}
}

// exactLERadius returns the radius of curvature at the leading edge (the
// chord convention's point) of the exact outline of n: the NACA Report
// 824 equations at 8001 cosine-spaced nodes, interpolated. For a
// symmetric section it is 1.1019 t²; camber moves it (2412 −1.4 %, 4424
// −6 %, 6209 +22 %), since the chord convention's leading edge is not
// the point of the mean line's nose and camber bends the nose.
func exactLERadius(t *testing.T, n shape.NACA4) float64 {
	t.Helper()
	nz, err := frame.Normalize(curve.Interpolate(n.Nodes(8000), false), frame.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return 1 / nz.Path.(*curve.Curve).Curvature(nz.SLE)
}

// The leading-edge radius over a spread of scans (invented, internal/
// scangen): NACA 4-digit sections 6–24 % thick, camber 0–6 % (none in
// three of ten) at 20–60 % of the chord, open and closed trailing edges,
// twist −25° to 35°, spacing σ 0 to 0.8, 800 points, 0.02 mm noise at a
// 152 mm chord; the stated radius against the exact outline's. Measured
// over these 40 scans: median 1.025, 10th and 90th percentiles 0.955 and
// 1.070, |error| 90th percentile 7.7 % (the form with the corner searched
// apart from the axis: median 1.001, 0.951 to 1.069, 9.1 %; the circle
// before it: median 1.022, 0.962 to 1.119, |error| 90th percentile
// 11.8 %). The spread is the
// noise's at a point of the nose: thin noses (6–8 %) hold only 3–8
// points within a radius of the leading edge at this count.
func TestLERadiusOfScanSpread(t *testing.T) {
	if testing.Short() || raceEnabled {
		t.Skip("prepares 40 scans (the normal suite runs it; under the race detector it takes minutes)")
	}
	var ratio, absErr []float64
	for cs := range 40 {
		rng := rand.New(rand.NewPCG(uint64(cs+1), 7))
		ns := scangen.NACASpec{Thickness: 0.06 + 0.18*rng.Float64(), ClosedTE: rng.Float64() < 0.5}
		if rng.Float64() < 0.7 {
			ns.Camber, ns.CamberPos = 0.06*rng.Float64(), 0.2+0.4*rng.Float64()
		}
		sigma, twist := 0.8*rng.Float64(), -25+60*rng.Float64()
		truth := exactLERadius(t, shape.NACA4{Camber: ns.Camber, CamberPos: ns.CamberPos, Thickness: ns.Thickness, SharpTE: ns.ClosedTE})
		q := leScan(t, ns, 800, sigma, twist, uint64(cs+1)) / truth
		ratio = append(ratio, q)
		absErr = append(absErr, math.Abs(q-1))
	}
	slices.Sort(ratio)
	slices.Sort(absErr)
	pct := func(a []float64, f float64) float64 { return a[int(f*float64(len(a)-1))] }
	med, p90 := pct(ratio, 0.5), pct(absErr, 0.9)
	t.Logf("LE radius / exact, 40 scans: median %.3f, 10th %.3f, 90th %.3f; |error| 90th pct %.3f", med, pct(ratio, 0.1), pct(ratio, 0.9), p90)
	if math.Abs(med-1) > 0.03 {
		t.Errorf("LE radius over the exact outline's: median %.3f, want within 3 %%", med)
	}
	if p90 > 0.10 {
		t.Errorf("LE radius over the exact outline's: |error| 90th percentile %.3f, want at most 0.10 (measured 0.077)", p90)
	}
}
