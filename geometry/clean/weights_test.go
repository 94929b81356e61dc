package clean

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// The weights of a loop stand for the length of outline round each
// point: on a circle of 40 even steps each point stands for one step, and
// a probe slip 0.2 radius off it stands for no more than the points
// beside it (calculated by hand: the chord of 9° is 2 sin 4.5°).
func TestLoopWeightsSlip(t *testing.T) {
	const n = 40
	pts := make([]geometry.Point, n)
	seq := make([]int32, n)
	for k := range pts {
		a := 2 * math.Pi * float64(k) / n
		pts[k] = geometry.Point{X: math.Cos(a), Y: math.Sin(a)}
		seq[k] = int32(k)
	}
	step := 2 * math.Sin(math.Pi/n)
	w := loopWeights(pts, seq)
	for k, v := range w {
		if math.Abs(v-step) > 1e-12 {
			t.Fatalf("point %d weighs %.6g, want the step %.6g", k, v, step)
		}
	}
	pts[10] = pts[10].Scale(1.2)
	w = loopWeights(pts, seq)
	if w[10] > step*(1+1e-12) {
		t.Errorf("the slip weighs %.4g, more than the step %.4g of the points beside it", w[10], step)
	}
}

// Each surface's weights sum to its extent along the chord and half its
// two end steps, however finely it is sampled: 200 points on one surface,
// 12 on the other.
func TestSurfaceWeightsSumToExtent(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 20))
	var xs []float64
	var upper []bool
	for range 200 {
		xs = append(xs, 0.05+0.9*rng.Float64())
		upper = append(upper, true)
	}
	for range 12 {
		xs = append(xs, 0.1+0.8*rng.Float64())
		upper = append(upper, false)
	}
	w := surfaceWeights(xs, upper)
	for _, side := range []bool{true, false} {
		var on []float64
		sum := 0.0
		for i, x := range xs {
			if upper[i] == side {
				on, sum = append(on, x), sum+w[i]
			}
		}
		slices.Sort(on)
		m := len(on)
		want := on[m-1] - on[0] + (on[1]-on[0])/2 + (on[m-1]-on[m-2])/2
		if math.Abs(sum-want) > 1e-12 {
			t.Errorf("upper %v: weights sum to %.6g, want %.6g", side, sum, want)
		}
	}
}

// Near the tail a fine upper surface with three coarse lower points
// below it, all sided as upper by a camber line that passed below them:
// the fit of the fine surface tells the coarse points apart. Two fine
// surfaces a gap apart are left alone: the parabola runs between them.
func TestOneSurfaceAft(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 20))
	var xs, ys []float64
	var near []int
	for k := range 40 {
		x := 0.86 + 0.14*float64(k)/39
		xs = append(xs, x)
		ys = append(ys, 0.3*(1-x)+1e-4*rng.NormFloat64())
		near = append(near, k)
	}
	for _, x := range []float64{0.88, 0.93, 0.97} {
		xs = append(xs, x)
		ys = append(ys, 0.1*(1-x))
		near = append(near, len(xs)-1)
	}
	upper := make([]bool, len(xs))
	for i := range upper {
		upper[i] = true
	}
	if !oneSurfaceAft(xs, ys, near, upper) {
		t.Fatal("one fine surface and three coarse points: not sided")
	}
	for i := range xs {
		if want := i < 40; upper[i] != want {
			t.Errorf("point %d at x %.3f: upper %v, want %v", i, xs[i], upper[i], want)
		}
	}

	xs, ys, near = nil, nil, nil
	for k := range 40 {
		x := 0.86 + 0.14*float64(k)/39
		y := 0.3 * (1 - x)
		if k%2 == 1 {
			y = 0.1 * (1 - x)
		}
		xs = append(xs, x)
		ys = append(ys, y+1e-5*rng.NormFloat64())
		near = append(near, k)
	}
	upper = make([]bool, len(xs))
	if oneSurfaceAft(xs, ys, near, upper) {
		t.Error("two fine surfaces: sided as one surface and a few points")
	}
}
