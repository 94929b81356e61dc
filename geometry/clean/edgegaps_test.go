package clean

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// The gaps' regularity is measured on the points: steps of one length
// give the strictest law allowed (gapShapeMax), log-normal steps of σ 0.8
// (a scanner's irregular spacing) one near the Poisson process's (for σ
// 0.8 the coefficient of variation is √(e^0.64 − 1) ≈ 0.95, k ≈ 1.1; the
// estimate from 24 gaps a side runs higher, never above 4).
func TestGapModel(t *testing.T) {
	loop := func(steps []float64) ([]geometry.Point, []int32) {
		var pts []geometry.Point
		var seq []int32
		var s float64
		for i, d := range steps {
			s += d
			pts = append(pts, geometry.Point{X: s})
			seq = append(seq, int32(i))
		}
		return pts, seq
	}
	even := make([]float64, 200)
	for i := range even {
		even[i] = 0.01
	}
	pts, seq := loop(even)
	if gm := newGapModel(pts, seq, 100, 99, 1); math.Abs(gm.k-gapShapeMax) > 1e-9 || math.Abs(gm.h[0]-0.01) > 1e-12 || math.Abs(gm.h[1]-0.01) > 1e-12 {
		t.Errorf("even steps: h %v k %.3g, want 0.01 and %.3g", gm.h, gm.k, gapShapeMax)
	}
	rng := rand.New(rand.NewPCG(3, 4))
	var ks []float64
	for range 50 {
		irr := make([]float64, 200)
		for i := range irr {
			irr[i] = 0.01 * math.Exp(0.8*rng.NormFloat64())
		}
		pts, seq := loop(irr)
		ks = append(ks, newGapModel(pts, seq, 100, 99, 1).k)
	}
	// Measured: median 1.4, largest 2.9 (an estimate from 48 gaps).
	slices.Sort(ks)
	if ks[len(ks)/2] > 2 || ks[len(ks)-1] > 4 {
		t.Errorf("log-normal steps of σ 0.8: k median %.3g, largest %.3g; want at most 2 and 4", ks[len(ks)/2], ks[len(ks)-1])
	}
}

// An open trailing edge (NACA 0012, NACA Report 824: a base 0.25 % of the
// chord thick, its surfaces meeting some 0.009 c behind it) probed at
// steps of one length, 0.012 c, along the outline from a random phase, so
// that no point falls on the base: the last points stop within a step of
// the corners, and a sharp corner 0.009 c on would leave a stretch of
// more than a step unsampled either side, which points that steady do
// not. The base must be stated in most runs (measured: 15 of 16; the
// Poisson law alone, gapSigmaMin set so that k = 1, stated it in 2); a
// sharp edge sampled alike (the closed-edge coefficient) must stay sharp.
func TestEdgeEvenStepsOpenBase(t *testing.T) {
	const chord, runs, step = 80.0, 16, 40
	for _, sharp := range []bool{false, true} {
		foil := shape.NACA4{Thickness: 0.12, SharpTE: sharp}
		stations := nacaArcStations(foil, 170*step+1)
		want, right := EdgeBlunt, 0
		if sharp {
			want = EdgeSharp
		}
		for seed := range uint64(runs) {
			rng := rand.New(rand.NewPCG(seed, 41))
			p := 1 + rng.IntN(step-1)
			var pts []geometry.Point
			for i := p; i < len(stations)-1; i += step {
				nz := geometry.Point{X: rng.NormFloat64(), Y: rng.NormFloat64()}.Scale(0.004 / chord)
				pts = append(pts, stations[i].Add(nz).Scale(chord).Rotate(0.3))
			}
			_, rep, err := Clean(edgeTestCloud(pts), Options{})
			if err != nil {
				t.Fatal(err)
			}
			if rep.Edge == nil {
				t.Fatalf("seed %d: no edge", seed)
			}
			if rep.Edge.Kind == want {
				right++
			} else {
				t.Logf("sharp %v seed %d: %s (%s)", sharp, seed, rep.Edge.Kind, rep.Edge.Why)
			}
		}
		if right < runs*3/4 {
			t.Errorf("sharp %v: %s stated in %d of %d runs", sharp, want, right, runs)
		}
	}
}

// onePassLoop returns points stepped once round the closed outline of
// foil (its base included when the edge is open) from a random phase,
// with log-normal steps of mean h and σ sigma of their logs, noise nz
// (chord units) and the count of points that fell on the base.
func onePassLoop(foil shape.NACA4, h, sigma, nz float64, rng *rand.Rand) ([]geometry.Point, int) {
	line := nacaDense(foil, 6000)
	// The base, from the lower corner back to the upper one (the first
	// point): the loop is closed.
	line = append(line, line[0])
	s := make([]float64, len(line))
	for i := 1; i < len(line); i++ {
		s[i] = s[i-1] + line[i].Dist(line[i-1])
	}
	total, baseFrom := s[len(s)-1], s[len(s)-2]
	var pts []geometry.Point
	onBase := 0
	// From a random spot near the nose once round (the trailing edge falls
	// in a gap of the steps, not where the loop closes).
	x0 := total * (0.45 + 0.1*rng.Float64())
	for r := 0.0; r < total; r += h * math.Exp(sigma*rng.NormFloat64()-sigma*sigma/2) {
		x := math.Mod(x0+r, total)
		j, _ := slices.BinarySearch(s, x)
		j = min(max(j-1, 0), len(s)-2)
		f := (x - s[j]) / (s[j+1] - s[j])
		if x > baseFrom && line[len(line)-2].Dist(line[0]) > 0 {
			onBase++
		}
		p := line[j].Add(line[j+1].Sub(line[j]).Scale(f))
		pts = append(pts, p.Add(geometry.Point{X: rng.NormFloat64(), Y: rng.NormFloat64()}.Scale(nz)))
	}
	return pts, onBase
}

// An open trailing edge (NACA 0012, NACA Report 824: a base 0.25 % of the
// chord thick, its surfaces meeting some 0.009 c behind it) and its
// closed-edge twin, each probed in one pass round the outline at steps of
// 0.012 c whose logs scatter by σ 0.2 (a probe program's steady pace), from
// a random spot near the nose; draws with a point on the base are left
// out. The base must be stated in most runs, the sharp twin must stay
// sharp in nearly all. Measured on these draws: blunt right in 24 of 31,
// sharp in 36 of 40, with the stretches either side of the end scored as
// independent forward recurrences (gapModel.deviance). Scored instead as
// the two parts of the one gap of a single pass that holds the end (joint
// density f(a + b)/h), blunt 28 of 31 and sharp 36 of 40 here, but with h
// the mean of the 24 gaps either side that law calls the short gaps of
// cosine stations crowding at the end unlikely and cuts unsampled sharp
// corners off (TestEdgeUnsampledSharpCorner 6 of 8,
// TestEdgeIrregularSharpNoBase 8 → 12 of 96): it needs the spacing at the
// end itself.
func TestEdgeOnePassSteadySteps(t *testing.T) {
	const chord, runs = 90.0, 40
	for _, sharp := range []bool{false, true} {
		foil := shape.NACA4{Thickness: 0.12, SharpTE: sharp}
		want := EdgeBlunt
		if sharp {
			want = EdgeSharp
		}
		right, counted := 0, 0
		for seed := range uint64(runs) {
			rng := rand.New(rand.NewPCG(seed, 53))
			pts, onBase := onePassLoop(foil, 0.012, 0.2, 0.002/chord, rng)
			if onBase > 0 {
				continue
			}
			for i := range pts {
				pts[i] = pts[i].Scale(chord).Rotate(0.2)
			}
			_, rep, err := Clean(edgeTestCloud(pts), Options{})
			if err != nil {
				t.Fatal(err)
			}
			if rep.Edge == nil {
				t.Fatalf("seed %d: no edge", seed)
			}
			counted++
			if rep.Edge.Kind == want {
				right++
			} else {
				t.Logf("sharp %v seed %d: %s (%s)", sharp, seed, rep.Edge.Kind, rep.Edge.Why)
			}
		}
		t.Logf("sharp %v: %s stated in %d of %d runs", sharp, want, right, counted)
		least := counted * 3 / 4
		if sharp {
			least = counted * 7 / 8
		}
		if right < least {
			t.Errorf("sharp %v: %s stated in %d of %d runs, want at least %d", sharp, want, right, counted, least)
		}
	}
}
