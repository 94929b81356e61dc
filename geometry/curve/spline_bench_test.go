package curve

import (
	"fmt"
	"math"
	"testing"
)

// BenchmarkSplineFit times one smoothing fit of two columns with the trace
// of the hat matrix on a closed loop of n knots, the step the
// smoothing-parameter search repeats.
func BenchmarkSplineFit(b *testing.B) {
	for _, n := range []int{1000, 10000, 100000} {
		ts, xs, ys := splineBenchLoop(n)
		p := splineNewProblem(ts, nil, true, 2*math.Pi)
		cols := [][]float64{xs, ys}
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := p.fit(1e-6, cols, true); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// splineBenchLoop returns n knots on [0, 2π) and an ellipse with a ripple.
func splineBenchLoop(n int) (ts, xs, ys []float64) {
	ts, xs, ys = make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range ts {
		t := 2 * math.Pi * (float64(i) + 0.3*math.Sin(float64(i))) / float64(n)
		ts[i] = t
		xs[i] = math.Cos(t) + 1e-3*math.Sin(37*t)
		ys[i] = 0.2*math.Sin(t) + 1e-3*math.Cos(53*t)
	}
	return ts, xs, ys
}
