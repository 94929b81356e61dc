package accuracy

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// bruteNearest2 is the least segDist2 of q over every segment in [lo, hi).
func bruteNearest2(q geometry.Point, poly []geometry.Point, lo, hi int) float64 {
	best := math.Inf(1)
	for j := lo; j < hi; j++ {
		best = min(best, segDist2(q, poly[j], poly[j+1]))
	}
	return best
}

// same reports whether a and b are the same float64, bit for bit, or
// both NaN.
func same(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || math.IsNaN(a) && math.IsNaN(b)
}

// TestNearestSeg2MatchesAll checks that the pruned search returns, to the
// bit, the least distance over every segment of the window: on a section's
// outline sampled as the reference is, against points near it and far,
// on both sides of the chord, at coordinates offset far from zero
// (rounding), with a zero-length segment, a NaN and an infinity; also
// maxDistance and mirrorDistance against their brute-force forms.
func TestNearestSeg2MatchesAll(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	base := make([]geometry.Point, 0, 2*refSamples+1)
	for k := 0; k <= refSamples; k++ {
		x := (1 + math.Cos(math.Pi*float64(k)/refSamples)) / 2
		base = append(base, foil.Upper(x))
	}
	for k := 1; k <= refSamples; k++ {
		x := (1 - math.Cos(math.Pi*float64(k)/refSamples)) / 2
		base = append(base, foil.Lower(x))
	}
	for _, off := range []float64{0, 1e6} {
		poly := make([]geometry.Point, len(base))
		for i, p := range base {
			poly[i] = geometry.Point{X: p.X + off, Y: p.Y - off}
		}
		poly[700] = poly[699] // a segment of no length
		reach := newSegReach(poly)
		var qs []geometry.Point
		for k := 0; k < 3000; k++ {
			j := rng.IntN(len(poly))
			scale := []float64{1e-9, 1e-6, 1e-4, 1e-2, 0.3}[k%5]
			q := poly[j].Add(geometry.Point{X: scale * rng.NormFloat64(), Y: scale * rng.NormFloat64()})
			qs = append(qs, q)
			lo := max(0, j-distWindow)
			hi := min(len(poly)-1, j+distWindow)
			want := bruteNearest2(q, poly, lo, hi)
			got := nearestSeg2(q, poly, lo, hi, j+rng.IntN(7)-3, reach.with(qs[len(qs)-1:]))
			if !same(got, want) {
				t.Fatalf("offset %g, point %v near %d: nearest %v, every segment %v", off, q, j, got, want)
			}
			if got := nearestSeg2(q, poly, 0, len(poly)-1, j, reach.with(qs[len(qs)-1:])); !same(got, bruteNearest2(q, poly, 0, len(poly)-1)) {
				t.Fatalf("offset %g, point %v, whole outline: %v", off, q, got)
			}
		}
		// maxDistance: the samples of a shifted copy, every ratio-th.
		var sub []geometry.Point
		for k := 0; k < len(poly); k += refRatio {
			sub = append(sub, poly[k].Add(geometry.Point{X: 1e-4 * rng.NormFloat64(), Y: 1e-4 * rng.NormFloat64()}))
		}
		want := 0.0
		for k, q := range sub {
			c := refRatio * k
			want = max(want, bruteNearest2(q, poly, max(0, c-distWindow), min(len(poly)-1, c+distWindow)))
		}
		if got := maxDistance(sub, poly, refRatio, reach); !same(got, math.Sqrt(want)) {
			t.Errorf("offset %g: maxDistance %v, every segment %v", off, got, math.Sqrt(want))
		}
		want = 0
		for k := 0; k < len(poly); k += mirrorStep {
			want = max(want, bruteNearest2(geometry.Point{X: poly[k].X, Y: -poly[k].Y}, poly, 0, len(poly)-1))
		}
		if got := mirrorDistance(poly); !same(got, math.Sqrt(want)) {
			t.Errorf("offset %g: mirrorDistance %v, every segment %v", off, got, math.Sqrt(want))
		}
	}
	// Not finite: a NaN in the window gives NaN, as min does; an
	// infinity skips nothing.
	poly := []geometry.Point{{X: 0, Y: 0}, {X: 1, Y: 0}, {X: math.NaN(), Y: 0}, {X: 3, Y: 0}, {X: 4, Y: 0}}
	q := geometry.Point{X: 0.5, Y: 0.1}
	if got := nearestSeg2(q, poly, 0, 4, 0, newSegReach(poly).with([]geometry.Point{q})); !math.IsNaN(got) {
		t.Errorf("with a NaN: %v, want NaN", got)
	}
	poly[2] = geometry.Point{X: math.Inf(1), Y: 0}
	want := bruteNearest2(q, poly, 0, 4)
	if got := nearestSeg2(q, poly, 0, 4, 3, newSegReach(poly).with([]geometry.Point{q})); !same(got, want) {
		t.Errorf("with an infinity: %v, want %v", got, want)
	}
}
