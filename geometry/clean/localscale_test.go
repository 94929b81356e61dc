package clean

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
)

// TestLocalScalesSlide checks localScales, whose window slides along the
// loop, against its definition (1.4826 × the median of the localWindow
// residuals on either side, by median on each window) bit for bit: short
// loops whose window spans all but one point, ties and zeros, and loops
// long enough to be split between CPUs; with a NaN or a negative value it
// takes the sort of each window.
func TestLocalScalesSlide(t *testing.T) {
	rng := rand.New(rand.NewPCG(18, 17))
	for _, n := range []int{8, 9, 21, 22, 100, 5000, 9000} {
		for kind := range 4 {
			seq := make([]int32, n)
			r := make([]float64, n)
			for i := range seq {
				seq[i] = int32(n - 1 - i) // point indices differ from places
				switch kind {
				case 0:
					r[i] = math.Abs(rng.NormFloat64())
				case 1:
					r[i] = float64(rng.IntN(4)) // ties and zeros
				case 2:
					r[i] = rng.ExpFloat64()
					if i == n/2 {
						r[i] = math.NaN()
					}
				case 3:
					r[i] = rng.NormFloat64() // negative values
				}
			}
			got := localScales(make([]geometry.Point, n), seq, r)
			w := min(localWindow, (n-1)/2)
			for i := range n {
				var buf []float64
				for d := 1; d <= w; d++ {
					buf = append(buf, r[((i-d)%n+n)%n], r[(i+d)%n])
				}
				want := 1.4826 * median(buf)
				if g := got[seq[i]]; math.Float64bits(g) != math.Float64bits(want) {
					t.Fatalf("n=%d kind %d place %d: %v, by definition %v", n, kind, i, g, want)
				}
			}
		}
	}
}
